import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { Extent, MultiPolygonRings } from '../geometry/types.ts';

// A quick, certain test that a patch holds at least one pure pixel: the grid pixel under
// the middle of its box lies wholly inside when no edge comes near that pixel's
// footprint and the footprint's centre is inside. "No" only means "not shown this way":
// the exact coverage (src/core/pixels/coverage.ts) then counts. The converse, that a
// small patch's box holds no whole pixel at all, spares the count for many undersized ones.

/** Edges this close to a footprint (share of the pixel size) count as touching it. */
const MARGIN = 1e-6;

/**
 * Whether the pixel under the middle of the outline's box (`extent`) is certainly pure.
 * For a crown that is about where the middle of its outline is, and it takes no pass.
 */
export function middlePixelIsPure(shape: MultiPolygonRings, extent: Extent, grid: RasterGrid): boolean {
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  const col = Math.floor(((extent[0] + extent[2]) / 2 - ox) / pw);
  const row = Math.floor((oy - (extent[1] + extent[3]) / 2) / ph);
  if (!(col >= 0 && col < grid.width && row >= 0 && row < grid.height)) return false;
  const gap = MARGIN * Math.max(pw, ph);
  const x0 = ox + col * pw - gap, x1 = ox + (col + 1) * pw + gap;
  const y1 = oy - row * ph + gap, y0 = oy - (row + 1) * ph - gap;
  const cx = (x0 + x1) / 2, cy = (y0 + y1) / 2;
  let inside = false;
  for (const rings of shape) {
    for (const ring of rings) {
      if (ring.length === 0) continue;
      let ax = ring[0][0], ay = ring[0][1];
      for (let i = 1; i < ring.length; i++) {
        const bx = ring[i][0], by = ring[i][1];
        // An edge whose box meets the grown footprint, with corners on both sides of
        // its line (or on it), may cross the footprint: not certain.
        if (!((ax < x0 && bx < x0) || (ax > x1 && bx > x1) || (ay < y0 && by < y0) || (ay > y1 && by > y1))) {
          const dx = bx - ax, dy = by - ay;
          const s0 = dx * (y0 - ay) - dy * (x0 - ax);
          const s1 = dx * (y0 - ay) - dy * (x1 - ax);
          const s2 = dx * (y1 - ay) - dy * (x0 - ax);
          const s3 = dx * (y1 - ay) - dy * (x1 - ax);
          if (!((s0 > 0 && s1 > 0 && s2 > 0 && s3 > 0) || (s0 < 0 && s1 < 0 && s2 < 0 && s3 < 0))) return false;
        }
        // Even-odd crossing along the ray east of the footprint's centre.
        if ((ay > cy) !== (by > cy) && cx < ax + ((cy - ay) * (bx - ax)) / (by - ay)) inside = !inside;
        ax = bx;
        ay = by;
      }
    }
  }
  return inside;
}

/** Pixels that jut out of a patch's box by more than this share of their size are certainly not pure. */
const JUT = 1e-3;

/**
 * A quick, certain test that a patch holds no pure pixel: no pixel of the grid fits
 * within its box. A pure pixel lies within the outline, so within its box; one that
 * juts out by more than a thousandth of its size misses at least that share of its
 * area, far more than the full-cover tolerance of the exact count (1e-9), which would
 * find none either. "No" means "not shown this way".
 */
export function noPixelFitsInBox(extent: Extent, grid: RasterGrid): boolean {
  const { originX: ox, originY: oy, pixelWidth: pw, pixelHeight: ph } = grid;
  // Whole columns and rows within the box grown by the allowance (col1, row1 exclusive).
  const col0 = Math.ceil((extent[0] - JUT * pw - ox) / pw), col1 = Math.floor((extent[2] + JUT * pw - ox) / pw);
  const row0 = Math.ceil((oy - extent[3] - JUT * ph) / ph), row1 = Math.floor((oy - extent[1] + JUT * ph) / ph);
  return col1 <= col0 || row1 <= row0;
}
