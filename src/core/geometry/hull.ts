import type { Position, Ring } from './types.ts';

// Convex hulls and a separating-axis test between them: two outlines whose hulls do
// not overlap cannot share any interior, so the exact (and costly) overlay is skipped.
// Hulls that only touch along an edge or at a point count as apart.

const cross = (o: Position, a: Position, b: Position) => (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);

/** Convex hull of the finite positions, counter-clockwise, not closed (Andrew's monotone chain). */
export function convexHull(points: Position[]): Position[] {
  const pts: Position[] = [];
  for (const p of points) if (Number.isFinite(p[0]) && Number.isFinite(p[1])) pts.push(p);
  pts.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (pts.length < 3) return pts;
  const lower: Position[] = [];
  for (const p of pts) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], p) <= 0) lower.pop();
    lower.push(p);
  }
  const upper: Position[] = [];
  for (let i = pts.length - 1; i >= 0; i--) {
    const p = pts[i];
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], p) <= 0) upper.pop();
    upper.push(p);
  }
  lower.pop();
  upper.pop();
  return lower.concat(upper);
}

/**
 * Convex hull of a simple closed ring in one pass, without sorting (Melkman, 1987,
 * "On-line construction of the convex hull of a simple polyline", Information
 * Processing Letters 25(1), 11-12): counter-clockwise, not closed, collinear points
 * dropped as convexHull drops them. Null when the ring is too short, holds a number
 * that is not finite, or starts with three collinear positions (convexHull then).
 */
export function simpleRingHull(ring: Ring): Position[] | null {
  const n = ring.length - 1; // the closing position repeats the first
  if (n < 3) return null;
  for (let i = 0; i < n; i++) if (!Number.isFinite(ring[i][0]) || !Number.isFinite(ring[i][1])) return null;
  const turn = cross(ring[0], ring[1], ring[2]);
  if (turn === 0) return null;
  // A deque in an array with room on both sides; deque[bottom] === deque[top].
  const deque = new Array<Position>(2 * n + 1);
  let bottom = n, top = n + 3;
  deque[bottom] = deque[top] = ring[2];
  deque[n + 1] = turn > 0 ? ring[0] : ring[1];
  deque[n + 2] = turn > 0 ? ring[1] : ring[0];
  for (let i = 3; i < n; i++) {
    const v = ring[i];
    // Inside the hull so far (left of both edges at the ends of the deque): no change.
    if (cross(deque[bottom], deque[bottom + 1], v) > 0 && cross(deque[top - 1], deque[top], v) > 0) continue;
    while (top - bottom > 1 && cross(deque[top - 1], deque[top], v) <= 0) top--;
    deque[++top] = v;
    while (top - bottom > 1 && cross(deque[bottom], deque[bottom + 1], v) <= 0) bottom++;
    deque[--bottom] = v;
  }
  return deque.slice(bottom, top);
}

/** Convex hull of outer rings of a valid outline (so each ring is simple). */
export function hullOfRings(rings: Ring[]): Position[] {
  return (rings.length === 1 && simpleRingHull(rings[0])) || convexHull(rings.length === 1 ? rings[0] : rings.flat());
}

/** Whether some edge direction of either hull separates them (gaps of `tolerance` or less count as touching). */
export function hullsApart(a: Position[], b: Position[], tolerance: number): boolean {
  if (a.length < 3 || b.length < 3) return false;
  return separatedByEdgeOf(a, b, tolerance) || separatedByEdgeOf(b, a, tolerance);
}

function separatedByEdgeOf(hull: Position[], other: Position[], tolerance: number): boolean {
  for (let i = 0, j = hull.length - 1; i < hull.length; j = i++) {
    // Outward normal of a counter-clockwise edge j -> i.
    const nx = hull[i][1] - hull[j][1];
    const ny = hull[j][0] - hull[i][0];
    const len = Math.sqrt(nx * nx + ny * ny);
    if (len === 0) continue;
    // Offsets from the edge's own vertex keep the products small in UTM metres. The
    // distances stay unscaled (times len): the first point deeper than the tolerance
    // rules this edge out.
    const ox = hull[j][0], oy = hull[j][1];
    const limit = -tolerance * len;
    let k = 0;
    while (k < other.length && (other[k][0] - ox) * nx + (other[k][1] - oy) * ny >= limit) k++;
    if (k === other.length) return true;
  }
  return false;
}
