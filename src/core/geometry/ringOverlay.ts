import { ringSignedArea } from './measure.ts';
import type { MultiPolygonRings, Position, Ring } from './types.ts';

// The overlap (or difference) of two simple rings whose boundaries cross only in
// general position, by the traversal of Greiner and Hormann (1998, "Efficient clipping
// of arbitrary polygons", ACM Transactions on Graphics 17(2), 71-83). Every edge pair
// is tested with orientation signs that are certain (a floating-point filter with the
// error bound of Shewchuk, 1997, "Adaptive precision floating-point arithmetic and fast
// robust geometric predicates", Discrete & Computational Geometry 18, 305-363). Whenever
// a sign is in doubt, or the boundaries touch at a vertex or run along each other, the
// answer is null: such degenerate cases go to the general overlay (JSTS) instead.
// Hand-written because the clipping libraries either handle degenerate cases wrongly
// and silently, or spend the general case's cost (noding graphs) on every pair.

/** Shewchuk's ccwerrboundA: (3 + 16 eps) eps with eps = 2^-53. */
const ORIENT_BOUND = (3 + 16 * 2 ** -53) * 2 ** -53;

/**
 * Sign of the turn a -> b -> c: 1 left (counter-clockwise), -1 right, 0 when it cannot
 * be told for certain in floating point (collinear, or too near to call).
 */
export function orientSign(ax: number, ay: number, bx: number, by: number, cx: number, cy: number): number {
  const left = (ax - cx) * (by - cy);
  const right = (ay - cy) * (bx - cx);
  const det = left - right;
  const bound = ORIENT_BOUND * (Math.abs(left) + Math.abs(right));
  return det > bound ? 1 : det < -bound ? -1 : 0;
}

/** A crossing of an edge of one ring with an edge of the other. */
interface Crossing {
  point: Position;
  /** Edge of ring A and position along it (0-1, exclusive). */
  edgeA: number;
  alongA: number;
  edgeB: number;
  alongB: number;
  /** Ring A enters ring B here (walking A forward). */
  aEnters: boolean;
  /** Index in B's order of the same crossing (filled after sorting). */
  inB: number;
  used: boolean;
}

/** The ring's positions without the closing repeat, counter-clockwise. */
function openCcw(ring: Ring): Position[] {
  const open = ring.slice(0, ring.length - 1);
  return ringSignedArea(ring) < 0 ? open.reverse() : open;
}

/** All boundary crossings, or null for a touch, an overlap or a doubtful sign. */
function crossings(a: Position[], b: Position[]): Crossing[] | null {
  const out: Crossing[] = [];
  const n = a.length, m = b.length;
  // Only edges that meet the other ring's box can meet any of its edges: pairing just
  // those (in the same order) finds the same crossings with far fewer box tests.
  const nearA = edgesMeeting(b, boxOf(a));
  const boxB = boxOf(b);
  for (let i = 0; i < n; i++) {
    const p = a[i], q = a[(i + 1) % n];
    const minX = Math.min(p[0], q[0]), maxX = Math.max(p[0], q[0]);
    const minY = Math.min(p[1], q[1]), maxY = Math.max(p[1], q[1]);
    if (boxB[2] < minX || boxB[0] > maxX || boxB[3] < minY || boxB[1] > maxY) continue;
    for (const j of nearA) {
      const r = b[j], s = b[(j + 1) % m];
      if (Math.max(r[0], s[0]) < minX || Math.min(r[0], s[0]) > maxX
        || Math.max(r[1], s[1]) < minY || Math.min(r[1], s[1]) > maxY) continue;
      const d1 = orientSign(p[0], p[1], q[0], q[1], r[0], r[1]);
      const d2 = orientSign(p[0], p[1], q[0], q[1], s[0], s[1]);
      const d3 = orientSign(r[0], r[1], s[0], s[1], p[0], p[1]);
      const d4 = orientSign(r[0], r[1], s[0], s[1], q[0], q[1]);
      if (d1 === 0 || d2 === 0 || d3 === 0 || d4 === 0) {
        // A zero sign with overlapping boxes may be a touch; a certain miss is fine.
        if ((d1 !== 0 && d1 === d2) || (d3 !== 0 && d3 === d4)) continue;
        return null;
      }
      if (d1 === d2 || d3 === d4) continue;
      // Offsets from p keep the products small in UTM metres.
      const ex = q[0] - p[0], ey = q[1] - p[1];
      const fx = s[0] - r[0], fy = s[1] - r[1];
      const gx = r[0] - p[0], gy = r[1] - p[1];
      const denom = ex * fy - ey * fx;
      const t = (gx * fy - gy * fx) / denom;
      const u = (gx * ey - gy * ex) / denom;
      if (!(t > 0 && t < 1 && u > 0 && u < 1)) return null;
      // B runs counter-clockwise, its inside on its left: A enters where p lies right of B's edge.
      out.push({ point: [p[0] + t * ex, p[1] + t * ey], edgeA: i, alongA: t, edgeB: j, alongB: u, aEnters: d3 < 0, inB: -1, used: false });
    }
  }
  return out;
}

