import { decodeTile, decodeTileAsync } from '../core/tiff/decodeTile.ts';
import type { SampleArray } from '../core/tiff/tags.ts';
import { compositeRgba } from '../core/render/composite.ts';
import { normalisedDifference } from '../core/render/indices.ts';
import { colourise, rampTable, vegetationRamp } from '../core/render/colourRamp.ts';
import { thresholdMask } from '../core/render/thresholdMask.ts';
import { sharpen, upsampleNearest } from '../core/render/pansharpen.ts';
import { bandSample } from '../core/render/bandSample.ts';
import type { EncodedTile, PixelBox, PlacedTile, RenderRequest, SampleReply } from './renderJobs.ts';

// What the render worker does with each job, as plain functions over bytes (no DOM), so
// the same code runs in the worker, in tests and in benchmarks.

const ramp = rampTable(vegetationRamp);

/**
 * Decodes every block of a job ahead of its band math, with the runtime's own inflater
 * where it has one (decodeTileAsync); the job's functions below then find the values on
 * each block. Blocks shared by several bands of an interleaved file decode once.
 */
export async function decodeBlocks(request: RenderRequest): Promise<void> {
  const tiles: EncodedTile[] = [];
  if ('tiles' in request) tiles.push(...request.tiles);
  if ('pan' in request) tiles.push(...request.pan);
  if ('bands' in request) for (const band of request.bands) tiles.push(...band);
  const decoded = new Map<ArrayBuffer, Promise<SampleArray>>();
  await Promise.all(tiles.map(async (tile) => {
    if (tile.bytes.byteLength === 0 || tile.values) return;
    let values = decoded.get(tile.bytes);
    if (!values) {
      values = decodeTileAsync(new Uint8Array(tile.bytes), tile.layout);
      decoded.set(tile.bytes, values);
    }
    tile.values = await values;
  }));
}

/** One band of a block as its own array: decoded, and taken out of interleaved samples. */
export function decodeBand(tile: EncodedTile): SampleArray {
  const { width, height, samples } = tile.layout;
  if (tile.bytes.byteLength === 0) return new Uint16Array(width * height);
  const data = tile.values ?? decodeTile(new Uint8Array(tile.bytes), tile.layout);
  if (samples === 1) return data;
  const band = new (data.constructor as new (n: number) => SampleArray)(width * height);
  for (let i = 0, j = tile.sample; i < band.length; i++, j += samples) band[i] = data[j];
  return band;
}

/** The values of a window of a level, gathered from the blocks that cover it; NaN where none does. */
export function assembleWindow(tiles: PlacedTile[], box: PixelBox): Float32Array {
  const width = box.x1 - box.x0;
  const height = box.y1 - box.y0;
  const out = new Float32Array(width * height).fill(NaN);
  for (const tile of tiles) {
    const data = decodeBand(tile);
    const tw = tile.layout.width;
    const cx0 = Math.max(box.x0, tile.x), cx1 = Math.min(box.x1, tile.x + tw, tile.levelWidth);
    const cy0 = Math.max(box.y0, tile.y), cy1 = Math.min(box.y1, tile.y + tile.layout.height, tile.levelHeight);
    for (let y = cy0; y < cy1; y++) {
      const from = (y - tile.y) * tw - tile.x;
      const to = (y - box.y0) * width - box.x0;
      for (let x = cx0; x < cx1; x++) out[to + x] = data[from + x];
    }
  }
  return out;
}

/**
 * A band over a box: when one block is exactly the box (a tiled file's own tile), its
 * decoded array as it is (integer data keeps its lookup-table stretch); else assembled.
 */
export function bandOver(tiles: PlacedTile[], box: PixelBox): SampleArray | Float32Array {
  const only = tiles.length === 1 ? tiles[0] : null;
  if (only && only.x === box.x0 && only.y === box.y0 && only.layout.width === box.x1 - box.x0 && only.layout.height === box.y1 - box.y0) {
    return decodeBand(only);
  }
  return assembleWindow(tiles, box);
}

