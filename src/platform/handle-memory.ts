// A site's imagery found again in a browser with the File System Access API: its files are
// picked through showOpenFilePicker, whose handles are kept here in IndexedDB by site
// (handles are structured-cloneable; WICG File System Access). On the next open each
// handle is asked for its file again. The browser usually wants the user's leave first,
// which can only be asked while handling a click (requestPermission). A file whose size
// or last modification differs from when it was picked is not handed out: it is
// 'changed', and the user picks it again so it is fingerprinted again.

import { handlePermission } from './handle-permission.ts';
import { KeyValueStore } from './idb-keyval.ts';
import type { FileRef, ImageryMemory, RecalledFile } from './types.ts';

/** One kept file: its handle, and its name, size and last modification when picked. */
export interface KeptHandle {
  handle: FileSystemFileHandle;
  name: string;
  size: number;
  modified: number;
}

/** What the memory needs of the platform that picked the files. */
export interface HandleSource {
  /** The handle a file was picked through, with the size and time it had then; null for a file picked otherwise. */
  handleOf(file: FileRef): KeptHandle | null;
  /** Makes a file read again through its handle readable by reference, as if just picked. */
  adopt(file: File, handle: FileSystemFileHandle): FileRef;
}

export const HANDLE_DATABASE = 'fellfield-imagery-handles';

export class HandleMemory implements ImageryMemory {
  readonly #source: HandleSource;
  readonly #kept: KeyValueStore<KeptHandle[]>;

  constructor(source: HandleSource, indexedDB: IDBFactory | undefined = globalThis.indexedDB) {
    this.#source = source;
    this.#kept = new KeyValueStore(HANDLE_DATABASE, 'sites', indexedDB);
  }

  async remember(siteId: string, files: FileRef[]): Promise<void> {
    const kept = files.map((f) => this.#source.handleOf(f)).filter((k): k is KeptHandle => k !== null);
    if (kept.length === 0) await this.#kept.delete(siteId);
    else await this.#kept.put(siteId, kept);
  }

  async recall(siteId: string, options: { ask?: boolean } = {}): Promise<RecalledFile[]> {
    const kept = (await this.#kept.get(siteId)) ?? [];
    const recalled: RecalledFile[] = [];
    for (const { handle, name, size, modified } of kept) {
      let leave = await handlePermission(handle, 'query', 'read');
      if (leave !== 'granted' && options.ask) leave = await handlePermission(handle, 'request', 'read');
      if (leave !== 'granted') {
        recalled.push({ name, state: 'not-allowed' });
        continue;
      }
      let file: File;
      try {
        file = await handle.getFile();
      } catch (error) {
        const kind = (error as DOMException)?.name;
        recalled.push({ name, state: kind === 'NotAllowedError' || kind === 'SecurityError' ? 'not-allowed' : 'missing' });
        continue;
      }
      if (file.size !== size || file.lastModified !== modified) recalled.push({ name, state: 'changed' });
      else recalled.push({ name, state: 'ready', file: this.#source.adopt(file, handle) });
    }
    return recalled;
  }
}
