import type { AppFiles, Platform } from '../../platform/types.ts';
import { probeSite } from '../../store/probeSite.ts';
import { SiteStore } from '../../store/SiteStore.ts';
import { siteFileText } from './backupSite.ts';
import { asideCopyName, parseCopyName } from './diskCopy.ts';
import { restoreSite } from './restoreSite.ts';

// The copies on disk as the start page sees them: each weighed against the store of its
// site in this browser profile, so the page can offer the ones worth restoring, that is
// those whose site is missing here, cannot be read, lacks changes the copy holds, or
// has another history (a site made anew after the store was reset; a copy set aside).

/** How a copy stands against the store of its site here. */
export type CopyStanding =
  | 'missing' // the site is not in this browser's storage at all
  | 'unreadable' // its store is there but cannot be read
  | 'behind' // the store lacks changes the copy holds
  | 'different' // the store has another history than the copy
  | 'current'; // the store holds everything in the copy (and maybe more)

export interface DiskCopyEntry {
  /** the copy's file name among the app's files */
  file: string;
  siteId: string;
  /** when the copy was written (ms since 1970) */
  writtenAt: number;
  /** for a copy set aside: when (ISO 8601, UTC) */
  asideAt: string | null;
  /** what the copy holds; null when it cannot be read */
  holds: CopyContents | null;
  /** why the copy cannot be read */
  problem: string | null;
  standing: CopyStanding;
  /** why the store cannot be read, for 'unreadable' */
  storeProblem: string | null;
  /** how many changes the store here holds, when it can be read */
  storedChanges: number | null;
}

export interface CopyContents {
  siteName: string;
  changes: number;
  patches: number;
  tags: number;
  passes: number;
  rulings: number;
  /** the time of the last change it holds (ISO 8601) */
  lastChange: string | null;
}

interface CopyFacts {
  site?: { name?: string };
  patches?: unknown[];
  tags?: unknown[];
  passes?: unknown[];
  rulings?: unknown[];
  head?: { seq?: number; hash?: string };
  ledger?: { seq: number; hash: string; time?: string }[];
}

/** Every copy among the app's files, newest first, each weighed against its store here. */
export async function listDiskCopies(files: AppFiles): Promise<DiskCopyEntry[]> {
  const copies = (await files.list()).flatMap((info) => {
    const parsed = parseCopyName(info.name);
    return parsed ? [{ info, ...parsed }] : [];
  });
  const entries: DiskCopyEntry[] = [];
  for (const { info, siteId, asideAt } of copies) {
    const base = { file: info.name, siteId, writtenAt: info.modified, asideAt, storeProblem: null, storedChanges: null };
    let facts: CopyFacts;
    try {
      const bytes = await files.read(info.name);
      facts = JSON.parse(new TextDecoder().decode(bytes ?? new Uint8Array()));
      if (!facts.head || typeof facts.head.seq !== 'number' || !Array.isArray(facts.ledger)) throw new Error('not a site file');
    } catch (error) {
      entries.push({ ...base, holds: null, problem: `${info.name}: cannot be read (${(error as Error).message})`, standing: 'different' });
      continue;
    }
    const head = { seq: facts.head.seq!, hash: facts.head.hash ?? '' };
    const probe = await probeSite(siteId, head.seq);
    let standing: CopyStanding;
    if (probe.kind === 'missing' || probe.kind === 'unreadable') standing = probe.kind;
    else if (probe.hashAt === head.hash) standing = 'current';
    else if (probe.head.seq < head.seq && facts.ledger[probe.head.seq - 1]?.hash === probe.head.hash) standing = 'behind';
    else standing = 'different';
    entries.push({
      ...base,
      holds: {
        siteName: facts.site?.name ?? siteId,
        changes: head.seq,
        patches: facts.patches?.length ?? 0,
        tags: facts.tags?.length ?? 0,
        passes: facts.passes?.length ?? 0,
        rulings: facts.rulings?.length ?? 0,
        lastChange: facts.ledger.at(-1)?.time ?? null,
      },
      problem: null,
      standing,
      storeProblem: probe.kind === 'unreadable' ? probe.problem : null,
      storedChanges: probe.kind === 'present' ? probe.head.seq : null,
    });
  }
  return entries.sort((a, b) => b.writtenAt - a.writtenAt);
}

/** Whether the start page offers the copy for restoring. */
export function worthRestoring(entry: DiskCopyEntry): boolean {
  return entry.holds !== null && entry.standing !== 'current';
}

/** The copies of sites lost from this profile (missing, unreadable or behind), found at start. */
export async function sitesAwaitingRestore(platform: Platform): Promise<DiskCopyEntry[]> {
  const files = await platform.appFiles().catch(() => null);
  if (!files) return [];
  const entries = await listDiskCopies(files).catch(() => []);
  return entries.filter((e) => e.asideAt === null && e.holds && ['missing', 'unreadable', 'behind'].includes(e.standing));
}

export interface RestoredCopy {
  name: string;
  patches: number;
  changes: number;
  /** the site that was stored here, set aside as a copy of its own before it was replaced */
  keptAs: string | null;
}

/**
 * Restores a site from its copy: the ledger is verified first (a changed or damaged copy
 * is refused, naming it). An unreadable store is deleted and written anew; a store of
 * another history is first written out as a copy set aside, so nothing is lost.
 */
export async function restoreDiskCopy(files: AppFiles, entry: DiskCopyEntry, now = new Date()): Promise<RestoredCopy> {
  const bytes = await files.read(entry.file);
  if (bytes === null) throw new Error(`${entry.file}: the copy is gone from ${files.where}`);
  const text = new TextDecoder().decode(bytes);
  let keptAs: string | null = null;
  if (entry.standing === 'unreadable') await SiteStore.remove(entry.siteId);
  if (entry.standing === 'different') {
    const stored = await SiteStore.open(entry.siteId).catch(() => null);
    if (stored) {
      try {
        keptAs = asideCopyName(entry.siteId, now);
        await files.write(keptAs, await siteFileText(stored));
      } finally {
        stored.close();
      }
    }
  }
  const store = await restoreSite(entry.file, text, { replace: true });
  try {
    return { name: store.name, patches: store.state.patches.size, changes: store.state.head.seq, keptAs };
  } finally {
    store.close();
  }
}
