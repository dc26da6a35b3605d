// Imagery benchmarks (issue 3): the pan-sharpened tile's band math, and the deflate
// decode rate per core and across two worker threads, each beside its floor or
// baseline in the same run. The browser benchmarks (first screen, pan step, memory,
// UI-thread blocking) are in bench/imagery/browser.ts; the large scene (pan 16384 x
// 16384, 8-band 4096 x 4096) is generated on the first `--size large` run.
import { inflateSync } from 'node:zlib';
import { compositeRgba } from '../src/core/render/composite.ts';
import { brovey, fastIhs, upsampleNearest } from '../src/core/render/pansharpen.ts';
import { result, seeded, summarize, time, type BenchResult, type Benchmark, type BenchSize } from './harness.ts';
import { chromiumDecoder } from './imagery/chromiumDecode.ts';
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

const decode: Benchmark = {
  name: 'imagery.decode',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const scene = await encodedScene(size === 'large' ? 4096 : 2048);
    const { tiles } = scene;
    const megapixels = (tiles.length * 256 * 256) / 1e6;
    // Per core: the render worker's decoder (the runtime's own inflater, capped, then the
    // predictor) in a worker of Chromium, the engine the render pool runs in, against
    // Node's zlib inflate of the same bytes.
    const rate = (t: { median: number }) => Math.round((megapixels / t.median) * 1000 * 10) / 10;
    const chromium = await chromiumDecoder();
    try {
      await chromium.load(tiles);
      await chromium.round(1); // the workers start and compile
      await chromium.round(2);
      // Rounds interleaved (zlib, one worker, two workers), so a machine that gets busier
      // or quieter meanwhile weighs on all three alike.
      const samples = { zlib: [] as number[], one: [] as number[], two: [] as number[] };
      for (let round = 0; round < 8; round++) {
        const start = performance.now();
        for (const t of tiles) inflateSync(t.bytes);
        const zlibMs = performance.now() - start;
        const oneMs = await chromium.round(1);
        const twoMs = await chromium.round(2);
        if (round === 0) continue; // warm-up
        samples.zlib.push(zlibMs);
        samples.one.push(oneMs);
        samples.two.push(twoMs);
      }
      const [zlib, one, two] = [samples.zlib, samples.one, samples.two].map(summarize);
      const speedup = one.median / two.median;
      return [
        result('imagery.decode', tiles.length, one, 'node:zlib inflateSync of the same tiles', zlib, {
          per: 'core', engine: 'chromium worker', mpix_per_s: rate(one), target_ratio: 0.5,
        }),
        // Across threads: the same tiles split over two Chromium workers against one doing all.
        result('imagery.decode', tiles.length, two, 'one chromium worker decoding all the tiles', one, {
          per: 'two workers', engine: 'chromium worker', speedup: Math.round(speedup * 100) / 100, target_speedup: 1.6,
        }),
      ];
    } finally {
      await chromium.close();
    }
  },
};

// seeded is re-exported for the browser bench's scene generator.
export { seeded };
export const benchmarks: Benchmark[] = [tile, decode, ...browserBenchmarks];
