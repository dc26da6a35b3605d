import { siteFileOf, writeSiteFile, type LedgerEvent } from '../../core/site/index.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import { siteFileText } from './backupSite.ts';
import { restoreSite } from './restoreSite.ts';

// The second copy of a site outside IndexedDB, which a browser engine may reset when the
// disk fills or a crash corrupts its store. The copy is the site file, written through a
// CopyTarget (in Electron: a file in the app's data folder, written under a temporary
// name, flushed, then renamed), at most `maxDelayMs` behind the last durable commit.
// The keeper holds its own copy of the ledger, fed by each commit, so it never has to
// read the store back: a store the engine has just reset cannot overwrite a good copy.

export interface CopyTarget {
  /** Replaces the copy atomically (temporary name, flush, rename). */
  write(name: string, text: string): Promise<void>;
  /** The copy's text, or null when there is none. */
  read(name: string): Promise<string | null>;
}

export function diskCopyName(siteId: string): string {
  return `${siteId}.site.json`;
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

/**
 * Keeps the copy on disk following the store: after a commit it waits `quietMs` for more
 * edits, but never lets the copy fall more than `maxDelayMs` behind.
 */
export class DiskCopyKeeper {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private firstDirty = 0;
  private writing: Promise<void> = Promise.resolve();
  private readonly unsubscribe: () => void;
  private ledger: LedgerEvent[] | null = null;
  private readonly pending: LedgerEvent[] = [];
  private readonly loaded: Promise<void>;
  /** the last error of a write, shown to the user until a write succeeds */
  lastError: Error | null = null;

  constructor(
    private readonly store: SiteStore,
    private readonly target: CopyTarget,
    private readonly options: { quietMs?: number; maxDelayMs?: number; onError?: (error: Error) => void } = {},
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
  }

  private schedule(): void {
    const quiet = this.options.quietMs ?? 10_000;
    const max = this.options.maxDelayMs ?? 120_000;
    const now = Date.now();
    if (!this.timer) this.firstDirty = now;
    else clearTimeout(this.timer);
    const wait = Math.max(0, Math.min(quiet, this.firstDirty + max - now));
    this.timer = setTimeout(() => void this.flush(), wait);
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
        await this.target.write(diskCopyName(state.site!.id), writeSiteFile(siteFileOf(state, ledger)));
        this.lastError = null;
      } catch (error) {
        this.lastError = error as Error;
        this.options.onError?.(error as Error);
      }
    });
    return this.writing;
  }

  dispose(): void {
    if (this.timer) clearTimeout(this.timer);
    this.unsubscribe();
  }
}
