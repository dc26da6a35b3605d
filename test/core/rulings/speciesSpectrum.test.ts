import { describe, expect, it } from 'vitest';
import { patchSpectrum } from '../../../src/core/render/spectrum.ts';
import { poolPixels, pooledSpectrum, settledPatchesBySpecies } from '../../../src/core/rulings/speciesSpectrum.ts';
import { ruledSite } from '../../app/rulings/ruledSite.ts';
import { recordRuling } from '../../../src/app/rulings/recordRuling.ts';

// The species spectrum: pooled medians with a cluster bootstrap (whole patches resampled).
// The pixel bootstrap it reduces to is checked against SciPy in
// test/reference/render-gdal.test.ts; the whole procedure against NumPy on the demo in
// test/reference/species-spectra.test.ts. Here: the cases worked by hand.

describe('the pooled species spectrum', () => {
  it('takes the median over every pixel of every patch (a worked example)', () => {
    // Band 0 pooled: 1 2 3 | 10 | 4 5 -> sorted 1 2 3 4 5 10, median (3 + 4) / 2.
    const pooled = poolPixels(2, [[[1, 10], [2, 20], [3, 30]], [[10, 100]], [], [[4, 40], [5, 50]]]);
    expect([...pooled.starts]).toEqual([0, 3, 4, 4, 6]);
    const result = pooledSpectrum(pooled, { resamples: 200 });
    expect(result.patches).toBe(3); // the empty one takes no part
    expect(result.pixels).toBe(6);
    expect(result.bands.map((b) => b.median)).toEqual([3.5, 35]);
    for (const b of result.bands) {
      expect(b.low).toBeLessThanOrEqual(b.median);
      expect(b.high).toBeGreaterThanOrEqual(b.median);
    }
  });

  it('is the pixel bootstrap of spectrum.ts when each patch is one pixel (same seed, same draws)', () => {
    const a = Array.from({ length: 37 }, (_, i) => (i * 7919) % 101);
    const b = a.map((v) => 3 * v + 1);
    const ours = pooledSpectrum(poolPixels(2, a.map((v, i) => [[v, b[i]]])), { resamples: 300, seed: 4 });
    const pixelwise = patchSpectrum([a, b], a.map((_, i) => i), { resamples: 300, seed: 4 });
    expect(ours.bands).toEqual(pixelwise.bands);
  });

  it('draws patches, not pixels: twenty copies of each patch value give the interval of the patch values alone', () => {
    // Pixels of one crown alike: the pooled median of drawn patches, each twenty times,
    // is the median of the drawn values (equal multiplicities), so the interval must be
    // that of ten values, not the far narrower one of two hundred independent pixels.
    const values = [12, 40, 7, 33, 25, 18, 51, 29, 3, 44];
    const copies = pooledSpectrum(poolPixels(1, values.map((v) => Array.from({ length: 20 }, () => [v]))), { resamples: 500, seed: 9 });
    const single = pooledSpectrum(poolPixels(1, values.map((v) => [[v]])), { resamples: 500, seed: 9 });
    expect(copies.bands).toEqual(single.bands);
    const naive = patchSpectrum([values.flatMap((v) => Array.from({ length: 20 }, () => v))], Array.from({ length: 200 }, (_, i) => i), { resamples: 500, seed: 9 });
    expect(naive.bands[0].high - naive.bands[0].low).toBeLessThan(copies.bands[0].high - copies.bands[0].low);
  });

  it('says NaN when no patch holds a pixel', () => {
    const result = pooledSpectrum(poolPixels(3, [[], []]));
    expect(result).toMatchObject({ patches: 0, pixels: 0 });
    expect(result.bands.every((b) => Number.isNaN(b.median))).toBe(true);
  });
});

describe('the settled patches of each species', () => {
  it('counts single calls, agreed calls and rulings, and leaves out the open ones', async () => {
    const { site, blindPassId } = await ruledSite([
      { size: 4, first: 'PICE' }, // single
      { size: 5, first: 'PICE', second: { species: 'PICE' } }, // agreed
      { size: 6, first: 'PICE', second: { species: 'ALVI' } }, // open until ruled
      { size: 7, first: 'ALVI', second: { species: "can't tell" } }, // open
    ]);
    expect(Object.fromEntries(settledPatchesBySpecies(site.state))).toEqual({ PICE: ['P1', 'P2'] });
    await recordRuling(site, { patchId: 'P3', decision: { kind: 'accept', passId: blindPassId }, reason: '', seen: null }, { interpreter: 'cy', time: '2025-08-01T10:00:00.000Z' });
    expect(Object.fromEntries(settledPatchesBySpecies(site.state))).toEqual({ PICE: ['P1', 'P2'], ALVI: ['P3'] });
  });
});
