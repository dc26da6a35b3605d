import type { RasterGrid } from '../geometry/rasterGrid.ts';
import type { PatchPixels } from '../pixels/patchPixels.ts';

// The sample table: one row per pure multispectral pixel, with its patch, species,
// class, fold, place, every band value, the index values and the statistics of the
// panchromatic pixels inside it. Held as columns, so CSV and Parquet write the same.

/** Bands of a raster as row-major arrays on their own grid (a scene or a window of one). */
export interface RasterBands {
  grid: RasterGrid;
  bands: ArrayLike<number>[];
  /** One name per band, for the column names. */
  names: string[];
  /** Values equal to this (or NaN) hold no data. */
  noData?: number | null;
}

/** A spectral index from one pixel's band values (indexed as in RasterBands.bands). */
export interface SpectralIndex {
  name: string;
  of(values: readonly number[]): number;
}

/** NDVI, (NIR - red) / (NIR + red): Rouse et al. (1974), "Monitoring vegetation systems in the Great Plains with ERTS". */
export function ndvi(red: number, nir: number): SpectralIndex {
  return {
    name: 'ndvi',
    of: (v) => (v[nir] + v[red] === 0 ? NaN : (v[nir] - v[red]) / (v[nir] + v[red])),
  };
}

export interface SamplePatch {
  id: string | number;
  species: string;
  /** Class under the scheme, or null when the scheme leaves the species out. */
  cls: string | null;
  /** 1-based fold, "test" for the held-out set, or null. */
  fold: number | 'test' | null;
  /** Chosen pixels on the multispectral grid (patchPixels). */
  pixels: PatchPixels;
}

export type ColumnType = 'string' | 'int' | 'float';

export interface SampleColumn {
  name: string;
  type: ColumnType;
  values: (string | number | null)[];
}

export interface SampleTable {
  columns: SampleColumn[];
  rows: number;
  /** Pixels left out, and why, one line per patch. */
  messages: string[];
}

const isMissing = (v: number, noData: number | null | undefined) => Number.isNaN(v) || (noData !== null && noData !== undefined && v === noData);

/** Grid cell of `raster` at a multispectral pixel (row, col of `ms`), or -1 outside. */
function cellAt(raster: RasterGrid, x: number, y: number): number {
  const c = Math.floor((x - raster.originX) / raster.pixelWidth);
  const r = Math.floor((raster.originY - y) / raster.pixelHeight);
  return c < 0 || r < 0 || c >= raster.width || r >= raster.height ? -1 : r * raster.width + c;
}

/** Mean and population standard deviation of the pan pixels whose centres lie in a footprint. */
function panStats(pan: RasterBands, x0: number, y0: number, x1: number, y1: number): { mean: number; sd: number; count: number } {
  const g = pan.grid;
  // Centre of column c at originX + (c + 0.5) w; take x0 <= centre < x1 (half-open, so
  // each pan pixel counts in exactly one multispectral pixel).
  const c0 = Math.max(0, Math.ceil((x0 - g.originX) / g.pixelWidth - 0.5));
  const c1 = Math.min(g.width - 1, Math.ceil((x1 - g.originX) / g.pixelWidth - 0.5) - 1);
  const r0 = Math.max(0, Math.ceil((g.originY - y1) / g.pixelHeight - 0.5));
  const r1 = Math.min(g.height - 1, Math.ceil((g.originY - y0) / g.pixelHeight - 0.5) - 1);
  let n = 0, sum = 0, sum2 = 0;
  const band = pan.bands[0];
  for (let r = r0; r <= r1; r++) {
    for (let c = c0; c <= c1; c++) {
      const v = band[r * g.width + c];
      if (isMissing(v, pan.noData)) continue;
      n++; sum += v; sum2 += v * v;
    }
  }
  if (n === 0) return { mean: NaN, sd: NaN, count: 0 };
  const mean = sum / n;
  return { mean, sd: Math.sqrt(Math.max(0, sum2 / n - mean * mean)), count: n };
}

