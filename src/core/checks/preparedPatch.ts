import { hullOfRings } from '../geometry/hull.ts';
import { jstsShape, type JstsGeometry } from '../geometry/jstsBridge.ts';
import { extentOfRings, multiPolygonArea } from '../geometry/measure.ts';
import { repairOutline, type RepairResult } from '../geometry/repair.ts';
import { ringIsStarAround } from '../geometry/segments.ts';
import type { Extent, MultiPolygonRings, Position, Ring } from '../geometry/types.ts';
import { validityIssues, type ValidityIssue } from '../geometry/validity.ts';
import type { PatchId } from './findings.ts';
import type { CheckSettings } from './settings.ts';

// A patch made ready for the checks once per edit: its validity verdict, the valid
// outline that area checks measure (the repaired one when broken), area, extent and
// convex hull. The JSTS geometry is built only when a neighbour needs an overlay.

/** What the checks need of a patch; LabelledPatch from the label file reader fits. */
export interface PatchInput {
  id: PatchId;
  species: string;
  /** Further interpreters' species calls, when the patch carries them. */
  tags?: { species: string }[];
  rings: MultiPolygonRings;
}

export interface PreparedPatch {
  input: PatchInput;
  issues: ValidityIssue[];
  /** The make-valid result, when the outline is broken beyond repeated positions. */
  repair: RepairResult | null;
  /** A valid outline to measure (the repaired one when broken); null when none is left. */
  shape: MultiPolygonRings | null;
  area: number;
  extent: Extent | null;
  /** Convex hull of the outline; built on first use by a neighbour test (see hullOf). */
  hull: Position[] | null;
  /** Built on first use by exactOverlap. */
  jsts: JstsGeometry | null;
}

const samePoint = (a: Position, b: Position) => a[0] === b[0] && a[1] === b[1];

/** The issues of every valid patch, shared (never changed). */
const NO_ISSUES: ValidityIssue[] = Object.freeze([]) as unknown as ValidityIssue[];

export function preparePatch(input: PatchInput, settings: CheckSettings): PreparedPatch {
  const quick = plainStarPatch(input, settings.maxVertices);
  if (quick) return quick;
  const issues = validityIssues(input.rings, settings.maxVertices);
  let repair: RepairResult | null = null;
  let shape: MultiPolygonRings | null;
  if (issues.length === 0) {
    shape = input.rings;
  } else if (issues.some((issue) => issue.reason === 'vertex-limit')) {
    shape = null; // too big to take apart within bounded time
  } else if (issues.every((issue) => issue.reason === 'repeated-point')) {
    shape = input.rings.map((rings) => rings.map((ring) => ring.filter((p, i) => i === 0 || !samePoint(p, ring[i - 1]))));
  } else {
    repair = repairOutline(input.rings, true);
    shape = repair.rings.length ? repair.rings : null;
  }
  const area = shape ? multiPolygonArea(shape) : 0;
  const extent = shape ? extentOfRings(shape) : null;
  return { input, issues, repair, shape, area, extent, hull: null, jsts: null };
}

/**
 * The commonest patch settled in two passes over its one ring instead of seven: what
 * validityIssues calls a valid one-ring outline drawn round its middle (closed, finite,
 * no repeated neighbours, star-shaped around its vertex mean), with its area, extent
 * and vertex mean worked out on the way, each sum in the same order as
 * multiPolygonArea, extentOfRings and ringIsStarAroundMean take it, so the verdict and
 * figures are the same to the last bit. Null: take the long way.
 */
function plainStarPatch(input: PatchInput, maxVertices: number): PreparedPatch | null {
  const parts = input.rings;
  if (parts.length !== 1 || parts[0].length !== 1) return null;
  const ring: Ring = parts[0][0];
  const n = ring.length, m = n - 1;
  if (n < 4 || n > maxVertices) return null;
  const first = ring[0], last = ring[m];
  if (first[0] !== last[0] || first[1] !== last[1]) return null;
  const y0 = first[1];
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  let sum = 0, sumX = 0, sumY = 0;
  let px = last[0], py = last[1];
  for (let i = 0; i < n; i++) {
    const p = ring[i];
    const x = p[0], y = p[1];
    if (!Number.isFinite(x) || !Number.isFinite(y)) return null;
    if (i > 0 && x === px && y === py) return null;
    if (x < minX) minX = x;
    if (y < minY) minY = y;
    if (x > maxX) maxX = x;
    if (y > maxY) maxY = y;
    // Shoelace term of edge (i - 1) -> i, as ringSignedArea takes it.
    sum += (px - x) * (py - y0 + y - y0);
    if (i < m) {
      sumX += x;
      sumY += y;
    }
    px = x;
    py = y;
  }
  // The rounding allowance of determinantEpsilon, from the extent just found.
  const span = Math.max(maxX - minX, maxY - minY);
  const maxAbs = Math.max(Math.abs(minX), Math.abs(maxX), Math.abs(minY), Math.abs(maxY));
  if (!ringIsStarAround(ring, sumX / m, sumY / m, 8 * Number.EPSILON * span * (maxAbs + span))) return null;
  return { input, issues: NO_ISSUES, repair: null, shape: parts, area: Math.abs(sum / 2), extent: [minX, minY, maxX, maxY], hull: null, jsts: null };
}

export function jstsOf(patch: PreparedPatch): JstsGeometry {
  if (!patch.jsts) patch.jsts = jstsShape(patch.shape!);
  return patch.jsts;
}

export function hullOf(patch: PreparedPatch): Position[] {
  if (!patch.hull) patch.hull = patch.shape ? hullOfRings(patch.shape.map((rings) => rings[0])) : [];
  return patch.hull;
}
