import type { MultiPolygonRings, Position } from '../geometry/types.ts';

// The shortest distance between two patch outlines: 0 when they touch, cross or one
// holds the other; otherwise the nearest pair of edges (polygons that do not meet are
// nearest along their boundaries).

function segmentDistance(a: Position, b: Position, c: Position, d: Position): number {
  if (segmentsCross(a, b, c, d)) return 0;
  return Math.min(pointSegment(a, c, d), pointSegment(b, c, d), pointSegment(c, a, b), pointSegment(d, a, b));
}

function pointSegment(p: Position, a: Position, b: Position): number {
  const dx = b[0] - a[0], dy = b[1] - a[1];
  const l2 = dx * dx + dy * dy;
  const t = l2 === 0 ? 0 : Math.max(0, Math.min(1, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / l2));
  return Math.hypot(a[0] + t * dx - p[0], a[1] + t * dy - p[1]);
}

const orient = (a: Position, b: Position, c: Position) => (b[0] - a[0]) * (c[1] - a[1]) - (b[1] - a[1]) * (c[0] - a[0]);

function segmentsCross(a: Position, b: Position, c: Position, d: Position): boolean {
  const o1 = orient(a, b, c), o2 = orient(a, b, d), o3 = orient(c, d, a), o4 = orient(c, d, b);
  return ((o1 > 0 && o2 < 0) || (o1 < 0 && o2 > 0)) && ((o3 > 0 && o4 < 0) || (o3 < 0 && o4 > 0));
}

/** Even-odd point in polygon over all rings of all parts. */
function pointInside(p: Position, parts: MultiPolygonRings): boolean {
  let inside = false;
  for (const rings of parts) {
    for (const ring of rings) {
      for (let i = 1; i < ring.length; i++) {
        const a = ring[i - 1], b = ring[i];
        if ((a[1] > p[1]) !== (b[1] > p[1]) && p[0] < a[0] + ((p[1] - a[1]) * (b[0] - a[0])) / (b[1] - a[1])) inside = !inside;
      }
    }
  }
  return inside;
}

export function outlineDistance(a: MultiPolygonRings, b: MultiPolygonRings): number {
  const first = a[0]?.[0]?.[0], second = b[0]?.[0]?.[0];
  if (!first || !second) return Infinity;
  if (pointInside(first, b) || pointInside(second, a)) return 0;
  let best = Infinity;
  for (const ra of a.flat()) {
    for (let i = 1; i < ra.length; i++) {
      for (const rb of b.flat()) {
        for (let j = 1; j < rb.length; j++) {
          const d = segmentDistance(ra[i - 1], ra[i], rb[j - 1], rb[j]);
          if (d < best) {
            best = d;
            if (best === 0) return 0;
          }
        }
      }
    }
  }
  return best;
}
