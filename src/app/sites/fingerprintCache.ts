import { KeyValueStore } from '../../platform/idb-keyval.ts';
import type { FileRef } from '../../platform/types.ts';

// Fingerprints taken before, kept on this machine by the file's name, size and last
// modification, so an imagery file unchanged since is not read through again on every
// open: a multi-gigabyte scene takes tens of seconds to hash. A file whose size or time
// differs is a new key, and is fingerprinted again. What this cannot see: a file rewritten
// with other content of the same size whose modification time is then set back to the old
// one (as some copy tools do on purpose); the one in the site's ledger is checked again
// only when the size or time moves. A file whose modification time is not known (a demo
// file) is never kept.

export interface FingerprintCache {
  /** The SHA-256 (lower-case hex) a file of this name, size and modification time had; null when none is kept. */
  get(file: FileRef): Promise<string | null>;
  /** Keeps a file's SHA-256 under its name, size and modification time (nothing for a file with no time). */
  put(file: FileRef, sha256: string): Promise<void>;
}

/** The key of a file: null when its modification time is not known. */
export function fingerprintKey(file: Pick<FileRef, 'name' | 'size' | 'modified'>): string | null {
  if (file.modified === undefined || !Number.isFinite(file.modified)) return null;
  return JSON.stringify([file.name, file.size, file.modified]);
}

interface Kept {
  sha256: string;
  /** when it was fingerprinted (ms since 1970) */
  at: number;
}

const SHA256 = /^[0-9a-f]{64}$/;

/** The fingerprints kept in IndexedDB (a database of their own); a storage failure only means hashing again. */
export class StoredFingerprints implements FingerprintCache {
  readonly #kept: KeyValueStore<Kept>;

  constructor(indexedDB: IDBFactory | undefined = globalThis.indexedDB) {
    this.#kept = new KeyValueStore('fellfield-fingerprints', 'files', indexedDB);
  }

  async get(file: FileRef): Promise<string | null> {
    const key = fingerprintKey(file);
    if (!key) return null;
    const kept = await this.#kept.get(key).catch(() => undefined);
    return typeof kept?.sha256 === 'string' && SHA256.test(kept.sha256) ? kept.sha256 : null;
  }

  async put(file: FileRef, sha256: string): Promise<void> {
    const key = fingerprintKey(file);
    if (key && SHA256.test(sha256)) await this.#kept.put(key, { sha256, at: Date.now() }).catch(() => undefined);
  }
}

/** Fingerprints kept for the life of the object (a script, a test). */
export class FingerprintsInMemory implements FingerprintCache {
  readonly #kept = new Map<string, string>();

  async get(file: FileRef): Promise<string | null> {
    const key = fingerprintKey(file);
    return (key && this.#kept.get(key)) ?? null;
  }

  async put(file: FileRef, sha256: string): Promise<void> {
    const key = fingerprintKey(file);
    if (key && SHA256.test(sha256)) this.#kept.set(key, sha256);
  }
}
