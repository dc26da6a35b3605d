import { gridOfSummary, type RasterGrid } from '../geometry/rasterGrid.ts';
import type { Extent, MultiPolygonRings } from '../geometry/types.ts';
import { coverageWindow, windowOf } from '../pixels/coverage.ts';
import { readWindowBands } from '../raster/readWindow.ts';
import type { ReadRange } from '../tiff/byteSource.ts';
import type { TiffSummary } from '../tiff/inspectTiff.ts';

// Where a scene raster holds no data, learnt block by block: only the blocks (tiles or
// strips) under some patch are read, each once, by byte ranges through readWindowBands.
// A block without any no-data pixel keeps nothing; one with some keeps a byte per pixel.
// A pixel holds no data when any of its bands equals the no-data value (from the
// GDAL_NODATA tag, or the user's), since a pixel missing a band has no whole spectrum.

/** A block's no-data pixels, row-major over the block clipped to the image; null: none. */
type BlockMask = Uint8Array | null;

/** How much of a patch lies over no-data pixels. */
export interface NoDataCover {
  /** Area over no-data pixels, m². */
  areaM2: number;
  /** That area as a share of the patch's area (0-1). */
  share: number;
}

export class NoDataMask {
  readonly summary: TiffSummary;
  readonly grid: RasterGrid;
  readonly value: number;
  #blocks = new Map<number, BlockMask>();

  /** A mask for a raster, or null when neither its header nor the user gives a no-data value. */
  static of(summary: TiffSummary, override?: number | null): NoDataMask | null {
    const value = override ?? summary.nodata;
    return value === null || value === undefined ? null : new NoDataMask(summary, value);
  }

  private constructor(summary: TiffSummary, value: number) {
    this.summary = summary;
    this.grid = gridOfSummary(summary);
    this.value = value;
  }

  get fileName(): string {
    return this.summary.fileName;
  }

  /** Blocks read so far. */
  get blocksRead(): number {
    return this.#blocks.size;
  }

  /** Indexes of the full-resolution blocks under an extent that have not been read yet. */
  missingBlocks(extent: Extent): number[] {
    const box = this.#pixelBox(extent);
    if (!box) return [];
    const level = this.summary.levels[0];
    const out: number[] = [];
    for (let by = Math.floor(box.row0 / level.blockHeight); by <= Math.floor(box.row1 / level.blockHeight); by++) {
      for (let bx = Math.floor(box.col0 / level.blockWidth); bx <= Math.floor(box.col1 / level.blockWidth); bx++) {
        const index = by * level.blocksAcross + bx;
        if (!this.#blocks.has(index)) out.push(index);
      }
    }
    return out;
  }

  /** Reads the given blocks (each once, every band) and notes their no-data pixels. */
  async readBlocks(read: ReadRange, blocks: Iterable<number>, signal?: AbortSignal): Promise<void> {
    const level = this.summary.levels[0];
    const bands = Array.from({ length: this.summary.bands }, (_, b) => b);
    for (const index of blocks) {
      if (this.#blocks.has(index)) continue;
      signal?.throwIfAborted();
      const x = (index % level.blocksAcross) * level.blockWidth;
      const y = Math.floor(index / level.blocksAcross) * level.blockHeight;
      const width = Math.min(level.blockWidth, level.width - x);
      const height = Math.min(level.blockHeight, level.height - y);
      const values = await readWindowBands(read, this.summary, { level: 0, x, y, width, height, bands }, { signal });
      this.#blocks.set(index, this.#maskOf(values, width * height));
    }
  }

  /**
   * How much of a valid outline lies over no-data pixels, by the exact coverage of each
   * pixel; null when none does. Throws when a block under it has not been read.
   */
  cover(shape: MultiPolygonRings, extent: Extent, patchArea: number): NoDataCover | null {
    const box = this.#pixelBox(extent);
    if (!box || !this.#anyNoData(box)) return null;
    const coverage = coverageWindow(shape, this.grid);
    const pixelArea = this.grid.pixelWidth * this.grid.pixelHeight;
    let covered = 0;
    for (let r = 0; r < coverage.height; r++) {
      for (let c = 0; c < coverage.width; c++) {
        const f = coverage.fraction[r * coverage.width + c];
        if (f > 0 && this.#isNoData(coverage.row0 + r, coverage.col0 + c)) covered += f;
      }
    }
    if (covered === 0) return null;
    const areaM2 = covered * pixelArea;
    return { areaM2, share: patchArea > 0 ? Math.min(1, areaM2 / patchArea) : 1 };
  }

  #pixelBox(extent: Extent) {
    const [x0, y0, x1, y1] = extent;
    return windowOf([[[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]], this.grid);
  }

  #block(row: number, col: number): { mask: BlockMask; offset: number } {
    const level = this.summary.levels[0];
    const by = Math.floor(row / level.blockHeight), bx = Math.floor(col / level.blockWidth);
    const index = by * level.blocksAcross + bx;
    const mask = this.#blocks.get(index);
    if (mask === undefined) throw new Error(`${this.fileName}: block ${index} was not read before the no-data check`);
    const width = Math.min(level.blockWidth, level.width - bx * level.blockWidth);
    return { mask, offset: (row - by * level.blockHeight) * width + (col - bx * level.blockWidth) };
  }

  #isNoData(row: number, col: number): boolean {
    const { mask, offset } = this.#block(row, col);
    return mask !== null && mask[offset] === 1;
  }

  /** Whether any block under the box holds a no-data pixel (most do not: nothing more to do). */
  #anyNoData(box: { row0: number; col0: number; row1: number; col1: number }): boolean {
    const level = this.summary.levels[0];
    for (let row = box.row0; row <= box.row1; row = (Math.floor(row / level.blockHeight) + 1) * level.blockHeight) {
      for (let col = box.col0; col <= box.col1; col = (Math.floor(col / level.blockWidth) + 1) * level.blockWidth) {
        if (this.#block(row, col).mask !== null) return true;
      }
    }
    return false;
  }

  #maskOf(values: ArrayLike<number>[], count: number): BlockMask {
    const value = this.value;
    const isNaN = Number.isNaN(value);
    let mask: Uint8Array | null = null;
    for (const band of values) {
      for (let i = 0; i < count; i++) {
        const v = band[i];
        if (isNaN ? v !== v : v === value) (mask ??= new Uint8Array(count))[i] = 1;
      }
    }
    return mask;
  }
}

/** Reads every block the patches' extents need, for each mask. */
export async function readMasksFor(
  masks: { mask: NoDataMask; read: ReadRange }[], extents: Iterable<Extent>, signal?: AbortSignal,
  onProgress?: (done: number, total: number) => void,
): Promise<void> {
  const list = [...extents];
  for (const { mask, read } of masks) {
    const needed = new Set<number>();
    for (const extent of list) for (const index of mask.missingBlocks(extent)) needed.add(index);
    let done = 0;
    for (const index of needed) {
      await mask.readBlocks(read, [index], signal);
      onProgress?.(++done, needed.size);
    }
  }
}
