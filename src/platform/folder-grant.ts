// In a plain browser the app's own files live in a folder the user grants through the
// File System Access API's folder picker (showDirectoryPicker). The folder's handle is
// kept in IndexedDB (handles are structured-cloneable), so the next visit finds it; the
// browser then usually wants the user's leave again, which only a click can ask for
// (requestPermission needs a user gesture), so the start page offers it.
//
// The handle is lost when the browser's storage is wiped, the very case the copies are
// for: then the user chooses the same folder again and the copies in it are found.

import { DirectoryAppFiles } from './directory-files.ts';
import { handlePermission } from './handle-permission.ts';
import { KeyValueStore } from './idb-keyval.ts';
import type { AppFiles, FolderGrant, FolderState } from './types.ts';

/** showDirectoryPicker's shape (WICG File System Access). */
export type DirectoryPicker = (options?: { id?: string; mode?: 'read' | 'readwrite'; startIn?: string }) => Promise<FileSystemDirectoryHandle>;

const KEY = 'folder';

export class BrowserFolderGrant implements FolderGrant {
  readonly #picker: DirectoryPicker;
  readonly #kept: KeyValueStore<FileSystemDirectoryHandle>;
  #handle: FileSystemDirectoryHandle | null | undefined; // undefined: not looked up yet
  #files: { handle: FileSystemDirectoryHandle; files: DirectoryAppFiles } | null = null;

  constructor(picker: DirectoryPicker, indexedDB: IDBFactory | undefined = globalThis.indexedDB) {
    this.#picker = picker;
    this.#kept = new KeyValueStore('fellfield-app-folder', 'handles', indexedDB);
  }

  async state(): Promise<FolderState> {
    const handle = await this.#load();
    if (!handle) return { state: 'none' };
    return (await handlePermission(handle, 'query', 'readwrite')) === 'granted' ? { state: 'ready', name: handle.name } : { state: 'ask', name: handle.name };
  }

  async choose(): Promise<FolderState> {
    let handle: FileSystemDirectoryHandle;
    try {
      handle = await this.#picker({ id: 'fellfield-files', mode: 'readwrite', startIn: 'documents' });
    } catch (error) {
      if ((error as DOMException)?.name === 'AbortError') return this.state(); // the user cancelled: nothing changes
      throw new Error(`The folder could not be chosen: ${(error as Error).message}`, { cause: error });
    }
    if ((await handlePermission(handle, 'query', 'readwrite')) !== 'granted') await handlePermission(handle, 'request', 'readwrite');
    this.#handle = handle;
    await this.#save(handle);
    return this.state();
  }

  async allowAgain(): Promise<FolderState> {
    const handle = await this.#load();
    if (handle) await handlePermission(handle, 'request', 'readwrite');
    return this.state();
  }

  /** The files of the granted folder, or null when there is none or leave is not given. */
  async files(): Promise<AppFiles | null> {
    if ((await this.state()).state !== 'ready') return null;
    const handle = this.#handle!;
    if (this.#files?.handle !== handle) this.#files = { handle, files: new DirectoryAppFiles(handle) };
    return this.#files.files;
  }

  async #load(): Promise<FileSystemDirectoryHandle | null> {
    if (this.#handle !== undefined) return this.#handle;
    try {
      this.#handle = (await this.#kept.get(KEY)) ?? null;
    } catch {
      this.#handle = null; // no storage to remember it in: the user chooses again
    }
    return this.#handle;
  }

  async #save(handle: FileSystemDirectoryHandle): Promise<void> {
    // Not remembered (storage refused): the folder still serves this visit.
    await this.#kept.put(KEY, handle).catch(() => undefined);
  }
}
