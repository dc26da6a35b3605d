import type { RasterGrid } from '../geometry/rasterGrid.ts';
import { Random } from '../random.ts';
import { writeGeoTiff, type SampleType } from '../tiff/writeGeoTiff.ts';
import { encodeNpy, type NpyArray } from './chipsNpy.ts';
import type { RasterBands, SamplePatch } from './samples.ts';
import { samplesCsv } from './samplesCsv.ts';

// Chips for convolutional models: for each patch (or for pure pixels sampled from
// each), an N x N window of every multispectral band around it and the window of the
// panchromatic band over the same ground, as .npy arrays (bands, rows, columns) or as
// GeoTIFFs, listed in an index CSV. Where a window runs off the scene it is filled
// with the no-data value (or 0) and marked incomplete.

export interface ChipCentre {
  patch: SamplePatch;
  /** Multispectral grid row and column of the chip's centre pixel. */
  row: number;
  col: number;
}

export interface ChipOptions {
  /** Window side in multispectral pixels; default 9. */
  size?: number;
  /** 'patch': one chip per patch, at its pure pixel nearest their mean; 'pixels': up to `perPatch` pure pixels each, sampled. */
  mode?: 'patch' | 'pixels';
  perPatch?: number;
  seed?: number;
  format?: 'npy' | 'geotiff';
  sampleType?: SampleType;
}

export interface ChipFile {
  name: string;
  bytes: Uint8Array;
}

export interface ChipSet {
  files: ChipFile[];
  /** The index, as CSV (RFC 4180). */
  index: string;
  messages: string[];
}

/** Where chips are centred. */
export function chipCentres(patches: readonly SamplePatch[], mode: 'patch' | 'pixels', perPatch = 10, seed = 1): { centres: ChipCentre[]; messages: string[] } {
  const centres: ChipCentre[] = [];
  const messages: string[] = [];
  const random = new Random(seed);
  for (const patch of patches) {
    const { rows, cols } = patch.pixels;
    if (rows.length === 0) {
      messages.push(`patch ${patch.id}: no pure pixels, so no chip`);
      continue;
    }
    if (mode === 'patch') {
      let mr = 0, mc = 0;
      for (let i = 0; i < rows.length; i++) { mr += rows[i]; mc += cols[i]; }
      mr /= rows.length; mc /= cols.length;
      let best = 0, bestD = Infinity;
      for (let i = 0; i < rows.length; i++) {
        const d = (rows[i] - mr) ** 2 + (cols[i] - mc) ** 2;
        if (d < bestD) { best = i; bestD = d; }
      }
      centres.push({ patch, row: rows[best], col: cols[best] });
    } else {
      const order = random.shuffle(Array.from(rows, (_, i) => i)).slice(0, perPatch).sort((a, b) => a - b);
      for (const i of order) centres.push({ patch, row: rows[i], col: cols[i] });
    }
  }
  return { centres, messages };
}

const ctors = { uint8: Uint8Array, uint16: Uint16Array, int16: Int16Array, float32: Float32Array } as const;

/** A window of every band of `raster` with its top-left corner at (x0, y1), width x height of its pixels. */
export function cutWindow(raster: RasterBands, x0: number, y1: number, width: number, height: number, sampleType: SampleType): { bands: NpyArray[]; complete: boolean } {
  const g = raster.grid;
  const c0 = Math.round((x0 - g.originX) / g.pixelWidth);
  const r0 = Math.round((g.originY - y1) / g.pixelHeight);
  const fill = raster.noData ?? 0;
  let complete = true;
  const bands = raster.bands.map((band) => {
    const out = new ctors[sampleType](width * height);
    for (let r = 0; r < height; r++) {
      for (let c = 0; c < width; c++) {
        const gr = r0 + r, gc = c0 + c;
        const inside = gr >= 0 && gc >= 0 && gr < g.height && gc < g.width;
        if (!inside) complete = false;
        out[r * width + c] = inside ? band[gr * g.width + gc] : fill;
      }
    }
    return out;
  });
  return { bands, complete };
}

