import { sha256Stream } from '../../core/ledger/sha256Stream.ts';
import { PlatformError } from '../../platform/errors.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import type { HashReply, HashRequest } from './fileHash.worker.ts';

// The SHA-256 of an imagery file, which can be many gigabytes: read by byte ranges
// through the platform bridge, a few megabytes at a time, into an incremental hash that
// runs in a worker. The next piece is read while the worker hashes the one before, so at
// most two pieces are held at once. Cancellable between pieces, with progress in bytes.

/** One running hash: pieces in order, then the digest. */
export interface HashJob {
  update(bytes: Uint8Array): Promise<void>;
  digest(): Promise<string>;
  drop(): void;
}

/** Who hashes: a worker in the app, the calling thread in tests. */
export interface Hasher {
  start(): HashJob;
  dispose(): void;
}

export const HASH_PIECE_BYTES = 4 * 1024 * 1024;

export interface HashOptions {
  signal?: AbortSignal;
  /** bytes of this file hashed so far */
  onBytes?: (done: number) => void;
  pieceBytes?: number;
}

/** Lower-case hex SHA-256 of a whole file, read piece by piece. */
export async function hashFile(platform: Pick<Platform, 'readRange'>, file: FileRef, hasher: Hasher, options: HashOptions = {}): Promise<string> {
  const { signal, onBytes = () => {}, pieceBytes = HASH_PIECE_BYTES } = options;
  const job = hasher.start();
  try {
    let hashing: Promise<void> = Promise.resolve();
    for (let offset = 0; offset < file.size; offset += pieceBytes) {
      const want = Math.min(pieceBytes, file.size - offset);
      const bytes = await platform.readRange(file, offset, want, signal);
      if (bytes.length !== want) throw new PlatformError('io', `changed while it was read (got ${bytes.length} of ${want} bytes at ${offset})`, file.name);
      await hashing;
      if (signal?.aborted) throw new PlatformError('aborted', 'the check was cancelled', file.name);
      hashing = job.update(bytes);
      onBytes(offset + want);
    }
    await hashing;
    return await job.digest();
  } catch (error) {
    job.drop();
    throw error;
  }
}

/** Hashes in the calling thread (tests, scripts). */
export function inlineHasher(): Hasher {
  return {
    start() {
      const hash = sha256Stream();
      return { update: async (bytes) => hash.update(bytes), digest: async () => hash.hex(), drop: () => {} };
    },
    dispose() {},
  };
}

/** One worker for every hash of the page, made on first use; jobs matched by id. */
export class WorkerHasher implements Hasher {
  #worker: Worker | null = null;
  #nextId = 1;
  #waiting = new Map<number, { resolve: (reply: HashReply) => void; reject: (error: Error) => void }>();

  start(): HashJob {
    const id = this.#nextId++;
    this.#send({ kind: 'start', id });
    const ask = (request: HashRequest, transfer: Transferable[] = []) => new Promise<HashReply>((resolve, reject) => {
      this.#waiting.set(id, { resolve, reject });
      this.#send(request, transfer);
    }).then((reply) => {
      if (reply.kind === 'failed') throw new Error(reply.message);
      return reply;
    });
    return {
      update: async (bytes) => {
        // The piece is handed over, not copied: the reader does not keep it.
        const owned = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? bytes : bytes.slice();
        await ask({ kind: 'update', id, bytes: owned }, [owned.buffer]);
      },
      digest: async () => {
        const reply = await ask({ kind: 'digest', id });
        return reply.kind === 'digest' ? reply.hex : '';
      },
      drop: () => {
        this.#waiting.delete(id);
        this.#send({ kind: 'drop', id });
      },
    };
  }

  #send(request: HashRequest, transfer: Transferable[] = []): void {
    this.#worker ??= this.#spawn();
    this.#worker.postMessage(request, transfer);
  }

  #spawn(): Worker {
    const worker = new Worker(new URL('./fileHash.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-hash' });
    worker.onmessage = (event: MessageEvent<HashReply>) => {
      const waiting = this.#waiting.get(event.data.id);
      this.#waiting.delete(event.data.id);
      waiting?.resolve(event.data);
    };
    worker.onerror = (event) => {
      const error = new Error(event.message || 'the hashing worker stopped unexpectedly');
      for (const waiting of this.#waiting.values()) waiting.reject(error);
      this.#waiting.clear();
      this.#worker?.terminate();
      this.#worker = null;
    };
    return worker;
  }

  dispose(): void {
    this.#worker?.terminate();
    this.#worker = null;
    const error = new Error('the hashing worker was closed');
    for (const waiting of this.#waiting.values()) waiting.reject(error);
    this.#waiting.clear();
  }
}
