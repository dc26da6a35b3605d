// Imagery benchmarks in headless Chromium (no GPU): the app opens a generated site
// (bench/imagery/browserScene.ts) from a local server, as it opens the demo.
//   imagery.first-screen: navigation to the whole extent drawn (natural colour).
//   imagery.pan-step: one screen's step by key at full resolution in the pan-sharpened view,
//   from the key, with read-ahead as the app runs it and (beside it) turned off.
// Both are timed in the page's own clock up to the map's 'fellfield:map-ready' mark (the
// render that completed the view), so the harness's polling is not counted.
// Each beside its floor measured in the same run: decoding the very blocks the page
// fetched for that screen with the render worker's decoder, in a Chromium worker with
// nothing else to do (the best of three passes), divided by the app's two render workers. Memory (JS heap after the pan steps) and the longest
// task on the UI thread ride along on the pan-step line.
import { join, resolve } from 'node:path';
import { readFileSync } from 'node:fs';
import { chromium, type Page } from 'playwright-core';
import { build } from 'vite';
import { inspectTiff, type TiffSummary } from '../../src/core/tiff/inspectTiff.ts';
import { blockLayout } from '../../src/core/tiff/blocks.ts';
import { result, summarize, type BenchResult, type BenchSize, type Benchmark } from '../harness.ts';
import { benchSite, type BenchSite } from './browserScene.ts';
import { chromiumDecoder, type ChromiumDecoder } from './chromiumDecode.ts';

const repo = resolve(import.meta.dirname, '../..');
const POOL_SIZE = 2; // createRenderPool on a 2- or 3-core machine

interface OpenFile {
  bytes: Uint8Array;
  summary: TiffSummary;
  /** Block by its byte offset: level and index. */
  blocks: Map<number, { level: number; index: number }>;
}

async function openFile(site: BenchSite, name: string): Promise<OpenFile> {
  const bytes = new Uint8Array(readFileSync(join(site.dir, name)));
  const summary = await inspectTiff(async (o, n) => bytes.subarray(o, o + n), bytes.length, name);
  const blocks = new Map<number, { level: number; index: number }>();
  summary.levels.forEach((level, l) => level.offsets.forEach((offset, index) => blocks.set(offset, { level: l, index })));
  return { bytes, summary, blocks };
}

/** Decode time (ms) of the blocks among the ranges the page read, spread over the pool. */
async function decodeFloor(decoder: ChromiumDecoder, files: Record<string, OpenFile>, reads: { file: string; offset: number; length: number }[]): Promise<{ ms: number; blocks: number }> {
  const jobs: { bytes: Uint8Array; layout: ReturnType<typeof blockLayout> }[] = [];
  for (const { file, offset, length } of reads) {
    const f = files[file];
    if (!f) continue;
    // A read may hold several neighbouring blocks: take each block that starts inside it.
    for (const [start, block] of f.blocks) {
      if (start < offset || start >= offset + length) continue;
      const count = f.summary.levels[block.level].byteCounts[block.index];
      jobs.push({ bytes: f.bytes.slice(start, start + count), layout: blockLayout(f.summary, block.level, block.index) });
    }
  }
  if (jobs.length === 0) return { ms: 0, blocks: 0 };
  await decoder.load(jobs);
  const passes = [await decoder.round(1), await decoder.round(1), await decoder.round(1)];
  return { ms: Math.min(...passes) / POOL_SIZE, blocks: jobs.length };
}

/** Median time of each stage mark (see src/ui/main.ts, openDemoSite, Workspace, MapView), from navigation. */
function medianParts(runs: Record<string, number>[]): Record<string, number> {
  const names = Object.keys(runs[0] ?? {});
  return Object.fromEntries(names.map((name) => [name, summarize(runs.map((r) => r[name] ?? NaN)).median]));
}

async function ready(page: Page) {
  await page.waitForTimeout(50);
  await page.waitForSelector('[data-testid="map"][data-ready="true"]', { timeout: 120_000 });
}

