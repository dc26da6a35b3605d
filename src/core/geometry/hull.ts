import type { Position, Ring } from './types.ts';

// Convex hulls and a separating-axis test between them: two outlines whose hulls do
// not overlap cannot share any interior, so the exact (and costly) overlay is skipped.
// Hulls that only touch along an edge or at a point count as apart.

/** Convex hull of the finite positions, counter-clockwise, not closed (Andrew's monotone chain). */
export function convexHull(points: Position[]): Position[] {
  const pts: Position[] = [];
  for (const p of points) if (Number.isFinite(p[0]) && Number.isFinite(p[1])) pts.push(p);
  pts.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  if (pts.length < 3) return pts;
  const cross = (o: Position, a: Position, b: Position) => (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
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

export function hullOfRings(rings: Ring[]): Position[] {
  return convexHull(rings.length === 1 ? rings[0] : rings.flat());
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
    const len = Math.hypot(nx, ny);
    if (len === 0) continue;
    // Offsets from the edge's own vertex keep the products small in UTM metres.
    const [ox, oy] = hull[j];
    let min = Infinity;
    for (const [x, y] of other) min = Math.min(min, ((x - ox) * nx + (y - oy) * ny) / len);
    if (min >= -tolerance) return true;
  }
  return false;
}
