import type { AppFiles, FolderGrant, FolderState, Platform } from '../../platform/types.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import type { OpenSite } from '../site.ts';
import { appFilesTarget, DiskCopyKeeper, type KeeperOptions, type KeeperStatus } from './diskCopy.ts';

// The copy on disk of one open site: a DiskCopyKeeper while the site is open and a last
// write when it closes (and when the page goes away). Where the platform has no place
// for the app's files yet (a browser whose user has not granted a folder), the session
// says so and can start keeping the copy once the user grants one.

/** What the desk shows about the copy: one line. */
export type CopyLine =
  | { kind: 'none'; folder: FolderState | null }
  | {
      kind: 'kept';
      where: string;
      /** the last copy written (its time; null when found up to date from before) and how many saved changes it lacks now */
      written: { at: number | null; behind: number } | null;
      /** the copy found on disk is of another history; the first change sets it aside */
      otherHistory: boolean;
      /** why the last write failed, and what to do */
      error: string | null;
      /** a copy of another history that was set aside (its file name), not overwritten */
      setAside: string | null;
    };

export class DiskCopySession {
  readonly #store: SiteStore;
  readonly #grant: FolderGrant | null;
  readonly #options: KeeperOptions;
  #keeper: DiskCopyKeeper | null = null;
  #where = '';
  #status: KeeperStatus | null = null;
  #folder: FolderState | null = null;
  #closed = false;
  readonly #listeners = new Set<(line: CopyLine) => void>();
  readonly #unsubscribe: () => void;
  readonly #onPageHide = () => void this.#keeper?.flush();

  constructor(store: SiteStore, grant: FolderGrant | null, options: KeeperOptions = {}) {
    this.#store = store;
    this.#grant = grant;
    this.#options = options;
    this.#unsubscribe = store.subscribe(() => this.#emit());
    globalThis.addEventListener?.('pagehide', this.#onPageHide);
    if (grant) void grant.state().then((folder) => ((this.#folder = folder), this.#emit()), () => undefined);
  }

  /** Starts keeping the copy in `files` (once; later calls are ignored). */
  attach(files: AppFiles): void {
    if (this.#keeper || this.#closed) return;
    this.#where = files.where;
    this.#keeper = new DiskCopyKeeper(this.#store, appFilesTarget(files), this.#options);
    this.#keeper.subscribe((status) => {
      this.#status = status;
      this.#emit();
    });
  }

  get line(): CopyLine {
    if (!this.#keeper || !this.#status) return { kind: 'none', folder: this.#folder };
    const { written, otherHistory, error, setAside } = this.#status;
    return {
      kind: 'kept',
      where: this.#where,
      written: written && { at: written.at, behind: this.#store.state.head.seq - written.seq },
      otherHistory,
      error: error && (error.message || String(error)),
      setAside,
    };
  }

  /** Follows the line; the listener is called at once and after every change. */
  subscribe(listener: (line: CopyLine) => void): () => void {
    this.#listeners.add(listener);
    listener(this.line);
    return () => this.#listeners.delete(listener);
  }

  /** Browser only: asks the user for a folder (from a click) and starts keeping the copy there. */
  async chooseFolder(how: 'choose' | 'allow again' = 'choose'): Promise<void> {
    if (!this.#grant) return;
    this.#folder = how === 'choose' ? await this.#grant.choose() : await this.#grant.allowAgain();
    const files = this.#folder.state === 'ready' ? await this.#grant.files() : null;
    if (files) this.attach(files);
    this.#emit();
  }

  /** Writes the last changes and stops; resolves when the copy is written (or failed). */
  async close(): Promise<void> {
    if (this.#closed) return;
    this.#closed = true;
    globalThis.removeEventListener?.('pagehide', this.#onPageHide);
    this.#unsubscribe();
    await this.#keeper?.close();
    this.#listeners.clear();
  }

  #emit(): void {
    const line = this.line;
    for (const listener of this.#listeners) listener(line);
  }
}

/**
 * The open site with its copy on disk kept (a stored site only; imagery alone has
 * nothing to copy). Closing the site writes the copy's last changes.
 */
export async function withDiskCopy(platform: Platform, site: OpenSite, options: KeeperOptions = {}): Promise<OpenSite> {
  if (!site.store) return site;
  const session = new DiskCopySession(site.store, platform.folderGrant, options);
  const files = await platform.appFiles().catch(() => null);
  if (files) session.attach(files);
  return {
    ...site,
    diskCopy: session,
    dispose: () => {
      // the keeper writes from the state in memory, so the store may close at once
      void session.close();
      site.dispose();
    },
  };
}
