import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { histogramOf, limitsFor } from '../../src/core/render/bandSample.ts';
import { stretchValue } from '../../src/core/render/stretch.ts';
import { normalisedDifference } from '../../src/core/render/indices.ts';
import { brovey, upsampleNearest } from '../../src/core/render/pansharpen.ts';
import { patchSpectrum, pixelsInside } from '../../src/core/render/spectrum.ts';
import { transformer } from '../../src/core/crs.ts';
import type { Raster } from '../../src/imagery/Raster.ts';
import { multispectralWindow, renderSharpenedTile } from '../../src/imagery/sharpenedTile.ts';
import type { RgbaTile } from '../../src/imagery/renderJobs.ts';
import { openRasterFile } from '../imagery/nodeRaster.ts';

// Stretch, indices, pan-sharpening and patch spectra of the demo scene (npm run
// demo:data, seed 1) against values computed by outside tools and committed as
// fixtures: GDAL 3.6.2 (Debian python3-gdal: ComputeStatistics, gdal_translate -scale
// -exponent, the VRT pan-sharpening of weighted Brovey), NumPy 1.24.2 (percentiles by
// method 'inverted_cdf', histogram, median), SciPy 1.10.1 (stats.bootstrap, percentile
// method) and Shapely 1.8.5 (Polygon.contains). Script: fixtures/render/make_fixtures.py.

const repo = resolve(import.meta.dirname, '../..');
const demo = join(repo, 'demo');
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures/render/render-values.json'), 'utf8'));
const haveDemo = existsSync(join(demo, 'ms.tif')) && existsSync(join(demo, 'pan.tif'));

let ms: Raster;
let pan: Raster;

