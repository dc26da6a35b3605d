// Store benchmarks, run inside Debian's Chromium through playwright-core, because what
// they measure is IndexedDB: the harness page (e2e/harness/) served by Vite's dev server.
//   store.edit-commit  one tag or vertex edit durable (strict), 10,000 patches in the site;
//                      floor: a bare strict Dexie put of one small row (ratio <= 1)
//   store.import       10,000 field polygons of GeoJSON into a site; floor: JSON.parse
//                      and one bulk put of the features (ratio <= 1, goal >= 1/3)
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { startHarnessServer } from '../e2e/harness/server.ts';
import { result, seeded, summarize, type BenchSize, type Benchmark, type BenchResult } from './harness.ts';

const args = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'];

/** A FeatureCollection of n small lon/lat polygons with a species attribute, seeded. */
export function fieldGeoJson(n: number, seed = 42): string {
  const random = seeded(seed);
  const species = ['PICE', 'ALVI', 'Green alder', 'unknown-x'];
  const features = Array.from({ length: n }, (_, i) => {
    const lon = 10.8 + random() * 0.05;
    const lat = 46.5 + random() * 0.03;
    const r = 0.00002 + random() * 0.00004;
    const ring = Array.from({ length: 8 }, (_, k) => {
      const a = (k / 8) * 2 * Math.PI;
      return [lon + r * Math.cos(a) * 1.4, lat + r * Math.sin(a)];
    });
    ring.push(ring[0]);
    return { type: 'Feature', properties: { plot: `P${i}`, species: species[i % 4] }, geometry: { type: 'Polygon', coordinates: [ring] } };
  });
  return JSON.stringify({ type: 'FeatureCollection', features });
}

async function withPage<T>(work: (page: Page) => Promise<T>): Promise<T> {
  const server = await startHarnessServer();
  const profile = mkdtempSync(join(tmpdir(), 'fellfield-bench-'));
  const context = await chromium.launchPersistentContext(profile, { executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true, args });
  try {
    const page = context.pages()[0] ?? (await context.newPage());
    await page.exposeBinding('reportSaved', () => undefined);
    await page.goto(server.url);
    await page.waitForFunction(() => 'storeBench' in window, undefined, { timeout: 120_000 });
    return await work(page);
  } finally {
    await context.close();
    await server.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

const sizes = (size: BenchSize) => (size === 'large' ? 20_000 : 10_000);

export const benchmarks: Benchmark[] = [
  {
    name: 'store.edit-commit',
    async run(size): Promise<BenchResult[]> {
      const n = sizes(size);
      const text = fieldGeoJson(n);
      return withPage(async (page) => {
        const out = await page.evaluate(({ t }) => window.storeBench.edits(t, 220), { t: text });
        // the first 20 edits warm up
        const ours = summarize(out.ours.slice(20));
        const floor = summarize(out.floor.slice(20));
        return [result('store.edit-commit', out.patches, ours, 'bare strict put', floor, { edits: ours.samples.length, engine: 'chromium' })];
      });
    },
  },
  {
    name: 'store.import',
    async run(size): Promise<BenchResult[]> {
      const n = sizes(size);
      const text = fieldGeoJson(n);
      return withPage(async (page) => {
        const ours: number[] = [];
        const floor: number[] = [];
        let patches = 0;
        for (let i = 0; i < 6; i++) {
          const r = await page.evaluate(({ t }) => window.storeBench.importOnce(t), { t: text });
          if (i === 0) continue; // warm-up
          ours.push(r.ours);
          floor.push(r.floor);
          patches = r.patches;
        }
        return [result('store.import', patches, summarize(ours), 'parse + bulk put', summarize(floor), { engine: 'chromium' })];
      });
    },
  },
];