/** [minX, minY, maxX, maxY] of an open ring's positions. */
function boxOf(ring: Position[]): [number, number, number, number] {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const p of ring) {
    if (p[0] < minX) minX = p[0];
    if (p[0] > maxX) maxX = p[0];
    if (p[1] < minY) minY = p[1];
    if (p[1] > maxY) maxY = p[1];
  }
  return [minX, minY, maxX, maxY];
}

/** Indices, in order, of the open ring's edges whose boxes meet `box` (closed boxes). */
function edgesMeeting(ring: Position[], box: [number, number, number, number]): number[] {
  const out: number[] = [];
  const m = ring.length;
  for (let j = 0; j < m; j++) {
    const r = ring[j], s = ring[(j + 1) % m];
    if (Math.max(r[0], s[0]) < box[0] || Math.min(r[0], s[0]) > box[2]
      || Math.max(r[1], s[1]) < box[1] || Math.min(r[1], s[1]) > box[3]) continue;
    out.push(j);
  }
  return out;
}

/** Whether p is inside the ring (open: no closing repeat); null when in doubt. */
export function inside(p: Position, ring: Position[]): boolean | null {
  let odd = false;
  for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
    const a = ring[j], b = ring[i];
    if ((a[1] > p[1]) === (b[1] > p[1])) continue;
    // The edge spans p's height: p is left of the upward edge when the turn is left.
    const sign = orientSign(a[0], a[1], b[0], b[1], p[0], p[1]);
    if (sign === 0) return null;
    if ((sign > 0) === (b[1] > a[1])) odd = !odd;
  }
  return odd;
}

const close = (ring: Position[]): Ring => [...ring, ring[0]];

/**
 * A stable sorted copy; by insertion when short: two crowns' boundaries cross a few
 * times, and for so few items Array.prototype.sort's set-up costs more than the sorting.
 */
function sortedCopy<T>(items: T[], compare: (a: T, b: T) => number): T[] {
  const out = [...items];
  if (out.length > 16) return out.sort(compare);
  for (let i = 1; i < out.length; i++) {
    const item = out[i];
    let j = i;
    for (; j > 0 && compare(out[j - 1], item) > 0; j--) out[j] = out[j - 1];
    out[j] = item;
  }
  return out;
}

/**
 * A ∩ B or A − B of two valid single rings (closed, simple), as polygons with outer
 * rings counter-clockwise and holes clockwise; null when the case is degenerate.
 */
