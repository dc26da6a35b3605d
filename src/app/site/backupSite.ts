import { siteFileOf, writeSiteFile } from '../../core/site/index.ts';
import type { SiteStore } from '../../store/SiteStore.ts';

/** The whole site as one site file (see src/core/site/siteFile.ts for the format). */
export async function siteFileText(store: SiteStore): Promise<string> {
  return writeSiteFile(siteFileOf(store.state, await store.ledger()));
}

/** A file name for a backup: the site's name and the ledger head, e.g. "upper-basin-site-120.json". */
export function backupFileName(store: SiteStore): string {
  const slug = store.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'site';
  return `${slug}-site-${store.state.head.seq}.json`;
}

/** Offers the site file for saving; false when the user cancels. */
export async function backupSite(store: SiteStore, save: (name: string, data: string) => Promise<boolean>): Promise<boolean> {
  return save(backupFileName(store), await siteFileText(store));
}
