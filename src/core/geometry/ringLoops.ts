import { ringSignedArea } from './measure.ts';
import { inside, orientSign } from './ringOverlay.ts';
import type { MultiPolygonRings, Position, Ring } from './types.ts';

// The commonest broken outlines a hand draws: a ring that crosses itself a few times
// (a figure-eight, a bowtie, a twisted corner). Cut at each crossing, such a ring falls
// into simple loops that meet at the crossing points only. When no loop lies inside
// another, every loop's inside is inside the ring by the even-odd rule, and the loops
// as parts form a valid MultiPolygon as they stand. This finds that case with certain
// orientation signs; anything else (a loop inside another, which makes a hole, loops
// that cross each other, a touch, a doubtful sign) is left to the general repair (null).

/** One proper crossing of edges i < j of an open ring. */
interface SelfCrossing {
  i: number;
  j: number;
  point: Position;
}

/** The proper crossings of an open ring's edges, or null on a touch, a fold or a doubtful sign. */
function selfCrossings(a: Position[], stopAfterOne: boolean): SelfCrossing[] | null {
  const n = a.length;
  const out: SelfCrossing[] = [];
  for (let i = 0; i < n; i++) {
    const p = a[i], q = a[(i + 1) % n];
    const minX = Math.min(p[0], q[0]), maxX = Math.max(p[0], q[0]);
    const minY = Math.min(p[1], q[1]), maxY = Math.max(p[1], q[1]);
    for (let j = i + 1; j < n; j++) {
      const r = a[j], s = a[(j + 1) % n];
      if (Math.max(r[0], s[0]) < minX || Math.min(r[0], s[0]) > maxX
        || Math.max(r[1], s[1]) < minY || Math.min(r[1], s[1]) > maxY) continue;
      const adjacent = j === i + 1 || (i === 0 && j === n - 1);
      if (adjacent) {
        // Neighbours share a vertex; collinear ones may fold back: not this case.
        const shared = j === i + 1 ? q : p;
        const far = j === i + 1 ? s : r;
        const other = j === i + 1 ? p : q;
        if (orientSign(other[0], other[1], shared[0], shared[1], far[0], far[1]) === 0) return null;
        continue;
      }
      const d1 = orientSign(p[0], p[1], q[0], q[1], r[0], r[1]);
      const d2 = orientSign(p[0], p[1], q[0], q[1], s[0], s[1]);
      const d3 = orientSign(r[0], r[1], s[0], s[1], p[0], p[1]);
      const d4 = orientSign(r[0], r[1], s[0], s[1], q[0], q[1]);
      if ((d1 !== 0 && d1 === d2) || (d3 !== 0 && d3 === d4)) continue;
      if (d1 === 0 || d2 === 0 || d3 === 0 || d4 === 0) return null;
      const ex = q[0] - p[0], ey = q[1] - p[1];
      const fx = s[0] - r[0], fy = s[1] - r[1];
      const t = ((r[0] - p[0]) * fy - (r[1] - p[1]) * fx) / (ex * fy - ey * fx);
      if (!(t > 0 && t < 1)) return null;
      out.push({ i, j, point: [p[0] + t * ex, p[1] + t * ey] });
      if (stopAfterOne) return out;
    }
  }
  return out;
}

/** Cuts an open ring at its crossings, one at a time; counts the cuts. Null when in doubt. */
function cutIntoLoops(a: Position[], loops: Position[][], depth: number): number | null {
  if (a.length < 3 || depth > 64) return null;
  const found = selfCrossings(a, true);
  if (!found) return null;
  if (found.length === 0) {
    loops.push(a);
    return 0;
  }
  const { i, j, point } = found[0];
  // One loop runs from the crossing through vertices i+1..j, the other through j+1..i.
  const first = [point, ...a.slice(i + 1, j + 1)];
  const second = [point, ...a.slice(j + 1), ...a.slice(0, i + 1)];
  const cutsFirst = cutIntoLoops(first, loops, depth + 1);
  if (cutsFirst === null) return null;
  const cutsSecond = cutIntoLoops(second, loops, depth + 1);
  return cutsSecond === null ? null : 1 + cutsFirst + cutsSecond;
}

/**
 * The loops of a ring that crosses itself, as parts with outer rings counter-clockwise,
 * when they lie side by side; null for a simple ring and for every case left to the
 * general repair.
 */
export function splitIntoLoops(ring: Ring): MultiPolygonRings | null {
  const a: Position[] = ring.slice(0, ring.length - 1);
  if (a.length < 4) return null;
  const all = selfCrossings(a, false);
  if (!all || all.length === 0) return null;
  const loops: Position[][] = [];
  // Each cut uses up one crossing of the whole ring; fewer cuts than crossings means two
  // loops cross each other.
  if (cutIntoLoops(a, loops, 0) !== all.length) return null;
  const crossingPoints = new Set(all.map((c) => `${c.point[0]} ${c.point[1]}`));
  for (const loop of loops) {
    const own = loop.find((p) => !crossingPoints.has(`${p[0]} ${p[1]}`));
    if (!own) return null;
    for (const other of loops) {
      if (other !== loop && inside(own, other) !== false) return null;
    }
  }
  return loops.map((loop) => [ccw([...loop, loop[0]])]);
}

const ccw = (ring: Ring): Ring => (ringSignedArea(ring) < 0 ? ring.reverse() : ring);
