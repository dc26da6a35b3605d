import { readSiteFile } from '../../core/export/siteFile.ts';
import { SiteStore, type StoreOptions } from '../../store/SiteStore.ts';

/**
 * Restores a site file, either layout: a backup saved by the app, or the history an
 * export writes beside its data (the ledger alone, replayed here). Refused with a
 * message naming the file when it is not a site file, from a newer version, or its
 * ledger does not verify or (for a backup) replay to its contents.
 */
export async function restoreSite(fileName: string, text: string, options: StoreOptions & { replace?: boolean } = {}): Promise<SiteStore> {
  const { state, events } = await readSiteFile(text, fileName);
  return SiteStore.restore(state, events, options);
}
