import Flatbush from 'flatbush';
import { extentOfRings } from '../geometry/measure.ts';
import type { Extent } from '../geometry/types.ts';
import { HELD_OUT, type FoldAssignment, type FoldPatch } from './folds.ts';
import { boxGap, type FoldGap, type GapAction } from './foldGap.ts';
import { outlineDistance } from './outlineDistance.ts';

// What a fold assignment gives: per fold the class counts and shares, and the smallest
// distance between one of its (test) patches and a patch that trains against it —
// the gap a spatially blocked evaluation relies on.

export interface FoldSummary {
  /** 0..k-1, or "held-out". */
  fold: number | 'held-out';
  patches: number;
  blocks: number;
  /** Patches per class. */
  classCounts: Record<string, number>;
  /** Stratification weight (e.g. pure pixels) per class. */
  classWeights: Record<string, number>;
  /** Share of this fold's weight per class. */
  classShares: Record<string, number>;
  /**
   * Shortest distance from a patch of this set to a training patch (any patch of
   * another fold; for the held-out set, any fold's), in CRS units; null when either side is empty.
   */
  minTrainDistance: number | null;
  /** The pair at that distance. */
  nearestPair: [string | number, string | number] | null;
  /**
   * Patches of this set nearer than the gap to a patch of another fold: left out (and
   * not counted in `patches`) or only reported, as the gap's action says; 0 without a gap.
   */
  withinGap: number;
}

export interface FoldReport {
  folds: FoldSummary[];
  heldOut: FoldSummary | null;
  /** Share of the whole (all folds) per class. */
  classShares: Record<string, number>;
  /** Largest |fold share - whole share| over folds and classes. */
  maxShareDeviation: number;
  /** The gap between folds, when one was asked for. */
  gap: { distance: number; action: GapAction; within: number } | null;
}

export function foldReport(patches: readonly FoldPatch[], assignment: FoldAssignment, gap: FoldGap | null = null): FoldReport {
  const extents: (Extent | null)[] = patches.map((p) => {
    const e = extentOfRings(p.rings);
    return e[0] <= e[2] && e[1] <= e[3] ? e : null;
  });
  const placed = patches.map((_, i) => i).filter((i) => extents[i] !== null && assignment.fold[i] >= HELD_OUT);
  const index = placed.length > 0 ? new Flatbush(placed.length) : null;
  if (index) {
    for (const i of placed) index.add(...(extents[i] as Extent));
    index.finish();
  }
  const classNames = [...new Set(patches.map((p) => p.cls))].sort();

  const whole: Record<string, number> = Object.fromEntries(classNames.map((c) => [c, 0]));
  let wholeTotal = 0;
  patches.forEach((p, i) => {
    if (assignment.fold[i] >= 0) { whole[p.cls] += p.weight ?? 1; wholeTotal += p.weight ?? 1; }
  });
  const classShares = Object.fromEntries(classNames.map((c) => [c, wholeTotal > 0 ? whole[c] / wholeTotal : 0]));

  /** Trains against fold f: any patch in a fold other than f (held-out patches never train). */
  const trainsAgainst = (f: number) => (j: number) => assignment.fold[j] >= 0 && assignment.fold[j] !== f;

  const summarize = (f: number): FoldSummary => {
    const members = placed.filter((i) => assignment.fold[i] === f);
    const classCounts: Record<string, number> = Object.fromEntries(classNames.map((c) => [c, 0]));
    const classWeights: Record<string, number> = Object.fromEntries(classNames.map((c) => [c, 0]));
    let total = 0;
    const blocks = new Set<number>();
    for (const i of members) {
      classCounts[patches[i].cls]++;
      classWeights[patches[i].cls] += patches[i].weight ?? 1;
      total += patches[i].weight ?? 1;
      if (assignment.block[i] >= 0) blocks.add(assignment.block[i]);
    }
    const shares = Object.fromEntries(classNames.map((c) => [c, total > 0 ? classWeights[c] / total : 0]));
    const nearest = nearestTraining(members, trainsAgainst(f));
    return {
      fold: f === HELD_OUT ? 'held-out' : f,
      patches: members.length,
      blocks: blocks.size,
      classCounts,
      classWeights,
      classShares: shares,
      minTrainDistance: nearest ? nearest.distance : null,
      nearestPair: nearest ? [patches[nearest.test].id, patches[nearest.train].id] : null,
      withinGap: gap ? (f === HELD_OUT ? gap.heldOut : gap.perFold[f]) : 0,
    };
  };

  /** Branch and bound: a first guess, then each member's index window within the best so far. */
  const nearestTraining = (members: number[], isTrain: (j: number) => boolean) => {
    if (!index || members.length === 0) return null;
    const [ax0, ay0, ax1, ay1] = extents[members[0]]!;
    const first = index.neighbors((ax0 + ax1) / 2, (ay0 + ay1) / 2, 1, Infinity, (k) => isTrain(placed[k]));
    if (first.length === 0) return null;
    let best = { distance: outlineDistance(patches[members[0]].rings, patches[placed[first[0]]].rings), test: members[0], train: placed[first[0]] };
    for (const i of members) {
      if (best.distance === 0) break;
      const [x0, y0, x1, y1] = extents[i]!;
      const d = best.distance;
      for (const k of index.search(x0 - d, y0 - d, x1 + d, y1 + d, (m) => isTrain(placed[m]))) {
        const j = placed[k];
        if (boxGap(extents[i]!, extents[j]!) >= best.distance) continue;
        const dd = outlineDistance(patches[i].rings, patches[j].rings);
        if (dd < best.distance) best = { distance: dd, test: i, train: j };
      }
    }
    return best;
  };

  const folds = Array.from({ length: assignment.k }, (_, f) => summarize(f));
  const heldOut = assignment.fold.includes(HELD_OUT) ? summarize(HELD_OUT) : null;
  let maxShareDeviation = 0;
  for (const f of folds) {
    if (f.patches === 0) continue;
    for (const c of classNames) maxShareDeviation = Math.max(maxShareDeviation, Math.abs(f.classShares[c] - classShares[c]));
  }
  const within = gap ? gap.within.reduce((sum, w) => sum + w, 0) : 0;
  return { folds, heldOut, classShares, maxShareDeviation, gap: gap ? { distance: gap.distance, action: gap.action, within } : null };
}
