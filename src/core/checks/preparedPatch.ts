import { hullOfRings } from '../geometry/hull.ts';
import { jstsShape, type JstsGeometry } from '../geometry/jstsBridge.ts';
import { extentOfRings, multiPolygonArea } from '../geometry/measure.ts';
import { repairOutline, type RepairResult } from '../geometry/repair.ts';
import type { Extent, MultiPolygonRings, Position } from '../geometry/types.ts';
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

export function preparePatch(input: PatchInput, settings: CheckSettings): PreparedPatch {
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

export function jstsOf(patch: PreparedPatch): JstsGeometry {
  if (!patch.jsts) patch.jsts = jstsShape(patch.shape!);
  return patch.jsts;
}

export function hullOf(patch: PreparedPatch): Position[] {
  if (!patch.hull) patch.hull = patch.shape ? hullOfRings(patch.shape.map((rings) => rings[0])) : [];
  return patch.hull;
}
