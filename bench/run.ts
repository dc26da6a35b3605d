// `npm run bench -- [name] [--size small|large]`: runs the named benchmark (a prefix
// such as `checks` runs the family), or all. Each bench/*.bench.ts exports `benchmarks`.
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { BenchSize, Benchmark } from './harness.ts';

const here = dirname(fileURLToPath(import.meta.url));

async function loadAll(): Promise<Benchmark[]> {
  const files = readdirSync(here).filter((f) => f.endsWith('.bench.ts')).sort();
  const all: Benchmark[] = [];
  for (const file of files) {
    const mod = (await import(pathToFileURL(join(here, file)).href)) as { benchmarks: Benchmark[] };
    all.push(...mod.benchmarks);
  }
  return all;
}

async function main() {
  const args = process.argv.slice(2);
  let size: BenchSize = 'small';
  const names: string[] = [];
  for (let i = 0; i < args.length; i++) {
    if (args[i] === '--size') {
      const value = args[++i];
      if (value !== 'small' && value !== 'large') {
        console.error(`bench: --size takes small or large, got '${value ?? ''}'`);
        process.exit(2);
      }
      size = value;
    } else names.push(args[i]);
  }
  const all = await loadAll();
  const chosen = names.length
    ? all.filter((b) => names.some((n) => b.name === n || b.name.startsWith(`${n}.`)))
    : all;
  if (chosen.length === 0) {
    console.error(`bench: no benchmark named ${names.join(', ')}. Known: ${all.map((b) => b.name).join(', ')}`);
    process.exit(2);
  }
  for (const bench of chosen) {
    for (const line of await bench.run(size)) console.log(JSON.stringify(line));
  }
}

await main();
