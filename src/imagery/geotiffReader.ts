// geotiff.js reading through the platform bridge, by byte ranges, made safe: a file is
// handed to geotiff.js only after our own inspector has walked its IFDs (geotiff.js has
// no cycle check), and every block is decoded by our capped decoder (geotiff.js inflates
// with no size cap). Used for small windows: pixel values, patch spectra.
import { GeoTIFF, type ReadRasterResult } from 'geotiff';
import { decodeTileAsync, type TileLayout } from '../core/tiff/decodeTile.ts';
import type { TiffSummary } from '../core/tiff/inspectTiff.ts';
import type { FileRef, Platform } from '../platform/types.ts';
import { ImageryError } from './inspectInWorker.ts';

/** The most pixels one window read may ask for (per band). */
export const MAX_WINDOW_PIXELS = 4_194_304;

interface Slice {
  offset: number;
  length: number;
}

/** The byte source geotiff.js asks for slices: here, the platform bridge. */
class BridgeSource {
  readonly #platform: Platform;
  readonly #file: FileRef;

  constructor(platform: Platform, file: FileRef) {
    this.#platform = platform;
    this.#file = file;
  }

  get fileSize(): number {
    return this.#file.size;
  }

  async fetch(slices: Slice[], signal?: AbortSignal): Promise<ArrayBuffer[]> {
    return Promise.all(slices.map(async ({ offset, length }) => {
      // geotiff.js reads its header speculatively past small files' ends: clamp.
      const clamped = Math.max(0, Math.min(length, this.#file.size - offset));
      const bytes = clamped > 0 ? await this.#platform.readRange(this.#file, offset, clamped, signal) : new Uint8Array(0);
      const out = new Uint8Array(length);
      out.set(bytes);
      return out.buffer;
    }));
  }

  async close(): Promise<void> {}
}

interface DecoderParameters {
  tileWidth: number;
  tileHeight: number;
  predictor: number;
}

/** A stand-in for geotiff.js's decoder pool that decodes with our capped decoder. */
function cappedDecoders(summary: TiffSummary) {
  return {
    bindParameters(compression: number, parameters: DecoderParameters) {
      const layout: TileLayout = {
        width: parameters.tileWidth,
        height: parameters.tileHeight,
        samples: summary.planar === 2 ? 1 : summary.bands,
        dtype: summary.dtype,
        compression,
        predictor: parameters.predictor ?? 1,
        littleEndian: summary.littleEndian,
        fileName: summary.fileName,
        blockName: 'a block',
      };
      return {
        async decode(buffer: ArrayBuffer): Promise<ArrayBuffer> {
          const values = await decodeTileAsync(new Uint8Array(buffer), layout);
          return values.buffer.byteLength === values.byteLength ? (values.buffer as ArrayBuffer) : (values.slice().buffer as ArrayBuffer);
        },
      };
    },
  };
}

export interface WindowRequest {
  /** 0 for the full image, then the overviews. */
  level: number;
  /** Pixel window [left, top, right, bottom) at that level. */
  window: [number, number, number, number];
  /** 0-based bands to read. */
  bands: number[];
  signal?: AbortSignal;
}

/** A validated GeoTIFF opened with geotiff.js over the bridge, for window reads. */
export class GeoTiffWindowReader {
  readonly summary: TiffSummary;
  readonly #tiff: GeoTIFF;

  private constructor(summary: TiffSummary, tiff: GeoTIFF) {
    this.summary = summary;
    this.#tiff = tiff;
  }

  /** `summary` must come from inspectTiff on the same file: that is what makes it safe. */
  static async open(platform: Platform, file: FileRef, summary: TiffSummary, signal?: AbortSignal): Promise<GeoTiffWindowReader> {
    const tiff = await GeoTIFF.fromSource(new BridgeSource(platform, file) as never, undefined, signal);
    return new GeoTiffWindowReader(summary, tiff);
  }

  /** One typed array per requested band, row-major over the window. */
  async read(request: WindowRequest): Promise<ArrayLike<number>[]> {
    const { level, window, bands, signal } = request;
    const [left, top, right, bottom] = window;
    const info = this.summary.levels[level];
    if (!info) throw new ImageryError(`${this.summary.fileName}: has no level ${level}`, 'out-of-range');
    if (!(left >= 0 && top >= 0 && right <= info.width && bottom <= info.height && right > left && bottom > top)) {
      throw new ImageryError(`${this.summary.fileName}: window ${window.join(', ')} is outside its ${info.width} x ${info.height} pixels`, 'out-of-range');
    }
    if ((right - left) * (bottom - top) > MAX_WINDOW_PIXELS) {
      throw new ImageryError(`${this.summary.fileName}: a window of ${right - left} x ${bottom - top} pixels is past the ${MAX_WINDOW_PIXELS}-pixel limit of one read`, 'too-large');
    }
    for (const band of bands) {
      if (!(band >= 0 && band < this.summary.bands)) throw new ImageryError(`${this.summary.fileName}: has no band ${band + 1}`, 'out-of-range');
    }
    const image = await this.#tiff.getImage(info.ifdIndex);
    const result = (await image.readRasters({
      window,
      samples: bands,
      interleave: false,
      pool: cappedDecoders(this.summary) as never,
      signal,
    })) as ReadRasterResult;
    return Array.from(result as ArrayLike<ArrayLike<number>>);
  }
}