/** The finished RGBA bytes of a tile job. */
export function composeTile(request: Extract<RenderRequest, { kind: 'bands' | 'index' | 'sharpen' }>): { rgba: Uint8ClampedArray<ArrayBuffer>; width: number; height: number } {
  const width = request.box.x1 - request.box.x0;
  const height = request.box.y1 - request.box.y0;
  let rgba: Uint8ClampedArray<ArrayBuffer>;
  if (request.kind === 'bands') {
    rgba = compositeRgba(request.bands.map((tiles) => bandOver(tiles, request.box)), request.limits, width * height, request.noData);
  } else if (request.kind === 'index') {
    const [a, b] = request.bands.map((tiles) => bandOver(tiles, request.box));
    const index = normalisedDifference(a, b, request.noData);
    const mask = request.threshold === null ? null : thresholdMask(index, request.threshold);
    rgba = colourise(index, ramp, request.low, request.high, mask);
  } else {
    const pan = bandOver(request.pan, request.box);
    const { msBox } = request;
    const bw = msBox.x1 - msBox.x0, bh = msBox.y1 - msBox.y0;
    const bands = request.bands.map((tiles) => {
      const window = assembleWindow(tiles, msBox);
      return upsampleNearest(window, bw, bh, width, height, request.x0 - msBox.x0, request.y0 - msBox.y0, request.step);
    });
    const sharpened = sharpen(request.method, { pan, bands, gain: request.gain, noData: request.noData });
    rgba = compositeRgba(sharpened, request.limits, width * height, null);
    // No multispectral pixel (outside its footprint, or its no-data) means no colour.
    const msNoData = request.msNoData;
    for (let i = 0; i < width * height; i++) {
      const v = bands[0][i];
      if (Number.isNaN(v) || Number.isNaN(sharpened[0][i]) || v === msNoData) rgba[i * 4 + 3] = 0;
    }
  }
  if (request.validWidth < width || request.validHeight < height) {
    for (let y = 0; y < height; y++) {
      for (let x = y < request.validHeight ? request.validWidth : 0; x < width; x++) rgba[(y * width + x) * 4 + 3] = 0;
    }
  }
  return { rgba, width, height };
}

/** A band's sorted sample over a window, for its stretch and histogram. */
export function sampleWindow(request: Extract<RenderRequest, { kind: 'sample' }>): SampleReply {
  const values = assembleWindow(request.tiles, request.box);
  return bandSample(values, request.noData, request.maxCount);
}

/** Every band's values over a window (the inspector's pixel, a patch's spectrum). */
export function readWindow(request: Extract<RenderRequest, { kind: 'window' }>): Float32Array[] {
  return request.bands.map((tiles) => assembleWindow(tiles, request.box));
}

const arrayTypes = {
  uint8: Uint8Array, int8: Int8Array, uint16: Uint16Array, int16: Int16Array,
  uint32: Uint32Array, int32: Int32Array, float32: Float32Array, float64: Float64Array,
} as const;

/** A pyramid row: one band over the box, cut into square tiles of the band's type, left to right. */
export function cutTiles(request: Extract<RenderRequest, { kind: 'cut' }>): ArrayBuffer[] {
  const { box, tileSize: T, fill } = request;
  const rows = assembleWindow(request.tiles, box);
  const width = box.x1 - box.x0;
  const Type = arrayTypes[request.dtype];
  const out: ArrayBuffer[] = [];
  for (let x0 = 0; x0 < width; x0 += T) {
    const tile = new Type(T * T);
    for (let y = 0; y < T; y++) {
      for (let x = 0; x < T; x++) {
        const v = rows[y * width + x0 + x];
        tile[y * T + x] = Number.isNaN(v) ? fill : v;
      }
    }
    out.push(tile.buffer as ArrayBuffer);
  }
  return out;
}

/** A coarser pyramid tile: each pixel the mean of the valid 2 x 2 below it (rounded for integers). */
export function reduceTile(request: Extract<RenderRequest, { kind: 'reduce' }>): ArrayBuffer {
  const { tileSize: T, noData, fill } = request;
  const Type = arrayTypes[request.dtype];
  const children = request.children.map((b) => (b ? new Type(b) : null));
  const integer = !request.dtype.startsWith('float');
  const tile = new Type(T * T);
  const half = T / 2;
  for (let y = 0; y < T; y++) {
    for (let x = 0; x < T; x++) {
      const child = children[(y >= half ? 2 : 0) + (x >= half ? 1 : 0)];
      let sum = 0, n = 0;
      if (child) {
        const sx = (x % half) * 2, sy = (y % half) * 2;
        for (let k = 0; k < 4; k++) {
          const v = child[(sy + (k >> 1)) * T + sx + (k & 1)];
          if (v !== noData && Number.isFinite(v)) {
            sum += v;
            n++;
          }
        }
      }
      tile[y * T + x] = n ? (integer ? Math.round(sum / n) : sum / n) : fill;
    }
  }
  return tile.buffer as ArrayBuffer;
}
