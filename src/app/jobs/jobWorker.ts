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
 * One worker, made on first use. A cancelled job is let go at once; when it was the
 * only one running, the worker is ended (that is what stops the work) and the next job
 * makes a new one.
 */
export class JobWorker<J, R> implements JobRunner<J, R> {
  #worker: Worker | null = null;
  #nextId = 1;
  #pending = new Map<number, { resolve: (r: R) => void; reject: (e: Error) => void }>();

  /**
   * @param make makes the worker: `() => new Worker(new URL('./x.worker.ts', import.meta.url), { type: 'module' })`
   * @param what what the work is, for messages ("the species spectra")
   * @param transfer buffers of a job to hand over rather than copy
   */
  constructor(
    private readonly make: () => Worker,
    private readonly what: string,
    private readonly transfer: (job: J) => Transferable[] = () => [],
  ) {}

  run(job: J, signal?: AbortSignal): Promise<R> {
    if (signal?.aborted) return Promise.reject(abortError(this.what));
    const worker = (this.#worker ??= this.#start());
    const id = this.#nextId++;
    return new Promise<R>((resolve, reject) => {
      const onAbort = () => {
        this.#pending.delete(id);
        if (this.#pending.size === 0) this.#end();
        reject(abortError(this.what));
      };
      signal?.addEventListener('abort', onAbort, { once: true });
      this.#pending.set(id, {
        resolve: (r) => { signal?.removeEventListener('abort', onAbort); resolve(r); },
        reject: (e) => { signal?.removeEventListener('abort', onAbort); reject(e); },
      });
      worker.postMessage({ id, job }, this.transfer(job));
    });
  }

  #start(): Worker {
    const worker = this.make();
    worker.addEventListener('message', (event: MessageEvent<JobReply<R>>) => {
      const reply = event.data;
      const waiting = this.#pending.get(reply.id);
      if (!waiting) return;
      this.#pending.delete(reply.id);
      if (reply.kind === 'done') waiting.resolve(reply.result);
      else waiting.reject(new Error(reply.message));
    });
    worker.addEventListener('error', (event: ErrorEvent) => {
      const failed = [...this.#pending.values()];
      this.#pending.clear();
      this.#end();
      for (const w of failed) w.reject(new Error(event.message || `${this.what} stopped unexpectedly`));
    });
    return worker;
  }

  #end(): void {
    this.#worker?.terminate();
    this.#worker = null;
  }

  dispose(): void {
    const left = [...this.#pending.values()];
    this.#pending.clear();
    this.#end();
    for (const w of left) w.reject(abortError(this.what));
  }
}
