import Flatbush from 'flatbush';
import { extentOfRings } from '../geometry/measure.ts';
import type { Extent } from '../geometry/types.ts';
import { HELD_OUT, type FoldAssignment, type FoldPatch } from './folds.ts';
import { outlineDistance } from './outlineDistance.ts';

// A gap between folds. Blocks go whole to folds, but two patches on either side of a
// block edge may touch, and then a fold is tested on a crown whose neighbour (the same
// light, soil and interpreter) trained the model: a train-test distance of 0. A gap of
// g metres finds every patch that comes nearer than g to a patch of another fold (the
// held-out set counts as a fold of its own) and either leaves it out — both patches of
// such a pair, so what is left keeps at least g between folds — or only reports it.
// (A buffer between training and test data: the spatial "buffered" cross-validation of
// Roberts et al. 2017, Ecography 40, 913-929, recalled from memory.)

/** The fold code of a patch left out for lying within the gap of another fold. */
export const GAP_LEFT_OUT = -3;

export type GapAction = 'leave-out' | 'report';

export interface FoldGap {
  /** metres (CRS units); 0 is no gap */
  distance: number;
  action: GapAction;
  /** per patch (input order): 1 when a patch of another fold lies nearer than the gap */
  within: Uint8Array;
  /** per fold 0..k-1: how many of its patches lie within the gap */
  perFold: number[];
  /** the same for the held-out set */
  heldOut: number;
}

/** Why a gap cannot be used, or null. */
export function gapProblem(distance: number): string | null {
  return Number.isFinite(distance) && distance >= 0 ? null : `the gap between folds must be a distance of 0 m or more, got ${distance}`;
}

/** Finds the patches within `distance` of another fold's patch; with 'leave-out', they leave their folds. */
export function applyFoldGap(patches: readonly FoldPatch[], assignment: FoldAssignment, distance: number, action: GapAction = 'leave-out'): { assignment: FoldAssignment; gap: FoldGap } {
  const problem = gapProblem(distance);
  if (problem) throw new RangeError(problem);
  const n = patches.length;
  const within = new Uint8Array(n);
  const setOf = (i: number) => assignment.fold[i];
  const placed: number[] = [];
  const extents: Extent[] = [];
  for (let i = 0; i < n; i++) {
    if (setOf(i) < HELD_OUT) continue; // unplaced
    const e = extentOfRings(patches[i].rings);
    if (!(e[0] <= e[2] && e[1] <= e[3])) continue;
    placed.push(i);
    extents.push(e);
  }
  if (distance > 0 && placed.length > 1) {
    const index = new Flatbush(placed.length);
    for (const e of extents) index.add(e[0], e[1], e[2], e[3]);
    index.finish();
    placed.forEach((i, a) => {
      const [x0, y0, x1, y1] = extents[a];
      for (const b of index.search(x0 - distance, y0 - distance, x1 + distance, y1 + distance)) {
        const j = placed[b];
        if (j <= i || setOf(j) === setOf(i) || (within[i] && within[j])) continue;
        if (boxGap(extents[a], extents[b]) >= distance) continue;
        if (outlineDistance(patches[i].rings, patches[j].rings) < distance) within[i] = within[j] = 1;
      }
    });
  }
  const perFold = new Array<number>(assignment.k).fill(0);
  let heldOut = 0;
  for (let i = 0; i < n; i++) {
    if (!within[i]) continue;
    if (setOf(i) === HELD_OUT) heldOut++;
    else perFold[setOf(i)]++;
  }
  const gap: FoldGap = { distance, action, within, perFold, heldOut };
  if (action === 'report' || distance === 0) return { assignment, gap };
  const fold = Int32Array.from(assignment.fold, (f, i) => (within[i] ? GAP_LEFT_OUT : f));
  const block = Int32Array.from(assignment.block, (b, i) => (within[i] ? -1 : b));
  const left = within.reduce((s, w) => s + w, 0);
  const messages = left ? [...assignment.messages, `${left} patch(es) lie within ${distance} m of a patch of another fold and are left out of every fold`] : assignment.messages;
  return { assignment: { ...assignment, fold, block, messages }, gap };
}

/** Gap between two boxes (0 when they overlap): a lower bound of the outlines' distance. */
export function boxGap(a: Extent, b: Extent): number {
  const dx = Math.max(0, b[0] - a[2], a[0] - b[2]);
  const dy = Math.max(0, b[1] - a[3], a[1] - b[3]);
  return Math.hypot(dx, dy);
}
