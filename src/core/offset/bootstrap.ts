import { Random } from '../random.ts';
import { fitPeak } from './peakFit.ts';
import { quantile } from './robust.ts';
import { argmax, combine, latticeNodes, latticeSide, nodeShift, onRim, type ShiftLattice } from './shiftLattice.ts';

// The uncertainty of the common shift by the nonparametric bootstrap over patches
// (Efron, B. & Tibshirani, R. J. 1993, An Introduction to the Bootstrap, Chapman & Hall):
// draw the patches with replacement, find the peak of the resampled score surface on
// the fine lattice, and look at how far the replicates fall from the estimate.

export interface BootstrapSummary {
  replicates: number;
  /** 95th percentile of the replicates' distance from the estimate, metres. */
  radius95: number;
  /** Standard deviations of the replicates, metres east and north. */
  sdX: number;
  sdY: number;
  /** Replicates whose peak fell on the rim of the fine lattice (an unstable estimate). */
  rimHits: number;
}

/** The peak (metres) of a surface on a lattice: best node plus the quadratic fit. */
export function latticePeak(surface: ArrayLike<number>, l: ShiftLattice): { shift: [number, number]; node: number; fitted: boolean } | null {
  const best = argmax(surface);
  if (best < 0) return null;
  const side = latticeSide(l);
  const fit = fitPeak(surface, side, best % side, Math.floor(best / side), 2);
  const [x, y] = nodeShift(l, best);
  return { shift: [x + fit.x * l.step, y + fit.y * l.step], node: best, fitted: fit.ok };
}

export function bootstrapShift(
  perPatch: Float32Array, members: readonly number[], patches: number, l: ShiftLattice,
  estimate: [number, number], replicates: number, seed: number,
): BootstrapSummary {
  const random = new Random(seed);
  const nodes = latticeNodes(l);
  const weights = new Float64Array(patches);
  const xs: number[] = [];
  const ys: number[] = [];
  const distances: number[] = [];
  let rimHits = 0;
  for (let b = 0; b < replicates; b++) {
    weights.fill(0);
    for (let k = 0; k < members.length; k++) weights[members[random.int(members.length)]]++;
    const peak = latticePeak(combine(perPatch, patches, nodes, weights), l);
    if (!peak) continue;
    if (onRim(l, peak.node)) rimHits++;
    xs.push(peak.shift[0]);
    ys.push(peak.shift[1]);
    distances.push(Math.hypot(peak.shift[0] - estimate[0], peak.shift[1] - estimate[1]));
  }
  const sd = (v: number[]) => {
    const m = v.reduce((s, x) => s + x, 0) / v.length;
    return Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / Math.max(1, v.length - 1));
  };
  return { replicates: distances.length, radius95: quantile(distances, 0.95), sdX: sd(xs), sdY: sd(ys), rimHits };
}
