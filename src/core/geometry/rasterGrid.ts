import type { Extent } from './types.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';

/**
 * A north-up raster grid in a projected CRS, as a GeoTIFF header gives it:
 * the outer corner of pixel (0, 0) at (originX, originY), columns growing east by
 * pixelWidth and rows growing south by pixelHeight (both positive, metres).
 */
export interface RasterGrid {
  originX: number;
  originY: number;
  pixelWidth: number;
  pixelHeight: number;
  width: number;
  height: number;
  epsg?: number;
}

export function gridExtent(grid: RasterGrid): Extent {
  return [
    grid.originX,
    grid.originY - grid.height * grid.pixelHeight,
    grid.originX + grid.width * grid.pixelWidth,
    grid.originY,
  ];
}

export function pixelArea(grid: RasterGrid): number {
  return grid.pixelWidth * grid.pixelHeight;
}

/** Why a grid cannot be used, or null when it can. */
export function gridProblem(grid: RasterGrid): string | null {
  const values = [grid.originX, grid.originY, grid.pixelWidth, grid.pixelHeight, grid.width, grid.height];
  if (!values.every(Number.isFinite)) return 'the raster grid has a value that is not a finite number';
  if (grid.pixelWidth <= 0 || grid.pixelHeight <= 0) return 'the raster grid has a pixel size that is not positive';
  if (grid.width < 1 || grid.height < 1) return 'the raster grid has no pixels';
  return null;
}

/** The grid a GeoTIFF header describes (its full-resolution level). */
export function gridOfSummary(summary: Pick<TiffSummary, 'origin' | 'pixelSize' | 'width' | 'height' | 'epsg'>): RasterGrid {
  return {
    originX: summary.origin[0],
    originY: summary.origin[1],
    pixelWidth: summary.pixelSize[0],
    pixelHeight: summary.pixelSize[1],
    width: summary.width,
    height: summary.height,
    ...(summary.epsg !== null ? { epsg: summary.epsg } : {}),
  };
}