export function ringOverlay(ringA: Ring, ringB: Ring, op: 'intersection' | 'difference'): MultiPolygonRings | null {
  const a = openCcw(ringA), b = openCcw(ringB);
  if (a.length < 3 || b.length < 3) return null;
  const found = crossings(a, b);
  if (!found) return null;
  if (found.length === 0) return apart(a, b, op);
  if (found.length % 2 === 1) return null;

  // Order the crossings along each ring; two at one place cannot be ordered.
  const alongA = sortedCopy(found, (x, y) => x.edgeA - y.edgeA || x.alongA - y.alongA);
  const alongB = sortedCopy(found, (x, y) => x.edgeB - y.edgeB || x.alongB - y.alongB);
  for (let k = 1; k < found.length; k++) {
    if (alongA[k].edgeA === alongA[k - 1].edgeA && alongA[k].alongA === alongA[k - 1].alongA) return null;
    if (alongB[k].edgeB === alongB[k - 1].edgeB && alongB[k].alongB === alongB[k - 1].alongB) return null;
  }
  alongB.forEach((c, k) => (c.inB = k));
  const indexInA = new Map(alongA.map((c, k) => [c, k]));
  // Entries and exits alternate along each ring; anything else is a doubtful case.
  for (let k = 0; k < alongA.length; k++) if (alongA[k].aEnters === alongA[(k + 1) % alongA.length].aEnters) return null;

  const out: MultiPolygonRings = [];
  // Intersection: walk A from where it enters B; difference: from where it leaves B.
  // A is walked forward; B forward inside A (intersection) or backward (difference).
  const forwardB = op === 'intersection';
  for (const start of alongA) {
    if (start.used || start.aEnters !== (op === 'intersection')) continue;
    const ring: Position[] = [];
    let at = start;
    let onA = true;
    for (let guard = 0; guard <= 2 * found.length; guard++) {
      at.used = true;
      ring.push(at.point);
      let next: Crossing;
      if (onA) {
        const k = indexInA.get(at)!;
        next = alongA[(k + 1) % alongA.length];
        pushVertices(ring, a, at.edgeA, next.edgeA, next.alongA <= at.alongA && next.edgeA === at.edgeA, true);
      } else if (forwardB) {
        next = alongB[(at.inB + 1) % alongB.length];
        pushVertices(ring, b, at.edgeB, next.edgeB, next.alongB <= at.alongB && next.edgeB === at.edgeB, true);
      } else {
        next = alongB[(at.inB - 1 + alongB.length) % alongB.length];
        pushVertices(ring, b, at.edgeB, next.edgeB, next.alongB >= at.alongB && next.edgeB === at.edgeB, false);
      }
      at = next;
      onA = !onA;
      if (at === start) break;
    }
    if (at !== start || !onA) return null;
    if (ring.length >= 3) out.push([close(ring)]);
  }
  return out;
}

/**
 * Appends the ring's vertices met walking from a crossing on edge `from` to one on edge
 * `to`: forward, the ends of edges from..to-1; backward, the starts of edges from..to+1.
 * `wraps` says the walk goes once round when both crossings sit on one edge.
 */
function pushVertices(out: Position[], ring: Position[], from: number, to: number, wraps: boolean, forward: boolean): void {
  const n = ring.length;
  if (from === to && !wraps) return;
  if (forward) {
    for (let e = from; ; e = (e + 1) % n) {
      out.push(ring[(e + 1) % n]);
      if ((e + 1) % n === to) break;
    }
  } else {
    for (let e = from; ; e = (e - 1 + n) % n) {
      out.push(ring[e]);
      if ((e - 1 + n) % n === to) break;
    }
  }
}

/** Boundaries that do not meet: one ring inside the other, or apart. */
function apart(a: Position[], b: Position[], op: 'intersection' | 'difference'): MultiPolygonRings | null {
  const aInB = inside(a[0], b);
  if (aInB === null) return null;
  if (aInB) return op === 'intersection' ? [[close(a)]] : [];
  const bInA = inside(b[0], a);
  if (bInA === null) return null;
  if (bInA) return op === 'intersection' ? [[close(b)]] : [[close(a), close([...b].reverse())]];
  return op === 'intersection' ? [] : [[close(a)]];
}
