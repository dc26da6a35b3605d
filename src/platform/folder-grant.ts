// In a plain browser the app's own files live in a folder the user grants through the
// File System Access API's folder picker (showDirectoryPicker). The folder's handle is
// kept in IndexedDB (handles are structured-cloneable), so the next visit finds it; the
// browser then usually wants the user's leave again, which only a click can ask for
// (requestPermission needs a user gesture), so the start page offers it.
//
// The handle is lost when the browser's storage is wiped, the very case the copies are
// for: then the user chooses the same folder again and the copies in it are found.

import { DirectoryAppFiles } from './directory-files.ts';
import type { AppFiles, FolderGrant, FolderState } from './types.ts';

/** showDirectoryPicker's shape (WICG File System Access). */
export type DirectoryPicker = (options?: { id?: string; mode?: 'read' | 'readwrite'; startIn?: string }) => Promise<FileSystemDirectoryHandle>;

type Permission = 'granted' | 'denied' | 'prompt';
interface PermissionMethods {
  queryPermission?(descriptor: { mode: 'readwrite' }): Promise<Permission>;
  requestPermission?(descriptor: { mode: 'readwrite' }): Promise<Permission>;
}

const DB_NAME = 'fellfield-app-folder';
const STORE = 'handles';
const KEY = 'folder';

export class BrowserFolderGrant implements FolderGrant {
  readonly #picker: DirectoryPicker;
  readonly #indexedDB: IDBFactory | undefined;
  #handle: FileSystemDirectoryHandle | null | undefined; // undefined: not looked up yet
  #files: { handle: FileSystemDirectoryHandle; files: DirectoryAppFiles } | null = null;

  constructor(picker: DirectoryPicker, indexedDB: IDBFactory | undefined = globalThis.indexedDB) {
    this.#picker = picker;
    this.#indexedDB = indexedDB;
  }

  async state(): Promise<FolderState> {
    const handle = await this.#load();
    if (!handle) return { state: 'none' };
    return (await permission(handle, 'query')) === 'granted' ? { state: 'ready', name: handle.name } : { state: 'ask', name: handle.name };
  }

  async choose(): Promise<FolderState> {
    let handle: FileSystemDirectoryHandle;
    try {
      handle = await this.#picker({ id: 'fellfield-files', mode: 'readwrite', startIn: 'documents' });
    } catch (error) {
      if ((error as DOMException)?.name === 'AbortError') return this.state(); // the user cancelled: nothing changes
      throw new Error(`The folder could not be chosen: ${(error as Error).message}`, { cause: error });
    }
    if ((await permission(handle, 'query')) !== 'granted') await permission(handle, 'request');
    this.#handle = handle;
    await this.#save(handle);
    return this.state();
  }

  async allowAgain(): Promise<FolderState> {
    const handle = await this.#load();
    if (handle) await permission(handle, 'request');
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
      this.#handle = await withStore(this.#indexedDB, 'readonly', (store) => store.get(KEY)) as FileSystemDirectoryHandle | null ?? null;
    } catch {
      this.#handle = null; // no storage to remember it in: the user chooses again
    }
    return this.#handle;
  }

  async #save(handle: FileSystemDirectoryHandle): Promise<void> {
    // Not remembered (storage refused): the folder still serves this visit.
    await withStore(this.#indexedDB, 'readwrite', (store) => store.put(handle, KEY)).catch(() => undefined);
  }
}

async function permission(handle: FileSystemDirectoryHandle, how: 'query' | 'request'): Promise<Permission> {
  const methods = handle as FileSystemDirectoryHandle & PermissionMethods;
  const call = how === 'query' ? methods.queryPermission : methods.requestPermission;
  if (!call) return 'granted'; // a browser without the permission methods gives handles their access outright
  try {
    return await call.call(handle, { mode: 'readwrite' });
  } catch {
    return how === 'query' ? 'prompt' : 'denied'; // e.g. a request without a click
  }
}

function withStore<T>(idb: IDBFactory | undefined, mode: IDBTransactionMode, work: (store: IDBObjectStore) => IDBRequest<T>): Promise<T | undefined> {
  if (!idb) return Promise.reject(new Error('no IndexedDB here'));
  return new Promise((resolve, reject) => {
    const open = idb.open(DB_NAME, 1);
    open.onupgradeneeded = () => open.result.createObjectStore(STORE);
    open.onerror = () => reject(open.error);
    open.onsuccess = () => {
      const db = open.result;
      const tx = db.transaction(STORE, mode);
      const request = work(tx.objectStore(STORE));
      tx.oncomplete = () => {
        db.close();
        resolve(request.result);
      };
      tx.onerror = tx.onabort = () => {
        db.close();
        reject(tx.error ?? request.error);
      };
    };
  });
}
