import type { Extent } from '../geometry/types.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';
import type { PixelWindow } from './readWindow.ts';

// Between map coordinates (the raster's CRS) and pixels of one level. A level's pixel
// is the full image's pixel times the ratio of the sizes, per axis.

/** Pixel size (x, y, positive) of a level, in CRS units. */
export function levelPixelSize(summary: TiffSummary, level: number): [number, number] {
  const l = summary.levels[level];
  return [summary.pixelSize[0] * (summary.width / l.width), summary.pixelSize[1] * (summary.height / l.height)];
}

/**
 * The smallest window of whole pixels at `level` covering an extent, clipped to the
 * image; null when the extent misses the image.
 */
export function windowForExtent(summary: TiffSummary, extent: Extent, level = 0): PixelWindow | null {
  const l = summary.levels[level];
  const [px, py] = levelPixelSize(summary, level);
  const [ox, oy] = summary.origin;
  const x0 = Math.max(0, Math.floor((extent[0] - ox) / px));
  const x1 = Math.min(l.width, Math.ceil((extent[2] - ox) / px));
  const y0 = Math.max(0, Math.floor((oy - extent[3]) / py));
  const y1 = Math.min(l.height, Math.ceil((oy - extent[1]) / py));
  if (!(x1 > x0) || !(y1 > y0)) return null;
  return { level, x: x0, y: y0, width: x1 - x0, height: y1 - y0 };
}

/** The extent (CRS units) a window covers. */
export function extentOfWindow(summary: TiffSummary, window: PixelWindow): Extent {
  const [px, py] = levelPixelSize(summary, window.level);
  const [ox, oy] = summary.origin;
  return [ox + window.x * px, oy - (window.y + window.height) * py, ox + (window.x + window.width) * px, oy - window.y * py];
}
