import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { TiffSummary } from '../core/tiff/inspectTiff.ts';
import { InputError } from './errors.ts';
import type { InspectJob, InspectReply } from './inspectWorker.ts';

export interface InspectOptions {
  /** The watchdog: the worker is terminated after this long. Default 20 s. */
  timeoutMs?: number;
  check?: InspectJob['check'];
  limits?: InspectJob['limits'];
  /** Another worker module in place of inspectWorker.ts (tests give one that never ends). */
  workerUrl?: URL;
}

export interface InspectResult {
  summary: TiffSummary;
  checkedBlocks: number;
}

/** tsx's ESM loader, registered in the worker so it can load our TypeScript directly. */
function tsxLoaderUrl(): string {
  const require = createRequire(import.meta.url);
  const path = require.resolve('tsx/package.json').replace(/package\.json$/, 'dist/esm/api/index.mjs');
  if (!existsSync(path)) throw new Error(`tsx's loader is not where expected (${path})`);
  return pathToFileURL(path).href;
}

/**
 * Inspects an untrusted file in a worker thread. A watchdog timer in this thread
 * terminates the worker if it runs too long (a starved event loop in the worker could
 * fire no timer of its own), and the worker's heap is capped. Bad input becomes one
 * InputError line.
 */
export function inspectInWorker(path: string, options: InspectOptions = {}): Promise<InspectResult> {
  const timeoutMs = options.timeoutMs ?? 20_000;
  const job: InspectJob = { path, check: options.check ?? 'first', limits: options.limits };
  const entry = (options.workerUrl ?? new URL('./inspectWorker.ts', import.meta.url)).href;
  const bootstrap =
    `import(${JSON.stringify(tsxLoaderUrl())}).then((m) => { m.register(); return import(${JSON.stringify(entry)}); });`;
  const worker = new Worker(bootstrap, {
    eval: true,
    workerData: { fellfieldInspect: job },
    resourceLimits: { maxOldGenerationSizeMb: 512 },
    stdout: false,
    stderr: false,
  });

  return new Promise<InspectResult>((resolve, reject) => {
    let settled = false;
    const finish = (action: () => void) => {
      if (settled) return;
      settled = true;
      clearTimeout(timer);
      void worker.terminate();
      action();
    };
    const timer = setTimeout(() => {
      finish(() => reject(new InputError(
        `${path}: gave up after ${(timeoutMs / 1000).toFixed(0)} s reading the file (a damaged or hostile file?)`,
      )));
    }, timeoutMs);
    worker.once('message', (reply: InspectReply) => {
      finish(() => {
        if (reply.ok) resolve({ summary: reply.summary, checkedBlocks: reply.checkedBlocks });
        else if (reply.code === 'internal') reject(new Error(reply.message));
        else reject(new InputError(reply.message));
      });
    });
    worker.once('error', (error: Error & { code?: string }) => {
      finish(() => {
        if (error.code === 'ERR_WORKER_OUT_OF_MEMORY') {
          reject(new InputError(`${path}: reading the file ran out of memory (a damaged or hostile file?)`));
        } else {
          reject(error);
        }
      });
    });
    worker.once('exit', (code) => {
      finish(() => reject(new Error(`the inspect worker stopped (exit code ${code}) before it answered`)));
    });
  });
}
