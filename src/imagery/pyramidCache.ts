import type { TiffLevel, TiffSummary } from '../core/tiff/inspectTiff.ts';
import { bytesPerSample, hostLittleEndian } from '../core/tiff/tags.ts';
import type { FileRef } from '../platform/types.ts';
import { Raster, type RangeReader } from './Raster.ts';
import { uniqueBuffers } from './renderJobs.ts';
import type { TileStore } from './tileStore.ts';

// A tiled pyramid for a file that has none of its own (striped, or without overviews):
// read once, band by band and 256 rows at a time, cut into 256 x 256 tiles and each
// coarser level averaged from the one below, all in the worker pool, kept in a tile
// store. Later views read the store as if it were a tiled GeoTIFF with overviews:
// the pyramid is described by a virtual summary whose block offsets are tile numbers.

const TILE = 256;

/** Whether a raster should be shown from a pyramid cache rather than from its file. */
export function needsPyramid(summary: TiffSummary): boolean {
  return !summary.tiled || (summary.levels.length === 1 && Math.max(summary.width, summary.height) > 2 * TILE);
}

/** The summary of the pyramid of `source`: tiled 256 x 256, uncompressed, band-separate, halving to one tile. */
export function pyramidSummary(source: TiffSummary): TiffSummary {
  const tileBytes = TILE * TILE * bytesPerSample(source.dtype);
  const levels: TiffLevel[] = [];
  let width = source.width, height = source.height, tile = 0;
  for (;;) {
    const across = Math.ceil(width / TILE), down = Math.ceil(height / TILE);
    const count = across * down * source.bands;
    const offsets = new Float64Array(count), byteCounts = new Float64Array(count).fill(tileBytes);
    for (let i = 0; i < count; i++) offsets[i] = (tile + i) * tileBytes;
    tile += count;
    levels.push({
      width, height, tiled: true, blockWidth: TILE, blockHeight: TILE, blocksAcross: across, blocksDown: down,
      offsets, byteCounts, compression: 1, predictor: 1, ifdOffset: 0, ifdIndex: levels.length,
    });
    if (width <= TILE && height <= TILE) break;
    width = Math.ceil(width / 2);
    height = Math.ceil(height / 2);
  }
  return {
    ...source, tiled: true, tileSize: [TILE, TILE], compression: 'none', compressionCode: 1, predictor: 1, planar: 2,
    littleEndian: hostLittleEndian, bigTiff: false, overviews: levels.length - 1, levels, decodable: true,
    fileSize: tile * tileBytes, warnings: [...source.warnings, 'shown from a tiled pyramid cache built when first opened'],
  };
}

/** The store key prefix of a file's pyramid: its name, size and shape. */
function prefixOf(source: Raster): string {
  const s = source.summary;
  return `${s.fileName}:${s.fileSize}:${s.width}x${s.height}x${s.bands}:${s.dtype}`;
}

export interface PyramidOptions {
  onProgress?: (progress: { label: string; fraction: number | null }) => void;
  signal?: AbortSignal;
}

/**
 * The raster shown from its pyramid cache, building the cache first when the store does
 * not hold a complete one. The returned raster shares the source's render pool.
 */
export async function cachedPyramid(source: Raster, store: TileStore, options: PyramidOptions = {}): Promise<Raster> {
  const prefix = prefixOf(source);
  const summary = pyramidSummary(source.summary);
  if (!(await store.get(`${prefix}/complete`))) await buildPyramid(source, summary, store, prefix, options);
  const tileBytes = TILE * TILE * bytesPerSample(summary.dtype);
  const reader: RangeReader = {
    async readRange(_file: FileRef, offset: number) {
      const bytes = await store.get(`${prefix}/${offset / tileBytes}`);
      if (!bytes) throw new Error(`${source.file.name}: a tile of its pyramid cache is missing (stored data may have been cleared by the browser)`);
      return new Uint8Array(bytes.slice(0));
    },
  };
  return Raster.fromSummary(reader, source.pool, { id: `pyramid:${prefix}`, name: source.file.name, size: summary.fileSize }, summary);
}

