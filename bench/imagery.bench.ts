// Imagery benchmarks (issue 3): the pan-sharpened tile's band math, and the deflate
// decode rate per core and across two worker threads, each beside its floor or
// baseline in the same run. The browser benchmarks (first screen, pan step, memory,
// UI-thread blocking) are in bench/imagery/browser.ts; the large scene (pan 16384 x
// 16384, 8-band 4096 x 4096) is generated on the first `--size large` run.
import { Worker } from 'node:worker_threads';
import { inflateSync } from 'node:zlib';
import { decodeTile } from '../src/core/tiff/decodeTile.ts';
import { compositeRgba } from '../src/core/render/composite.ts';
import { brovey, fastIhs, upsampleNearest } from '../src/core/render/pansharpen.ts';
import { result, seeded, time, type BenchResult, type Benchmark, type BenchSize } from './harness.ts';
import { encodedScene, seededBand } from './imagery/scene.ts';
import { browserBenchmarks } from './imagery/browser.ts';

const limits = [0, 1, 2].map(() => ({ min: 80, max: 900, gamma: 1 }));

/** The worker's work on one 256 x 256 pan tile after decoding: upsample, fuse, stretch. */
function sharpenTile(method: 'brovey' | 'ihs', pan: Uint16Array, ms: Uint16Array[]): Uint8ClampedArray {
  const bands = ms.map((band) => upsampleNearest(band, 65, 65, 256, 256, 0.5, 0.5, 0.25));
  const fused = (method === 'brovey' ? brovey : fastIhs)({ pan, bands });
  return compositeRgba(fused, limits, 256 * 256);
}

const tile: Benchmark = {
  name: 'imagery.tile',
  async run(): Promise<BenchResult[]> {
    const pan = seededBand(256, 256, 11);
    const ms = [12, 13, 14].map((seed) => seededBand(65, 65, seed));
    const natural = [12, 13, 14].map((seed) => seededBand(256, 256, seed));
    // Floor: the plain composite of three decoded 256 x 256 bands (lookup-table stretch).
    const floor = await time(() => compositeRgba(natural, limits, 256 * 256), { runs: 40, warmup: 5 });
    const lines: BenchResult[] = [];
    for (const method of ['brovey', 'ihs'] as const) {
      const ours = await time(() => sharpenTile(method, pan, ms), { runs: 40, warmup: 5 });
      lines.push(result(`imagery.tile`, 1, ours, 'natural-colour composite of the same tile (floor)', floor, { method, target_ms: 5 }));
    }
    return lines;
  },
};

function runWorker(worker: Worker, tiles: { bytes: Uint8Array; layout: unknown }[], rounds: number): Promise<number> {
  return new Promise((resolve, reject) => {
    worker.once('message', (m: { ms: number }) => resolve(m.ms));
    worker.once('error', reject);
    worker.postMessage({ tiles, rounds });
  });
}

const decode: Benchmark = {
  name: 'imagery.decode',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const scene = await encodedScene(size === 'large' ? 4096 : 2048);
    const { tiles } = scene;
    const megapixels = (tiles.length * 256 * 256) / 1e6;
    // Per core: our capped inflate + predictor against Node's zlib (C) inflate of the same bytes.
    const ours = await time(() => { for (const t of tiles) decodeTile(t.bytes, t.layout); }, { runs: 5 });
    const zlib = await time(() => { for (const t of tiles) inflateSync(t.bytes); }, { runs: 5 });
    const lines = [
      result('imagery.decode', tiles.length, ours, 'node:zlib inflateSync of the same tiles', zlib, {
        per: 'core', mpix_per_s: Math.round((megapixels / ours.median) * 1000 * 10) / 10, target_ratio: 0.5,
      }),
    ];
    // Across threads: the same tiles split over two workers against one worker doing all.
    const spawn = () => new Worker(new URL('./imagery/tsWorker.mjs', import.meta.url), { workerData: { module: new URL('./imagery/decodeWorker.ts', import.meta.url).href } });
    const workers = [spawn(), spawn()];
    try {
      const half = Math.ceil(tiles.length / 2);
      await Promise.all(workers.map((w) => runWorker(w, tiles.slice(0, 8), 1))); // warm-up
      const one = await time(() => runWorker(workers[0], tiles, 1), { runs: 5 });
      const two = await time(() => Promise.all([runWorker(workers[0], tiles.slice(0, half), 1), runWorker(workers[1], tiles.slice(half), 1)]), { runs: 5 });
      const speedup = one.median / two.median;
      lines.push(result('imagery.decode', tiles.length, two, 'one worker thread decoding all the tiles', one, {
        per: 'two workers', speedup: Math.round(speedup * 100) / 100, target_speedup: 1.6,
      }));
    } finally {
      await Promise.all(workers.map((w) => w.terminate()));
    }
    return lines;
  },
};

// seeded is re-exported for the browser bench's scene generator.
export { seeded };
export const benchmarks: Benchmark[] = [tile, decode, ...browserBenchmarks];