describe.runIf(haveDemo)('rendering the demo scene, against GDAL, NumPy, SciPy and Shapely', () => {
  beforeAll(async () => {
    for (const name of ['ms.tif', 'pan.tif']) {
      const hash = createHash('sha256').update(readFileSync(join(demo, name))).digest('hex');
      // The fixtures describe one demo scene: a changed generator needs new fixtures.
      expect(hash, `demo/${name} differs from the one the fixtures were made from; re-run make_fixtures.py`).toBe(fixture.inputs[name]);
    }
    ms = await openRasterFile(join(demo, 'ms.tif'));
    pan = await openRasterFile(join(demo, 'pan.tif'));
  });

  it('samples the 256 x 256 overview for the default stretch: GDAL mean and sd, NumPy percentiles and histogram', async () => {
    expect(ms.summary.levels[ms.statsLevel()].width).toBe(256);
    for (const expected of fixture.overviewStats) {
      const sample = await ms.sample(expected.band - 1);
      expect(sample.sorted.length).toBe(65536);
      expect(sample.mean).toBeCloseTo(expected.mean, 6); // GDALRasterBand::ComputeStatistics
      expect(sample.sd).toBeCloseTo(expected.sd, 6);
      expect(limitsFor(sample, { kind: 'percentile', low: 2, high: 98 })).toMatchObject({ min: expected.p2, max: expected.p98 });
      expect(limitsFor(sample, { kind: 'percentile', low: 0.5, high: 99.5 })).toMatchObject({ min: expected['p0.5'], max: expected['p99.5'] });
      expect(limitsFor(sample, { kind: 'minmax' })).toMatchObject({ min: expected.min, max: expected.max });
      expect([...histogramOf(sample, 16, [expected.min, expected.max]).counts]).toEqual(expected.histogram16);
      // 11-bit data in uint16: the default limits are the data's, far below 65535.
      expect(expected.p98).toBeLessThan(2048);
    }
  });

  it('stretches with gamma as gdal_translate -scale -exponent does (within one level)', async () => {
    const [x, y, w, h] = fixture.stretch.window;
    const [red] = await ms.readWindow(0, { x0: x, y0: y, x1: x + w, y1: y + h }, [4]);
    for (const c of fixture.stretch.cases) {
      const ours = Array.from(red, (v) => stretchValue(v, { min: c.min, max: c.max, gamma: c.gamma }));
      const worst = Math.max(...ours.map((v, i) => Math.abs(v - c.bytes[i])));
      expect(worst).toBeLessThanOrEqual(1);
      expect(ours.filter((v, i) => v === c.bytes[i]).length / ours.length).toBeGreaterThan(0.95);
    }
  });

  it('computes NDVI, NDRE and green NDVI as NumPy does on GDAL-read bands', async () => {
    const [x, y, w, h] = fixture.indices.window;
    const [green, red, rededge, nir] = await ms.readWindow(0, { x0: x, y0: y, x1: x + w, y1: y + h }, [2, 4, 5, 6]);
    const cases: [Float32Array, number[]][] = [
      [normalisedDifference(nir, red), fixture.indices.ndvi],
      [normalisedDifference(nir, rededge), fixture.indices.ndre],
      [normalisedDifference(nir, green), fixture.indices.gndvi],
    ];
    for (const [ours, theirs] of cases) {
      expect(ours.length).toBe(theirs.length);
      for (let i = 0; i < ours.length; i++) expect(ours[i]).toBeCloseTo(theirs[i], 6);
    }
  });

  it('pan-sharpens one pan tile as GDAL weighted Brovey with nearest upsampling does (within 1 DN)', async () => {
    const [px, py, pw, ph] = fixture.brovey.panWindow;
    const level = 0, bx = px / pw, by = py / ph;
    const { msLevel, msBox, x0, y0, step } = multispectralWindow(pan, ms, level, bx, by);
    expect(msLevel).toBe(0);
    expect(step).toBeCloseTo(0.25, 12);
    const bands: number[] = fixture.brovey.bands.map((b: number) => b - 1);
    const windows = await ms.readWindow(msLevel, msBox, bands);
    const [panValues] = await pan.readWindow(level, { x0: px, y0: py, x1: px + pw, y1: py + ph }, [0]);
    const bw = msBox.x1 - msBox.x0, bh = msBox.y1 - msBox.y0;
    const upsampled = windows.map((w) => upsampleNearest(w, bw, bh, pw, ph, x0 - msBox.x0, y0 - msBox.y0, step));
    const sharpened = brovey({ pan: panValues, bands: upsampled });
    let worst = 0;
    fixture.brovey.picks.forEach((pixel: number, i: number) => {
      for (let k = 0; k < 3; k++) worst = Math.max(worst, Math.abs(sharpened[k][pixel] - fixture.brovey.values[k][i]));
    });
    expect(worst).toBeLessThanOrEqual(1); // GDAL rounds to the uint16 output

    // The tile the map draws is these values, stretched.
    const limits = bands.map(() => ({ min: 40, max: 500, gamma: 1 }));
    const tile = (await renderSharpenedTile(pan, ms, level, bx, by, { method: 'brovey', bands, limits, gain: 1 })) as RgbaTile;
    expect([tile.width, tile.height]).toEqual([256, 256]);
    for (const pixel of [0, 1000, 40_000, 65_535]) {
      for (let k = 0; k < 3; k++) expect(tile.rgba[pixel * 4 + k]).toBe(stretchValue(sharpened[k][pixel], limits[k]));
    }
  });

  it('finds the pixels of a field polygon as Shapely does, their medians as NumPy and intervals near SciPy bootstrap', async () => {
    const spec = fixture.spectrum;
    // proj4 (the app's projection library) against GDAL/PROJ for the polygon's corners.
    const toUtm = transformer(4326, 32608);
    spec.ringLonLat.forEach((p: [number, number], i: number) => {
      const [x, y] = toUtm(p);
      expect(Math.abs(x - spec.ringUtm[i][0])).toBeLessThan(0.001);
      expect(Math.abs(y - spec.ringUtm[i][1])).toBeLessThan(0.001);
    });
    const ring: [number, number][] = spec.ringUtm;
    const xs = ring.map((p) => p[0]), ys = ring.map((p) => p[1]);
    const [ox, oy] = ms.summary.origin;
    const size = ms.summary.pixelSize[0];
    const box = {
      x0: Math.floor((Math.min(...xs) - ox) / size), x1: Math.ceil((Math.max(...xs) - ox) / size),
      y0: Math.floor((oy - Math.max(...ys)) / size), y1: Math.ceil((oy - Math.min(...ys)) / size),
    };
    const width = box.x1 - box.x0;
    const window = { originX: ox + box.x0 * size, originY: oy - box.y0 * size, pixelWidth: size, pixelHeight: size, width, height: box.y1 - box.y0 };
    const inside = pixelsInside(window, [ring]);
    expect(inside.map((i) => [box.x0 + (i % width), box.y0 + Math.floor(i / width)])).toEqual(spec.pixels);
    const bands = await ms.readWindow(0, box, [0, 1, 2, 3, 4, 5, 6, 7]);
    const result = patchSpectrum(bands, inside, { resamples: 4000, seed: 7 });
    expect(result.bands.map((b) => b.median)).toEqual(spec.medians);
    result.bands.forEach((b, k) => {
      const [low, high] = spec.intervals[k];
      // Two Monte Carlo runs of the same bootstrap: close, not equal.
      const tolerance = Math.max(2, 0.25 * (high - low));
      expect(Math.abs(b.low - low)).toBeLessThanOrEqual(tolerance);
      expect(Math.abs(b.high - high)).toBeLessThanOrEqual(tolerance);
    });
  });
});
