import { spawnSync } from 'node:child_process';
import { expect } from 'vitest';

// Helpers for the checks against GDAL (Debian gdal-bin 3.6, "GDAL 3.6.2").

export const gdalVersion: string | null = (() => {
  const result = spawnSync('gdalinfo', ['--version'], { encoding: 'utf8' });
  return result.status === 0 ? result.stdout.trim() : null;
})();

/** Tests skip with this message where gdalinfo is missing; on CI a missing GDAL fails. */
export const gdalMissing = 'gdalinfo not found: install Debian gdal-bin to run the GDAL reference checks';

export interface GdalInfo {
  size: [number, number];
  geoTransform?: number[];
  metadata: Record<string, Record<string, string>>;
  bands: {
    band: number;
    block: [number, number];
    type: string;
    description?: string;
    noDataValue?: number | string;
    overviews?: { size: [number, number] }[];
    metadata: Record<string, Record<string, string>>;
  }[];
  /** From gdalinfo's "stac" "proj:epsg". */
  epsg: number | null;
}

export function gdalinfo(path: string): { info: GdalInfo; stderr: string } {
  const result = spawnSync('gdalinfo', ['-json', path], { encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`gdalinfo failed on ${path}: ${result.stderr}`);
  const raw = JSON.parse(result.stdout);
  return { info: { ...raw, epsg: raw.stac?.['proj:epsg'] ?? null }, stderr: result.stderr };
}

export const gdalTypes: Record<string, string> = {
  Byte: 'uint8', Int8: 'int8', UInt16: 'uint16', Int16: 'int16', UInt32: 'uint32', Int32: 'int32',
  Float32: 'float32', Float64: 'float64',
};

/** `fellfield info --json` and gdalinfo agree on everything both report. */
export function expectAgreement(ours: Record<string, unknown>, gdal: GdalInfo): void {
  const o = ours as {
    width: number; height: number; bands: number; dtype: string; epsg: number | null; pixel_size: number[];
    origin: number[]; extent: number[]; tiled: boolean; tile_size: number[] | null; block_size: number[];
    compression: string; predictor: number; overviews: number; overview_sizes: number[][]; nodata: number | string | null;
    interleave: string;
  };
  expect([o.width, o.height]).toEqual(gdal.size);
  expect(o.bands).toBe(gdal.bands.length);
  expect(o.dtype).toBe(gdalTypes[gdal.bands[0].type]);
  expect(o.epsg).toBe(gdal.epsg);
  const [ox, px, rx, oy, ry, py] = gdal.geoTransform ?? [0, 1, 0, 0, 0, 1];
  expect([rx, ry]).toEqual([0, 0]);
  expect(o.origin[0]).toBeCloseTo(ox, 9);
  expect(o.origin[1]).toBeCloseTo(oy, 9);
  expect(o.pixel_size[0]).toBeCloseTo(px, 12);
  expect(o.pixel_size[1]).toBeCloseTo(-py, 12);
  const [w, h] = gdal.size;
  const extent = [ox, oy + h * py, ox + w * px, oy];
  o.extent.forEach((v, i) => expect(v).toBeCloseTo(extent[i], 6));
  expect(o.block_size).toEqual(gdal.bands[0].block);
  if (o.tiled) expect(o.tile_size).toEqual(gdal.bands[0].block);
  const structure = gdal.metadata.IMAGE_STRUCTURE ?? {};
  expect(o.compression).toBe((structure.COMPRESSION ?? 'none').toLowerCase());
  expect(String(o.predictor)).toBe(structure.PREDICTOR ?? '1');
  if (o.bands > 1) expect(o.interleave).toBe((structure.INTERLEAVE ?? '').toLowerCase());
  const overviews = gdal.bands[0].overviews ?? [];
  expect(o.overviews).toBe(overviews.length);
  expect(o.overview_sizes).toEqual(overviews.map((v) => v.size));
  const nodata = gdal.bands[0].noDataValue;
  if (nodata === undefined) expect(o.nodata).toBeNull();
  else if (typeof nodata === 'string') expect(String(o.nodata).toLowerCase()).toBe(nodata.toLowerCase());
  else expect(o.nodata).toBe(nodata);
}
