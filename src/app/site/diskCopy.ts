import { siteFileOf, writeSiteFile, type LedgerEvent } from '../../core/site/index.ts';
import type { AppFiles } from '../../platform/types.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import { siteFileText } from './backupSite.ts';
import { restoreSite } from './restoreSite.ts';

// The second copy of a site outside IndexedDB, which a browser engine may reset when the
// disk fills or a crash corrupts its store. The copy is the site file, written through a
// CopyTarget (the app's own files: in Electron a file in the app's data folder, written
// under a temporary name, flushed, then renamed; in a browser a file in a granted
// folder), at most `maxDelayMs` behind the last durable commit.
// The keeper holds its own copy of the ledger, fed by each commit, so it never has to
// read the store back: a store the engine has just reset cannot overwrite a good copy.
// Nor can a store with another history (the site made anew after a reset): before its
// first write the keeper reads the copy already there, and when that copy is not an
// earlier state of this very ledger it is set aside under a name of its own, not lost.

export interface CopyTarget {
  /** Replaces the copy atomically (temporary name, flush, rename). */
  write(name: string, text: string): Promise<void>;
  /** The copy's text, or null when there is none. */
  read(name: string): Promise<string | null>;
}

/** The app's own files as a target for copies (text in UTF-8). */
export function appFilesTarget(files: AppFiles): CopyTarget {
  return {
    write: (name, text) => files.write(name, text),
    read: async (name) => {
      const bytes = await files.read(name);
      return bytes === null ? null : new TextDecoder().decode(bytes);
    },
  };
}

export function diskCopyName(siteId: string): string {
  return `${siteId}.site.json`;
}

/** The name under which a copy with another history is set aside, stamped with the time (UTC). */
export function asideCopyName(siteId: string, time: Date): string {
  return `${siteId}.site.aside-${time.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z')}.json`;
}

