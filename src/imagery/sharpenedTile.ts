import type { SharpenMethod } from '../core/render/pansharpen.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import type { Raster } from './Raster.ts';
import { uniqueBuffers, type PixelBox, type TileImage } from './renderJobs.ts';

// A pan-sharpened tile at pan resolution: one pan tile, plus the window of the
// multispectral bands covering the same ground (a quarter of its size when pixels are
// four times larger), upsampled and fused in the worker. The multispectral level is the
// coarsest one still at least as fine as the pan level, so nothing finer is read.

export interface SharpenSpec {
  method: SharpenMethod;
  /** Displayed multispectral bands (0-based), red, green, blue. */
  bands: number[];
  limits: StretchLimits[];
  /** Pan-to-intensity gain (see panGain). */
  gain: number;
}

/** Where the multispectral window of a pan tile lies: its level, box, corner and step. */
export function multispectralWindow(pan: Raster, ms: Raster, level: number, bx: number, by: number) {
  const panRes = pan.resolution(level);
  const msLevel = ms.levelFor(panRes);
  const msRes = ms.resolution(msLevel);
  const box = pan.tileBox(level, bx, by);
  const step = panRes / msRes;
  // The pan tile's top-left corner on the ground, then in multispectral pixels.
  const groundX = pan.summary.origin[0] + box.x0 * panRes;
  const groundY = pan.summary.origin[1] - box.y0 * (pan.summary.pixelSize[1] * pan.summary.height / pan.summary.levels[level].height);
  const x0 = (groundX - ms.summary.origin[0]) / msRes;
  const y0 = (ms.summary.origin[1] - groundY) / (ms.summary.pixelSize[1] * ms.summary.height / ms.summary.levels[msLevel].height);
  const msBox: PixelBox = {
    x0: Math.floor(x0),
    y0: Math.floor(y0),
    x1: Math.ceil(x0 + (box.x1 - box.x0) * step),
    y1: Math.ceil(y0 + (box.y1 - box.y0) * step),
  };
  return { msLevel, msBox, x0, y0, step };
}

/** Renders one pan-sharpened tile of the pan raster's view grid. */
export async function renderSharpenedTile(pan: Raster, ms: Raster, level: number, bx: number, by: number, spec: SharpenSpec, signal?: AbortSignal): Promise<TileImage> {
  try {
    return await sharpenedTile(pan, ms, level, bx, by, spec, signal);
  } catch (error) {
    if ((error as Error).name !== 'AbortError') pan.reportProblem(`sharpened ${level}/${bx}/${by}`, error as Error);
    throw error;
  }
}

async function sharpenedTile(pan: Raster, ms: Raster, level: number, bx: number, by: number, spec: SharpenSpec, signal?: AbortSignal): Promise<TileImage> {
  const frame = pan.tileFrame(level, bx, by);
  const { msLevel, msBox, x0, y0, step } = multispectralWindow(pan, ms, level, bx, by);
  const [panTiles, ...bandTiles] = await Promise.all([
    pan.blocksCovering(level, 0, frame.box, signal),
    ...spec.bands.map((band) => ms.blocksCovering(msLevel, band, msBox, signal)),
  ]);
  return (await pan.pool.run({
    payload: {
      kind: 'sharpen', ...frame, method: spec.method, pan: panTiles, bands: bandTiles, msBox, x0, y0, step,
      limits: spec.limits, gain: spec.gain, msNoData: ms.summary.nodata,
    },
    transfer: uniqueBuffers([panTiles, ...bandTiles]),
    signal,
  })) as TileImage;
}
