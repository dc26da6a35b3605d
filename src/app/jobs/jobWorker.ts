import { callWorker, KEEP_LISTENING } from '../workerCall.ts';

// Pure computations away from the UI thread: a worker answers one job per message,
// matched by id, with the result or the error's message; buffers travel transferred.
// The page side is a JobWorker made with the worker's URL (written where Vite can see
// it); tests and the command line run the same function inline instead.

export type JobReply<R> = { id: number; kind: 'done'; result: R } | { id: number; kind: 'failed'; message: string };

/** Runs one kind of job; the page's JobWorker and a plain function both fit. */
export interface JobRunner<J, R> {
  run(job: J, signal?: AbortSignal): Promise<R>;
}

const abortError = (what: string) => new DOMException(`${what} was cancelled`, 'AbortError');

/** A runner that computes in the calling thread (tests, the command line). */
export function inlineRunner<J, R>(work: (job: J) => R): JobRunner<J, R> {
  return {
    async run(job, signal) {
      if (signal?.aborted) throw abortError('the work');
      return work(job);
    },
  };
}

/** Call in the worker's own module: answers every job with `work`. */
export function serveJobs<J, R>(work: (job: J) => R, transfer: (result: R) => Transferable[] = () => []): void {
  // The worker's own global scope, typed as much as this needs (the page's DOM types have no worker scope).
  const scope = self as unknown as {
    onmessage: ((event: MessageEvent<{ id: number; job: J }>) => void) | null;
    postMessage(message: JobReply<R>, transfer: Transferable[]): void;
  };
  scope.onmessage = (event: MessageEvent<{ id: number; job: J }>) => {
    const { id, job } = event.data;
    try {
      const result = work(job);
      scope.postMessage({ id, kind: 'done', result }, transfer(result));
    } catch (error) {
      scope.postMessage({ id, kind: 'failed', message: (error as Error).message }, []);
    }
  };
}

/**
 * One worker, made on first use, called through callWorker (src/app/workerCall.ts). A
 * cancelled call ends the worker (that is what stops the work) and with it every other
 * call still waiting, which then rejects as cancelled too; the next call makes a new one.
 */
export class JobWorker<J, R> implements JobRunner<J, R> {
  #worker: Worker | null = null;
  #nextId = 1;
  /** one per call still waiting, so ending the worker can end each of them */
  #waiting = new Set<AbortController>();

  /**
   * @param make makes the worker: `() => new Worker(new URL('./x.worker.ts', import.meta.url), { type: 'module' })`
   * @param what what the work is, for messages ("working out the species spectra")
   * @param transfer buffers of a job to hand over rather than copy
   */
  constructor(
    private readonly make: () => Worker,
    private readonly what: string,
    private readonly transfer: (job: J) => Transferable[] = () => [],
  ) {}

  async run(job: J, signal?: AbortSignal): Promise<R> {
    if (signal?.aborted) throw abortError(this.what);
    const worker = (this.#worker ??= this.make());
    const id = this.#nextId++;
    const call = new AbortController();
    const follow = () => call.abort();
    signal?.addEventListener('abort', follow, { once: true });
    this.#waiting.add(call);
    try {
      return await callWorker<JobReply<R>, R>(worker, { id, job }, {
        hear: (reply) => {
          if (reply.id !== id) return KEEP_LISTENING;
          return reply.kind === 'done' ? { done: true, value: reply.result } : { done: true, error: new Error(reply.message) };
        },
        signal: call.signal,
        aborted: () => abortError(this.what),
        what: this.what,
        onBroken: () => this.#end(),
        transfer: this.transfer(job),
      });
    } finally {
      signal?.removeEventListener('abort', follow);
      this.#waiting.delete(call);
    }
  }

  #end(): void {
    const worker = this.#worker;
    this.#worker = null;
    worker?.terminate();
    for (const call of [...this.#waiting]) call.abort();
  }

  dispose(): void {
    this.#end();
  }
}
