// `npm run demo:data`: writes the demo site (a generated scene of a fictional basin)
// into demo/ at the repository root, or into --out DIR. Files are written under a
// temporary name and renamed into place, so a crash never leaves half a file.
// Each date is rendered and encoded in its own worker thread (this same file), while
// the main thread makes the field survey and truth and relays progress: the dates
// share nothing but the seed, and the scene is the same in every thread.

import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import { demoFiles, demoRasterFiles, type DemoFile } from '../core/demo/files.ts';
import { DATE_KEYS, FULL_SIZE, type DateKey } from '../core/demo/scene.ts';
import { demoSiteFile } from '../core/export/demoSiteFile.ts';
import { synthesizeDemo } from '../core/demo/synthesize.ts';
import { InputError } from './errors.ts';

export const DEFAULT_DEMO_SEED = 1;
export const DEFAULT_DEMO_DIR = resolve(dirname(fileURLToPath(import.meta.url)), '../../demo');

export interface DemoSiteOptions {
  out?: string;
  seed?: number;
  size?: number;
  log?: (line: string) => void;
  /** Render each date in a worker thread (default true); falls back to this thread. */
  parallel?: boolean;
}

interface DateJob {
  demoDate: DateKey;
  seed: number;
  size: number;
}

type WorkerMessage = { kind: 'progress'; line: string } | { kind: 'files'; files: DemoFile[] };

/** Renders and encodes one date in a worker; resolves to its two files. */
function dateInWorker(job: DateJob, log: (line: string) => void): Promise<DemoFile[]> {
  return new Promise((resolveFiles, reject) => {
    // The worker starts as a tiny script that registers the TypeScript loader (as
    // bin/fellfield.mjs does) and then imports this file.
    const bootstrap = `import(${JSON.stringify(import.meta.resolve('tsx/esm/api'))})
      .then(({ register }) => { register(); return import(${JSON.stringify(import.meta.url)}); })`;
    const worker = new Worker(bootstrap, { eval: true, workerData: job });
    let files: DemoFile[] | null = null;
    worker.on('message', (message: WorkerMessage) => {
      if (message.kind === 'progress') log(message.line);
      else files = message.files.map((f) => ({ ...f, bytes: new Uint8Array(f.bytes) }));
    });
    worker.once('error', reject);
    worker.once('exit', (code) => {
      if (files) resolveFiles(files);
      else reject(new Error(`the ${job.demoDate}-date worker stopped (exit code ${code}) before finishing`));
    });
  });
}

/** The worker's side: the scene with one date rendered, encoded, sent back. */
function runDateJob(job: DateJob): void {
  const say = (line: string) => parentPort!.postMessage({ kind: 'progress', line } satisfies WorkerMessage);
  const scene = synthesizeDemo({ seed: job.seed, size: job.size, dates: [job.demoDate], onProgress: (line) => { if (line.startsWith('rendering')) say(line); } });
  const files = demoRasterFiles(scene, job.demoDate, (name) => say(`encoding ${name}`));
  parentPort!.postMessage({ kind: 'files', files } satisfies WorkerMessage, files.map((f) => f.bytes.buffer as ArrayBuffer));
}

const usage = `npm run demo:data -- [--out DIR] [--seed N] [--size PIXELS] [--quiet]

Writes the demo site: pan.tif, ms.tif, pan-late.tif, ms-late.tif, field.geojson,
truth.json, roster.json, manifest.json and demo.site.json (the site file).
  --out DIR      where to write (default: demo/ at the repository root)
  --seed N       a non-negative integer; the same seed gives the same bytes (default ${DEFAULT_DEMO_SEED})
  --size PIXELS  panchromatic pixels on a side, a multiple of 4 from 64 (default ${FULL_SIZE})
  --quiet        no progress lines`;

function integerOption(name: string, raw: string | undefined, fallback: number, min: number, max: number): number {
  if (raw === undefined) return fallback;
  if (!/^\d+$/.test(raw) || Number(raw) < min || Number(raw) > max) {
    throw new InputError(`--${name} must be a whole number from ${min} to ${max}, got '${raw}'`);
  }
  return Number(raw);
}

