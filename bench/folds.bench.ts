// folds.assign: 10,000 crown patches into 5 spatially blocked, stratified folds, beside
// the floor of the same blocking with the blocks dealt at random (no stratification):
// ratio = floor / ours stays at or below 1 and says what the stratification costs.
// The fold report (class counts and smallest train-test gaps) is timed as an extra.
import type { Ring } from '../src/core/geometry/types.ts';
import { Random } from '../src/core/random.ts';
import { foldReport } from '../src/core/training/foldReport.ts';
import { anchorOf, assignFolds, type FoldAssignment, type FoldPatch } from '../src/core/training/folds.ts';
import { applyFoldGap, boxGap } from '../src/core/training/foldGap.ts';
import { extentOfRings } from '../src/core/geometry/measure.ts';
import { outlineDistance } from '../src/core/training/outlineDistance.ts';
import { result, seeded, time, type BenchResult, type Benchmark, type BenchSize } from './harness.ts';

const SHARES = [0.3, 0.25, 0.2, 0.12, 0.1, 0.03];

function crowns(n: number, seed = 1): FoldPatch[] {
  const random = seeded(seed);
  const span = Math.sqrt(n) * 12; // about one crown per 12 m square
  return Array.from({ length: n }, (_, i) => {
    const cx = 600000 + random() * span, cy = 5100000 + random() * span;
    const r = 0.5 + 4.5 * random();
    const ring: Ring = [];
    for (let j = 0; j < 16; j++) {
      const a = (2 * Math.PI * j) / 16;
      ring.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
    }
    ring.push([ring[0][0], ring[0][1]]);
    let u = random(), cls = 0;
    while (cls < SHARES.length - 1 && u >= SHARES[cls]) { u -= SHARES[cls]; cls++; }
    return { id: i, cls: `c${cls}`, rings: [[ring]], weight: 1 + Math.floor(random() * 30) };
  });
}

/** Floor: the same blocks (by the centre of each box) dealt to folds at random. */
function randomDeal(patches: FoldPatch[], k: number, blockSize: number, seed: number): FoldAssignment {
  const random = new Random(seed);
  const foldOfBlock = new Map<string, number>();
  const fold = new Int32Array(patches.length);
  patches.forEach((p, i) => {
    const [x, y] = anchorOf(p.rings)!;
    const key = `${Math.floor(x / blockSize)},${Math.floor(y / blockSize)}`;
    let f = foldOfBlock.get(key);
    if (f === undefined) { f = random.int(k); foldOfBlock.set(key, f); }
    fold[i] = f;
  });
  return { k, blockSize, seed, fold, block: new Int32Array(patches.length).fill(-1), blocks: [], messages: [] };
}

const assign: Benchmark = {
  name: 'folds.assign',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const n = size === 'large' ? 100000 : 10000;
    const patches = crowns(n);
    const options = { k: 5, blockSize: 50, seed: 1 };
    const ours = await time(() => assignFolds(patches, options), { runs: 9, warmup: 2 });
    const floor = await time(() => randomDeal(patches, 5, 50, 1), { runs: 9, warmup: 2 });
    const assignment = assignFolds(patches, options);
    const report = await time(() => foldReport(patches, assignment), { runs: 5, warmup: 1 });
    const shares = foldReport(patches, assignment);
    const dealt = foldReport(patches, randomDeal(patches, 5, 50, 1));
    return [result('folds.assign', n, ours, 'random deal of the same blocks (floor)', floor, {
      blocks: assignment.blocks.length,
      max_share_deviation: Math.round(shares.maxShareDeviation * 10000) / 10000,
      random_deal_max_share_deviation: Math.round(dealt.maxShareDeviation * 10000) / 10000,
      report_ms: Math.round(report.median * 100) / 100,
      min_train_test_m: shares.folds.map((f) => (f.minTrainDistance === null ? null : Math.round(f.minTrainDistance * 100) / 100)),
    })];
  },
};

/** Baseline of the gap: every pair of patches in different folds, boxes first, then outlines. */
function allPairsGap(patches: FoldPatch[], assignment: FoldAssignment, gap: number): number {
  const boxes = patches.map((p) => extentOfRings(p.rings));
  const within = new Uint8Array(patches.length);
  for (let i = 0; i < patches.length; i++) {
    for (let j = i + 1; j < patches.length; j++) {
      if (assignment.fold[i] === assignment.fold[j] || boxGap(boxes[i], boxes[j]) >= gap) continue;
      if (outlineDistance(patches[i].rings, patches[j].rings) < gap) within[i] = within[j] = 1;
    }
  }
  return within.reduce((a, b) => a + b, 0);
}

// folds.gap: the patches of 10,000 crowns within 1 m of another fold's, by a spatial
// index, beside every pair of patches in different folds (boxes, then outlines).
const gap: Benchmark = {
  name: 'folds.gap',
  async run(size: BenchSize): Promise<BenchResult[]> {
    const n = size === 'large' ? 100000 : 10000;
    const patches = crowns(n);
    const assignment = assignFolds(patches, { k: 5, blockSize: 50, seed: 1 });
    const ours = await time(() => applyFoldGap(patches, assignment, 1), { runs: 5, warmup: 1 });
    const baseline = await time(() => allPairsGap(patches, assignment, 1), { runs: 5, warmup: 1 });
    const within = applyFoldGap(patches, assignment, 1).gap.within.reduce((a, b) => a + b, 0);
    return [result('folds.gap', n, ours, 'all pairs in different folds', baseline, { within_gap: within, baseline_within_gap: allPairsGap(patches, assignment, 1) })];
  },
};

export const benchmarks: Benchmark[] = [assign, gap];
