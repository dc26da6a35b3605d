import { intersectionArea } from '../geometry/overlay.ts';
import type { MultiPolygonRings, Position } from '../geometry/types.ts';

// The shared area of two outlines, fast in general position. By Green's theorem the
// area of A ∩ B is the shoelace sum over its boundary, and that boundary is made of
// the stretches of A's edges inside B and of B's edges inside A (Weiler & Atherton
// 1977 trace the same pieces to build the polygon; we only need its area). Each edge
// is cut where it crosses the other outline's edges, and its pieces alternate in/out.
// When a vertex of one outline lies on (or very near) the other's boundary, the
// pieces are ambiguous: then the polygon-clipping library in geometry/overlay.ts
// does the work instead. Matching thousands of patches needs this: the library takes
// about a millisecond per pair, this takes some microseconds.

interface Edge {
  ax: number;
  ay: number;
  bx: number;
  by: number;
}

/** All edges of an outline, outer rings counter-clockwise and holes clockwise, shifted by (ox, oy). */
function orientedEdges(shape: MultiPolygonRings, ox: number, oy: number): Edge[] {
  const edges: Edge[] = [];
  for (const part of shape) {
    part.forEach((ring, r) => {
      const n = ring.length - 1; // closed: the last position repeats the first
      if (n < 3) return;
      let twiceArea = 0;
      for (let i = 0; i < n; i++) twiceArea += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
      const forward = r === 0 ? twiceArea > 0 : twiceArea < 0;
      for (let i = 0; i < n; i++) {
        const p: Position = forward ? ring[i] : ring[n - i];
        const q: Position = forward ? ring[i + 1] : ring[n - i - 1];
        edges.push({ ax: p[0] - ox, ay: p[1] - oy, bx: q[0] - ox, by: q[1] - oy });
      }
    });
  }
  return edges;
}

/** Even-odd point-in-outline over every ring (parts and holes alike). */
function inside(x: number, y: number, edges: Edge[]): boolean {
  let within = false;
  for (const e of edges) {
    if ((e.ay > y) !== (e.by > y) && x < e.ax + ((y - e.ay) * (e.bx - e.ax)) / (e.by - e.ay)) within = !within;
  }
  return within;
}

/**
 * Adds the shoelace terms of the pieces of `edges` that lie inside `other`; returns
 * NaN when a vertex sits on the other boundary (the degenerate case).
 */
function insidePieces(edges: Edge[], other: Edge[], tolerance: number): number {
  let sum = 0;
  const cuts: number[] = [];
  for (const e of edges) {
    const dx = e.bx - e.ax;
    const dy = e.by - e.ay;
    cuts.length = 0;
    for (const f of other) {
      const fx = f.bx - f.ax;
      const fy = f.by - f.ay;
      // Signed areas: e's ends against f's line, and f's ends against e's line.
      const d1 = fx * (e.ay - f.ay) - fy * (e.ax - f.ax);
      const d2 = fx * (e.by - f.ay) - fy * (e.bx - f.ax);
      const d3 = dx * (f.ay - e.ay) - dy * (f.ax - e.ax);
      const d4 = dx * (f.by - e.ay) - dy * (f.bx - e.ax);
      const boxesMeet =
        Math.min(e.ax, e.bx) <= Math.max(f.ax, f.bx) + tolerance && Math.min(f.ax, f.bx) <= Math.max(e.ax, e.bx) + tolerance &&
        Math.min(e.ay, e.by) <= Math.max(f.ay, f.by) + tolerance && Math.min(f.ay, f.by) <= Math.max(e.ay, e.by) + tolerance;
      if (!boxesMeet) continue;
      const eLength = Math.hypot(dx, dy);
      const fLength = Math.hypot(fx, fy);
      // A vertex within `tolerance` of the other segment's line while the boxes meet:
      // touching, collinear or nearly so. Leave it to the clipping library.
      if (Math.abs(d1) <= tolerance * fLength || Math.abs(d2) <= tolerance * fLength ||
          Math.abs(d3) <= tolerance * eLength || Math.abs(d4) <= tolerance * eLength) return NaN;
      if ((d1 > 0) !== (d2 > 0) && (d3 > 0) !== (d4 > 0)) cuts.push(d1 / (d1 - d2));
    }
    cuts.sort((a, b) => a - b);
    let within = inside(e.ax, e.ay, other);
    let t0 = 0;
    cuts.push(1);
    for (const t1 of cuts) {
      if (within) {
        const sx = e.ax + t0 * dx;
        const sy = e.ay + t0 * dy;
        const ex = e.ax + t1 * dx;
        const ey = e.ay + t1 * dy;
        sum += sx * ey - ex * sy;
      }
      within = !within;
      t0 = t1;
    }
  }
  return sum;
}

/**
 * Area shared by two outlines (squared units of their coordinates). Works on simple
 * polygons with holes and several parts; exact up to rounding in general position,
 * and handed to the clipping library when edges touch or overlap.
 */
export function sharedArea(a: MultiPolygonRings, b: MultiPolygonRings): number {
  // Work near the origin: projected coordinates in the millions would cost the
  // shoelace products most of their precision.
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const shape of [a, b]) {
    for (const part of shape) for (const ring of part) for (const [x, y] of ring) {
      if (x < minX) minX = x;
      if (y < minY) minY = y;
      if (x > maxX) maxX = x;
      if (y > maxY) maxY = y;
    }
  }
  if (!(maxX >= minX && maxY >= minY)) return 0;
  const tolerance = 1e-9 * Math.max(maxX - minX, maxY - minY, 1e-300);
  const ea = orientedEdges(a, minX, minY);
  const eb = orientedEdges(b, minX, minY);
  const twice = insidePieces(ea, eb, tolerance) + insidePieces(eb, ea, tolerance);
  if (Number.isNaN(twice)) return intersectionArea(a, b);
  return Math.max(0, twice / 2);
}
