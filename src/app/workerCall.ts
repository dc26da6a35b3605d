// One request to a worker, heard until its answer: the pattern of every long job the
// app hands to a worker (checks, shift estimates). The worker may send several replies
// (progress, batches) before the last; `hear` says when the call is over.

/** What `hear` makes of a reply: keep listening, or the call's end. */
export type Heard<T> = { done: false } | { done: true; value: T } | { done: true; error: Error };

export const KEEP_LISTENING = { done: false } as const;

export interface WorkerCallOptions<Reply, T> {
  /** Each reply of the worker; replies of other calls return KEEP_LISTENING. */
  hear(reply: Reply): Heard<T>;
  signal?: AbortSignal;
  /** the error an abort rejects with */
  aborted(): Error;
  /** what stopped, for a worker that fails without a message, e.g. 'the checks' */
  what: string;
  /**
   * Called when the worker broke or the call was cancelled: a job under way has no other
   * way to stop, so the owner terminates the worker and makes a new one next time.
   */
  onBroken(): void;
  transfer?: Transferable[];
}

export function callWorker<Reply, T>(worker: Worker, message: unknown, options: WorkerCallOptions<Reply, T>): Promise<T> {
  const { signal } = options;
  if (signal?.aborted) return Promise.reject(options.aborted());
  return new Promise<T>((resolve, reject) => {
    const stop = () => {
      worker.removeEventListener('message', onMessage);
      worker.removeEventListener('error', onError);
      signal?.removeEventListener('abort', onAbort);
    };
    const onMessage = (event: MessageEvent<Reply>) => {
      const heard = options.hear(event.data);
      if (!heard.done) return;
      stop();
      if ('error' in heard) reject(heard.error);
      else resolve(heard.value);
    };
    const onError = (event: ErrorEvent) => {
      stop();
      options.onBroken();
      reject(new Error(event.message || `${options.what} stopped unexpectedly`));
    };
    const onAbort = () => {
      stop();
      options.onBroken();
      reject(options.aborted());
    };
    worker.addEventListener('message', onMessage);
    worker.addEventListener('error', onError);
    signal?.addEventListener('abort', onAbort, { once: true });
    worker.postMessage(message, options.transfer ?? []);
  });
}
