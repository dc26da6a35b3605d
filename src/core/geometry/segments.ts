import type { Position, Ring } from './types.ts';

// Segment predicates for the fast simplicity screen. They lean to "touching" when a
// determinant is within rounding of zero, so a doubtful ring goes on to the exact
// JSTS validity test instead of being passed here.

/** Twice the signed area of triangle a, b, c; 0 when collinear (within `eps`). */
function orient(a: Position, b: Position, c: Position, eps: number): number {
  const value = (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);
  return Math.abs(value) <= eps ? 0 : value;
}

function onSegment(a: Position, b: Position, p: Position): boolean {
  return Math.min(a[0], b[0]) <= p[0] && p[0] <= Math.max(a[0], b[0])
    && Math.min(a[1], b[1]) <= p[1] && p[1] <= Math.max(a[1], b[1]);
}

/** Whether closed segments ab and cd share any point. */
export function segmentsTouch(a: Position, b: Position, c: Position, d: Position, eps: number): boolean {
  const o1 = orient(a, b, c, eps);
  const o2 = orient(a, b, d, eps);
  const o3 = orient(c, d, a, eps);
  const o4 = orient(c, d, b, eps);
  if (o1 !== 0 && o2 !== 0 && o3 !== 0 && o4 !== 0) return Math.sign(o1) !== Math.sign(o2) && Math.sign(o3) !== Math.sign(o4);
  return (o1 === 0 && onSegment(a, b, c)) || (o2 === 0 && onSegment(a, b, d))
    || (o3 === 0 && onSegment(c, d, a)) || (o4 === 0 && onSegment(c, d, b));
}

/** Rounding allowance for determinants over a ring: differences of coordinates as large
 * as `maxAbs` carry errors near maxAbs * 2^-53, multiplied by edge spans up to `span`. */
export function determinantEpsilon(ring: Ring): number {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const [x, y] of ring) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  const span = Math.max(maxX - minX, maxY - minY);
  const maxAbs = Math.max(Math.abs(minX), Math.abs(maxX), Math.abs(minY), Math.abs(maxY));
  return 8 * Number.EPSILON * span * (maxAbs + span);
}

/**
 * True when a closed ring without repeated consecutive points is certainly simple:
 * no two non-adjacent edges touch and no two adjacent edges fold back on each other.
 * False means "not certain" (the caller asks JSTS). O(n^2), meant for small rings.
 */
export function ringIsCertainlySimple(ring: Ring): boolean {
  const m = ring.length - 1; // edges
  const eps = determinantEpsilon(ring);
  for (let i = 0; i < m; i++) {
    const a = ring[i], b = ring[i + 1];
    const minX = Math.min(a[0], b[0]), maxX = Math.max(a[0], b[0]);
    const minY = Math.min(a[1], b[1]), maxY = Math.max(a[1], b[1]);
    for (let j = i + 1; j < m; j++) {
      const c = ring[j], d = ring[j + 1];
      if (Math.max(c[0], d[0]) < minX || Math.min(c[0], d[0]) > maxX
        || Math.max(c[1], d[1]) < minY || Math.min(c[1], d[1]) > maxY) continue;
      const adjacent = j === i + 1 || (i === 0 && j === m - 1);
      if (!adjacent) {
        if (segmentsTouch(a, b, c, d, eps)) return false;
        continue;
      }
      // Adjacent edges share one vertex; they must not be collinear and overlapping.
      const shared = j === i + 1 ? b : a;
      const farI = j === i + 1 ? a : b;
      const farJ = j === i + 1 ? d : c;
      if (orient(shared, farI, farJ, eps) === 0) {
        const dot = (farI[0] - shared[0]) * (farJ[0] - shared[0]) + (farI[1] - shared[1]) * (farJ[1] - shared[1]);
        if (dot > 0) return false; // a spike: the ring turns back along itself
      }
    }
  }
  return true;
}

/** True when all positions of a ring lie on one line (within rounding): no area at all. */
export function ringIsCollinear(ring: Ring): boolean {
  const a = ring[0];
  const b = ring.find((p) => p[0] !== a[0] || p[1] !== a[1]);
  if (!b) return true;
  const eps = determinantEpsilon(ring);
  return ring.every((c) => orient(a, b, c, eps) === 0);
}
