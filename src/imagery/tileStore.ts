import type { AppFiles } from '../platform/types.ts';
import { DiskTileStore } from './diskTileStore.ts';

// Where pyramid caches keep their tiles: on disk among the app's own files where the
// platform has them (Electron's data folder, a folder granted in a browser), else in
// IndexedDB; memory in tests and benchmarks.

export interface TileStore {
  get(key: string): Promise<ArrayBuffer | undefined>;
  /** Puts several tiles in one transaction. */
  put(entries: [string, ArrayBuffer][]): Promise<void>;
}

export class MemoryTileStore implements TileStore {
  readonly tiles = new Map<string, ArrayBuffer>();
  async get(key: string) {
    return this.tiles.get(key);
  }
  async put(entries: [string, ArrayBuffer][]) {
    for (const [key, value] of entries) this.tiles.set(key, value);
  }
}

const DB_NAME = 'fellfield-pyramids';
const STORE = 'tiles';

/** The tile store in IndexedDB, or null where the browser has none (then the file is read directly). */
export async function indexedDbTileStore(): Promise<TileStore | null> {
  const idb = globalThis.indexedDB;
  if (!idb) return null;
  const db = await new Promise<IDBDatabase>((resolve, reject) => {
    const request = idb.open(DB_NAME, 1);
    request.onupgradeneeded = () => request.result.createObjectStore(STORE);
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(new Error(`the pyramid cache could not be opened: ${request.error?.message ?? 'unknown error'}`));
  });
  const done = (tx: IDBTransaction) => new Promise<void>((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(new Error(`the pyramid cache could not be written: ${tx.error?.message ?? 'unknown error'}`));
    tx.onabort = () => reject(new Error(`the pyramid cache could not be written: ${tx.error?.message ?? 'the write was refused (is the disk full?)'}`));
  });
  return {
    get: (key) => new Promise((resolve, reject) => {
      const request = db.transaction(STORE, 'readonly').objectStore(STORE).get(key);
      request.onsuccess = () => resolve(request.result as ArrayBuffer | undefined);
      request.onerror = () => reject(new Error(`the pyramid cache could not be read: ${request.error?.message ?? 'unknown error'}`));
    }),
    put: async (entries) => {
      const tx = db.transaction(STORE, 'readwrite');
      const store = tx.objectStore(STORE);
      for (const [key, value] of entries) store.put(value, key);
      await done(tx);
    },
  };
}

const diskStores = new WeakMap<AppFiles, DiskTileStore>();

/**
 * The tile store to open for a reader: the app's files on disk when it is a platform that
 * has them (one store per folder, shared by every raster), else IndexedDB.
 */
export function tileStoreFor(reader: object): () => Promise<TileStore | null> {
  const platform = reader as { appFiles?: () => Promise<AppFiles | null> };
  if (typeof platform.appFiles !== 'function') return indexedDbTileStore;
  return async () => {
    const files = await platform.appFiles!().catch(() => null);
    if (!files) return indexedDbTileStore();
    let store = diskStores.get(files);
    if (!store) diskStores.set(files, (store = new DiskTileStore(files)));
    return store;
  };
}
