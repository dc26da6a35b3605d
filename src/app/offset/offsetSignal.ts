import type { Extent } from '../../core/geometry/types.ts';
import { maskShadows, ndviValues, redAndNir, DEFAULT_SHADOW_SHARE, brightnessValues, type SignalGrid, type SignalKind } from '../../core/offset/index.ts';
import { extentOfWindow, levelPixelSize, windowForExtent } from '../../core/raster/pixelWindow.ts';
import type { Raster } from '../../imagery/Raster.ts';

// The signal the shift search scores, read from an open raster of the desk: the same
// grid the command line builds from files (src/core/offset/sceneSignal.ts), but its
// blocks are fetched through the platform bridge and decoded in the render pool.

/** More full-resolution pixels than this per band is refused: choose fewer polygons (a smaller area). */
export const MAX_SIGNAL_PIXELS = 16_777_216;

export class OffsetInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'OffsetInputError';
  }
}

/** Reads NDVI (multispectral raster) or brightness (panchromatic) over `extent`, clipped to the raster. */
export async function readSignal(raster: Raster, kind: SignalKind, extent: Extent, signal?: AbortSignal): Promise<SignalGrid> {
  const { summary } = raster;
  const window = windowForExtent(summary, extent, 0);
  if (!window) throw new OffsetInputError(`${summary.fileName}: the polygons lie outside the scene`);
  if (window.width * window.height > MAX_SIGNAL_PIXELS) {
    throw new OffsetInputError(
      `${summary.fileName}: the polygons span ${window.width} x ${window.height} pixels, more than one estimate reads; choose the patches of a smaller area`,
    );
  }
  let bands = [0];
  if (kind === 'ndvi') {
    try {
      const { red, nir } = redAndNir(summary);
      bands = [red, nir];
    } catch (error) {
      throw new OffsetInputError((error as Error).message);
    }
  }
  const box = { x0: window.x, y0: window.y, x1: window.x + window.width, y1: window.y + window.height };
  const arrays = await raster.readWindow(0, box, bands, signal);
  const values = kind === 'ndvi' ? ndviValues(arrays[0], arrays[1], summary.nodata) : brightnessValues(arrays[0], summary.nodata);
  if (kind === 'ndvi') maskShadows(values, arrays[1], DEFAULT_SHADOW_SHARE);
  const [minX, , , maxY] = extentOfWindow(summary, window);
  const [pixelX, pixelY] = levelPixelSize(summary, 0);
  return { values, width: window.width, height: window.height, originX: minX, originY: maxY, pixelX, pixelY };
}
