import { blockIndex, blockLayout } from '../core/tiff/blocks.ts';
import type { TiffSummary } from '../core/tiff/inspectTiff.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import { percentileOfSorted, type BandSample } from '../core/render/bandSample.ts';
import type { FileRef, Platform } from '../platform/types.ts';
import { ImageryError, inspectInWorker } from './inspectInWorker.ts';
import { coalescingReader } from './coalescingReader.ts';
import { uniqueBuffers, type EncodedTile, type JobRunner, type PixelBox, type PlacedTile, type SampleReply, type TileImage } from './renderJobs.ts';

/** The render pool (a WorkerPool of render workers) or any other runner of render jobs. */
export type RenderPool = JobRunner;

/** What a raster needs of the outside world: byte ranges of its file. */
export type RangeReader = Pick<Platform, 'readRange'>;

/** Tile size of the view grid of striped files (their strips are cut into these). */
const STRIP_TILE = 256;

/**
 * One GeoTIFF opened through the platform bridge (or any range reader): its summary,
 * and windows of it read by byte range and decoded in the shared render pool. Nothing
 * reads the whole file; tiles cover only the bands a view shows, at the level it needs.
 */
export class Raster {
  readonly file: FileRef;
  readonly summary: TiffSummary;
  readonly pool: RenderPool;
  #reader: RangeReader;
  #samples = new Map<string, Promise<BandSample>>();
  #failed = new Set<string>();
  #listeners = new Set<(message: string, count: number) => void>();

  private constructor(reader: RangeReader, pool: RenderPool, file: FileRef, summary: TiffSummary) {
    this.#reader = reader;
    this.pool = pool;
    this.file = file;
    this.summary = summary;
  }

  static async open(reader: RangeReader, pool: RenderPool, file: FileRef, signal?: AbortSignal): Promise<Raster> {
    const summary = await inspectInWorker(reader, file, { signal });
    if (!summary.decodable) {
      throw new ImageryError(`${file.name}: ${summary.compression} compression of ${summary.dtype} data cannot be decoded yet`, 'unsupported');
    }
    // The blocks of a screen are read together: neighbours in the file as one read.
    return Raster.fromSummary(coalescingReader(reader), pool, file, summary);
  }

  /** A raster from a summary read elsewhere (a worker, a test, the command line). */
  static fromSummary(reader: RangeReader, pool: RenderPool, file: FileRef, summary: TiffSummary): Raster {
    return new Raster(reader, pool, file, summary);
  }

