import type { CheckDelta } from '../../core/checks/CheckSession.ts';
import type { Finding } from '../../core/checks/findings.ts';
import type { CheckProgress, CheckScene, TrackedPatch } from './checkHost.ts';
import type { ChecksMessage, ChecksReply } from './checks.worker.ts';
import { packPatches } from './patchBatch.ts';
import { callWorker, KEEP_LISTENING } from '../workerCall.ts';
import { nextTask } from '../../core/nextTask.ts';

// Who runs the checks: a worker in the app (the page stays responsive), the calling
// thread in tests (inlineCheckRunner.ts). Both run CheckHost, so both apply the same
// rules; the app's thread never loads the checks' geometry code itself.

/** Reads bytes of the scene raster at `raster` (its index in CheckScene.rasters). */
export type PageBytes = (raster: number, offset: number, length: number, signal?: AbortSignal) => Promise<Uint8Array>;

export interface CheckRunner {
  /** The whole-site check. Cancelling stops it; the runner can then load again. */
  load(patches: TrackedPatch[], scene: CheckScene, onProgress: (p: CheckProgress) => void, signal?: AbortSignal): Promise<Finding[]>;
  /** Re-checks after edits (after a load). */
  apply(upserts: TrackedPatch[], removals: string[]): Promise<CheckDelta>;
  dispose(): void;
}

const abortError = () => new DOMException('the checks were cancelled', 'AbortError');

/** Patches per message to the worker: each copy stays short on the UI thread. */
const PATCH_BATCH = 2000;

/**
 * One worker, made on first use. Cancelling a load terminates it (the session it held
 * is lost with it); the next load makes a new one.
 */
export class WorkerCheckRunner implements CheckRunner {
  #worker: Worker | null = null;
  #nextId = 1;
  readonly #bytes: PageBytes;

  constructor(bytes: PageBytes) {
    this.#bytes = bytes;
  }

  async load(patches: TrackedPatch[], scene: CheckScene, onProgress: (p: CheckProgress) => void, signal?: AbortSignal): Promise<Finding[]> {
    if (signal?.aborted) throw abortError();
    this.#end();
    const worker = this.#start();
    for (let i = 0; i < patches.length; i += PATCH_BATCH) {
      const batch = packPatches(patches.slice(i, i + PATCH_BATCH));
      worker.postMessage({ kind: 'add', batch } satisfies ChecksMessage, [batch.coordinates.buffer, batch.structure.buffer]);
      // Let the page answer input between batches.
      if (i + PATCH_BATCH < patches.length) await nextTask();
      if (signal?.aborted) {
        this.#end();
        throw abortError();
      }
    }
    const findings: Finding[] = [];
    await this.#call({ kind: 'load', id: this.#nextId++, scene }, (reply) => {
      if (reply.kind === 'progress') onProgress(reply.progress);
      else if (reply.kind === 'findings') findings.push(...reply.findings);
    }, signal);
    return findings;
  }

  async apply(upserts: TrackedPatch[], removals: string[]): Promise<CheckDelta> {
    let delta: CheckDelta = { removed: [], added: [] };
    await this.#call({ kind: 'apply', id: this.#nextId++, upserts, removals }, (reply) => {
      if (reply.kind === 'applied') delta = reply.delta;
    });
    return delta;
  }

  dispose(): void {
    this.#end();
  }

  #start(): Worker {
    const worker = new Worker(new URL('./checks.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-checks' });
    // The worker asks for raster bytes; only the page can reach them.
    worker.addEventListener('message', (event: MessageEvent<ChecksReply>) => {
      const reply = event.data;
      if (reply.kind !== 'read') return;
      this.#bytes(reply.raster, reply.offset, reply.length).then(
        (bytes) => {
          const copy = bytes.slice().buffer;
          worker.postMessage({ kind: 'bytes', request: reply.request, bytes: copy } satisfies ChecksMessage, [copy]);
        },
        (error: Error) => worker.postMessage({ kind: 'bytes', request: reply.request, error: error.message } satisfies ChecksMessage),
      );
    });
    this.#worker = worker;
    return worker;
  }

  /** Sends one request and hears its replies until it is done, failed or cancelled. */
  #call(message: Extract<ChecksMessage, { id: number }>, onReply: (reply: ChecksReply) => void, signal?: AbortSignal): Promise<void> {
    const worker = this.#worker;
    if (!worker) return Promise.reject(new Error('the checks have not been loaded'));
    return callWorker<ChecksReply, void>(worker, message, {
      hear: (reply) => {
        if (reply.kind === 'read' || reply.id !== message.id) return KEEP_LISTENING;
        onReply(reply);
        if (reply.kind === 'loaded' || reply.kind === 'applied') return { done: true, value: undefined };
        if (reply.kind === 'failed') return { done: true, error: new Error(reply.message) };
        return KEEP_LISTENING;
      },
      signal, aborted: abortError, what: 'the checks', onBroken: () => this.#end(),
    });
  }

  #end(): void {
    this.#worker?.terminate();
    this.#worker = null;
  }
}
