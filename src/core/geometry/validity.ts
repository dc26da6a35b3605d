import IsValidOp from 'jsts/org/locationtech/jts/operation/valid/IsValidOp.js';
import TopologyValidationError from 'jsts/org/locationtech/jts/operation/valid/TopologyValidationError.js';
import { jstsShape } from './jstsBridge.ts';
import { ringIsCertainlySimple, ringIsCollinear, ringIsStarAroundMean } from './segments.ts';
import type { MultiPolygonRings, Position, Ring } from './types.ts';

// Validity of a patch outline by the OGC Simple Features rules (OGC 06-103r4, 6.1.7
// LinearRing "closed and simple", 6.1.11 Polygon, 6.1.14 MultiPolygon). Structure that
// JSTS cannot even build (bad numbers, open or too-short rings) and zero area are told
// here; topology (self-intersection, holes outside or nested, split interiors, parts
// overlapping) comes from JSTS's IsValidOp, a port of JTS that follows the OGC rules.
// A one-ring patch of modest size first gets a quick simplicity screen: when it passes,
// the ring is certainly simple and JSTS is not needed; when in doubt, JSTS decides.

export type ValidityReason =
  | 'invalid-coordinate'
  | 'ring-not-closed'
  | 'too-few-points'
  | 'repeated-point'
  | 'zero-area'
  | 'self-intersection'
  | 'hole-outside-shell'
  | 'nested-holes'
  | 'disconnected-interior'
  | 'nested-shells'
  | 'duplicate-rings'
  | 'vertex-limit';

export interface ValidityIssue {
  reason: ValidityReason;
  message: string;
  /** Where the problem is, when one place can be named. */
  point: Position | null;
  /** Part and ring index (outer ring 0) of the ring at fault, when it is one ring. */
  part?: number;
  ring?: number;
}

/** Rings this size or less get the quick O(n^2) simplicity screen before JSTS. */
const SCREEN_LIMIT = 256;

const jstsReasons: Record<number, ValidityReason> = {
  [TopologyValidationError.HOLE_OUTSIDE_SHELL]: 'hole-outside-shell',
  [TopologyValidationError.NESTED_HOLES]: 'nested-holes',
  [TopologyValidationError.DISCONNECTED_INTERIOR]: 'disconnected-interior',
  [TopologyValidationError.SELF_INTERSECTION]: 'self-intersection',
  [TopologyValidationError.RING_SELF_INTERSECTION]: 'self-intersection',
  [TopologyValidationError.NESTED_SHELLS]: 'nested-shells',
  [TopologyValidationError.DUPLICATE_RINGS]: 'duplicate-rings',
  [TopologyValidationError.TOO_FEW_POINTS]: 'too-few-points',
  [TopologyValidationError.INVALID_COORDINATE]: 'invalid-coordinate',
  [TopologyValidationError.RING_NOT_CLOSED]: 'ring-not-closed',
  [TopologyValidationError.REPEATED_POINT]: 'repeated-point',
};

const samePoint = (a: Position, b: Position) => a[0] === b[0] && a[1] === b[1];

export function vertexCount(parts: MultiPolygonRings): number {
  let n = 0;
  for (const rings of parts) for (const ring of rings) n += ring.length;
  return n;
}

