import type { RasterGrid } from '../geometry/rasterGrid.ts';
import { ringSignedArea } from '../geometry/measure.ts';
import type { MultiPolygonRings, Ring } from '../geometry/types.ts';

// Exact coverage: the share of each pixel footprint that lies inside a polygon.
// Every edge is cut at the grid's row and column lines; each piece adds the signed
// area between itself and the right edge of its cell, and the whole height it spans to
// the cells further right (a prefix sum along the row carries it). The sum over a
// cell is the integral of the winding number over that cell, so for a valid polygon
// with its holes wound against its shell it is the covered area, exact up to rounding.
// This is the signed-area accumulation of anti-aliased scanline rasterizers (common
// practice; e.g. R. Levien's font-rs accumulation buffer, 2016, recalled from memory).

/** Fractions for the pixels under a patch's bounding box, clipped to the grid. */
export interface CoverageWindow {
  /** Grid row and column of the window's top-left pixel. */
  row0: number;
  col0: number;
  /** Window size in pixels (0 when the patch misses the grid). */
  width: number;
  height: number;
  /** Covered share of each pixel's area, row-major, 0..1. */
  fraction: Float64Array;
}

const EMPTY: CoverageWindow = { row0: 0, col0: 0, width: 0, height: 0, fraction: new Float64Array(0) };

/** The grid window under an outline's bounding box, or null when it misses the grid. */
export function windowOf(parts: MultiPolygonRings, grid: RasterGrid, margin = 0): { row0: number; col0: number; row1: number; col1: number } | null {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const rings of parts) {
    for (const ring of rings) {
      for (const p of ring) {
        if (p[0] < minX) minX = p[0];
        if (p[0] > maxX) maxX = p[0];
        if (p[1] < minY) minY = p[1];
        if (p[1] > maxY) maxY = p[1];
      }
    }
  }
  if (!(minX <= maxX && minY <= maxY)) return null;
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  const col0 = Math.max(0, Math.floor((minX - margin - ox) / pw));
  const col1 = Math.min(grid.width - 1, Math.ceil((maxX + margin - ox) / pw) - 1);
  const row0 = Math.max(0, Math.floor((oy - maxY - margin) / ph));
  const row1 = Math.min(grid.height - 1, Math.ceil((oy - minY + margin) / ph) - 1);
  if (col0 > col1 || row0 > row1) return null;
  return { row0, col0, row1, col1 };
}

/**
 * Coverage fraction of every pixel under the outline's bounding box. Parts are
 * outer ring then holes, in any winding; overlapping parts would count twice
 * (the label reader's valid patches do not overlap themselves).
 */
export function coverageWindow(parts: MultiPolygonRings, grid: RasterGrid): CoverageWindow {
  const box = windowOf(parts, grid);
  if (!box) return EMPTY;
  const width = box.col1 - box.col0 + 1;
  const height = box.row1 - box.row0 + 1;
  // One spare column on the right takes the cover that leaves the window.
  const stride = width + 1;
  const acc = new Float64Array(stride * height);
  for (const rings of parts) {
    rings.forEach((ring, i) => {
      const area = ringSignedArea(ring);
      if (area === 0 || !Number.isFinite(area)) return;
      // Shell counts +1 whatever its winding; holes count -1.
      const sign = (i === 0 ? 1 : -1) * (area > 0 ? 1 : -1);
      accumulateRing(ring, grid, box.col0, box.row0, width, height, stride, sign, acc);
    });
  }
  const fraction = new Float64Array(width * height);
  for (let r = 0; r < height; r++) {
    let cover = 0;
    for (let c = 0; c < width; c++) {
      cover += acc[r * stride + c];
      // Clamp rounding noise; a valid outline covers 0..1 of each pixel.
      fraction[r * width + c] = cover < 1e-12 ? 0 : cover > 1 - 1e-12 ? 1 : cover;
    }
  }
  return { row0: box.row0, col0: box.col0, width, height, fraction };
}

/**
 * Adds one ring's signed pieces into `acc`. Coordinates go to window pixel units:
 * u east from the window's left edge, v south from its top edge. An edge pointing
 * south (v rising) on the left of a region adds positive cover to its right.
 */
function accumulateRing(
  ring: Ring, grid: RasterGrid, col0: number, row0: number, width: number, height: number,
  stride: number, sign: number, acc: Float64Array,
): void {
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  // Counter-clockwise in x, y (y north) runs south along its left side in u, v.
  for (let i = 1; i < ring.length; i++) {
    const u0 = (ring[i - 1][0] - ox) / pw - col0;
    const v0 = (oy - ring[i - 1][1]) / ph - row0;
    const u1 = (ring[i][0] - ox) / pw - col0;
    const v1 = (oy - ring[i][1]) / ph - row0;
    if (v0 === v1) continue; // horizontal edges add no cover
    const down = v1 > v0;
    const dir = down ? sign : -sign;
    const va = down ? v0 : v1, vb = down ? v1 : v0;
    const ua = down ? u0 : u1, ub = down ? u1 : u0;
    const slope = (ub - ua) / (vb - va); // du per dv
    const kFrom = Math.max(0, Math.floor(va));
    const kTo = Math.min(height - 1, Math.ceil(vb) - 1);
    for (let k = kFrom; k <= kTo; k++) {
      const top = Math.max(va, k);
      const bottom = Math.min(vb, k + 1);
      if (bottom <= top) continue;
      const uTop = ua + (top - va) * slope;
      const uBottom = ua + (bottom - va) * slope;
      addRowPiece(uTop, top, uBottom, bottom, dir, acc, k * stride, width);
    }
  }
}

/** One edge piece inside row strip; walks the columns it crosses. */
function addRowPiece(
  uA: number, vA: number, uB: number, vB: number, dir: number, acc: Float64Array, rowStart: number, width: number,
): void {
  const dv = vB - vA;
  const uLo = Math.min(uA, uB), uHi = Math.max(uA, uB);
  // Entirely left of the window: full cover to every cell.
  if (uHi <= 0) {
    acc[rowStart] += dir * dv;
    return;
  }
  if (uLo >= width) return; // right of the window: the spare column swallows nothing we read
  const cStart = Math.floor(uLo);
  const cEnd = Math.ceil(uHi) - 1;
  if (cEnd <= cStart) {
    addCellPiece(Math.max(cStart, -1), (uA + uB) / 2, dir * dv, acc, rowStart, width);
    return;
  }
  // Split at each integer u; v is linear in u along the piece.
  const dvdu = dv / (uB - uA);
  for (let c = cStart; c <= cEnd; c++) {
    const left = Math.max(uLo, c), right = Math.min(uHi, c + 1);
    if (right <= left) continue;
    const pieceDv = Math.abs((right - left) * dvdu);
    addCellPiece(c, (left + right) / 2, dir * pieceDv, acc, rowStart, width);
  }
}

/** A piece within column c, mid-point u, signed height h: its cell gets the part to its right. */
function addCellPiece(c: number, uMid: number, h: number, acc: Float64Array, rowStart: number, width: number): void {
  if (c < 0) {
    acc[rowStart] += h;
    return;
  }
  if (c >= width) return;
  const inCell = c + 1 - uMid; // share of the cell to the right of the piece
  acc[rowStart + c] += h * inCell;
  acc[rowStart + c + 1] += h * (1 - inCell);
}
