import { blockIndex, blockLayout } from '../tiff/blocks.ts';
import type { ReadRange } from '../tiff/byteSource.ts';
import { decodeTileAsync } from '../tiff/decodeTile.ts';
import { TiffError } from '../tiff/errors.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';
import { bytesPerSample, typedArrayOver, type SampleArray } from '../tiff/tags.ts';

// Reads a rectangle of pixels of one or more bands at one resolution level, decoding
// only the tiles or strips that cover it, each once whatever the number of bands asked.
// Pure: the bytes come through a range reader (a file handle, a Blob, an IPC bridge).

/** A pixel rectangle of one level; x, y is its top-left pixel (column, row), 0-based. */
export interface PixelWindow {
  /** 0 is the full image, then the overviews from largest to smallest. */
  level: number;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface ReadWindowOptions {
  /** Most pixels (width x height) one call may read; default 64 million. */
  maxPixels?: number;
  /** Cancels the read between blocks. */
  signal?: AbortSignal;
}

export const DEFAULT_MAX_WINDOW_PIXELS = 64 * 1024 * 1024;

/** One band (0-based) of a window, row-major, in the file's sample type. */
export async function readWindow(
  read: ReadRange, summary: TiffSummary, window: PixelWindow & { band: number }, options: ReadWindowOptions = {},
): Promise<SampleArray> {
  const [values] = await readWindowBands(read, summary, { ...window, bands: [window.band] }, options);
  return values;
}

/**
 * Several bands (0-based) of a window, one row-major array per band in the order asked.
 * Sparse blocks (byte count 0) read as the no-data value, or 0 without one. Throws
 * RangeError for a window or band outside the image, TiffError for a window past the
 * pixel cap or a block that does not decode.
 */
export async function readWindowBands(
  read: ReadRange, summary: TiffSummary, window: PixelWindow & { bands: readonly number[] }, options: ReadWindowOptions = {},
): Promise<SampleArray[]> {
  const { level: levelIndex, x, y, width, height, bands } = window;
  const level = summary.levels[levelIndex];
  if (!level) throw new RangeError(`${summary.fileName}: no level ${levelIndex} (the file has ${summary.levels.length})`);
  const ints = [x, y, width, height];
  if (!ints.every(Number.isInteger) || width < 1 || height < 1 || x < 0 || y < 0 || x + width > level.width || y + height > level.height) {
    throw new RangeError(
      `${summary.fileName}: window ${width} x ${height} at (${x}, ${y}) is not inside level ${levelIndex} (${level.width} x ${level.height})`,
    );
  }
  for (const band of bands) {
    if (!Number.isInteger(band) || band < 0 || band >= summary.bands) {
      throw new RangeError(`${summary.fileName}: no band ${band + 1} (the file has ${summary.bands})`);
    }
  }
  const maxPixels = options.maxPixels ?? DEFAULT_MAX_WINDOW_PIXELS;
  if (width * height > maxPixels) {
    throw new TiffError('too-large', summary.fileName, `a window of ${width} x ${height} pixels is past the limit of ${maxPixels} pixels per read`);
  }
  if (!summary.decodable) {
    throw new TiffError('unsupported', summary.fileName, `${summary.compression} compression or its predictor cannot be decoded here`);
  }

  const count = width * height;
  const outputs = bands.map(() => typedArrayOver(summary.dtype, new ArrayBuffer(count * bytesPerSample(summary.dtype)), count));
  const fill = summary.nodata !== null && Number.isFinite(summary.nodata) ? summary.nodata : 0;
  const bx0 = Math.floor(x / level.blockWidth);
  const bx1 = Math.floor((x + width - 1) / level.blockWidth);
  const by0 = Math.floor(y / level.blockHeight);
  const by1 = Math.floor((y + height - 1) / level.blockHeight);
  // Interleaved files hold every band in each block; band-separate ones a block per band.
  const separate = summary.planar === 2;
  const passes = separate ? bands.map((band, k) => ({ band, outputs: [k] })) : [{ band: 0, outputs: bands.map((_, k) => k) }];

  for (const pass of passes) {
    for (let by = by0; by <= by1; by++) {
      for (let bx = bx0; bx <= bx1; bx++) {
        options.signal?.throwIfAborted();
        const col = bx * level.blockWidth;
        const row = by * level.blockHeight;
        const index = blockIndex(summary, levelIndex, pass.band, col, row);
        const length = level.byteCounts[index];
        // The overlap of this block with the window, in image pixels.
        const c0 = Math.max(x, col);
        const c1 = Math.min(x + width, col + level.blockWidth, level.width);
        const r0 = Math.max(y, row);
        const r1 = Math.min(y + height, row + level.blockHeight, level.height);
        if (length === 0) {
          for (const k of pass.outputs) fillRect(outputs[k], width, c0 - x, r0 - y, c1 - c0, r1 - r0, fill);
          continue;
        }
        const layout = blockLayout(summary, levelIndex, index);
        const block = await decodeTileAsync(await read(level.offsets[index], length), layout);
        const samples = layout.samples;
        for (let k = 0; k < pass.outputs.length; k++) {
          const out = outputs[pass.outputs[k]];
          const sample = separate ? 0 : bands[pass.outputs[k]];
          for (let r = r0; r < r1; r++) {
            const src = ((r - row) * layout.width + (c0 - col)) * samples + sample;
            const dst = (r - y) * width + (c0 - x);
            if (samples === 1) {
              out.set(block.subarray(src, src + (c1 - c0)), dst);
            } else {
              for (let c = 0; c < c1 - c0; c++) out[dst + c] = block[src + c * samples];
            }
          }
        }
      }
    }
  }
  return outputs;
}

function fillRect(out: SampleArray, stride: number, x: number, y: number, w: number, h: number, value: number): void {
  for (let r = y; r < y + h; r++) out.fill(value, r * stride + x, r * stride + x + w);
}