async function buildPyramid(source: Raster, summary: TiffSummary, store: TileStore, prefix: string, options: PyramidOptions): Promise<void> {
  const { onProgress = () => {}, signal } = options;
  const name = source.file.name;
  const fill = summary.nodata ?? 0;
  const totalTiles = summary.levels.reduce((n, l) => n + l.offsets.length, 0);
  let done = 0;
  const tileNumber = (level: number, band: number, bx: number, by: number) => {
    const info = summary.levels[level];
    return info.offsets[band * info.blocksAcross * info.blocksDown + by * info.blocksAcross + bx] / (TILE * TILE * bytesPerSample(summary.dtype));
  };
  const report = () => onProgress({ label: `Building a tiled pyramid of ${name}`, fraction: done / totalTiles });

  // Level 0: the file read once, 256 rows of one band at a time, cut into tiles in the pool.
  const base = summary.levels[0];
  for (let band = 0; band < summary.bands; band++) {
    for (let by = 0; by < base.blocksDown; by++) {
      if (signal?.aborted) throw new DOMException('the work was cancelled', 'AbortError');
      const box = { x0: 0, y0: by * TILE, x1: base.blocksAcross * TILE, y1: (by + 1) * TILE };
      const blocks = await source.blocksCovering(0, band, box, signal);
      const tiles = (await source.pool.run({
        payload: { kind: 'cut', tiles: blocks, box, tileSize: TILE, dtype: summary.dtype, fill },
        transfer: uniqueBuffers(blocks),
        signal,
      })) as ArrayBuffer[];
      await store.put(tiles.map((tile, bx) => [`${prefix}/${tileNumber(0, band, bx, by)}`, tile]));
      done += tiles.length;
      report();
    }
  }

  // Coarser levels: each tile the 2 x 2 mean of the valid pixels below it (GDAL's AVERAGE).
  for (let level = 1; level < summary.levels.length; level++) {
    const info = summary.levels[level];
    const below = summary.levels[level - 1];
    for (let band = 0; band < summary.bands; band++) {
      for (let by = 0; by < info.blocksDown; by++) {
        if (signal?.aborted) throw new DOMException('the work was cancelled', 'AbortError');
        const entries = await Promise.all(Array.from({ length: info.blocksAcross }, async (_, bx): Promise<[string, ArrayBuffer]> => {
          const children = await Promise.all([0, 1, 2, 3].map(async (k) => {
            const cx = bx * 2 + (k % 2), cy = by * 2 + (k >> 1);
            if (cx >= below.blocksAcross || cy >= below.blocksDown) return null;
            const bytes = await store.get(`${prefix}/${tileNumber(level - 1, band, cx, cy)}`);
            return bytes ? bytes.slice(0) : null;
          }));
          const tile = (await source.pool.run({
            payload: { kind: 'reduce', children, tileSize: TILE, dtype: summary.dtype, noData: summary.nodata, fill },
            transfer: children.filter((c): c is ArrayBuffer => c !== null),
            signal,
          })) as ArrayBuffer;
          return [`${prefix}/${tileNumber(level, band, bx, by)}`, tile];
        }));
        await store.put(entries);
        done += entries.length;
        report();
      }
    }
  }
  await store.put([[`${prefix}/complete`, new ArrayBuffer(1)]]);
}
/**
 * A raster ready for viewing: itself when it is tiled with overviews, else its pyramid
 * cache (built on first open, with progress). Where no tile store can be had, the file
 * is read directly (slower, but it still shows).
 */
export async function viewable(raster: Raster, openStore: () => Promise<TileStore | null>, options: PyramidOptions = {}): Promise<Raster> {
  if (!needsPyramid(raster.summary)) return raster;
  const store = await openStore().catch(() => null);
  return store ? cachedPyramid(raster, store, options) : raster;
}

/** Opens a raster from its file and makes it viewable (see viewable). */
export async function openForViewing(
  reader: RangeReader, pool: Raster['pool'], file: FileRef, openStore: () => Promise<TileStore | null>, options: PyramidOptions = {},
): Promise<Raster> {
  return viewable(await Raster.open(reader, pool, file, options.signal), openStore, options);
}