/** The site id of a copy's file name and, for one set aside, when; null for any other name. */
export function parseCopyName(name: string): { siteId: string; asideAt: string | null } | null {
  const match = /^(.+?)\.site(?:\.aside-(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z)?\.json$/.exec(name);
  if (!match) return null;
  const [, siteId, y, mo, d, h, mi, s] = match;
  return { siteId, asideAt: y ? `${y}-${mo}-${d}T${h}:${mi}:${s}Z` : null };
}

/** Writes the site file now. */
export async function writeDiskCopy(store: SiteStore, target: CopyTarget): Promise<void> {
  await target.write(diskCopyName(store.state.site!.id), await siteFileText(store));
}

/** Restores a site from its copy on disk (replacing a broken store); null when there is no copy. */
export async function restoreFromDiskCopy(siteId: string, target: CopyTarget): Promise<SiteStore | null> {
  const name = diskCopyName(siteId);
  const text = await target.read(name);
  return text === null ? null : restoreSite(name, text, { replace: true });
}

/** Where the keeper stands, for the save status on the desk. */
export interface KeeperStatus {
  /** the ledger head of the last copy written, and when (null: found up to date, written before this session) */
  written: { seq: number; at: number | null } | null;
  /** the copy found on disk is of another history (set aside with the first write) */
  otherHistory: boolean;
  /** the last write failed (shown until a write succeeds) */
  error: Error | null;
  /** a copy with another history found in the way, and the name it was set aside under */
  setAside: string | null;
}

export interface KeeperOptions {
  quietMs?: number;
  maxDelayMs?: number;
  onError?: (error: Error) => void;
  /** the clock, for the set-aside stamp */
  now?: () => Date;
}

/**
 * Keeps the copy on disk following the store: after a commit it waits `quietMs` for more
 * edits, but never lets the copy fall more than `maxDelayMs` behind. A copy missing or
 * behind when the keeper starts is written at once.
 */
export class DiskCopyKeeper {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private firstDirty = 0;
  private writing: Promise<void> = Promise.resolve();
  private readonly unsubscribe: () => void;
  private ledger: LedgerEvent[] | null = null;
  private readonly pending: LedgerEvent[] = [];
  private readonly loaded: Promise<void>;
  /** what the copy on disk was when first read (read again after a failed read) */
  private inspection: Promise<Inspection> | null = null;
  private readonly listeners = new Set<(status: KeeperStatus) => void>();
  private disposed = false;
  status: KeeperStatus = { written: null, otherHistory: false, error: null, setAside: null };

  /** the last error of a write, shown to the user until a write succeeds */
  get lastError(): Error | null {
    return this.status.error;
  }

  constructor(
    private readonly store: SiteStore,
    private readonly target: CopyTarget,
    private readonly options: KeeperOptions = {},
  ) {
    this.unsubscribe = store.subscribe((_state, event) => {
      if (this.ledger) this.ledger.push(event);
      else this.pending.push(event);
      this.schedule();
    });
    this.loaded = store.ledger().then((events) => {
      const last = events.at(-1)?.seq ?? 0;
      this.ledger = [...events, ...this.pending.filter((e) => e.seq > last)];
    });
    void this.inspect().then(({ inWay, behind, copySeq }) => {
      if (inWay !== null) this.update({ otherHistory: true });
      else if (!behind) this.update({ written: this.status.written ?? { seq: copySeq, at: null } });
      else if (!this.disposed) void this.flush();
    }, () => undefined); // a failed read is told by the first write, which reads again
  }

  /** Follows the status; the listener is called at once and after every change. */
  subscribe(listener: (status: KeeperStatus) => void): () => void {
    this.listeners.add(listener);
    listener(this.status);
    return () => this.listeners.delete(listener);
  }

  /** Whether the copy on disk holds everything the store holds (as far as this session knows). */
  get upToDate(): boolean {
    return this.status.written?.seq === this.store.state.head.seq && this.status.error === null;
  }

  /**
   * Reads the copy now on disk, once: whether it is in the way (not an earlier state of
   * this ledger: its text, to set aside) and whether it is behind the store.
   */
  private inspect(): Promise<Inspection> {
    this.inspection ??= (async () => {
      await this.loaded;
      const text = await this.target.read(diskCopyName(this.store.state.site!.id));
      if (text === null) return { inWay: null, behind: true, copySeq: 0 };
      const head = copyHead(text);
      const ours = head && this.ledger![head.seq - 1];
      if (!ours || ours.hash !== head.hash) return { inWay: text, behind: true, copySeq: head?.seq ?? 0 };
      return { inWay: null, behind: head.seq !== this.store.state.head.seq, copySeq: head.seq };
    })();
    this.inspection.catch(() => (this.inspection = null));
    return this.inspection;
  }

  private schedule(): void {
    if (this.disposed) return;
    const quiet = this.options.quietMs ?? 10_000;
    const max = this.options.maxDelayMs ?? 120_000;
    const now = Date.now();
    if (!this.timer) this.firstDirty = now;
    else clearTimeout(this.timer);
    const wait = Math.max(0, Math.min(quiet, this.firstDirty + max - now));
    this.timer = setTimeout(() => void this.flush(), wait);
    this.emit();
  }

  /** Writes the copy now (also what a timer calls), one write at a time. */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.writing = this.writing.then(async () => {
      try {
        await this.loaded;
        const state = this.store.state;
        const ledger = this.ledger!;
        if (ledger.length !== state.head.seq || ledger.at(-1)?.hash !== state.head.hash) {
          throw new Error(`the copy of site "${this.store.name}" was not written: its ledger does not reach the state's head; the copy on disk is kept as it was`);
        }
        const siteId = state.site!.id;
        const { inWay } = await this.inspect();
        if (inWay !== null && this.status.setAside === null) {
          const aside = asideCopyName(siteId, this.options.now?.() ?? new Date());
          await this.target.write(aside, inWay);
          this.update({ setAside: aside });
        }
        await this.target.write(diskCopyName(siteId), writeSiteFile(siteFileOf(state, ledger)));
        this.update({ written: { seq: state.head.seq, at: Date.now() }, otherHistory: false, error: null });
      } catch (error) {
        this.update({ error: error as Error });
        this.options.onError?.(error as Error);
      }
    });
    return this.writing;
  }

  /** Writes what the copy still lacks, then stops following the store (closing a site). */
  async close(): Promise<void> {
    this.dispose();
    await this.inspect().catch(() => undefined); // no write of the start may follow the last one
    await this.writing;
    if (this.status.written?.seq !== this.store.state.head.seq) await this.flush();
  }

  dispose(): void {
    this.disposed = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.unsubscribe();
  }

  private update(change: Partial<KeeperStatus>): void {
    this.status = { ...this.status, ...change };
    this.emit();
  }

  private emit(): void {
    for (const listener of this.listeners) listener(this.status);
  }
}

interface Inspection {
  inWay: string | null;
  behind: boolean;
  copySeq: number;
}

/** The head a site file's text records, or null when the text is not a readable site file. */
export function copyHead(text: string): { seq: number; hash: string } | null {
  try {
    const head = (JSON.parse(text) as { head?: { seq?: unknown; hash?: unknown } }).head;
    return head && typeof head.seq === 'number' && typeof head.hash === 'string' ? { seq: head.seq, hash: head.hash } : null;
  } catch {
    return null;
  }
}