function stack(bands: NpyArray[], sampleType: SampleType): NpyArray {
  const out = new ctors[sampleType](bands.reduce((n, b) => n + b.length, 0));
  let at = 0;
  for (const b of bands) { out.set(b, at); at += b.length; }
  return out;
}

const slug = (id: string | number) => String(id).replace(/[^A-Za-z0-9_-]+/g, '_');

/**
 * Cuts and encodes chips. `msGrid` is the grid the pure pixels were chosen on; `ms`
 * and `pan` may be windows of the scene on grids of their own.
 */
export function writeChips(patches: readonly SamplePatch[], msGrid: RasterGrid, ms: RasterBands, pan: RasterBands | null, options: ChipOptions = {}): ChipSet {
  const size = options.size ?? 9;
  if (!Number.isInteger(size) || size < 1) throw new RangeError(`the chip size must be a whole number of pixels, got ${size}`);
  const format = options.format ?? 'npy';
  const sampleType = options.sampleType ?? 'uint16';
  const epsg = msGrid.epsg;
  if (format === 'geotiff' && epsg === undefined) throw new RangeError('GeoTIFF chips need the grid\'s EPSG code');
  const { centres, messages } = chipCentres(patches, options.mode ?? 'patch', options.perPatch, options.seed);
  const ratio = pan ? msGrid.pixelWidth / pan.grid.pixelWidth : 0;
  if (pan && Math.abs(ratio - Math.round(ratio)) > 1e-9) throw new RangeError(`the panchromatic pixel (${pan.grid.pixelWidth}) does not divide the multispectral pixel (${msGrid.pixelWidth})`);
  const files: ChipFile[] = [];
  const index = {
    columns: ['file', 'kind', 'patch_id', 'species', 'class', 'fold', 'centre_row', 'centre_col', 'x_left', 'y_top', 'pixel_size', 'width', 'height', 'bands', 'dtype', 'complete']
      .map((name) => ({ name, type: 'string' as const, values: [] as (string | number | null)[] })),
    rows: 0,
    messages: [],
  };
  const add = (values: (string | number | null)[]) => { values.forEach((v, i) => index.columns[i].values.push(v)); index.rows++; };
  const half = Math.floor(size / 2);
  const counts = new Map<string, number>();
  for (const centre of centres) {
    const x0 = msGrid.originX + (centre.col - half) * msGrid.pixelWidth;
    const y1 = msGrid.originY - (centre.row - half) * msGrid.pixelHeight;
    const key = slug(centre.patch.id);
    const n = (counts.get(key) ?? 0) + 1;
    counts.set(key, n);
    const stem = `${key}_${String(n).padStart(3, '0')}`;
    const parts: { kind: 'ms' | 'pan'; raster: RasterBands; px: number; side: number }[] = [{ kind: 'ms', raster: ms, px: msGrid.pixelWidth, side: size }];
    if (pan) parts.push({ kind: 'pan', raster: pan, px: pan.grid.pixelWidth, side: size * Math.round(ratio) });
    for (const part of parts) {
      const cut = cutWindow(part.raster, x0, y1, part.side, part.side, sampleType);
      const name = `${stem}_${part.kind}.${format === 'npy' ? 'npy' : 'tif'}`;
      const bytes = format === 'npy'
        ? encodeNpy(stack(cut.bands, sampleType), [cut.bands.length, part.side, part.side])
        : writeGeoTiff({
          width: part.side, height: part.side, sampleType, bands: cut.bands, epsg: epsg!, origin: [x0, y1],
          pixelSize: [part.px, part.px], overviewFactors: [], stripped: true, compression: 'deflate',
          noData: part.raster.noData ?? undefined, bandNames: part.raster.names,
        });
      files.push({ name, bytes });
      const p = centre.patch;
      add([name, part.kind, String(p.id), p.species, p.cls, p.fold === null ? null : String(p.fold), centre.row, centre.col, x0, y1, part.px, part.side, part.side, cut.bands.length, sampleType, cut.complete ? 'true' : 'false']);
      if (!cut.complete) messages.push(`chip ${name} runs off the scene: filled with ${part.raster.noData ?? 0}`);
    }
  }
  return { files, index: samplesCsv(index), messages };
}
