import { fitPeak } from './peakFit.ts';
import { median } from './robust.ts';
import { argmax, latticeNodes, latticeSide, nodeShift, type ShiftLattice } from './shiftLattice.ts';

// Each patch's own best shift (the peak of its own contrast surface on the coarse
// lattice, fitted below a step), what is left of it once the common shift is taken
// off, and which patches stand apart: a misplaced or mistagged polygon.

export interface OwnPeak {
  /** The patch's own best shift, metres east and north. */
  shift: [number, number];
  /** Its contrast there (the largest on its coarse surface). */
  contrast: number;
}

export interface PatchResidual {
  own: [number, number] | null;
  /** own minus the common shift, metres. */
  residual: [number, number] | null;
  /** Length of the residual, metres. */
  distance: number | null;
  /** The distance in robust scales (see residualsAgainst). */
  z: number | null;
  /** Contrast at the common shift as a share of the patch's own best contrast. */
  fit: number | null;
  outlier: boolean;
}

export interface OutlierRule {
  /** Residuals longer than this many robust scales ... */
  zLimit: number;
  /** ... and than this many metres make an outlier. */
  minDistance: number;
  /** A patch whose contrast at the common shift is below this share of its own best is an outlier. */
  minFit: number;
}

/**
 * The patch's own peak on the coarse lattice: the local maximum reached by climbing
 * its contrast surface from the node nearest the common shift (a neighbouring crown
 * farther off does not count), fitted below a step. Null when it has no values there.
 */
export function ownPeak(perPatch: Float32Array, patch: number, lattice: ShiftLattice, from: [number, number]): OwnPeak | null {
  const nodes = latticeNodes(lattice);
  const side = latticeSide(lattice);
  const surface = perPatch.subarray(patch * nodes, (patch + 1) * nodes);
  let col = Math.min(side - 1, Math.max(0, Math.round((from[0] - lattice.cx) / lattice.step) + lattice.half));
  let row = Math.min(side - 1, Math.max(0, Math.round((from[1] - lattice.cy) / lattice.step) + lattice.half));
  if (!Number.isFinite(surface[row * side + col])) {
    const best = argmax(surface);
    if (best < 0) return null;
    col = best % side;
    row = Math.floor(best / side);
  }
  for (let steps = 0; steps < nodes; steps++) {
    let bestCol = col;
    let bestRow = row;
    for (let dy = -1; dy <= 1; dy++) {
      for (let dx = -1; dx <= 1; dx++) {
        const c = col + dx;
        const r = row + dy;
        if (c < 0 || r < 0 || c >= side || r >= side) continue;
        if (surface[r * side + c] > surface[bestRow * side + bestCol]) {
          bestCol = c;
          bestRow = r;
        }
      }
    }
    if (bestCol === col && bestRow === row) break;
    col = bestCol;
    row = bestRow;
  }
  const node = row * side + col;
  const fit = fitPeak(surface, side, col, row);
  const [x, y] = nodeShift(lattice, node);
  return { shift: [x + fit.x * lattice.step, y + fit.y * lattice.step], contrast: surface[node] };
}

/**
 * Residuals against the common shift and outlier flags. A patch is an outlier when
 * it fits the common shift much worse than its own peak (its contrast there is below
 * `minFit` of the peak's, or not positive), or when its residual is longer than both
 * `minDistance` and `zLimit` robust scales. The scale comes from the median residual
 * length: for round Gaussian errors of scale s the length is Rayleigh distributed
 * with median s * sqrt(2 ln 2) (a handbook fact); a median, unlike a standard
 * deviation, is not dragged by the outliers themselves (the median/MAD idea of
 * Iglewicz & Hoaglin 1993, on lengths rather than signed values).
 */
export function residualsAgainst(
  own: readonly (OwnPeak | null)[], atCommon: ArrayLike<number>, shift: [number, number], rule: OutlierRule,
): PatchResidual[] {
  const distances = own.map((o) => (o ? Math.hypot(o.shift[0] - shift[0], o.shift[1] - shift[1]) : NaN));
  const scale = median(distances.filter(Number.isFinite)) / Math.sqrt(2 * Math.LN2);
  const limit = Math.max(rule.minDistance, rule.zLimit * scale);
  return own.map((o, i) => {
    const d = distances[i];
    if (!o || !Number.isFinite(d)) return { own: null, residual: null, distance: null, z: null, fit: null, outlier: true };
    const c = atCommon[i];
    const fit = o.contrast > 0 && Number.isFinite(c) ? c / o.contrast : null;
    const poorFit = fit === null || fit < rule.minFit;
    return {
      own: o.shift, residual: [o.shift[0] - shift[0], o.shift[1] - shift[1]], distance: d,
      z: scale > 0 ? d / scale : null, fit, outlier: poorFit || d > limit,
    };
  });
}
