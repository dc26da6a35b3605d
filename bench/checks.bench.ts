// Benchmarks of the patch checks over seeded sites of crown-sized patches.
import Flatbush from 'flatbush';
import { extentOfRings } from '../src/core/geometry/measure.ts';
import { CheckSession } from '../src/core/checks/CheckSession.ts';
import { pairFindings } from '../src/core/checks/pairFindings.ts';
import { patchFindings } from '../src/core/checks/patchFindings.ts';
import { preparePatch, type PatchInput } from '../src/core/checks/preparedPatch.ts';
import { sceneFor, seededSite } from './checks/site.ts';
import { resolveSettings, type SceneGrids } from '../src/core/checks/settings.ts';
import { loadavg } from 'node:os';
import { resolve } from 'node:path';
import { chromium } from 'playwright-core';
import { createServer } from 'vite';
import { result, seeded, summarize, time, type BenchResult, type Benchmark, type BenchSize, type Timing } from './harness.ts';

const repo = resolve(import.meta.dirname, '..');

/** The same checks with every pair tried (box test first), no spatial index. */
function allPairsCheck(patches: PatchInput[], scene: SceneGrids): number {
  const settings = resolveSettings({}, scene);
  const prepared = patches.map((p) => preparePatch(p, settings));
  let found = 0;
  for (const p of prepared) found += patchFindings(p, settings, scene).length;
  for (let i = 0; i < prepared.length; i++) {
    for (let j = i + 1; j < prepared.length; j++) found += pairFindings(prepared[i], prepared[j], settings).length;
  }
  return found;
}

function fullCheck(patches: PatchInput[], scene: SceneGrids): number {
  const session = new CheckSession({ scene });
  session.load(patches);
  return session.findings().length;
}

const full: Benchmark = {
  name: 'checks.full',
  async run(size: BenchSize) {
    const sizes = size === 'large' ? [1000, 10000, 100000] : [1000, 10000];
    const lines: BenchResult[] = [];
    // Growth is judged against the size before (a 1k run is too short to judge from).
    let previous: { n: number; timing: Timing } | null = null;
    for (const n of sizes) {
      const site = seededSite(n);
      const scene = sceneFor(n);
      const found = fullCheck(site, scene);
      const ours = await time(() => fullCheck(site, scene), { runs: n >= 100000 ? 5 : 7, warmup: 2 });
      const scale = previous ? (n * Math.log2(n)) / (previous.n * Math.log2(previous.n)) : 1;
      const growth = previous ? Math.round((ours.median / (previous.timing.median * scale)) * 100) / 100 : null;
      const extra = { findings: found, growth_vs_n_log_n: growth };
      if (n <= 10000) {
        lines.push(result('checks.full', n, ours, 'all-pairs', await time(() => allPairsCheck(site, scene), { runs: 5, warmup: 0 }), extra));
      } else {
        // All-pairs is quadratic (minutes at 100k); here the reference is the previous
        // size scaled by n log n, so a ratio near 1 means the growth stays n log n.
        const t = previous!.timing;
        const floor = { ...t, median: t.median * scale, p95: t.p95 * scale };
        lines.push(result('checks.full', n, ours, `n log n from ${previous!.n}`, floor, extra));
      }
      previous = { n, timing: ours };
    }
    return lines;
  },
};

/** Candidate pairs only (boxes that meet), from a Flatbush index or by trying every pair. */
const candidates: Benchmark = {
  name: 'checks.candidates',
  async run(size: BenchSize) {
    const lines: BenchResult[] = [];
    for (const n of size === 'large' ? [10000, 100000] : [10000]) {
      const boxes = seededSite(n).map((p) => extentOfRings(p.rings));
      const indexed = () => {
        const tree = new Flatbush(boxes.length);
        for (const b of boxes) tree.add(b[0], b[1], b[2], b[3]);
        tree.finish();
        let pairs = 0;
        boxes.forEach((b, i) => { for (const j of tree.search(b[0], b[1], b[2], b[3])) if (j > i) pairs++; });
        return pairs;
      };
      const allPairs = () => {
        let pairs = 0;
        for (let i = 0; i < boxes.length; i++) {
          const a = boxes[i];
          for (let j = i + 1; j < boxes.length; j++) {
            const b = boxes[j];
            if (a[0] <= b[2] && a[2] >= b[0] && a[1] <= b[3] && a[3] >= b[1]) pairs++;
          }
        }
        return pairs;
      };
      const pairs = indexed();
      if (n <= 10000 && allPairs() !== pairs) throw new Error('the index and all-pairs disagree on candidate pairs');
      const ours = await time(indexed, { runs: 7 });
      const base = n <= 10000 ? await time(allPairs, { runs: 5 }) : null;
      lines.push(base
        ? result('checks.candidates', n, ours, 'all-pairs box tests', base, { pairs })
        : result('checks.candidates', n, ours, 'n log n from 10k', { ...ours, median: lines[0].ms * (n * Math.log2(n)) / (10000 * Math.log2(10000)) }, { pairs }));
    }
    return lines;
  },
};

