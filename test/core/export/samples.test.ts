import { parquetMetadata, parquetReadObjects } from 'hyparquet';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { buildSamples, ndvi, type RasterBands, type SamplePatch } from '../../../src/core/export/samples.ts';
import { samplesCsv } from '../../../src/core/export/samplesCsv.ts';
import { samplesParquet } from '../../../src/core/export/samplesParquet.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { patchPixels } from '../../../src/core/pixels/patchPixels.ts';

// Sample tables on a scene whose values follow a formula, read back by independent
// readers: PapaParse 5.7.1 (npm) for the CSV, hyparquet 1.31.5 (npm) for Parquet.
// Pan statistics use the variance of the whole numbers 0..n²-1 laid out in an n x n
// block: (n⁴ - 1) / 12 (discrete uniform distribution, handbook formula).

const ms: RasterGrid = { originX: 500000, originY: 4200020, pixelWidth: 2, pixelHeight: 2, width: 10, height: 10, epsg: 32633 };
const pan: RasterGrid = { ...ms, pixelWidth: 0.5, pixelHeight: 0.5, width: 40, height: 40 };
const msValue = (b: number, r: number, c: number) => 1000 * (b + 1) + 10 * r + c;
const msBands: RasterBands = {
  grid: ms,
  names: ['blue', 'green', 'red', 'NIR'],
  bands: [0, 1, 2, 3].map((b) => Uint16Array.from({ length: 100 }, (_, i) => msValue(b, Math.floor(i / 10), i % 10))),
  noData: 0,
};
// Pan: within each 4 x 4 block, 0..15 in reading order, plus 100 x the block's column.
const panBand = Uint16Array.from({ length: 1600 }, (_, i) => {
  const r = Math.floor(i / 40), c = i % 40;
  return (r % 4) * 4 + (c % 4) + 100 * Math.floor(c / 4);
});
const panBands: RasterBands = { grid: pan, names: ['pan'], bands: [panBand] };
const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];

const patches: SamplePatch[] = [
  { id: 'a', species: 'pice', cls: 'conifer', fold: 2, pixels: patchPixels([[square(500002, 4200002, 4)]], ms, { kind: 'inside', buffer: 0 }) },
  { id: 'b,"odd"', species: 'salx', cls: null, fold: 'test', pixels: patchPixels([[square(500010, 4200010, 2)]], ms, { kind: 'inside', buffer: 0 }) },
];
const table = buildSamples(patches, ms, msBands, { pan: panBands, indices: [ndvi(2, 3)] });

describe('sample table', () => {
  it('holds one row per pure pixel with its place, values, index and pan statistics', () => {
    expect(table.rows).toBe(5);
    const col = (name: string) => table.columns.find((c) => c.name === name)!.values;
    expect(table.columns.map((c) => c.name)).toEqual([
      'patch_id', 'species', 'class', 'fold', 'row', 'col', 'x', 'y', 'cover',
      'band_1_blue', 'band_2_green', 'band_3_red', 'band_4_nir', 'ndvi', 'pan_mean', 'pan_sd', 'pan_count',
    ]);
    // a covers x 500002-500006, y 4200002-4200006: rows 7-8, columns 1-2.
    expect(col('row').slice(0, 4)).toEqual([7, 7, 8, 8]);
    expect(col('col').slice(0, 4)).toEqual([1, 2, 1, 2]);
    expect(col('x')[0]).toBe(500003);
    expect(col('y')[0]).toBe(4200005);
    expect(col('band_3_red')[0]).toBe(msValue(2, 7, 1));
    expect(col('ndvi')[0]).toBeCloseTo((msValue(3, 7, 1) - msValue(2, 7, 1)) / (msValue(3, 7, 1) + msValue(2, 7, 1)), 12);
    // Pan pixels in MS column 1: 0..15 + 100; mean 7.5 + 100, population sd sqrt(255 / 12).
    expect(col('pan_mean')[0]).toBe(107.5);
    expect(col('pan_sd')[0] as number).toBeCloseTo(Math.sqrt(255 / 12), 12);
    expect(col('pan_count')[0]).toBe(16);
    expect(col('fold')).toEqual(['2', '2', '2', '2', 'test']);
    expect(col('class')[4]).toBeNull();
  });

  it('leaves out no-data pixels and says which patch lost them', () => {
    const holed: RasterBands = { ...msBands, bands: msBands.bands.map((b, i) => (i === 1 ? Uint16Array.from(b, (v, k) => (k === 7 * 10 + 2 ? 0 : v)) : b)) };
    const t = buildSamples(patches, ms, holed);
    expect(t.rows).toBe(4);
    expect(t.messages).toEqual(['patch a: 1 pixel(s) hold no data (or lie off the raster) and are left out of the samples']);
  });

  it('reads back from CSV with a standard parser, quoting and all', () => {
    const text = samplesCsv(table);
    expect(text.endsWith('\r\n')).toBe(true);
    const parsed = Papa.parse<Record<string, string>>(text.trimEnd(), { header: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toHaveLength(5);
    expect(parsed.data[4].patch_id).toBe('b,"odd"');
    expect(parsed.data[4].class).toBe('');
    expect(Number(parsed.data[0].pan_sd)).toBe(table.columns.find((c) => c.name === 'pan_sd')!.values[0]);
    expect(Number(parsed.data[1].band_4_nir)).toBe(msValue(3, 7, 2));
  });

  it('reads back from Parquet with typed columns, nulls and metadata', async () => {
    const bytes = samplesParquet(table, { fellfield_scheme: 'conifers' });
    expect(new TextDecoder().decode(bytes.subarray(0, 4))).toBe('PAR1'); // the format's magic, both ends
    expect(new TextDecoder().decode(bytes.subarray(bytes.length - 4))).toBe('PAR1');
    const file = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    const meta = parquetMetadata(file);
    expect(Number(meta.num_rows)).toBe(5);
    expect(meta.key_value_metadata).toContainEqual({ key: 'fellfield_scheme', value: 'conifers' });
    const types = Object.fromEntries(meta.schema.slice(1).map((s) => [s.name, s.type]));
    expect(types).toMatchObject({ patch_id: 'BYTE_ARRAY', row: 'INT32', x: 'DOUBLE', pan_count: 'INT32' });
    const rows = await parquetReadObjects({ file });
    expect(rows).toHaveLength(5);
    expect(rows[0]).toMatchObject({ patch_id: 'a', species: 'pice', class: 'conifer', fold: '2', row: 7, col: 1, x: 500003, band_1_blue: msValue(0, 7, 1), pan_mean: 107.5 });
    expect(rows[4]).toMatchObject({ patch_id: 'b,"odd"', class: null, fold: 'test' });
  });
});
