// `npm run demo:data`: writes the demo site (a generated scene of a fictional basin)
// into demo/ at the repository root, or into --out DIR. Files are written under a
// temporary name and renamed into place, so a crash never leaves half a file.

import { mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';
import { demoFiles } from '../core/demo/files.ts';
import { FULL_SIZE } from '../core/demo/scene.ts';
import { synthesizeDemo } from '../core/demo/synthesize.ts';
import { InputError } from './errors.ts';

export const DEFAULT_DEMO_SEED = 1;
export const DEFAULT_DEMO_DIR = resolve(dirname(fileURLToPath(import.meta.url)), '../../demo');

export interface DemoSiteOptions {
  out?: string;
  seed?: number;
  size?: number;
  log?: (line: string) => void;
}

const usage = `npm run demo:data -- [--out DIR] [--seed N] [--size PIXELS] [--quiet]

Writes the demo site: pan.tif, ms.tif, pan-late.tif, ms-late.tif, field.geojson,
truth.json, roster.json and manifest.json.
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
  const scene = synthesizeDemo({ seed, size: options.size ?? FULL_SIZE, onProgress: (line) => log(`${stamp()}  ${line}`) });
  const files = await demoFiles(scene, (name) => log(`${stamp()}  encoding ${name}`));
  const names: string[] = [];
  for (const file of files) {
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

if (process.argv[1] && import.meta.url === pathToFileURL(resolve(process.argv[1])).href) {
  process.exitCode = await runDemoData(process.argv.slice(2));
}
