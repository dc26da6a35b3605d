import type { Raster } from './Raster.ts';

// What the pixel inspector shows at one map coordinate: for each raster of the scene,
// the pixel under it (full resolution) and every band's raw value.

export interface RasterPixel {
  file: string;
  role: 'pan' | 'ms';
  col: number;
  row: number;
  /** False when the coordinate lies outside this raster. */
  inside: boolean;
  /** Raw values, one per band (empty when outside). */
  values: number[];
}

/** Column and row of the full-resolution pixel holding map coordinate (x, y). */
export function pixelAt(raster: Raster, x: number, y: number): { col: number; row: number; inside: boolean } {
  const { origin, pixelSize, width, height } = raster.summary;
  const col = Math.floor((x - origin[0]) / pixelSize[0]);
  const row = Math.floor((origin[1] - y) / pixelSize[1]);
  return { col, row, inside: col >= 0 && row >= 0 && col < width && row < height };
}

/** Reads the pixel under (x, y) in each raster given. */
export async function readPixels(rasters: { raster: Raster; role: 'pan' | 'ms' }[], x: number, y: number, signal?: AbortSignal): Promise<RasterPixel[]> {
  return Promise.all(rasters.map(async ({ raster, role }) => {
    const { col, row, inside } = pixelAt(raster, x, y);
    const values = inside ? await raster.pixelValues(col, row, signal) : [];
    return { file: raster.file.name, role, col, row, inside, values };
  }));
}