/** Generates the demo site and writes it; returns the directory and the file names. */
export async function writeDemoSite(options: DemoSiteOptions = {}): Promise<{ dir: string; files: string[]; ms: number }> {
  const started = performance.now();
  const dir = resolve(options.out ?? DEFAULT_DEMO_DIR);
  const log = options.log ?? (() => {});
  const seed = options.seed ?? DEFAULT_DEMO_SEED;
  const stamp = () => `${((performance.now() - started) / 1000).toFixed(1).padStart(5)} s`;
  try {
    mkdirSync(dir, { recursive: true });
  } catch (error) {
    throw new InputError(`cannot create the output folder ${dir}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
  log(`${stamp()}  demo site, seed ${seed}, into ${dir}`);
  const size = options.size ?? FULL_SIZE;
  const say = (line: string) => log(`${stamp()}  ${line}`);
  const parallel = options.parallel ?? true;
  const rendering = DATE_KEYS.map((key) => (parallel
    ? dateInWorker({ demoDate: key, seed, size }, say).catch((error: Error) => {
      say(`${key} date in the main thread instead (worker: ${error.message})`);
      return null;
    })
    : Promise.resolve(null)));
  // The main thread's own copy of the scene, without images, for the survey and truth.
  const scene = synthesizeDemo({ seed, size, dates: [], onProgress: say });
  const prepared: Partial<Record<DateKey, DemoFile[]>> = {};
  for (const [i, key] of DATE_KEYS.entries()) {
    prepared[key] = (await rendering[i])
      ?? demoRasterFiles(synthesizeDemo({ seed, size, dates: [key], onProgress: say }), key, (name) => say(`encoding ${name}`));
  }
  const files = await demoFiles(scene, () => {}, prepared);
  files.push(await demoSiteFile(files));
  // The manifest goes last and an old one goes first, so a manifest on disk always
  // means a complete site, even after an interrupted run.
  rmSync(join(dir, 'manifest.json'), { force: true });
  const names: string[] = [];
  const manifestLast = [...files.filter((f) => f.name !== 'manifest.json'), ...files.filter((f) => f.name === 'manifest.json')];
  for (const file of manifestLast) {
    const target = join(dir, file.name);
    const partial = join(dir, `.${file.name}.partial-${process.pid}`);
    try {
      writeFileSync(partial, file.bytes);
      renameSync(partial, target);
    } catch (error) {
      rmSync(partial, { force: true });
      throw new InputError(`cannot write ${target}: ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
    }
    names.push(file.name);
    log(`${stamp()}  wrote ${file.name} (${(file.bytes.length / 1048576).toFixed(1)} MiB)`);
  }
  const ms = performance.now() - started;
  log(`${stamp()}  done: ${scene.crowns.length} crowns, ${scene.survey.polygons.length} field polygons`);
  return { dir, files: names, ms };
}

/** The command line; returns the exit code (0 done, 2 bad input or an unwritable folder). */
export async function runDemoData(argv: string[]): Promise<number> {
  try {
    let parsed;
    try {
      parsed = parseArgs({
        args: argv,
        options: { out: { type: 'string' }, seed: { type: 'string' }, size: { type: 'string' }, quiet: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } },
        strict: true,
        allowPositionals: false,
      });
    } catch (error) {
      // node:util's messages can run over several lines; the user gets one.
      throw new InputError((error as Error).message.replace(/\s*\n\s*/g, ' '));
    }
    const { values } = parsed;
    if (values.help) {
      process.stdout.write(`${usage}\n`);
      return 0;
    }
    const seed = integerOption('seed', values.seed, DEFAULT_DEMO_SEED, 0, Number.MAX_SAFE_INTEGER);
    const size = integerOption('size', values.size, FULL_SIZE, 64, 16384);
    if (size % 4 !== 0) throw new InputError(`--size must be a multiple of 4, got ${size}`);
    await writeDemoSite({ out: values.out, seed, size, log: values.quiet ? undefined : (line) => process.stdout.write(`${line}\n`) });
    return 0;
  } catch (error) {
    if (error instanceof InputError) {
      process.stderr.write(`demo:data: ${error.message}\n`);
      return 2;
    }
    process.stderr.write(`demo:data: internal error: ${(error as Error)?.message ?? String(error)}\n`);
    return 2;
  }
}

if (!isMainThread && (workerData as DateJob | undefined)?.demoDate) {
  runDateJob(workerData as DateJob);
} else if (isMainThread && process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  process.exitCode = await runDemoData(process.argv.slice(2));
}