  /**
   * The same file placed elsewhere on the map (pixel space: see core/raster/pixelSpace),
   * sharing its reads and its render pool.
   */
  placedAt(placement: Pick<TiffSummary, 'origin' | 'pixelSize' | 'extent'>): Raster {
    const { origin, pixelSize, extent } = placement;
    return new Raster(this.#reader, this.pool, this.file, { ...this.summary, origin, pixelSize, extent });
  }

  /**
   * Hears of tiles that could not be shown (a damaged block, a failed read): the message
   * of the latest and how many have failed. The rest of the raster stays usable.
   */
  onProblem(listener: (message: string, count: number) => void): () => void {
    this.#listeners.add(listener);
    return () => this.#listeners.delete(listener);
  }

  /** Runs a tile's work; a failure (not a cancellation) is told to the listeners, then rethrown. */
  async #watch<T>(what: string, work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      if ((error as Error).name !== 'AbortError') this.reportProblem(what, error as Error);
      throw error;
    }
  }

  /** Tells the listeners of a tile that failed (once per tile). */
  reportProblem(what: string, error: Error): void {
    if (this.#failed.has(what)) return;
    this.#failed.add(what);
    const message = error.message.startsWith(this.file.name) ? error.message : `${this.file.name}: ${error.message}`;
    for (const listener of this.#listeners) listener(message, this.#failed.size);
  }

  get levelCount(): number {
    return this.summary.levels.length;
  }

  /** The view grid's tile size at a level: the file's own tiles, or 256 x 256 over strips. */
  tileSize(level: number): [number, number] {
    const info = this.summary.levels[level];
    return info.tiled ? [info.blockWidth, info.blockHeight] : [STRIP_TILE, STRIP_TILE];
  }

  /** Ground size of one pixel at a level (x). */
  resolution(level: number): number {
    return (this.summary.pixelSize[0] * this.summary.width) / this.summary.levels[level].width;
  }

  /** The pixel window of view-grid tile (bx, by) at a level. */
  tileBox(level: number, bx: number, by: number): PixelBox {
    const [tw, th] = this.tileSize(level);
    return { x0: bx * tw, y0: by * th, x1: (bx + 1) * tw, y1: (by + 1) * th };
  }

  /** Bytes of the file by range, for readers that decode elsewhere (a checks worker). */
  readBytes(offset: number, length: number, signal?: AbortSignal): Promise<Uint8Array> {
    return this.#reader.readRange(this.file, offset, length, signal);
  }

  /** The compressed block of one band holding pixel (col, row) of a level, fetched by its byte range. */
  async encodedBlock(level: number, band: number, col: number, row: number, signal?: AbortSignal): Promise<PlacedTile> {
    const info = this.summary.levels[level];
    const index = blockIndex(this.summary, level, band, col, row);
    const offset = info.offsets[index];
    const length = info.byteCounts[index];
    const layout = blockLayout(this.summary, level, index);
    const sample = this.summary.planar === 2 ? 0 : band;
    const x = Math.floor(col / info.blockWidth) * info.blockWidth;
    const y = Math.floor(row / info.blockHeight) * info.blockHeight;
    const place = { x, y, levelWidth: info.width, levelHeight: info.height };
    if (length === 0) return { bytes: new ArrayBuffer(0), layout, sample, ...place };
    const bytes = await this.#reader.readRange(this.file, offset, length, signal);
    if (bytes.length < length) {
      throw new ImageryError(`${this.file.name}: ${layout.blockName} is cut short (${bytes.length} of ${length} bytes)`, 'truncated');
    }
    // A private copy, so it can be transferred to the worker.
    const own = bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength ? bytes : bytes.slice();
    return { bytes: own.buffer as ArrayBuffer, layout, sample, ...place };
  }

  /** The blocks of one band that cover a window of a level (clipped to the level). */
  async blocksCovering(level: number, band: number, box: PixelBox, signal?: AbortSignal): Promise<PlacedTile[]> {
    const info = this.summary.levels[level];
    const x0 = Math.max(0, box.x0), y0 = Math.max(0, box.y0);
    const x1 = Math.min(info.width, box.x1), y1 = Math.min(info.height, box.y1);
    if (x1 <= x0 || y1 <= y0) return [];
    const reads: Promise<PlacedTile>[] = [];
    for (let by = Math.floor(y0 / info.blockHeight); by * info.blockHeight < y1; by++) {
      for (let bx = Math.floor(x0 / info.blockWidth); bx * info.blockWidth < x1; bx++) {
        reads.push(this.encodedBlock(level, band, bx * info.blockWidth, by * info.blockHeight, signal));
      }
    }
    return Promise.all(reads);
  }

  /** Frame of a view-grid tile: its box and the part of it inside the image. */
  tileFrame(level: number, bx: number, by: number) {
    const info = this.summary.levels[level];
    const box = this.tileBox(level, bx, by);
    return {
      box,
      validWidth: Math.max(0, Math.min(box.x1, info.width) - box.x0),
      validHeight: Math.max(0, Math.min(box.y1, info.height) - box.y0),
      noData: this.summary.nodata,
    };
  }

  /** A finished RGBA tile: one band as grey, or three as red, green, blue. */
  renderTile(level: number, bx: number, by: number, bands: number[], limits: StretchLimits[], signal?: AbortSignal): Promise<TileImage> {
    return this.#watch(`${level}/${bx}/${by}/${bands}`, async () => {
      const frame = this.tileFrame(level, bx, by);
      const tiles = await Promise.all(bands.map((band) => this.blocksCovering(level, band, frame.box, signal)));
      return (await this.pool.run({
        payload: { kind: 'bands', ...frame, bands: tiles, limits },
        transfer: uniqueBuffers(tiles),
        signal,
      })) as TileImage;
    });
  }

  /** A finished tile of the normalised difference of bands a and b, coloured by the ramp. */
  renderIndexTile(
    level: number, bx: number, by: number, a: number, b: number,
    range: { low: number; high: number; threshold: number | null }, signal?: AbortSignal,
  ): Promise<TileImage> {
    return this.#watch(`${level}/${bx}/${by}/${a},${b}`, async () => {
      const frame = this.tileFrame(level, bx, by);
      const [ta, tb] = await Promise.all([a, b].map((band) => this.blocksCovering(level, band, frame.box, signal)));
      return (await this.pool.run({
        payload: { kind: 'index', ...frame, bands: [ta, tb], ...range },
        transfer: uniqueBuffers([ta, tb]),
        signal,
      })) as TileImage;
    });
  }

  /** Every listed band's values over a window of a level, NaN outside the image. */
  async readWindow(level: number, box: PixelBox, bands: number[], signal?: AbortSignal): Promise<Float32Array[]> {
    const tiles = await Promise.all(bands.map((band) => this.blocksCovering(level, band, box, signal)));
    return (await this.pool.run({ payload: { kind: 'window', bands: tiles, box }, transfer: uniqueBuffers(tiles), signal })) as Float32Array[];
  }

  /** The raw values of every band at one full-resolution pixel. */
  async pixelValues(col: number, row: number, signal?: AbortSignal): Promise<number[]> {
    const bands = Array.from({ length: this.summary.bands }, (_, i) => i);
    const values = await this.readWindow(0, { x0: col, y0: row, x1: col + 1, y1: row + 1 }, bands, signal);
    return values.map((v) => v[0]);
  }

  /**
   * A band's sorted sample: over a window of a level when given ("what is on screen"),
   * else over the smallest level that still has enough pixels (an overview, never the
   * full image of a large scene). Whole-level samples are kept.
   */
  sample(band: number, where?: { level: number; box: PixelBox }, signal?: AbortSignal): Promise<BandSample> {
    if (where) return this.#sample(band, where.level, where.box, signal);
    const key = `${band}`;
    let sample = this.#samples.get(key);
    if (!sample) {
      const level = this.statsLevel();
      const info = this.summary.levels[level];
      sample = this.#sample(band, level, { x0: 0, y0: 0, x1: info.width, y1: info.height }, signal);
      sample.catch(() => this.#samples.delete(key));
      this.#samples.set(key, sample);
    }
    return sample;
  }

  async #sample(band: number, level: number, box: PixelBox, signal?: AbortSignal): Promise<BandSample> {
    const tiles = await this.blocksCovering(level, band, box, signal);
    return (await this.pool.run({
      payload: { kind: 'sample', tiles, box, noData: this.summary.nodata, maxCount: 1 << 18 },
      transfer: uniqueBuffers(tiles),
      signal,
    })) as SampleReply;
  }

  /** Percentile limits of one band (see sample). */
  async bandLimits(band: number, low = 2, high = 98, signal?: AbortSignal): Promise<{ min: number; max: number }> {
    const { sorted } = await this.sample(band, undefined, signal);
    if (sorted.length === 0) return { min: 0, max: 1 };
    const min = percentileOfSorted(sorted, low);
    const max = percentileOfSorted(sorted, high);
    return { min, max: max > min ? max : min + 1 };
  }

  /** The smallest level with at least 256 x 256 pixels, or the largest there is. */
  statsLevel(): number {
    let chosen = 0;
    for (let i = 0; i < this.summary.levels.length; i++) {
      const { width, height } = this.summary.levels[i];
      if (width * height >= 65_536) chosen = i;
    }
    return chosen;
  }

  /** The coarsest level whose pixels are no larger than `resolution` (level 0 when even it is coarser). */
  levelFor(resolution: number): number {
    let chosen = 0;
    for (let i = 0; i < this.levelCount; i++) if (this.resolution(i) <= resolution * 1.0001) chosen = i;
    return chosen;
  }
}

export type { EncodedTile };
