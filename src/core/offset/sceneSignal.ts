import { bandTableFor } from '../bandTable.ts';
import type { Extent } from '../geometry/types.ts';
import { extentOfWindow, levelPixelSize, windowForExtent } from '../raster/pixelWindow.ts';
import { readWindowBands } from '../raster/readWindow.ts';
import type { ReadRange } from '../tiff/byteSource.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';
import { brightnessValues, maskShadows, ndviValues, type SignalGrid, type SignalKind } from './signalGrid.ts';

// The signal grid over the part of a scene the search needs: the polygons' extent
// grown by the search radius and the ring, read by window from the scene's files.

export interface SceneRaster {
  read: ReadRange;
  summary: TiffSummary;
}

/** A scene problem a user can fix; the message names the file. */
export class SceneSignalError extends Error {
  constructor(readonly fileName: string, problem: string) {
    super(`${fileName}: ${problem}`);
    this.name = 'SceneSignalError';
  }
}

/** 0-based red and NIR bands by name, else by centre wavelength (red 620-700 nm, NIR 760-900 nm). */
export function redAndNir(summary: TiffSummary): { red: number; nir: number } {
  const table = bandTableFor(summary.bands, summary.bandNames, summary.bandWavelengthsNm);
  const find = (name: RegExp, lo: number, hi: number) => {
    const byName = table.find((b) => name.test(b.name));
    const byWave = table.find((b) => b.centre_nm !== null && b.centre_nm >= lo && b.centre_nm <= hi);
    return (byName ?? byWave)?.index;
  };
  const red = find(/^red$/i, 620, 700);
  const nir = find(/^(nir|near[- ]?infrared)\s*1?$/i, 760, 900);
  if (red === undefined || nir === undefined) {
    throw new SceneSignalError(summary.fileName, `has no band named or centred as ${red === undefined ? 'red' : 'near-infrared'}, which NDVI needs (use the panchromatic signal)`);
  }
  return { red: red - 1, nir: nir - 1 };
}

/** NIR below this share of the median marks a cast shadow (see maskShadows). */
export const DEFAULT_SHADOW_SHARE = 0.5;

/** Reads the signal over `extent` (scene CRS), clipped to the raster; throws when they do not meet. */
export async function sceneSignal(
  raster: SceneRaster, kind: SignalKind, extent: Extent, options: { shadowShare?: number; signal?: AbortSignal } = {},
): Promise<SignalGrid> {
  const { signal } = options;
  const { summary, read } = raster;
  const window = windowForExtent(summary, extent, 0);
  if (!window) throw new SceneSignalError(summary.fileName, 'the polygons lie outside the scene');
  const bands = kind === 'ndvi' ? (({ red, nir }) => [red, nir])(redAndNir(summary)) : [0];
  const arrays = await readWindowBands(read, summary, { ...window, bands }, { signal });
  const values = kind === 'ndvi' ? ndviValues(arrays[0], arrays[1], summary.nodata) : brightnessValues(arrays[0], summary.nodata);
  if (kind === 'ndvi') maskShadows(values, arrays[1], options.shadowShare ?? DEFAULT_SHADOW_SHARE);
  const [minX, , , maxY] = extentOfWindow(summary, window);
  const [pixelX, pixelY] = levelPixelSize(summary, 0);
  return { values, width: window.width, height: window.height, originX: minX, originY: maxY, pixelX, pixelY };
}
