import type { SiteState } from '../core/site/index.ts';
import { SiteDatabase, siteDatabaseName } from './schema.ts';
import type { StoreOptions } from './SiteStore.ts';

// A light look at one site's database, for weighing a copy on disk against it without
// loading the site: is it there, can it be read, what is its head, and which hash does
// its ledger hold at a given change. Nothing is created when the database is missing.

export type SiteProbe =
  | { kind: 'missing' }
  | { kind: 'unreadable'; problem: string }
  | { kind: 'present'; head: SiteState['head']; hashAt: string | null };

export async function probeSite(siteId: string, seq: number, options: StoreOptions = {}): Promise<SiteProbe> {
  const idb = options.indexedDB ?? globalThis.indexedDB;
  const name = siteDatabaseName(siteId);
  try {
    const known = await idb.databases();
    if (!known.some((d) => d.name === name)) return { kind: 'missing' };
  } catch (error) {
    return { kind: 'unreadable', problem: oneLine(error) };
  }
  const db = new SiteDatabase(name, options);
  try {
    await db.open();
    const head = (await db.meta.get('head'))?.value as SiteState['head'] | undefined;
    const site = (await db.meta.get('site'))?.value;
    if (!head || !site) return { kind: 'missing' }; // made, but never given its first change
    return { kind: 'present', head, hashAt: seq > 0 ? ((await db.ledger.get(seq))?.hash ?? null) : null };
  } catch (error) {
    return { kind: 'unreadable', problem: oneLine(error) };
  } finally {
    db.close({ disableAutoOpen: true });
  }
}

function oneLine(error: unknown): string {
  const e = error as { name?: string; message?: string };
  return `${e?.name ?? 'Error'}: ${(e?.message ?? String(error)).split('\n')[0]}`;
}