/** Structural problems of one ring; empty when JSTS can take it. One pass, no allocation. */
function ringStructure(ring: Ring, part: number, index: number): ValidityIssue[] {
  const where = `${index === 0 ? 'outer ring' : `hole ${index}`}${part > 0 ? ` of part ${part}` : ''}`;
  const n = ring.length;
  let repeatAt = -1;
  // Up to three distinct positions are enough to know the ring is not degenerate.
  let first: Position | null = null, second: Position | null = null, third = false;
  for (let i = 0; i < n; i++) {
    const p = ring[i];
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) {
      return [{ reason: 'invalid-coordinate', message: `${where} has a position that is not a finite number`, point: null, part, ring: index }];
    }
    if (i > 0 && repeatAt < 0 && samePoint(p, ring[i - 1])) repeatAt = i;
    if (!first) first = p;
    else if (!second) { if (!samePoint(p, first)) second = p; }
    else if (!third && !samePoint(p, first) && !samePoint(p, second)) third = true;
  }
  if (n < 4 || !third) {
    const distinct = first ? (second ? (third ? 3 : 2) : 1) : 0;
    return [{ reason: 'too-few-points', message: `${where} has ${n < 4 && third ? `${n} positions; a ring needs at least 4 (3 distinct, closed)` : `${distinct} distinct position(s); a ring needs at least 3`}`, point: ring[0] ?? null, part, ring: index }];
  }
  const issues: ValidityIssue[] = [];
  if (!samePoint(ring[0], ring[n - 1])) {
    issues.push({ reason: 'ring-not-closed', message: `${where} does not end where it starts`, point: ring[n - 1], part, ring: index });
  }
  if (repeatAt > 0) {
    issues.push({ reason: 'repeated-point', message: `${where} repeats a position`, point: ring[repeatAt], part, ring: index });
  }
  if (ringIsCollinear(ring)) {
    issues.push({ reason: 'zero-area', message: `${where} encloses no area (its positions are collinear)`, point: ring[0], part, ring: index });
  }
  return issues;
}

/** Closed, of finite numbers, with no position repeated next to itself. */
function plainRing(ring: Ring): boolean {
  const n = ring.length;
  if (n < 4 || ring[0][0] !== ring[n - 1][0] || ring[0][1] !== ring[n - 1][1]) return false;
  for (let i = 0; i < n; i++) {
    const p = ring[i];
    if (!Number.isFinite(p[0]) || !Number.isFinite(p[1])) return false;
    if (i > 0 && p[0] === ring[i - 1][0] && p[1] === ring[i - 1][1]) return false;
  }
  return true;
}

function withoutRepeats(ring: Ring): Ring {
  return ring.filter((p, i) => i === 0 || !samePoint(p, ring[i - 1]));
}

/**
 * All validity problems of a patch outline; empty when it is valid.
 * Consecutive repeated positions are reported (the brief counts them as invalid) though
 * JTS accepts them; the topology test then runs on the outline without them.
 */
export function validityIssues(parts: MultiPolygonRings, maxVertices = Infinity): ValidityIssue[] {
  const count = vertexCount(parts);
  if (count > maxVertices) {
    return [{ reason: 'vertex-limit', message: `the outline has ${count} vertices, over the limit of ${maxVertices}; it was not checked further`, point: null }];
  }
  // The common case, a one-ring outline drawn round its middle, is settled in two passes.
  if (parts.length === 1 && parts[0].length === 1 && plainRing(parts[0][0]) && ringIsStarAroundMean(parts[0][0])) return [];
  if (parts.length === 0 || parts.some((rings) => rings.length === 0)) {
    return [{ reason: 'too-few-points', message: 'the outline has no rings', point: null }];
  }
  const issues = parts.flatMap((rings, p) => rings.flatMap((ring, r) => ringStructure(ring, p, r)));
  const blocking = issues.some((issue) => issue.reason !== 'repeated-point');
  if (blocking) return issues;

  const cleaned = issues.length ? parts.map((rings) => rings.map(withoutRepeats)) : parts;
  if (cleaned.some((rings) => rings.some((ring) => ring.length < 4))) return issues;
  if (cleaned.length === 1 && cleaned[0].length === 1 && cleaned[0][0].length <= SCREEN_LIMIT
    && ringIsCertainlySimple(cleaned[0][0])) return issues;

  const op = new IsValidOp(jstsShape(cleaned));
  if (op.isValid()) return issues;
  const error = op.getValidationError();
  const c = error.getCoordinate();
  const reason = jstsReasons[error.getErrorType()] ?? 'self-intersection';
  issues.push({ reason, message: error.getMessage().toLowerCase(), point: c ? [c.x, c.y] : null });
  return issues;
}