const columnName = (name: string) => name.trim().toLowerCase().replace(/[^a-z0-9]+/g, '_').replace(/^_|_$/g, '');

/**
 * Builds the table. `msGrid` is the grid the pixels were chosen on; `ms` and `pan`
 * may be windows of the scene (each on its own grid): values are looked up by place.
 */
export function buildSamples(
  patches: readonly SamplePatch[], msGrid: RasterGrid, ms: RasterBands, options: { pan?: RasterBands; indices?: SpectralIndex[] } = {},
): SampleTable {
  const { pan, indices = [] } = options;
  const bandNames = ms.names.map((n, i) => `band_${i + 1}_${columnName(n) || 'value'}`);
  const cols = {
    patch_id: [] as string[], species: [] as string[], class: [] as (string | null)[], fold: [] as (string | null)[],
    row: [] as number[], col: [] as number[], x: [] as number[], y: [] as number[], cover: [] as number[],
  };
  const bandValues: number[][] = ms.bands.map(() => []);
  const indexValues: (number | null)[][] = indices.map(() => []);
  const panMean: (number | null)[] = [], panSd: (number | null)[] = [], panCount: number[] = [];
  const messages: string[] = [];
  for (const patch of patches) {
    let skipped = 0;
    for (let i = 0; i < patch.pixels.rows.length; i++) {
      const row = patch.pixels.rows[i], col = patch.pixels.cols[i];
      const x0 = msGrid.originX + col * msGrid.pixelWidth, y1 = msGrid.originY - row * msGrid.pixelHeight;
      const x = x0 + msGrid.pixelWidth / 2, y = y1 - msGrid.pixelHeight / 2;
      const cell = cellAt(ms.grid, x, y);
      const values = cell < 0 ? null : ms.bands.map((b) => b[cell]);
      if (!values || values.some((v) => isMissing(v, ms.noData))) { skipped++; continue; }
      cols.patch_id.push(String(patch.id)); cols.species.push(patch.species); cols.class.push(patch.cls);
      cols.fold.push(patch.fold === null ? null : String(patch.fold));
      cols.row.push(row); cols.col.push(col); cols.x.push(x); cols.y.push(y); cols.cover.push(patch.pixels.fractions[i]);
      values.forEach((v, b) => bandValues[b].push(v));
      indices.forEach((index, k) => {
        const v = index.of(values);
        indexValues[k].push(Number.isFinite(v) ? v : null);
      });
      if (pan) {
        const s = panStats(pan, x0, y1 - msGrid.pixelHeight, x0 + msGrid.pixelWidth, y1);
        panMean.push(s.count ? s.mean : null); panSd.push(s.count ? s.sd : null); panCount.push(s.count);
      }
    }
    if (skipped) messages.push(`patch ${patch.id}: ${skipped} pixel(s) hold no data (or lie off the raster) and are left out of the samples`);
  }
  const columns: SampleColumn[] = [
    { name: 'patch_id', type: 'string', values: cols.patch_id },
    { name: 'species', type: 'string', values: cols.species },
    { name: 'class', type: 'string', values: cols.class },
    { name: 'fold', type: 'string', values: cols.fold },
    { name: 'row', type: 'int', values: cols.row },
    { name: 'col', type: 'int', values: cols.col },
    { name: 'x', type: 'float', values: cols.x },
    { name: 'y', type: 'float', values: cols.y },
    { name: 'cover', type: 'float', values: cols.cover },
    ...bandNames.map((name, b) => ({ name, type: 'float' as const, values: bandValues[b] })),
    ...indices.map((index, k) => ({ name: columnName(index.name), type: 'float' as const, values: indexValues[k] })),
  ];
  if (pan) {
    columns.push({ name: 'pan_mean', type: 'float', values: panMean });
    columns.push({ name: 'pan_sd', type: 'float', values: panSd });
    columns.push({ name: 'pan_count', type: 'int', values: panCount });
  }
  return { columns, rows: cols.row.length, messages };
}
