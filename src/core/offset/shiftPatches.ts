import type { MultiPolygonRings } from '../geometry/types.ts';
import type { OffsetEstimate, OffsetSettings } from './estimateShift.ts';

// Applying a shift: new geometries, the originals untouched, and the record of what
// was applied (the payload a ledger event or an export's provenance carries).

export interface Shift {
  /** Metres east and north, in the patches' projected CRS. */
  dx: number;
  dy: number;
}

/** Each outline moved by the shift; new arrays, the input is not changed. */
export function shiftPatches(patches: readonly MultiPolygonRings[], shift: Shift): MultiPolygonRings[] {
  return patches.map((parts) => parts.map((rings) => rings.map((ring) => ring.map(([x, y]) => [x + shift.dx, y + shift.dy] as [number, number]))));
}

export const SHIFT_METHOD =
  'maximum of the mean contrast of the signal inside each polygon against a ring just outside, ' +
  'searched coarse to fine over a disc, quadratic peak fit, bootstrap over polygons';

/** What an applied shift records: enough to redo it, undo it and explain it. */
export interface ShiftRecord {
  shift: Shift;
  /** 95 % radius of the estimate, metres. */
  uncertaintyM: number;
  method: string;
  settings: OffsetSettings;
  /** The patches moved, and those the estimate left out as outliers (moved too). */
  patchIds: (string | number)[];
  outliers: (string | number)[];
}

/** The record of applying a reliable estimate to these patches; throws on an unreliable one. */
export function shiftRecord(estimate: OffsetEstimate, patchIds: readonly (string | number)[]): ShiftRecord {
  if (!estimate.reliable || estimate.dx === null || estimate.dy === null || estimate.uncertainty === null) {
    throw new RangeError(`no reliable shift to apply: ${estimate.reasons.join('; ')}`);
  }
  return {
    shift: { dx: estimate.dx, dy: estimate.dy },
    uncertaintyM: estimate.uncertainty,
    method: `${SHIFT_METHOD} (signal: ${estimate.settings.signal})`,
    settings: estimate.settings,
    patchIds: [...patchIds],
    outliers: [...estimate.outliers],
  };
}
