import { patchContrast } from './contrast.ts';
import type { PatchTemplate } from './patchTemplate.ts';
import type { SignalGrid } from './signalGrid.ts';

// A square lattice of trial shifts, (2 half + 1) nodes a side, around a centre, cut to
// a disc of the search radius; every patch's contrast at every node; and the combined
// score surface over a chosen set of patches.

export interface ShiftLattice {
  /** Centre shift, metres east and north. */
  cx: number;
  cy: number;
  /** Node spacing, metres. */
  step: number;
  half: number;
  /** Nodes farther than this from the zero shift are not tried. */
  radius: number;
}

export const latticeSide = (l: ShiftLattice) => 2 * l.half + 1;
export const latticeNodes = (l: ShiftLattice) => latticeSide(l) ** 2;

/** The shift (metres) of node k, numbered row by row from the south-west corner. */
export function nodeShift(l: ShiftLattice, k: number): [number, number] {
  const side = latticeSide(l);
  return [l.cx + ((k % side) - l.half) * l.step, l.cy + (Math.floor(k / side) - l.half) * l.step];
}

/** Whether node k lies within the search radius (a hair of slack for rounding). */
export function nodeInRadius(l: ShiftLattice, k: number): boolean {
  const [x, y] = nodeShift(l, k);
  return Math.hypot(x, y) <= l.radius + 1e-9;
}

/** Contrast of every patch at every node in the radius: [patch * nodes + node], NaN elsewhere. */
export function evaluateLattice(templates: readonly PatchTemplate[], grid: SignalGrid, l: ShiftLattice): Float32Array {
  const nodes = latticeNodes(l);
  const out = new Float32Array(templates.length * nodes).fill(NaN);
  for (let k = 0; k < nodes; k++) {
    if (!nodeInRadius(l, k)) continue;
    const [dx, dy] = nodeShift(l, k);
    for (let p = 0; p < templates.length; p++) out[p * nodes + k] = patchContrast(templates[p], grid, dx, dy);
  }
  return out;
}

/**
 * The score surface: at each node, the weighted mean of the patches' contrasts
 * (weights: 1 per patch, or bootstrap counts; 0 leaves a patch out). NaN where no
 * weighted patch has a value.
 */
export function combine(perPatch: Float32Array, patches: number, nodes: number, weights: ArrayLike<number>): Float64Array {
  const sum = new Float64Array(nodes);
  const total = new Float64Array(nodes);
  for (let p = 0; p < patches; p++) {
    const w = weights[p];
    if (w === 0) continue;
    const base = p * nodes;
    for (let k = 0; k < nodes; k++) {
      const v = perPatch[base + k];
      if (v === v) {
        sum[k] += w * v;
        total[k] += w;
      }
    }
  }
  for (let k = 0; k < nodes; k++) sum[k] = total[k] > 0 ? sum[k] / total[k] : NaN;
  return sum;
}

/** Index of the largest finite value; -1 when there is none. */
export function argmax(values: ArrayLike<number>): number {
  let best = -1;
  let bestValue = -Infinity;
  for (let k = 0; k < values.length; k++) {
    if (values[k] > bestValue) {
      bestValue = values[k];
      best = k;
    }
  }
  return best;
}

/** Whether node k is on the rim of the tried nodes: a 4-neighbour is off the lattice or outside the radius. */
export function onRim(l: ShiftLattice, k: number): boolean {
  const side = latticeSide(l);
  const col = k % side;
  const row = Math.floor(k / side);
  const neighbours = [[col - 1, row], [col + 1, row], [col, row - 1], [col, row + 1]];
  return neighbours.some(([c, r]) => c < 0 || r < 0 || c >= side || r >= side || !nodeInRadius(l, r * side + c));
}
