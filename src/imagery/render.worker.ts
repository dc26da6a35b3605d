/// <reference lib="webworker" />
// The render worker: decodes compressed tiles (with their size capped to what the file
// declares), stretches and composes them, and returns finished RGBA tiles as
// ImageBitmaps, so the UI thread only draws.
import { decodeTile, type TileLayout } from '../core/tiff/decodeTile.ts';
import type { SampleArray } from '../core/tiff/tags.ts';
import { compositeRgba } from '../core/render/composite.ts';
import { percentileLimits, type StretchLimits } from '../core/render/stretch.ts';
import type { WorkerReply } from './WorkerPool.ts';

export interface EncodedTile {
  /** Empty for a sparse block (byte count 0), which reads as zeros. */
  bytes: ArrayBuffer;
  layout: TileLayout;
  /** Which sample to take from a pixel-interleaved block (0 for band-separate files). */
  sample: number;
}

export type RenderRequest =
  | {
      kind: 'render';
      /** One encoded tile per displayed band (1 for grey, 3 for a composite). */
      tiles: EncodedTile[];
      limits: StretchLimits[];
      noData: number | null;
      /** The part of the tile that lies inside the image; the rest is made transparent. */
      validWidth: number;
      validHeight: number;
    }
  | {
      kind: 'stats';
      /** All tiles of one band at one level, with where each sits in the level. */
      tiles: (EncodedTile & { x: number; y: number })[];
      width: number;
      height: number;
      noData: number | null;
      low: number;
      high: number;
    };

export type RenderResult = ImageBitmap | { min: number; max: number };

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = async (event: MessageEvent<{ id: number; request: RenderRequest }>) => {
  const { id, request } = event.data;
  try {
    const result = request.kind === 'render' ? await render(request) : stats(request);
    const reply: WorkerReply = { id, ok: true, result };
    scope.postMessage(reply, result instanceof ImageBitmap ? [result] : []);
  } catch (error) {
    const reply: WorkerReply = { id, ok: false, error: (error as Error).message };
    scope.postMessage(reply);
  }
};

async function render(request: Extract<RenderRequest, { kind: 'render' }>): Promise<ImageBitmap> {
  const { width, height } = request.tiles[0].layout;
  const bands = request.tiles.map(decodeBand);
  const rgba = compositeRgba(bands, request.limits, width * height, request.noData);
  if (request.validWidth < width || request.validHeight < height) {
    for (let y = 0; y < height; y++) {
      for (let x = y < request.validHeight ? request.validWidth : 0; x < width; x++) rgba[(y * width + x) * 4 + 3] = 0;
    }
  }
  return createImageBitmap(new ImageData(rgba, width, height));
}

function stats(request: Extract<RenderRequest, { kind: 'stats' }>): { min: number; max: number } {
  // Gathers the valid pixels of one band at a small level, then takes percentiles.
  const values: number[] = [];
  for (const tile of request.tiles) {
    const data = decodeBand(tile);
    const { width: tw, height: th } = tile.layout;
    const rows = Math.min(th, request.height - tile.y);
    const cols = Math.min(tw, request.width - tile.x);
    for (let r = 0; r < rows; r++) for (let c = 0; c < cols; c++) values.push(data[r * tw + c]);
  }
  return percentileLimits(values, request.low, request.high, request.noData);
}

/** One band of a block as its own array: decoded, and taken out of interleaved samples. */
function decodeBand(tile: EncodedTile): SampleArray {
  const { width, height, samples } = tile.layout;
  if (tile.bytes.byteLength === 0) return new Uint16Array(width * height);
  const data = decodeTile(new Uint8Array(tile.bytes), tile.layout);
  if (samples === 1) return data;
  const band = new (data.constructor as new (n: number) => SampleArray)(width * height);
  for (let i = 0, j = tile.sample; i < band.length; i++, j += samples) band[i] = data[j];
  return band;
}
