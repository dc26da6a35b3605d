import { patchSpectrum, pixelsInside, type BandSpectrum } from '../core/render/spectrum.ts';
import type { PolygonRings } from '../core/geometry/types.ts';
import type { Raster } from './Raster.ts';

export interface PatchSpectrum {
  pixels: number;
  bands: BandSpectrum[];
}

/**
 * The spectrum of a polygon (in the raster's CRS) over a multispectral raster: reads only
 * the full-resolution window under the polygon's bounds, every band, in the render pool.
 */
export async function readPatchSpectrum(raster: Raster, rings: PolygonRings, signal?: AbortSignal): Promise<PatchSpectrum> {
  const { origin, pixelSize, width, height, bands, nodata } = raster.summary;
  const xs = rings[0].map((p) => p[0]), ys = rings[0].map((p) => p[1]);
  const box = {
    x0: Math.max(0, Math.floor((Math.min(...xs) - origin[0]) / pixelSize[0])),
    x1: Math.min(width, Math.ceil((Math.max(...xs) - origin[0]) / pixelSize[0])),
    y0: Math.max(0, Math.floor((origin[1] - Math.max(...ys)) / pixelSize[1])),
    y1: Math.min(height, Math.ceil((origin[1] - Math.min(...ys)) / pixelSize[1])),
  };
  if (box.x1 <= box.x0 || box.y1 <= box.y0) return { pixels: 0, bands: [] };
  const window = {
    originX: origin[0] + box.x0 * pixelSize[0], originY: origin[1] - box.y0 * pixelSize[1],
    pixelWidth: pixelSize[0], pixelHeight: pixelSize[1], width: box.x1 - box.x0, height: box.y1 - box.y0,
  };
  const inside = pixelsInside(window, rings);
  if (inside.length === 0) return { pixels: 0, bands: [] };
  const values = await raster.readWindow(0, box, Array.from({ length: bands }, (_, i) => i), signal);
  return patchSpectrum(values, inside, { noData: nodata, resamples: 1000, seed: 1 });
}
