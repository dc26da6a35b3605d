// Benchmarks of the patch checks over seeded sites of crown-sized patches.
import Flatbush from 'flatbush';
import { extentOfRings } from '../src/core/geometry/measure.ts';
import { CheckSession } from '../src/core/checks/CheckSession.ts';
import { pairFindings } from '../src/core/checks/pairFindings.ts';
import { patchFindings } from '../src/core/checks/patchFindings.ts';
import { preparePatch, type PatchInput } from '../src/core/checks/preparedPatch.ts';
import { resolveSettings, type SceneGrids } from '../src/core/checks/settings.ts';
import type { RasterGrid } from '../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../src/core/geometry/types.ts';
import { result, seeded, time, type BenchResult, type Benchmark, type BenchSize, type Timing } from './harness.ts';

const SPECIES = ['pice', 'lari', 'pinu', 'juni', 'alnu', 'salx'];
const CELL = 12; // m between lattice points; crowns up to 10 m across fit a cell

/** A crown outline: a noisy polygon of `k` vertices, counter-clockwise, closed. */
function crown(random: () => number, cx: number, cy: number, r: number, k: number): Ring {
  const ring: Ring = [];
  for (let i = 0; i < k; i++) {
    const a = (2 * Math.PI * i) / k;
    const rr = r * (0.85 + 0.3 * random());
    ring.push([cx + rr * Math.cos(a), cy + rr * Math.sin(a)]);
  }
  ring.push([ring[0][0], ring[0][1]]);
  return ring;
}

/**
 * A seeded site: one crown (1-10 m across) per lattice cell; 5 % of cells get a second
 * crown overlapping the first, 10 % are split in two patches that touch along a chord,
 * 1 % are digitized twice, 2 % carry disagreeing tags and 0.5 % are drawn as bowties.
 */
export function seededSite(n: number, seed = 1): PatchInput[] {
  const random = seeded(seed);
  const side = Math.ceil(Math.sqrt(n));
  const patches: PatchInput[] = [];
  const species = () => SPECIES[Math.floor(random() * SPECIES.length)];
  for (let cell = 0; patches.length < n; cell++) {
    const r = 0.5 + 4.5 * random();
    const jitter = CELL / 2 - r;
    const cx = 600000 + (cell % side) * CELL + (random() - 0.5) * jitter;
    const cy = 5100000 + Math.floor(cell / side) * CELL + (random() - 0.5) * jitter;
    const k = 12 + Math.floor(random() * 13);
    const ring = crown(random, cx, cy, r, k);
    const roll = random();
    if (roll < 0.1 && patches.length + 1 < n) {
      // Split along the chord from vertex 0 to vertex k/2: two patches sharing an edge.
      const half = Math.floor(k / 2);
      const left = [...ring.slice(0, half + 1), ring[0]];
      const right = [...ring.slice(half, k), ring[0], ring[half]];
      patches.push({ id: patches.length, species: species(), rings: [[left]] });
      patches.push({ id: patches.length, species: species(), rings: [[right]] });
      continue;
    }
    const tags = roll < 0.12 ? [{ species: species() }, { species: species() }] : undefined;
    if (roll > 0.995) {
      ring.splice(0, 3, ring[2], ring[1], ring[0]); // crossing edges near vertex 0
      ring[ring.length - 1] = [ring[0][0], ring[0][1]];
    }
    patches.push({ id: patches.length, species: species(), tags, rings: [[ring]] });
    if (roll > 0.15 && roll < 0.16 && patches.length < n) {
      // A near-copy, as when one crown is digitized twice.
      patches.push({ id: patches.length, species: species(), rings: [[ring.map(([x, y]) => [x + 0.05, y] as [number, number])]] });
    }
    if (roll > 0.1 && roll < 0.15 && patches.length < n) {
      const shift = r * (0.4 + 0.8 * random());
      patches.push({ id: patches.length, species: species(), rings: [[crown(random, cx + shift, cy, r * 0.8, k)]] });
    }
  }
  return patches;
}

/**
 * A scene over the site: 0.3 m panchromatic and 1.2 m multispectral grids whose east
 * edge stops a few metres short of the last column of crowns, so some cross it.
 */
export function sceneFor(n: number): SceneGrids {
  const span = Math.ceil(Math.sqrt(n)) * CELL;
  const grid = (pixel: number): RasterGrid => ({
    originX: 600000 - CELL, originY: 5100000 + span + CELL, pixelWidth: pixel, pixelHeight: pixel,
    width: Math.floor((span + CELL - 8) / pixel), height: Math.ceil((span + 2 * CELL) / pixel),
  });
  return { pan: grid(0.3), ms: grid(1.2) };
}

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

export const benchmarks: Benchmark[] = [full, candidates, incremental];
