import { blockIndex, blockLayout } from '../core/tiff/blocks.ts';
import type { TiffSummary } from '../core/tiff/inspectTiff.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import type { FileRef, Platform } from '../platform/types.ts';
import { ImageryError, inspectInWorker } from './inspectInWorker.ts';
import type { EncodedTile, RenderRequest, RenderResult } from './render.worker.ts';
import type { WorkerPool } from './WorkerPool.ts';

export type RenderPool = WorkerPool<RenderRequest, RenderResult>;

/**
 * One GeoTIFF opened through the platform bridge: its summary, and tiles read by byte
 * range and decoded in the shared render pool. Nothing reads the whole file.
 */
export class Raster {
  readonly file: FileRef;
  readonly summary: TiffSummary;
  #platform: Platform;
  #pool: RenderPool;
  #limits = new Map<string, Promise<{ min: number; max: number }>>();

  private constructor(platform: Platform, pool: RenderPool, file: FileRef, summary: TiffSummary) {
    this.#platform = platform;
    this.#pool = pool;
    this.file = file;
    this.summary = summary;
  }

  static async open(platform: Platform, pool: RenderPool, file: FileRef, signal?: AbortSignal): Promise<Raster> {
    const summary = await inspectInWorker(platform, file, { signal });
    if (!summary.decodable) {
      throw new ImageryError(`${file.name}: ${summary.compression} compression of ${summary.dtype} data cannot be decoded yet`, 'unsupported');
    }
    if (!summary.tiled) {
      throw new ImageryError(`${file.name}: striped files are not shown yet; save it as a tiled GeoTIFF (e.g. gdal_translate -co TILED=YES)`, 'unsupported');
    }
    return new Raster(platform, pool, file, summary);
  }

  get levelCount(): number {
    return this.summary.levels.length;
  }

  /** The compressed block of one band at a level, fetched by its byte range. */
  async encodedTile(level: number, band: number, bx: number, by: number, signal?: AbortSignal): Promise<EncodedTile> {
    const info = this.summary.levels[level];
    const index = blockIndex(this.summary, level, band, bx * info.blockWidth, by * info.blockHeight);
    const offset = info.offsets[index];
    const length = info.byteCounts[index];
    const layout = blockLayout(this.summary, level, index);
    const sample = this.summary.planar === 2 ? 0 : band;
    if (length === 0) return { bytes: new ArrayBuffer(0), layout, sample };
    const bytes = await this.#platform.readRange(this.file, offset, length, signal);
    if (bytes.length < length) {
      throw new ImageryError(`${this.file.name}: ${layout.blockName} is cut short (${bytes.length} of ${length} bytes)`, 'truncated');
    }
    // A private copy, so it can be transferred to the worker.
    const own = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? bytes : bytes.slice();
    return { bytes: own.buffer as ArrayBuffer, layout, sample };
  }

  /** A finished RGBA tile: one band as grey, or three as red, green, blue. */
  async renderTile(level: number, bx: number, by: number, bands: number[], limits: StretchLimits[], signal?: AbortSignal): Promise<ImageBitmap> {
    const info = this.summary.levels[level];
    const tiles = await Promise.all(bands.map((band) => this.encodedTile(level, band, bx, by, signal)));
    const result = await this.#pool.run({
      payload: {
        kind: 'render',
        tiles,
        limits,
        noData: this.summary.nodata,
        validWidth: Math.min(info.blockWidth, info.width - bx * info.blockWidth),
        validHeight: Math.min(info.blockHeight, info.height - by * info.blockHeight),
      },
      transfer: uniqueBuffers(tiles),
      signal,
    });
    return result as ImageBitmap;
  }

  /**
   * Percentile limits of one band, from the smallest level that still has enough
   * pixels (an overview, never the full image of a large scene).
   */
  bandLimits(band: number, low = 2, high = 98, signal?: AbortSignal): Promise<{ min: number; max: number }> {
    const key = `${band}:${low}:${high}`;
    let limits = this.#limits.get(key);
    if (!limits) {
      limits = this.#computeLimits(band, low, high, signal);
      limits.catch(() => this.#limits.delete(key));
      this.#limits.set(key, limits);
    }
    return limits;
  }

  async #computeLimits(band: number, low: number, high: number, signal?: AbortSignal): Promise<{ min: number; max: number }> {
    const level = this.#statsLevel();
    const info = this.summary.levels[level];
    const tiles: (EncodedTile & { x: number; y: number })[] = [];
    for (let by = 0; by < info.blocksDown; by++) {
      for (let bx = 0; bx < info.blocksAcross; bx++) {
        const tile = await this.encodedTile(level, band, bx, by, signal);
        tiles.push({ ...tile, x: bx * info.blockWidth, y: by * info.blockHeight });
      }
    }
    const result = await this.#pool.run({
      payload: { kind: 'stats', tiles, width: info.width, height: info.height, noData: this.summary.nodata, low, high },
      transfer: uniqueBuffers(tiles),
      signal,
    });
    return result as { min: number; max: number };
  }

  #statsLevel(): number {
    // The smallest level with at least 256 x 256 pixels, or the largest there is.
    let chosen = 0;
    for (let i = 0; i < this.summary.levels.length; i++) {
      const { width, height } = this.summary.levels[i];
      if (width * height >= 65_536) chosen = i;
    }
    return chosen;
  }
}

function uniqueBuffers(tiles: EncodedTile[]): ArrayBuffer[] {
  return [...new Set(tiles.map((t) => t.bytes).filter((b) => b.byteLength > 0))];
}
