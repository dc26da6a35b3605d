// A small pool of Web Workers with typed jobs: jobs are matched by id, buffers are
// transferred, worker errors become real Errors on the caller's side, and an aborted
// job's result is dropped. One pool serves the whole app; dispose() ends its workers.

export interface JobRequest<T> {
  payload: T;
  transfer?: Transferable[];
  signal?: AbortSignal;
}

interface Pending {
  resolve: (value: unknown) => void;
  reject: (reason: Error) => void;
  worker: number;
}

interface Queued {
  id: number;
  message: unknown;
  transfer: Transferable[];
  signal?: AbortSignal;
  resolve: (value: unknown) => void;
  reject: (reason: Error) => void;
}

export interface WorkerReply {
  id: number;
  ok: boolean;
  result?: unknown;
  error?: string;
}

export class WorkerPool<Req, Res> {
  readonly size: number;
  #workers: Worker[] = [];
  #busy: number[] = [];
  #pending = new Map<number, Pending>();
  #queue: Queued[] = [];
  #nextId = 1;
  #disposed = false;

  constructor(makeWorker: () => Worker, size: number) {
    this.size = Math.max(1, size);
    for (let i = 0; i < this.size; i++) {
      const worker = makeWorker();
      worker.onmessage = (event: MessageEvent<WorkerReply>) => this.#settle(i, event.data);
      worker.onerror = (event) => this.#fail(i, new Error(event.message || 'a render worker failed'));
      this.#workers.push(worker);
      this.#busy.push(0);
    }
  }

  run(request: JobRequest<Req>): Promise<Res> {
    if (this.#disposed) return Promise.reject(new Error('the worker pool was closed'));
    if (request.signal?.aborted) return Promise.reject(abortError());
    return new Promise<Res>((resolve, reject) => {
      this.#queue.push({
        id: this.#nextId++,
        message: request.payload,
        transfer: request.transfer ?? [],
        signal: request.signal,
        resolve: resolve as (value: unknown) => void,
        reject,
      });
      this.#pump();
    });
  }

  /** Jobs waiting or running: a measure of how busy the imagery is. */
  get load(): number {
    return this.#queue.length + this.#pending.size;
  }

  dispose(): void {
    this.#disposed = true;
    for (const worker of this.#workers) worker.terminate();
    const closed = new Error('the worker pool was closed');
    for (const job of this.#queue) job.reject(closed);
    for (const pending of this.#pending.values()) pending.reject(closed);
    this.#queue = [];
    this.#pending.clear();
  }

  #pump(): void {
    while (this.#queue.length) {
      const free = this.#leastBusy();
      if (this.#busy[free] >= 2) return; // two jobs in flight per worker keep it fed
      const job = this.#queue.shift()!;
      if (job.signal?.aborted) {
        job.reject(abortError());
        continue;
      }
      this.#busy[free]++;
      this.#pending.set(job.id, { resolve: job.resolve, reject: job.reject, worker: free });
      job.signal?.addEventListener('abort', () => {
        const pending = this.#pending.get(job.id);
        if (pending) pending.reject(abortError()); // the worker finishes; its reply is dropped
      }, { once: true });
      this.#workers[free].postMessage({ id: job.id, request: job.message }, job.transfer);
    }
  }

  #leastBusy(): number {
    let best = 0;
    for (let i = 1; i < this.#busy.length; i++) if (this.#busy[i] < this.#busy[best]) best = i;
    return best;
  }

  #settle(worker: number, reply: WorkerReply): void {
    const pending = this.#pending.get(reply.id);
    this.#busy[worker] = Math.max(0, this.#busy[worker] - 1);
    if (pending) {
      this.#pending.delete(reply.id);
      if (reply.ok) pending.resolve(reply.result);
      else pending.reject(new Error(reply.error ?? 'the render worker reported an error'));
    }
    this.#pump();
  }

  #fail(worker: number, error: Error): void {
    for (const [id, pending] of this.#pending) {
      if (pending.worker === worker) {
        this.#pending.delete(id);
        pending.reject(error);
      }
    }
    this.#busy[worker] = 0;
    this.#pump();
  }
}

export function abortError(): Error {
  return new DOMException('the work was cancelled', 'AbortError');
}
