// Reference check: GeoTIFFs written by GDAL 3.6.2 (gdal_translate and gdaladdo, Debian
// gdal-bin; made by fixtures/gdal-tiff/make.sh, version in VERSION.txt) read back through
// inspectTiff + decodeTile to the values of the ASCII grids they were made from, and
// inspectTiff reports what gdalinfo reported of them (the committed *.gdalinfo.json).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { infoJson } from '../../src/cli/verbs/info.ts';
import { inspectTiff } from '../../src/core/tiff/inspectTiff.ts';
import { averageOverview } from '../../src/core/tiff/overview.ts';
import { memoryReader, readBand } from '../core/tiff/helpers.ts';
import { expectAgreement, type GdalInfo } from './gdal.ts';

const fixture = (name: string) => new URL(`./fixtures/gdal-tiff/${name}`, import.meta.url);

/** The values of an ESRI ASCII grid, row by row. */
function ascii(name: string): number[] {
  const lines = readFileSync(fixture(name), 'utf8').trim().split('\n');
  return lines.filter((l) => !/^[a-z]/i.test(l.trim())).flatMap((l) => l.trim().split(/\s+/).map(Number));
}

const asType = (dtype: string) => (v: number) => (dtype.startsWith('float') ? Math.fround(v) : v);

const fixtures: { file: string; sources: string[]; version: string; bigTiff?: boolean; bigEndian?: boolean }[] = [
  { file: 'deflate-uint16-band', sources: ['u1', 'u2', 'u3'], version: 'deflate, predictor 2, band-separate, 2 overviews' },
  { file: 'lzw-uint8-pixel', sources: ['b1', 'b2', 'b3'], version: 'LZW, predictor 2, pixel-interleaved' },
  { file: 'deflate-uint16-pixel', sources: ['u1', 'u2', 'u3'], version: 'deflate, 16-bit predictor 2 across 3 samples, 32 x 16 tiles' },
  { file: 'packbits-int16-strips', sources: ['s1'], version: 'PackBits, signed, strips of 5 rows' },
  { file: 'deflate-float32-pred3', sources: ['f1'], version: 'deflate, floating-point predictor, no-data -9999' },
  { file: 'lzw-float32-bigendian', sources: ['f1'], version: 'LZW, big-endian floats, strips of 7', bigEndian: true },
  { file: 'lzw-int16-bigendian-pred2', sources: ['s1'], version: 'LZW, predictor 2, big-endian, signed', bigEndian: true },
  { file: 'none-uint16-bigtiff-bigendian', sources: ['u1', 'u2'], version: 'BigTIFF, big-endian, uncompressed strips', bigTiff: true, bigEndian: true },
  { file: 'deflate-uint8-geographic', sources: ['b1'], version: 'EPSG:4326, one 256 x 256 tile' },
];

describe('GDAL-written GeoTIFFs read by inspectTiff + decodeTile', () => {
  for (const f of fixtures) {
    it(`${f.file}.tif (${f.version})`, async () => {
      const bytes = new Uint8Array(readFileSync(fixture(`${f.file}.tif`)));
      const summary = await inspectTiff(memoryReader(bytes), bytes.length, `${f.file}.tif`);
      expect(summary.warnings).toEqual([]);
      expect(summary.bigTiff).toBe(f.bigTiff ?? false);
      expect(summary.littleEndian).toBe(!f.bigEndian);
      const gdal = JSON.parse(readFileSync(fixture(`${f.file}.gdalinfo.json`), 'utf8')) as GdalInfo;
      expectAgreement(infoJson(summary, 0), gdal);
      f.sources.forEach((source, band) => {
        expect(readBand(bytes, summary, 0, band)).toEqual(ascii(`${source}.asc`).map(asType(summary.dtype)));
      });
    });
  }

  it('an overview GDAL averaged (gdaladdo -r average) decodes to what GDAL decodes, and to our own mean', async () => {
    const bytes = new Uint8Array(readFileSync(fixture('deflate-uint16-band.tif')));
    const summary = await inspectTiff(memoryReader(bytes), bytes.length, 'deflate-uint16-band.tif');
    const gdalOverview = ascii('deflate-uint16-band.ovr1.b1.asc');
    expect(readBand(bytes, summary, 1, 0)).toEqual(gdalOverview);
    // 40 x 24 divides by 2, so each overview pixel is the mean of one 2 x 2 block, no-data left out.
    const full = Uint16Array.from(ascii('u1.asc'));
    expect(Array.from(averageOverview(full, 40, 24, 2, 0))).toEqual(gdalOverview);
  });
});
