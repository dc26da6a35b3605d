// imagery.overview-decode: decode every tile of the demo multispectral raster's largest
// overview, all bands, reading the bytes through the platform bridge (the browser
// implementation over HTTP range requests to the app's own local server). The floor is
// the same work reading the bytes straight from the file: ratio near 1 means the bridge
// costs little beside decoding.
import { mkdtempSync, openSync, readSync, closeSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { execFileSync } from 'node:child_process';
import { blockLayout } from '../src/core/tiff/blocks.ts';
import { decodeTile } from '../src/core/tiff/decodeTile.ts';
import { inspectTiff, type TiffSummary } from '../src/core/tiff/inspectTiff.ts';
import { BrowserPlatform } from '../src/platform/browser.ts';
import { result, time, type Benchmark } from './harness.ts';

const root = join(import.meta.dirname, '..');

function makeDemo(size: number): string {
  const out = mkdtempSync(join(tmpdir(), 'fellfield-bench-demo-'));
  execFileSync(process.execPath, [join(root, 'node_modules/tsx/dist/cli.mjs'), join(root, 'src/cli/demo-data.ts'), '--out', out, '--size', String(size), '--quiet'], { stdio: 'inherit' });
  return out;
}

async function decodeLevel(summary: TiffSummary, level: number, read: (offset: number, length: number) => Promise<Uint8Array>) {
  const info = summary.levels[level];
  let values = 0;
  await Promise.all(Array.from(info.offsets, async (offset, index) => {
    const bytes = await read(offset, info.byteCounts[index]);
    values += decodeTile(bytes, blockLayout(summary, level, index)).length;
  }));
  return values;
}

export const benchmarks: Benchmark[] = [
  {
    name: 'imagery.overview-decode',
    async run(size) {
      const demo = makeDemo(size === 'large' ? 4096 : 2048);
      const path = join(demo, 'ms.tif');
      const fd = openSync(path, 'r');
      const readFile = async (offset: number, length: number) => {
        const buffer = Buffer.alloc(length);
        readSync(fd, buffer, 0, length, offset);
        return new Uint8Array(buffer.buffer, buffer.byteOffset, length);
      };
      const summary = await inspectTiff(readFile, statSync(path).size, 'ms.tif');
      const level = 1; // the largest overview
      const { startServer } = await import('../scripts/serve.mjs');
      const server = await startServer({ port: 0, root: join(root, 'static'), demoDir: demo });
      try {
        const platform = new BrowserPlatform({ demoBaseUrl: new URL('demo/', server.url).href });
        const file = await platform.openDemoFile('ms.tif');
        const viaBridge = (offset: number, length: number) => platform.readRange(file, offset, length);
        const values = await decodeLevel(summary, level, viaBridge);
        const ours = await time(() => decodeLevel(summary, level, viaBridge));
        const floor = await time(() => decodeLevel(summary, level, readFile));
        const info = summary.levels[level];
        return [result('imagery.overview-decode', values, ours, 'direct file reads (floor)', floor, {
          level_size: [info.width, info.height],
          tiles: info.offsets.length,
        })];
      } finally {
        closeSync(fd);
        await server.close();
      }
    },
  },
];
