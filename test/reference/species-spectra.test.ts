import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { readPurePixels, SpeciesSpectra, inlineSpectra } from '../../src/app/rulings/speciesSpectra.ts';
import { pooledSpectrum, settledPatchesBySpecies } from '../../src/core/rulings/speciesSpectrum.ts';
import { readSiteFile } from '../../src/core/export/siteFile.ts';
import type { SiteState } from '../../src/core/site/index.ts';
import type { Raster } from '../../src/imagery/Raster.ts';
import { openRasterFile } from '../imagery/nodeRaster.ts';

// The species spectra of the Rulings page on the demo (npm run demo:data, seed 1), against
// GDAL 3.6.2, Shapely 1.8.5 and NumPy 1.24.2 (Debian's python3): the pixels whose centres
// Shapely's Polygon.contains puts in each field polygon of the species, their values read
// by GDAL, the pooled numpy.median per band, and a cluster bootstrap written in NumPy
// (whole polygons drawn with replacement, 9999 resamples, percentiles by definition 7 of
// Hyndman & Fan 1996). Ours runs 4000 resamples on another generator, so the intervals
// are two Monte Carlo runs of one procedure: close within max(2 DN, a quarter of the
// interval's width), as for the patch spectrum in render-gdal.test.ts.
// Script: fixtures/rulings/make_species_spectra.py.

const repo = resolve(import.meta.dirname, '../..');
const demo = join(repo, 'demo');
const fixture = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures/rulings/species-spectra.json'), 'utf8')) as {
  inputs: Record<string, string>;
  species: { species: string; patchIds: string[]; pixelsPerPatch: number[]; medians: number[]; intervals: [number, number][] }[];
};
const haveDemo = existsSync(join(demo, 'ms.tif')) && existsSync(join(demo, 'demo.site.json'));

let ms: Raster;
let state: SiteState;

describe.runIf(haveDemo)('species spectra of the demo, against GDAL, Shapely and NumPy', () => {
  beforeAll(async () => {
    for (const name of ['ms.tif', 'demo.site.json']) {
      const hash = createHash('sha256').update(readFileSync(join(demo, name))).digest('hex');
      expect(hash, `demo/${name} differs from the one the fixture was made from; re-run make_species_spectra.py`).toBe(fixture.inputs[name]);
    }
    ms = await openRasterFile(join(demo, 'ms.tif'));
    state = (await readSiteFile(readFileSync(join(demo, 'demo.site.json'), 'utf8'), 'demo.site.json')).state;
  });

  it('finds the settled patches of each species as the fixture does, and their pixels as Shapely', async () => {
    const settled = settledPatchesBySpecies(state);
    for (const expected of fixture.species) {
      expect(settled.get(expected.species)).toEqual(expected.patchIds);
      const outlines = expected.patchIds.map((id) => state.patches.get(id)!.geometry);
      const { pooled, noData } = await readPurePixels(ms, outlines, { kind: 'centre' });
      expect(noData).toBe(0);
      expect(Array.from(pooled.starts.subarray(1), (end, g) => end - pooled.starts[g])).toEqual(expected.pixelsPerPatch);
    }
  });

  it('gives NumPy’s pooled medians exactly and intervals near the NumPy cluster bootstrap', async () => {
    for (const expected of fixture.species) {
      const outlines = expected.patchIds.map((id) => state.patches.get(id)!.geometry);
      const { pooled } = await readPurePixels(ms, outlines, { kind: 'centre' });
      const result = pooledSpectrum(pooled, { resamples: 4000, seed: 11 });
      expect(result.bands.map((b) => b.median)).toEqual(expected.medians);
      result.bands.forEach((b, k) => {
        const [low, high] = expected.intervals[k];
        const tolerance = Math.max(2, 0.25 * (high - low));
        expect(Math.abs(b.low - low), `${expected.species} band ${k + 1} low`).toBeLessThanOrEqual(tolerance);
        expect(Math.abs(b.high - high), `${expected.species} band ${k + 1} high`).toBeLessThanOrEqual(tolerance);
      });
    }
  });

  it('keeps a species’ spectrum while its outlines stay the same, and works it out again when one changes', async () => {
    const spectra = new SpeciesSpectra(inlineSpectra, { resamples: 200, seed: 1 });
    const [first] = fixture.species;
    const outlines = first.patchIds.map((id) => state.patches.get(id)!.geometry);
    const a = await spectra.of(ms, first.species, outlines, { kind: 'centre' });
    expect(await spectra.of(ms, first.species, [...outlines], { kind: 'centre' })).toBe(a);
    const edited = [...outlines.slice(1), structuredClone(outlines[0])];
    const b = await spectra.of(ms, first.species, edited, { kind: 'centre' });
    expect(b).not.toBe(a);
    expect(b.spectrum.bands.map((x) => x.median)).toEqual(first.medians); // the same pixels, pooled in another order
    expect(await spectra.of(ms, first.species, outlines, { kind: 'inside', buffer: 0.5 })).not.toBe(a);
  });
});
