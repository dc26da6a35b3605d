// A small key-value store in an IndexedDB database of its own, for what the platform
// keeps beside the app's Dexie database: the handles of a granted folder or of picked
// files (structured-cloneable, so they go in as they are), and fingerprints checked
// before. Each call opens the database, runs one transaction and closes it again: these
// are read once per open of a site, not in a loop.

export class KeyValueStore<V> {
  readonly #database: string;
  readonly #store: string;
  readonly #indexedDB: IDBFactory | undefined;

  constructor(database: string, store: string, indexedDB: IDBFactory | undefined = globalThis.indexedDB) {
    this.#database = database;
    this.#store = store;
    this.#indexedDB = indexedDB;
  }

  /** The value under `key`, or undefined when there is none. */
  async get(key: string): Promise<V | undefined> {
    return (await this.#run('readonly', (store) => store.get(key))) as V | undefined;
  }

  async put(key: string, value: V): Promise<void> {
    await this.#run('readwrite', (store) => store.put(value, key));
  }

  async delete(key: string): Promise<void> {
    await this.#run('readwrite', (store) => store.delete(key));
  }

  #run<T>(mode: IDBTransactionMode, work: (store: IDBObjectStore) => IDBRequest<T>): Promise<T> {
    const idb = this.#indexedDB;
    if (!idb) return Promise.reject(new Error('no IndexedDB here'));
    return new Promise((resolve, reject) => {
      const open = idb.open(this.#database, 1);
      open.onupgradeneeded = () => open.result.createObjectStore(this.#store);
      open.onerror = () => reject(open.error);
      open.onsuccess = () => {
        const db = open.result;
        let tx: IDBTransaction;
        let request: IDBRequest<T>;
        try {
          tx = db.transaction(this.#store, mode);
          request = work(tx.objectStore(this.#store));
        } catch (error) {
          db.close();
          reject(error); // e.g. a value that cannot be cloned
          return;
        }
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
}
