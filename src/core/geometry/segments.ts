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
 * A quick sufficient test for most drawn crowns: seen from the mean of its vertices,
 * every edge turns the same way (beyond rounding) and the ring goes round once. Then
 * each ray from that point meets the ring once, so the ring is simple (star-shaped).
 * O(n); false only means "not shown this way".
 */
export function ringIsStarAroundMean(ring: Ring, eps: number = determinantEpsilon(ring)): boolean {
  const m = ring.length - 1;
  if (m < 3) return false;
  let cx = 0, cy = 0;
  for (let i = 0; i < m; i++) {
    cx += ring[i][0];
    cy += ring[i][1];
  }
  return ringIsStarAround(ring, cx / m, cy / m, eps);
}

/** ringIsStarAroundMean with the vertex mean (cx, cy) given, for a caller that has it. */
export function ringIsStarAround(ring: Ring, cx: number, cy: number, eps: number): boolean {
  const m = ring.length - 1;
  if (m < 3) return false;
  let turn = 0;
  let rounds = 0;
  let px = ring[0][0] - cx, py = ring[0][1] - cy;
  for (let i = 1; i <= m; i++) {
    const qx = ring[i][0] - cx, qy = ring[i][1] - cy;
    // Twice the signed area of c, p, q (as orient() does, within the same allowance).
    const o = px * qy - py * qx;
    const sign = o > eps ? 1 : o < -eps ? -1 : 0;
    if (sign === 0 || (turn !== 0 && sign !== turn)) return false;
    turn = sign;
    // Going round counter-clockwise, an edge passes the ray east of c upward (clockwise:
    // downward); count those passes with half-open ends, so a vertex on the ray counts once.
    if (turn > 0 ? py < 0 && qy >= 0 : py >= 0 && qy < 0) rounds++;
    px = qx;
    py = qy;
  }
  return rounds === 1;
}

/**
 * True when a closed ring without repeated consecutive points is certainly simple:
 * no two non-adjacent edges touch and no two adjacent edges fold back on each other.
 * False means "not certain" (the caller asks JSTS). Edges are swept in order of their
 * west end, so only edges whose x ranges meet are paired; meant for small rings.
 */
export function ringIsCertainlySimple(ring: Ring): boolean {
  const m = ring.length - 1; // edges
  const eps = determinantEpsilon(ring);
  if (ringIsStarAroundMean(ring, eps)) return true;
  const minX = new Float64Array(m), maxX = new Float64Array(m);
  const order = new Array<number>(m);
  for (let i = 0; i < m; i++) {
    const a = ring[i][0], b = ring[i + 1][0];
    minX[i] = a < b ? a : b;
    maxX[i] = a < b ? b : a;
    order[i] = i;
  }
  order.sort((p, q) => minX[p] - minX[q]);
  for (let k = 0; k < m; k++) {
    const first = order[k];
    for (let l = k + 1; l < m && minX[order[l]] <= maxX[first]; l++) {
      const second = order[l];
      const i = first < second ? first : second, j = first < second ? second : first;
      const a = ring[i], b = ring[i + 1], c = ring[j], d = ring[j + 1];
      if (Math.max(c[1], d[1]) < Math.min(a[1], b[1]) || Math.min(c[1], d[1]) > Math.max(a[1], b[1])) continue;
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