const incremental: Benchmark = {
  name: 'checks.incremental',
  async run() {
    const n = 10000;
    const site = seededSite(n);
    const scene = sceneFor(n);
    const session = new CheckSession({ scene });
    session.load(site);
    const random = seeded(7);
    // Each run edits a different patch: moves it by up to half a metre.
    const edit = () => {
      const original = site[Math.floor(random() * n)];
      const dx = random() - 0.5;
      const moved: PatchInput = { ...original, rings: original.rings.map((part) => part.map((ring) => ring.map(([x, y]) => [x + dx, y] as [number, number]))) };
      session.upsert(moved);
      session.upsert(original);
    };
    // 1100 runs = 2200 edits, so one index rebuild (after 2048 loose patches) is in the tail.
    const ours = await time(edit, { runs: 1100, warmup: 5 });
    const base = await time(() => fullCheck(site, scene), { runs: 5 });
    // Each timed run makes two edits (there and back); report one edit's time.
    const half = { ...ours, median: ours.median / 2, p95: ours.p95 / 2 };
    return [result('checks.incremental', n, half, 'full re-check', base, {
      edit: 'move one patch up to 0.5 m, then re-check',
      max_ms: Math.round((Math.max(...ours.samples) / 2) * 100) / 100,
    })];
  },
};

type PageRun = {
  ms: number; editMs: number; findings: number; longTasks: number; longestTask: number;
  keyPresses: number; answeredWhileChecking: number; longestKeyWait: number;
};

/**
 * checks.ui: the whole-site check of 100,000 patches in headless Chromium, as the desk
 * runs it (a worker) beside the chunked check in the page's own thread. Reported: the
 * longest task the UI thread ran while checking (Long Tasks API), and key presses sent
 * every 50 ms during the check, each answered by a handler in the page (how many were
 * answered before the check ended, and the longest wait). ratio = page's longest task
 * over the worker's.
 */
const ui: Benchmark = {
  name: 'checks.ui',
  async run(size: BenchSize) {
    const n = size === 'large' ? 200_000 : 100_000;
    const server = await createServer({ root: repo, logLevel: 'error', server: { port: 0, host: '127.0.0.1' } });
    await server.listen();
    const browser = await chromium.launch({
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking'],
    });
    try {
      const page = await browser.newPage();
      await page.goto(`${server.resolvedUrls!.local[0]}bench/checks/page.html`);
      await page.waitForFunction(() => 'checksBench' in window, null, { timeout: 120_000 });
      const once = async (where: 'worker' | 'page') => {
        const done = page.evaluate(({ where, n }) => (window as unknown as { checksBench: { run(w: string, n: number): Promise<PageRun> } }).checksBench.run(where, n), { where, n });
        let finished = false;
        void done.finally(() => (finished = true));
        // Wait until the check is under way, then keep pressing a key.
        await page.waitForFunction(() => (window as unknown as { checksBench: { isChecking(): boolean } }).checksBench.isChecking(), null, { timeout: 300_000, polling: 20 }).catch(() => {});
        while (!finished) {
          await page.keyboard.press('x');
          await new Promise((resolve) => setTimeout(resolve, 50));
        }
        return done;
      };
      const runs = { worker: [] as PageRun[], page: [] as PageRun[] };
      for (let i = 0; i < 5; i++) {
        runs.worker.push(await once('worker'));
        runs.page.push(await once('page'));
      }
      const longest = (list: PageRun[]) => summarize(list.map((r) => r.longestTask));
      const median = (values: number[]) => summarize(values).median;
      return [result('checks.ui', n, longest(runs.worker), 'whole-site check in the page thread, chunked', longest(runs.page), {
        measure: 'longest UI-thread task while checking (ms)',
        check_ms: Math.round(median(runs.worker.map((r) => r.ms))),
        check_ms_in_page: Math.round(median(runs.page.map((r) => r.ms))),
        edit_ms: Math.round(median(runs.worker.map((r) => r.editMs)) * 10) / 10,
        findings: runs.worker[0].findings,
        key_presses_answered_while_checking: runs.worker.map((r) => r.answeredWhileChecking),
        longest_key_wait_ms: Math.round(median(runs.worker.map((r) => r.longestKeyWait))),
        longest_key_wait_ms_in_page: Math.round(median(runs.page.map((r) => r.longestKeyWait))),
        load_avg_1min: Math.round(loadavg()[0] * 10) / 10,
      })];
    } finally {
      await browser.close();
      await server.close();
    }
  },
};

export const benchmarks: Benchmark[] = [full, candidates, incremental, ui];