export async function runBrowserBenchmarks(size: BenchSize): Promise<BenchResult[]> {
  const site = benchSite(size === 'large' ? 16384 : 4096);
  const files = { 'pan.tif': await openFile(site, 'pan.tif'), 'ms.tif': await openFile(site, 'ms.tif') };
  const outDir = join(site.dir, 'dist');
  await build({ root: repo, logLevel: 'error', build: { outDir, emptyOutDir: true } });
  const { startServer } = await import(join(repo, 'scripts', 'serve.mjs'));
  const server = await startServer({ port: 0, root: outDir, demoDir: site.dir });
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--enable-precise-memory-info'],
  });
  const decoder = await chromiumDecoder();
  try {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    await context.addInitScript(() => {
      const w = window as unknown as { longestTask: number };
      w.longestTask = 0;
      addEventListener('keydown', () => ((window as unknown as { lastKey: number }).lastKey = performance.now()), true);
      new PerformanceObserver((list) => {
        for (const entry of list.getEntries()) w.longestTask = Math.max(w.longestTask, entry.duration);
      }).observe({ type: 'longtask', buffered: true });
    });
    let reads: { file: string; offset: number; length: number }[] = [];
    context.on('request', (request) => {
      const range = /^bytes=(\d+)-(\d+)/.exec(request.headers()['range'] ?? '');
      const file = request.url().split('/').pop()!;
      if (range && file in files) reads.push({ file, offset: Number(range[1]), length: Number(range[2]) - Number(range[1]) + 1 });
    });

    // First screen: the app opened in a new tab (as a window opens it) until the whole
    // extent is drawn; a warm-up, then five. The tab before is closed after the timing.
    const firsts: number[] = [];
    const firstFloors: number[] = [];
    let firstBlocks = 0;
    let page: Page | null = null;
    const walls: number[] = [];
    const parts: Record<string, number>[] = [];
    for (let run = 0; run < 6; run++) {
      reads = [];
      const before = page;
      page = await context.newPage();
      const start = performance.now();
      await page.goto(server.url);
      await ready(page);
      const wall = performance.now() - start;
      // In the page's clock, from the navigation's start to the render that completed
      // the view: neither the tab's creation nor this harness's polling is counted.
      const marks = await page.evaluate(() => Object.fromEntries(performance.getEntriesByType('mark')
        .filter((m) => m.name.startsWith('fellfield:')).map((m) => [m.name.slice('fellfield:'.length), Math.round(m.startTime)])));
      await before?.close();
      if (run === 0) continue;
      firsts.push(marks['map-ready']);
      walls.push(wall);
      parts.push(marks);
      const floor = await decodeFloor(decoder, files, reads);
      firstFloors.push(floor.ms);
      firstBlocks = floor.blocks;
    }

    await page?.close();

    // Full resolution, pan-sharpened: zoom in at the centre, then step one screen at a
    // time by key (Shift+arrow), pausing on each screen until the reads stop, as an
    // interpreter going over a scene does. Once with read-ahead off (each step reads its
    // screen: that run's reads give each step's decode floor) and once as the app runs.
    const moves = ['ArrowLeft', 'ArrowLeft', 'ArrowUp', 'ArrowRight', 'ArrowRight', 'ArrowUp', 'ArrowLeft'];
    const quiet = async (p: Page) => {
      // No new read for 400 ms: the step's screen and its read-ahead are done.
      for (let seen = -1; seen !== requestCount;) {
        seen = requestCount;
        await p.waitForTimeout(400);
      }
    };
    let requestCount = 0;
    context.on('request', () => requestCount++);
    const stepRun = async (address: string) => {
      const p = await context.newPage();
      await p.goto(address);
      await ready(p);
      const box = (await p.locator('[data-testid="map"]').boundingBox())!;
      await p.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
      await p.keyboard.press('=');
      await p.keyboard.press('s');
      await ready(p);
      await quiet(p);
      await p.evaluate(() => ((window as unknown as { longestTask: number }).longestTask = 0));
      const times: number[] = [];
      const stepReads: (typeof reads)[] = [];
      for (const key of moves) {
        reads = [];
        await p.keyboard.press(`Shift+${key}`);
        await ready(p);
        // Page clock, from the key to the render that completed the new screen.
        times.push(await p.evaluate(() => performance.getEntriesByName('fellfield:map-ready').at(-1)!.startTime
          - (window as unknown as { lastKey: number }).lastKey));
        stepReads.push(reads);
        await quiet(p);
      }
      const heap = await p.evaluate(() => (performance as unknown as { memory?: { usedJSHeapSize: number } }).memory?.usedJSHeapSize ?? 0);
      const longest = await p.evaluate(() => (window as unknown as { longestTask: number }).longestTask);
      await p.close();
      return { times, stepReads, heap, longest };
    };
    const cold = await stepRun(`${server.url}?readahead=off`);
    const warm = await stepRun(server.url);
    const stepFloors: number[] = [];
    const levels = new Set<number>();
    for (const stepReads of cold.stepReads) {
      stepFloors.push((await decodeFloor(decoder, files, stepReads)).ms);
      for (const r of stepReads) {
        if (r.file !== 'pan.tif') continue;
        for (const [start, block] of files['pan.tif'].blocks) if (start >= r.offset && start < r.offset + r.length) levels.add(block.level);
      }
    }
    const { heap, longest } = warm;
    await context.close();

    const n = (site.panSize * site.panSize) / 1e6;
    const first = summarize(firsts), firstFloor = summarize(firstFloors);
    const step = summarize(warm.times), stepFloor = summarize(stepFloors), coldStep = summarize(cold.times);
    return [
      result('imagery.first-screen', firstBlocks, first, 'decode of the blocks that screen read, over 2 workers (floor)', firstFloor, {
        pan_mpix: n, viewport: [1280, 800], target_ms: 1000, target_ratio: 1 / 1.5,
        wall_ms_with_new_tab: Math.round(summarize(walls).median),
        parts_ms: medianParts(parts),
      }),
      result('imagery.pan-step', moves.length, step, "decode of the blocks of each step's screen (read by the same steps with read-ahead off), over 2 workers (floor)", stepFloor, {
        each_ms: warm.times.map(Math.round),
        read_ahead_off_ms: Math.round(coldStep.median), read_ahead_off_p95_ms: Math.round(coldStep.p95),
        read_ahead_off_ratio: Math.round((stepFloor.median / coldStep.median) * 1000) / 1000,
        pan_levels_read: [...levels].sort(), target_ms: 300, target_ratio: 1 / 1.5,
        js_heap_mb: Math.round(heap / 1e5) / 10, longest_ui_task_ms: Math.round(longest), target_longest_task_ms: 50,
      }),
    ];
  } finally {
    await decoder.close();
    await browser.close();
    await server.close();
  }
}

// One run gives both lines: `npm run bench -- imagery` runs it once for both.
const runs = new Map<BenchSize, Promise<BenchResult[]>>();
const once = (size: BenchSize) => {
  if (!runs.has(size)) runs.set(size, runBrowserBenchmarks(size));
  return runs.get(size)!;
};

export const browserBenchmarks: Benchmark[] = [
  { name: 'imagery.first-screen', run: (size) => once(size).then((lines) => lines.filter((l) => l.bench === 'imagery.first-screen')) },
  { name: 'imagery.pan-step', run: (size) => once(size).then((lines) => lines.filter((l) => l.bench === 'imagery.pan-step')) },
];
