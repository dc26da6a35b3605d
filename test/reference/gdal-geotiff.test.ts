// Reference check: GDAL (Debian gdal-bin 3.6, `gdalinfo -json` and `gdal_translate`) reads
// the files our writer makes as we meant them, and `fellfield info --json` agrees with
// gdalinfo on them. Source: GDAL, the general-purpose reference reader (see SOURCES.md).
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeDemoSite } from '../../src/cli/demo-data.ts';
import { averageOverview } from '../../src/core/tiff/overview.ts';
import { writeGeoTiff, type WriteGeoTiffOptions } from '../../src/core/tiff/writeGeoTiff.ts';
import { makeBands } from '../core/tiff/helpers.ts';
import { expectAgreement, gdalinfo, gdalMissing, gdalTypes, gdalVersion } from './gdal.ts';

const dir = mkdtempSync(join(tmpdir(), 'fellfield-gdal-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function fellfieldInfo(path: string): Promise<Record<string, unknown>> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await main(['info', path, '--json', '--verify'], { stdout: (t) => out.push(t), stderr: (t) => err.push(t) });
  expect(err).toEqual([]);
  expect(code).toBe(0);
  return JSON.parse(out.join(''));
}

/** GDAL's own decoding of one band of a level (-1 the full image), as raw samples. */
function gdalPixels(path: string, overview: number, band: number, dtype: string): ArrayLike<number> {
  const out = join(dir, `px-${Math.random().toString(36).slice(2)}.bin`);
  const args = ['-q', '-of', 'ENVI', '-b', String(band + 1), ...(overview >= 0 ? ['-ovr', String(overview)] : []), path, out];
  const result = spawnSync('gdal_translate', args, { encoding: 'utf8' });
  if (result.status !== 0) throw new Error(`gdal_translate failed: ${result.stderr}`);
  const raw = readFileSync(out);
  const buffer = raw.buffer.slice(raw.byteOffset, raw.byteOffset + raw.byteLength);
  switch (dtype) {
    case 'uint8':
      return new Uint8Array(buffer);
    case 'uint16':
      return new Uint16Array(buffer);
    case 'int16':
      return new Int16Array(buffer);
    default:
      return new Float32Array(buffer);
  }
}

const utm = { epsg: 32632, origin: [612000, 5143000] as [number, number], pixelSize: [0.5, 0.5] as [number, number] };

const cases: [string, WriteGeoTiffOptions][] = [
  ['uint16, deflate, predictor, 3 bands, no-data, names', {
    ...utm, width: 150, height: 90, sampleType: 'uint16', bands: makeBands('uint16', 150, 90, 3, 1), tileSize: 32,
    noData: 0, bandNames: ['blue', 'green', 'red'], bandWavelengthsNm: [482, 561, 655], overviewFactors: [2, 4, 8],
  }],
  ['uint8, LZW, predictor, 1 band', {
    ...utm, width: 70, height: 50, sampleType: 'uint8', bands: makeBands('uint8', 70, 50, 1, 2), tileSize: 16, compression: 'lzw', overviewFactors: [2],
  }],
  ['int16, PackBits, strips, 2 bands', {
    ...utm, width: 61, height: 40, sampleType: 'int16', bands: makeBands('int16', 61, 40, 2, 3), tileSize: 16, compression: 'packbits',
    predictor: false, stripped: true, overviewFactors: [2, 4],
  }],
  ['float32, deflate, floating-point predictor, no-data -9999', {
    ...utm, width: 45, height: 33, sampleType: 'float32', bands: makeBands('float32', 45, 33, 2, 4), tileSize: 16, noData: -9999, overviewFactors: [3],
  }],
  ['float32, uncompressed, NaN no-data, geographic', {
    epsg: 4326, origin: [10.5, 46.3], pixelSize: [1e-5, 1e-5], width: 40, height: 20, sampleType: 'float32',
    bands: makeBands('float32', 40, 20, 1, 5), tileSize: 16, compression: 'none', noData: NaN, overviewFactors: [],
  }],
  ['uint16, LZW, predictor, strips', {
    ...utm, width: 100, height: 37, sampleType: 'uint16', bands: makeBands('uint16', 100, 37, 2, 6), tileSize: 32, compression: 'lzw', stripped: true, overviewFactors: [2],
  }],
];

describe.skipIf(!gdalVersion && !process.env.CI)(`GDAL reads what writeGeoTiff writes (${gdalVersion ?? gdalMissing})`, () => {
  it('has gdalinfo', () => {
    expect(gdalVersion, gdalMissing).toMatch(/^GDAL 3\./);
  });

  for (const [name, options] of cases) {
    it(name, async () => {
      const path = join(dir, `${name.replace(/[^a-z0-9]+/gi, '-')}.tif`);
      writeFileSync(path, writeGeoTiff(options));
      const { info, stderr } = gdalinfo(path);
      expect(stderr).toBe(''); // no warning from libtiff or GDAL

      // What we wrote, as GDAL sees it.
      const factors = options.overviewFactors ?? [];
      const tile = options.tileSize ?? 256;
      expect(info.size).toEqual([options.width, options.height]);
      expect(info.bands).toHaveLength(options.bands.length);
      expect(info.bands.every((b) => gdalTypes[b.type] === options.sampleType)).toBe(true);
      expect(info.epsg).toBe(options.epsg);
      const [ox, px, , oy, , py] = info.geoTransform!;
      expect([ox, oy]).toEqual(options.origin);
      expect([px, -py]).toEqual(options.pixelSize);
      expect(info.metadata['']?.AREA_OR_POINT).toBe('Area');
      const rows = Math.max(1, Math.min(options.height, Math.floor((tile * tile) / options.width)));
      expect(info.bands[0].block).toEqual(options.stripped ? [options.width, rows] : [tile, tile]);
      const structure = info.metadata.IMAGE_STRUCTURE;
      const compression = options.compression ?? 'deflate';
      expect(structure.COMPRESSION).toBe(compression === 'none' ? undefined : compression.toUpperCase());
      if (compression !== 'none' && options.predictor !== false) expect(structure.PREDICTOR).toBe(options.sampleType === 'float32' ? '3' : '2');
      if (options.bands.length > 1) expect(structure.INTERLEAVE).toBe('BAND');
      expect((info.bands[0].overviews ?? []).map((o) => o.size)).toEqual(
        factors.map((f) => [Math.ceil(options.width / f), Math.ceil(options.height / f)]),
      );
      if (options.noData === undefined) expect(info.bands[0].noDataValue).toBeUndefined();
      else if (Number.isNaN(options.noData)) expect(String(info.bands[0].noDataValue).toLowerCase()).toBe('nan');
      else expect(info.bands[0].noDataValue).toBe(options.noData);
      options.bandNames?.forEach((n, b) => expect(info.bands[b].description).toBe(n));
      options.bandWavelengthsNm?.forEach((nm, b) => expect(info.bands[b].metadata['']?.wavelength_nm).toBe(String(nm)));

      // GDAL decodes the same pixels, at every level.
      for (let b = 0; b < options.bands.length; b++) {
        expect(Array.from(gdalPixels(path, -1, b, options.sampleType))).toEqual(Array.from(options.bands[b]));
        factors.forEach((f, level) => {
          const ours = averageOverview(options.bands[b], options.width, options.height, f, options.noData);
          expect(Array.from(gdalPixels(path, level, b, options.sampleType))).toEqual(Array.from(ours));
        });
      }

      // And fellfield info says what gdalinfo says.
      expectAgreement(await fellfieldInfo(path), info);
    });
  }

  it('fellfield info agrees with gdalinfo on the demo site', async () => {
    const site = await writeDemoSite({ out: join(dir, 'demo'), size: 512 });
    const tifs = site.files.filter((f) => f.endsWith('.tif'));
    expect(tifs.length).toBeGreaterThanOrEqual(2);
    for (const name of tifs) {
      const path = join(site.dir, name);
      const { info, stderr } = gdalinfo(path);
      expect(stderr).toBe('');
      expectAgreement(await fellfieldInfo(path), info);
    }
  }, 120_000);
});
