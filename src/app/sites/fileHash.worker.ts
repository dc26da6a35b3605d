/// <reference lib="webworker" />
// Hashes files piece by piece away from the UI thread: the page reads byte ranges through
// the platform bridge and transfers each piece here; one SHA-256 state per job.
import { sha256Stream, type Sha256Stream } from '../../core/ledger/sha256Stream.ts';

export type HashRequest =
  | { kind: 'start'; id: number }
  | { kind: 'update'; id: number; bytes: Uint8Array }
  | { kind: 'digest'; id: number }
  | { kind: 'drop'; id: number };

export type HashReply =
  | { kind: 'updated'; id: number }
  | { kind: 'digest'; id: number; hex: string }
  | { kind: 'failed'; id: number; message: string };

const scope = self as unknown as DedicatedWorkerGlobalScope;
const jobs = new Map<number, Sha256Stream>();

scope.onmessage = (event: MessageEvent<HashRequest>) => {
  const request = event.data;
  try {
    if (request.kind === 'start') jobs.set(request.id, sha256Stream());
    else if (request.kind === 'drop') jobs.delete(request.id);
    else {
      const job = jobs.get(request.id);
      if (!job) throw new Error(`no hash job ${request.id}`);
      if (request.kind === 'update') {
        job.update(request.bytes);
        scope.postMessage({ kind: 'updated', id: request.id } satisfies HashReply);
      } else {
        jobs.delete(request.id);
        scope.postMessage({ kind: 'digest', id: request.id, hex: job.hex() } satisfies HashReply);
      }
    }
  } catch (error) {
    jobs.delete(request.id);
    scope.postMessage({ kind: 'failed', id: request.id, message: (error as Error).message } satisfies HashReply);
  }
};
