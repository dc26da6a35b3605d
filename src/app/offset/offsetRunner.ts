import { runOffsetJob, type OffsetJob, type OffsetJobResult, type OffsetProgress } from './offsetJob.ts';
import type { OffsetWorkerReply } from './offset.worker.ts';
import { callWorker, KEEP_LISTENING } from '../workerCall.ts';

// Who runs the search: a worker in the app (the page stays responsive), the calling
// thread in tests and scripts. Both run runOffsetJob.

export interface OffsetRunner {
  run(job: OffsetJob, onProgress: (p: OffsetProgress) => void, signal?: AbortSignal): Promise<OffsetJobResult>;
  dispose(): void;
}

const abortError = () => new DOMException('the estimate was cancelled', 'AbortError');

/** Runs in the calling thread. */
export class InlineOffsetRunner implements OffsetRunner {
  async run(job: OffsetJob, onProgress: (p: OffsetProgress) => void, signal?: AbortSignal): Promise<OffsetJobResult> {
    if (signal?.aborted) throw abortError();
    return runOffsetJob(job, onProgress);
  }

  dispose(): void {}
}

/**
 * One worker, made on first use. Cancelling terminates it (a search in progress has no
 * other way to stop) and the next run makes a new one.
 */
export class WorkerOffsetRunner implements OffsetRunner {
  #worker: Worker | null = null;
  #nextId = 1;

  run(job: OffsetJob, onProgress: (p: OffsetProgress) => void, signal?: AbortSignal): Promise<OffsetJobResult> {
    if (signal?.aborted) return Promise.reject(abortError());
    const worker = (this.#worker ??= new Worker(new URL('./offset.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-offset' }));
    const id = this.#nextId++;
    // The grid is copied, not transferred: the caller keeps it for the per-area step or a rerun.
    return callWorker<OffsetWorkerReply, OffsetJobResult>(worker, { id, job }, {
      hear: (reply) => {
        if (reply.id !== id) return KEEP_LISTENING;
        if (reply.kind === 'progress') {
          onProgress(reply.progress);
          return KEEP_LISTENING;
        }
        return reply.kind === 'done' ? { done: true, value: reply.result } : { done: true, error: new Error(reply.message) };
      },
      signal, aborted: abortError, what: 'the shift estimate', onBroken: () => this.#end(),
    });
  }

  #end(): void {
    this.#worker?.terminate();
    this.#worker = null;
  }

  dispose(): void {
    this.#end();
  }
}
