import type { TiffSummary } from '../core/tiff/inspectTiff.ts';
import type { FileRef, Platform } from '../platform/types.ts';
import type { InspectMessage, InspectReply } from './inspect.worker.ts';
import { abortError } from './WorkerPool.ts';

/** A problem with an image file, told in one line that names the file. */
export class ImageryError extends Error {
  constructor(message: string, readonly code: string = 'unreadable') {
    super(message);
    this.name = 'ImageryError';
  }
}

const newInspectWorker = () => new Worker(new URL('./inspect.worker.ts', import.meta.url), { type: 'module', name: 'fellfield-inspect' });

// Workers started ahead of need (a worker takes tens of milliseconds to start), each used
// for one file and then ended, as one started on demand is; let go when not taken soon.
const spares: Worker[] = [];
const SPARE_LIFE_MS = 20_000;
let sparesTimer: ReturnType<typeof setTimeout> | null = null;

/** Starts header readers for `count` files about to be opened, while other work goes on. */
export function warmInspectWorkers(count: number): void {
  while (spares.length < count) spares.push(newInspectWorker());
  if (sparesTimer !== null) clearTimeout(sparesTimer);
  sparesTimer = setTimeout(() => {
    for (const worker of spares.splice(0)) worker.terminate();
    sparesTimer = null;
  }, SPARE_LIFE_MS);
}

/**
 * Reads a TIFF's header and directories in a worker of its own, with a watchdog: a
 * damaged or hostile file that makes parsing spin is cut off after `timeoutMs`.
 */
export function inspectInWorker(
  platform: Pick<Platform, 'readRange'>,
  file: FileRef,
  options: { timeoutMs?: number; signal?: AbortSignal } = {},
): Promise<TiffSummary> {
  const timeoutMs = options.timeoutMs ?? 15_000;
  return new Promise((resolve, reject) => {
    const worker = spares.pop() ?? newInspectWorker();
    const finish = (outcome: () => void) => {
      clearTimeout(timer);
      options.signal?.removeEventListener('abort', onAbort);
      worker.terminate();
      outcome();
    };
    const timer = setTimeout(
      () => finish(() => reject(new ImageryError(`${file.name}: reading its header took over ${timeoutMs / 1000} s; the file looks damaged`, 'timeout'))),
      timeoutMs,
    );
    const onAbort = () => finish(() => reject(abortError()));
    options.signal?.addEventListener('abort', onAbort, { once: true });
    worker.onerror = (event) => finish(() => reject(new ImageryError(`${file.name}: ${event.message || 'the header reader failed'}`)));
    worker.onmessage = async (event: MessageEvent<InspectReply>) => {
      const reply = event.data;
      if (reply.kind === 'done') finish(() => resolve(reply.summary as TiffSummary));
      else if (reply.kind === 'failed') finish(() => reject(new ImageryError(reply.message, reply.code)));
      else {
        try {
          const bytes = await platform.readRange(file, reply.offset, reply.length, options.signal);
          const copy = bytes.slice().buffer;
          worker.postMessage({ kind: 'bytes', request: reply.request, bytes: copy } satisfies InspectMessage, [copy]);
        } catch (error) {
          worker.postMessage({ kind: 'bytes', request: reply.request, error: (error as Error).message } satisfies InspectMessage);
        }
      }
    };
    worker.postMessage({ kind: 'inspect', fileName: file.name, fileSize: file.size } satisfies InspectMessage);
  });
}
