import { runOffsetJob, type OffsetJob, type OffsetJobResult, type OffsetProgress } from './offsetJob.ts';
import type { OffsetWorkerReply } from './offset.worker.ts';

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
    return new Promise<OffsetJobResult>((resolve, reject) => {
      const stop = () => {
        worker.removeEventListener('message', onMessage);
        worker.removeEventListener('error', onError);
        signal?.removeEventListener('abort', onAbort);
      };
      const onMessage = (event: MessageEvent<OffsetWorkerReply>) => {
        const reply = event.data;
        if (reply.id !== id) return;
        if (reply.kind === 'progress') return onProgress(reply.progress);
        stop();
        if (reply.kind === 'done') resolve(reply.result);
        else reject(new Error(reply.message));
      };
      const onError = (event: ErrorEvent) => {
        stop();
        this.#end();
        reject(new Error(event.message || 'the shift estimate stopped unexpectedly'));
      };
      const onAbort = () => {
        stop();
        this.#end();
        reject(abortError());
      };
      worker.addEventListener('message', onMessage);
      worker.addEventListener('error', onError);
      signal?.addEventListener('abort', onAbort, { once: true });
      // The grid is copied, not transferred: the caller keeps it for the per-area step or a rerun.
      worker.postMessage({ id, job });
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
