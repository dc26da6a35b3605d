import { listSites, type SiteListing } from '../../store/siteCatalogue.ts';
import { DEMO_SITE_ID } from './openStoredDemo.ts';

export interface StoredSiteEntry extends SiteListing {
  /** the demo opens with its own imagery; other sites ask for theirs */
  demo: boolean;
}

/** The sites kept in this browser profile's storage, by name, for the start screen. */
export async function storedSites(): Promise<StoredSiteEntry[]> {
  return (await listSites()).map((site) => ({ ...site, demo: site.id === DEMO_SITE_ID }));
}
