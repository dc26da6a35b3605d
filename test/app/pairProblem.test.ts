import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';
import { pairProblem } from '../../src/app/openImageryFiles.ts';
import { bandTableFor, bandTableProblem } from '../../src/core/bandTable.ts';
import { openRasterFile } from '../imagery/nodeRaster.ts';

// How a panchromatic and a multiband raster that do not pair are told apart, and band
// tables that do not fit their raster.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-pair-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function raster(name: string, bands: number, epsg: number, origin: [number, number], pixel: number, size: number) {
  const path = join(dir, name);
  writeFileSync(path, writeGeoTiff({
    width: size, height: size, sampleType: 'uint16', bands: Array.from({ length: bands }, () => new Uint16Array(size * size).fill(100)),
    epsg, origin, pixelSize: [pixel, pixel], tileSize: 32, overviewFactors: [],
  }));
  return openRasterFile(path);
}

describe('pairing a scene', () => {
  it('accepts a pan and a multiband raster over the same ground', async () => {
    const pan = await raster('pan.tif', 1, 32633, [500000, 5000000], 0.5, 64);
    const ms = await raster('ms.tif', 4, 32633, [500000, 5000000], 2, 16);
    expect(pairProblem(pan, ms)).toBeNull();
  });
  it('says which CRS each is in and what to do', async () => {
    const pan = await raster('pan-n.tif', 1, 32633, [500000, 5000000], 0.5, 64);
    const ms = await raster('ms-s.tif', 4, 32733, [500000, 5000000], 2, 16);
    expect(pairProblem(pan, ms)).toBe('pan-n.tif is in EPSG:32633 but ms-s.tif is in EPSG:32733; a scene\'s rasters must share one CRS, so only pan-n.tif is shown (reproject one, e.g. gdalwarp -t_srs EPSG:32633)');
  });
  it('says how far apart footprints that do not overlap are, and how much a partial one covers', async () => {
    const pan = await raster('pan-a.tif', 1, 32633, [500000, 5000000], 0.5, 64);
    const far = await raster('ms-far.tif', 4, 32633, [500100, 4999950], 2, 16);
    expect(pairProblem(pan, far)).toBe('pan-a.tif and ms-far.tif do not overlap: the centre of ms-far.tif lies 100 m east and 50 m south of the other\'s');
    const half = await raster('ms-half.tif', 4, 32633, [500016, 5000000], 2, 16);
    expect(pairProblem(pan, half)).toBe('ms-half.tif covers only 50 % of pan-a.tif; pan-sharpened views are empty outside it');
  });
});

describe('band tables that do not fit', () => {
  it('falls back to the preset and says why when the names do not match the band count', () => {
    const names = ['blue', 'green', 'red'];
    expect(bandTableFor(4, names, null).map((b) => b.name)).toEqual(['blue', 'green', 'red', 'NIR']);
    expect(bandTableProblem(4, names, null)).toBe('its metadata names 3 bands but the raster has 4, so the 4-band preset is used instead');
    expect(bandTableProblem(5, names, null)).toMatch(/band numbers are used instead/);
    expect(bandTableProblem(4, null, [480, 545])).toBe('its metadata gives 2 wavelengths for 4 bands; they are left out');
    expect(bandTableFor(4, null, [480, 545])[0].centre_nm).toBe(480); // the preset's own
    expect(bandTableProblem(4, ['a', 'b', 'c', 'd'], [1, 2, 3, 4])).toBeNull();
  });
});
