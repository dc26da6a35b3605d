// imagery.decode in the render workers' own engine: the decoder bundled into Web Workers
// of headless Chromium (no GPU), timed round by round over the same tiles the Node lines
// use, so the caller can interleave its rounds with the baseline's on a noisy machine.
import { build, type Rollup } from 'vite';
import { chromium, type Page } from 'playwright-core';
import type { TileLayout } from '../../src/core/tiff/decodeTile.ts';

type Tile = { bytes: Uint8Array; layout: TileLayout };

interface BenchWindow {
  setUp(code: string): Promise<void>;
  load(tiles: { bytes: string; layout: TileLayout }[]): void;
  decodeRound(workers: number): Promise<number>;
}

// Plain JavaScript for the page (kept out of the TypeScript transform, which would add
// helpers the page lacks): one and two started workers, the tiles split between them.
const pageScript = `
let tiles = [], pools = {};
function decodeIn(worker, share) {
  return new Promise((resolve, reject) => {
    worker.onmessage = (event) => resolve(event.data.times[0]);
    worker.onerror = (event) => reject(new Error(event.message));
    worker.postMessage({ tiles: share, rounds: 1 });
  });
}
window.decodeRound = async (workers) => {
  const pool = pools[workers];
  const size = Math.ceil(tiles.length / workers);
  const start = performance.now();
  await Promise.all(pool.map((worker, i) => decodeIn(worker, tiles.slice(i * size, (i + 1) * size))));
  return performance.now() - start;
};
window.load = (payload) => {
  tiles = payload.map((t) => ({ bytes: Uint8Array.from(atob(t.bytes), (c) => c.charCodeAt(0)), layout: t.layout }));
};
window.setUp = async (code) => {
  const url = URL.createObjectURL(new Blob([code], { type: 'text/javascript' }));
  pools = { 1: [new Worker(url)], 2: [new Worker(url), new Worker(url)] };
};
`;

/**
 * A page with the decoder in one and in two workers: `load` hands it tiles, `round(n)`
 * times one pass over every loaded tile split between n workers.
 */
export interface ChromiumDecoder {
  load(tiles: Tile[]): Promise<void>;
  round(workers: 1 | 2): Promise<number>;
  close(): Promise<void>;
}

export async function chromiumDecoder(): Promise<ChromiumDecoder> {
  const built = (await build({
    configFile: false, logLevel: 'error',
    build: { write: false, minify: true, lib: { entry: new URL('./decodeInWorker.ts', import.meta.url).pathname, formats: ['iife'], name: 'decodeInWorker' } },
  })) as Rollup.RollupOutput[];
  const code = built[0].output[0].code;
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'],
  });
  const page: Page = await browser.newPage();
  await page.addScriptTag({ content: pageScript });
  await page.evaluate((code) => (window as unknown as BenchWindow).setUp(code), code);
  return {
    load: async (tiles) => {
      const payload = tiles.map((t) => ({ bytes: Buffer.from(t.bytes).toString('base64'), layout: t.layout }));
      await page.evaluate((payload) => (window as unknown as BenchWindow).load(payload), payload);
    },
    round: (workers) => page.evaluate((workers) => (window as unknown as BenchWindow).decodeRound(workers), workers),
    close: () => browser.close(),
  };
}
