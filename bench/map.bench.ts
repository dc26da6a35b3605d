// map.patches (issue 4): 10,000 patches over the scene in headless Chromium (software
// canvas, no GPU), one redraw after a pan of half a screen or a zoom of one level, with
// the whole scene in view (every patch on screen: the worst case) and with a view 150 m
// across. Ours is the desk's
// StoredPatchLayer (at this zoom its far view: every patch burnt into one image, see
// src/ui/map/patchOverview.ts); the baseline in the same browser is a
// naive vector layer (no spatial index, new styles on every draw). Each redraw is timed
// in the page around OpenLayers' synchronous render.
import { loadavg } from 'node:os';
import { resolve } from 'node:path';
import { chromium } from 'playwright-core';
import { createServer } from 'vite';
import { result, summarize, type BenchResult, type BenchSize, type Benchmark } from './harness.ts';

const repo = resolve(import.meta.dirname, '..');
const RUNS = 11;
const WARMUP = 2;

type Bench = { setup(kind: string, n: number, seed: number): number; redraw(action: string, step: number): number; zoomTo(width: number): void };

const patches: Benchmark = {
  name: 'map.patches',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const n = size === 'large' ? 50_000 : 10_000;
    const server = await createServer({ root: repo, logLevel: 'error', server: { port: 0, host: '127.0.0.1' } });
    await server.listen();
    const url = server.resolvedUrls!.local[0];
    const browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'],
    });
    try {
      const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
      await page.goto(`${url}bench/map/page.html`);
      await page.waitForFunction(() => 'mapBench' in window, null, { timeout: 120_000 });
      const measure = async (kind: 'ours' | 'naive', action: 'pan' | 'zoom', width: number | null) =>
        page.evaluate(({ kind, action, n, runs, warmup, width }) => {
          const bench = (window as unknown as { mapBench: Bench }).mapBench;
          bench.setup(kind, n, 7);
          if (width !== null) bench.zoomTo(width);
          const samples: number[] = [];
          for (let i = 0; i < warmup + runs; i++) {
            const ms = bench.redraw(action, i);
            if (i >= warmup) samples.push(ms);
          }
          return samples;
        }, { kind, action, n, runs: RUNS, warmup: WARMUP, width });
      const lines: BenchResult[] = [];
      // The whole scene (every patch on screen, the far view) and a view 150 m across
      // (outlines as vector features, the ones the tools edit).
      for (const [view, width] of [['whole scene', null], ['150 m across', 150]] as const) {
        for (const action of ['pan', 'zoom'] as const) {
          const ours = summarize(await measure('ours', action, width));
          const naive = summarize(await measure('naive', action, width));
          lines.push(result('map.patches', n, ours, 'naive vector layer (no spatial index, styles made per draw)', naive, {
            action, view, target_ms: 100, load_avg_1min: Math.round(loadavg()[0] * 10) / 10,
          }));
        }
      }
      return lines;
    } finally {
      await browser.close();
      await server.close();
    }
  },
};

export const benchmarks: Benchmark[] = [patches];
