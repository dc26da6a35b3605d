import { coverageWindow } from '../pixels/coverage.ts';
import { FULL_COVER_TOLERANCE } from '../pixels/rule.ts';
import type { RasterGrid } from './rasterGrid.ts';
import type { MultiPolygonRings } from './types.ts';

// Pure pixels: raster cells whose whole footprint lies inside an outline, so their
// spectrum is the patch's alone. One implementation serves the checks and the training
// sheets: the exact coverage of src/core/pixels under the "wholly inside" rule, no buffer
// (patchPixels with { kind: 'inside', buffer: 0 } keeps the same cells).

/**
 * Counts pure pixels of a valid outline on a grid. `stopAt` caps the count (the
 * undersized check only needs to know whether there are enough).
 */
export function countPurePixels(parts: MultiPolygonRings, grid: RasterGrid, stopAt = Infinity): number {
  const { fraction } = coverageWindow(parts, grid);
  let count = 0;
  for (let i = 0; i < fraction.length && count < stopAt; i++) if (fraction[i] >= 1 - FULL_COVER_TOLERANCE) count++;
  return count;
}
