import { patchPixels } from '../pixels/patchPixels.ts';
import type { RasterGrid } from './rasterGrid.ts';
import type { MultiPolygonRings } from './types.ts';

// Pure pixels: raster cells whose whole footprint lies inside an outline, so their
// spectrum is the patch's alone. One implementation serves the checks and the training
// sheets: the exact coverage of src/core/pixels under the "wholly inside" rule, no buffer.

/**
 * Counts pure pixels of a valid outline on a grid. `stopAt` caps the count (the
 * undersized check only needs to know whether there are enough).
 */
export function countPurePixels(parts: MultiPolygonRings, grid: RasterGrid, stopAt = Infinity): number {
  return Math.min(stopAt, patchPixels(parts, grid, { kind: 'inside', buffer: 0 }).rows.length);
}
