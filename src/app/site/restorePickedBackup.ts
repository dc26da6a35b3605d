import { readText } from '../../platform/read-whole.ts';
import type { Platform } from '../../platform/types.ts';
import { restoreSite } from './restoreSite.ts';

/** A backup restored on this machine, told as the start page says it. */
export interface RestoredBackup {
  id: string;
  name: string;
  patches: number;
  events: number;
}

/**
 * Asks for a site file and restores it into this machine's storage. Null when the user
 * cancels; a refusal (not a site file, newer version, tampered ledger, site already
 * here) throws with a message that names the file.
 */
export async function restorePickedBackup(platform: Platform, options: { replace?: boolean } = {}): Promise<RestoredBackup | null> {
  const [file] = await platform.pickFiles({ title: 'Restore a site from its backup file', extensions: ['json'] });
  if (!file) return null;
  const text = await readText(platform, file, { maxBytes: 512 * 1024 * 1024 });
  const store = await restoreSite(file.name, text, options);
  try {
    return { id: store.state.site?.id ?? '', name: store.name, patches: store.state.patches.size, events: store.state.head.seq };
  } finally {
    store.close();
  }
}
