import type { TileLayout } from '../core/tiff/decodeTile.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import type { SharpenMethod } from '../core/render/pansharpen.ts';
import type { Dtype, SampleArray } from '../core/tiff/tags.ts';

// The jobs of the render pool and their answers: typed once, shared by the page side
// (Raster) and the worker.

export interface EncodedTile {
  /** Empty for a sparse block (byte count 0), which reads as zeros. */
  bytes: ArrayBuffer;
  layout: TileLayout;
  /** Which sample to take from a pixel-interleaved block (0 for band-separate files). */
  sample: number;
  /** The decoded block, once the worker has decoded it (never sent). */
  values?: SampleArray;
}

/** An encoded block and where its top-left pixel sits in its level. */
export interface PlacedTile extends EncodedTile {
  x: number;
  y: number;
  /** Size of the level: a tile's padding beyond it holds no image. */
  levelWidth: number;
  levelHeight: number;
}

/** A window of a level in whole pixels: [x0, y0) to [x1, y1). */
export interface PixelBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

interface TileFrame {
  /** The tile's window in pixels of its level; the tile is this size. */
  box: PixelBox;
  /** The part of the tile that lies inside the image; the rest is made transparent. */
  validWidth: number;
  validHeight: number;
  noData: number | null;
}

export type RenderRequest =
  | (TileFrame & {
      kind: 'bands';
      /** Per displayed band (1 for grey, 3 for a composite), the blocks covering the box. */
      bands: PlacedTile[][];
      limits: StretchLimits[];
    })
  | (TileFrame & {
      kind: 'index';
      /** The two bands of the normalised difference (a - b) / (a + b). */
      bands: [PlacedTile[], PlacedTile[]];
      /** Index values mapped to the ends of the ramp. */
      low: number;
      high: number;
      /** Pixels below this index value are left out; null keeps all. */
      threshold: number | null;
    })
  | (TileFrame & {
      kind: 'sharpen';
      method: SharpenMethod;
      /** The pan blocks covering the box. */
      pan: PlacedTile[];
      /** Per displayed band, the multispectral blocks covering `msBox`. */
      bands: PlacedTile[][];
      /** The multispectral window (in pixels of its level) the pan tile needs. */
      msBox: PixelBox;
      /** Top-left corner of the pan tile in multispectral pixels, and the ratio of pixel sizes. */
      x0: number;
      y0: number;
      step: number;
      limits: StretchLimits[];
      gain: number;
      msNoData: number | null;
    })
  | {
      kind: 'sample';
      /** Tiles of one band covering `box` at one level. */
      tiles: PlacedTile[];
      box: PixelBox;
      noData: number | null;
      maxCount: number;
    }
  | {
      kind: 'window';
      /** Per band, the blocks covering `box`. */
      bands: PlacedTile[][];
      box: PixelBox;
    }
  | {
      /** A pyramid cache's row of base tiles: one band's blocks over `box`, cut into square tiles. */
      kind: 'cut';
      tiles: PlacedTile[];
      box: PixelBox;
      tileSize: number;
      dtype: Dtype;
      /** The value of pixels outside the image (no-data, else 0). */
      fill: number;
    }
  | {
      /** A pyramid cache's coarser tile: the 2 x 2 mean of the valid pixels of up to four child tiles. */
      kind: 'reduce';
      /** Top-left, top-right, bottom-left, bottom-right; null where the level below has none. */
      children: (ArrayBuffer | null)[];
      tileSize: number;
      dtype: Dtype;
      noData: number | null;
      fill: number;
    };

/** The answer to a 'sample' job: sorted valid values, their mean and sd. */
export interface SampleReply {
  sorted: Float64Array;
  mean: number;
  sd: number;
}

/** Finished RGBA bytes of a tile, as the in-thread runner returns them. */
export interface RgbaTile {
  rgba: Uint8ClampedArray<ArrayBuffer>;
  width: number;
  height: number;
}

/** A finished tile: a bitmap from the worker pool, or bytes from the in-thread runner. */
export type TileImage = ImageBitmap | RgbaTile;

export type RenderResult = TileImage | SampleReply | Float32Array[] | ArrayBuffer[] | ArrayBuffer;

/** What runs render jobs: the worker pool, or the in-thread runner (tests, benchmarks, the CLI). */
export interface JobRunner {
  run(request: { payload: RenderRequest; transfer?: Transferable[]; signal?: AbortSignal }): Promise<RenderResult>;
}

/** The buffers of tiles, each once, for transferring to a worker. */
export function uniqueBuffers(tiles: EncodedTile[] | EncodedTile[][]): ArrayBuffer[] {
  return [...new Set(tiles.flat().map((t) => t.bytes).filter((b) => b.byteLength > 0))];
}
