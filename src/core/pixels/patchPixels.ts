import polylabel from 'polylabel';
import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { MultiPolygonRings, Position } from '../geometry/types.ts';
import { coverageWindow, type CoverageWindow } from './coverage.ts';
import { FULL_COVER_TOLERANCE, type PixelRule } from './rule.ts';

// The pure pixels of one patch under a rule, as grid rows and columns with the
// covered share of each.

export interface PatchPixels {
  /** Grid rows and columns of the chosen pixels, row-major order. */
  rows: Int32Array;
  cols: Int32Array;
  /** Covered share of each chosen pixel's footprint. */
  fractions: Float64Array;
  /** The coverage of every pixel under the patch's bounding box. */
  coverage: CoverageWindow;
}

/** The chosen pixels of a patch under a rule. */
export function patchPixels(parts: MultiPolygonRings, grid: RasterGrid, rule: PixelRule): PatchPixels {
  const coverage = coverageWindow(parts, grid);
  const { width, height, fraction } = coverage;
  const keep = new Uint8Array(width * height);
  if (rule.kind === 'inside') {
    for (let i = 0; i < keep.length; i++) keep[i] = fraction[i] >= 1 - FULL_COVER_TOLERANCE ? 1 : 0;
    if (rule.buffer > 0) dropNearEdges(parts, grid, coverage, rule.buffer, keep);
  } else if (rule.kind === 'cover') {
    const least = rule.minCover - FULL_COVER_TOLERANCE;
    for (let i = 0; i < keep.length; i++) keep[i] = fraction[i] > 0 && fraction[i] >= least ? 1 : 0;
  } else {
    markCentresInside(parts, grid, coverage, keep);
  }
  let count = 0;
  for (let i = 0; i < keep.length; i++) count += keep[i];
  const rows = new Int32Array(count);
  const cols = new Int32Array(count);
  const fractions = new Float64Array(count);
  let k = 0;
  for (let r = 0; r < height; r++) {
    for (let c = 0; c < width; c++) {
      const i = r * width + c;
      if (!keep[i]) continue;
      rows[k] = coverage.row0 + r;
      cols[k] = coverage.col0 + c;
      fractions[k] = fraction[i];
      k++;
    }
  }
  return { rows, cols, fractions, coverage };
}

/** Clears kept pixels whose footprint comes nearer than `buffer` to any edge. */
function dropNearEdges(parts: MultiPolygonRings, grid: RasterGrid, coverage: CoverageWindow, buffer: number, keep: Uint8Array): void {
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  const { row0, col0, width, height } = coverage;
  const buffer2 = buffer * buffer;
  for (const rings of parts) {
    for (const ring of rings) {
      for (let i = 1; i < ring.length; i++) {
        const p = ring[i - 1], q = ring[i];
        const cFrom = Math.max(0, Math.floor((Math.min(p[0], q[0]) - buffer - ox) / pw) - col0);
        const cTo = Math.min(width - 1, Math.floor((Math.max(p[0], q[0]) + buffer - ox) / pw) - col0);
        const rFrom = Math.max(0, Math.floor((oy - Math.max(p[1], q[1]) - buffer) / ph) - row0);
        const rTo = Math.min(height - 1, Math.floor((oy - Math.min(p[1], q[1]) + buffer) / ph) - row0);
        for (let r = rFrom; r <= rTo; r++) {
          for (let c = cFrom; c <= cTo; c++) {
            const at = r * width + c;
            if (!keep[at]) continue;
            const x0 = ox + (col0 + c) * pw;
            const y1 = oy - (row0 + r) * ph;
            if (segmentToBoxDistance2(p[0], p[1], q[0], q[1], x0, y1 - ph, x0 + pw, y1) < buffer2) keep[at] = 0;
          }
        }
      }
    }
  }
}

/**
 * Distance from a segment to an axis-aligned box it does not cross: the nearer of its
 * ends to the box and of the box's corners to it (two convex sets that do not overlap
 * are nearest at a vertex of one of them).
 */
export function segmentToBoxDistance(p: Position, q: Position, x0: number, y0: number, x1: number, y1: number): number {
  return Math.sqrt(segmentToBoxDistance2(p[0], p[1], q[0], q[1], x0, y0, x1, y1));
}

function pointToBox2(x: number, y: number, x0: number, y0: number, x1: number, y1: number): number {
  const dx = x < x0 ? x0 - x : x > x1 ? x - x1 : 0;
  const dy = y < y0 ? y0 - y : y > y1 ? y - y1 : 0;
  return dx * dx + dy * dy;
}

function pointToSegment2(cx: number, cy: number, px: number, py: number, dx: number, dy: number, length2: number): number {
  let t = length2 === 0 ? 0 : ((cx - px) * dx + (cy - py) * dy) / length2;
  t = t < 0 ? 0 : t > 1 ? 1 : t;
  const ex = px + t * dx - cx, ey = py + t * dy - cy;
  return ex * ex + ey * ey;
}

/** Squared distance, without allocations (the buffer test runs it per pixel and edge). */
function segmentToBoxDistance2(px: number, py: number, qx: number, qy: number, x0: number, y0: number, x1: number, y1: number): number {
  const dx = qx - px, dy = qy - py;
  const length2 = dx * dx + dy * dy;
  return Math.min(
    pointToBox2(px, py, x0, y0, x1, y1),
    pointToBox2(qx, qy, x0, y0, x1, y1),
    pointToSegment2(x0, y0, px, py, dx, dy, length2),
    pointToSegment2(x1, y0, px, py, dx, dy, length2),
    pointToSegment2(x1, y1, px, py, dx, dy, length2),
    pointToSegment2(x0, y1, px, py, dx, dy, length2),
  );
}

/** Marks pixels whose centre is inside (even-odd crossings along each row's centre line). */
function markCentresInside(parts: MultiPolygonRings, grid: RasterGrid, coverage: CoverageWindow, keep: Uint8Array): void {
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  const { row0, col0, width, height } = coverage;
  const crossings: number[] = [];
  for (let r = 0; r < height; r++) {
    const y = oy - (row0 + r + 0.5) * ph;
    crossings.length = 0;
    for (const rings of parts) {
      for (const ring of rings) {
        for (let i = 1; i < ring.length; i++) {
          const p = ring[i - 1], q = ring[i];
          // Half-open in y, so a vertex on the line counts once.
          if ((p[1] > y) !== (q[1] > y)) crossings.push(p[0] + ((y - p[1]) * (q[0] - p[0])) / (q[1] - p[1]));
        }
      }
    }
    crossings.sort((a, b) => a - b);
    let k = 0;
    for (let c = 0; c < width; c++) {
      const x = ox + (col0 + c + 0.5) * pw;
      while (k < crossings.length && crossings[k] < x) k++;
      if (k % 2 === 1) keep[r * width + c] = 1;
    }
  }
}

/**
 * Radius of the widest circle inside the outline (its pole of inaccessibility, by
 * polylabel 2.1.0, to within `precision` metres). A shrink by more than this leaves nothing.
 */
export function innerRadius(parts: MultiPolygonRings, precision = 0.01): number {
  let best = 0;
  for (const rings of parts) {
    if (rings.length === 0 || rings[0].length < 4) continue;
    best = Math.max(best, polylabel(rings as number[][][], precision).distance);
  }
  return best;
}
