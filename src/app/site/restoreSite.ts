import { readSiteFile } from '../../core/site/index.ts';
import { SiteStore, type StoreOptions } from '../../store/SiteStore.ts';

/**
 * Restores a site file: refused with a message naming the file when it is not a site
 * file, from a newer version, or its ledger does not verify or replay to its contents.
 */
export async function restoreSite(fileName: string, text: string, options: StoreOptions & { replace?: boolean } = {}): Promise<SiteStore> {
  const { state, ledger } = await readSiteFile(fileName, text);
  return SiteStore.restore(state, ledger, options);
}
