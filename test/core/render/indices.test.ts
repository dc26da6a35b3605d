import { describe, expect, it } from 'vitest';
import { bandForRole, indexBands, normalisedDifference } from '../../../src/core/render/indices.ts';
import { presetBandTable } from '../../../src/core/bandTable.ts';
import { maskShare, thresholdMask, vegetationMask } from '../../../src/core/render/thresholdMask.ts';
import { colourise, rampTable, vegetationRamp } from '../../../src/core/render/colourRamp.ts';

describe('vegetation indices', () => {
  it('computes the normalised difference (Rouse et al. 1974 for NDVI)', () => {
    // NIR 0.5, red 0.08 reflectance: (0.5 - 0.08) / (0.58) = 0.7241...
    const ndvi = normalisedDifference([0.5, 0, 100, 7], [0.08, 0, 100, 0], 7);
    expect(ndvi[0]).toBeCloseTo(0.42 / 0.58, 6);
    expect(ndvi[1]).toBeNaN(); // both zero
    expect(ndvi[2]).toBe(0);
    expect(ndvi[3]).toBeNaN(); // no-data
  });

  it('finds the bands of each index in the 8-band preset', () => {
    const table = presetBandTable(8)!;
    expect(indexBands(table, 'ndvi')).toEqual({ a: 6, b: 4 }); // NIR1, red
    expect(indexBands(table, 'ndre')).toEqual({ a: 6, b: 5 }); // NIR1, red edge
    expect(indexBands(table, 'gndvi')).toEqual({ a: 6, b: 2 }); // NIR1, green
  });

  it('finds bands by wavelength when names are plain', () => {
    const table = [
      { index: 1, name: 'b1', centre_nm: 490 }, { index: 2, name: 'b2', centre_nm: 560 },
      { index: 3, name: 'b3', centre_nm: 665 }, { index: 4, name: 'b4', centre_nm: 842 },
    ];
    expect(bandForRole(table, 'red')).toBe(2);
    expect(bandForRole(table, 'nir')).toBe(3);
    expect(bandForRole(table, 'rededge')).toBeNull();
  });

  it('says which band is missing for an index the table cannot feed', () => {
    const fourBands = presetBandTable(4)!;
    expect(indexBands(fourBands, 'ndre')).toEqual({ problem: 'NDRE (red edge) needs a rededge band, and the band table has none' });
  });
});

describe('threshold mask and colour ramp', () => {
  it('keeps pixels at or above the threshold, never NaN', () => {
    expect([...thresholdMask([0.1, 0.3, 0.31, NaN, 0.9], 0.3)]).toEqual([0, 1, 1, 0, 1]);
    expect(maskShare(new Uint8Array([1, 0, 1, 1]))).toBe(0.75);
  });

  it('masks vegetation from all bands through the band table', () => {
    const table = presetBandTable(4)!; // blue, green, red, NIR
    const bands = [[1, 1], [1, 1], [100, 100], [400, 110]];
    expect([...vegetationMask(bands, table, { index: 'ndvi', min: 0.3 })]).toEqual([1, 0]);
    expect(() => vegetationMask(bands, table, { index: 'ndre', min: 0.3 })).toThrow(/rededge/);
    expect(() => vegetationMask(bands.slice(0, 2), table, { index: 'ndvi', min: 0.3 })).toThrow(/only 2 bands/);
  });

  it('runs through the ramp from its low to its high colour, transparent where empty', () => {
    const table = rampTable(vegetationRamp);
    const rgba = colourise([-1, 1, NaN, 0.5], table, -1, 1, new Uint8Array([1, 1, 1, 0]));
    expect([...rgba.slice(0, 4)]).toEqual([...vegetationRamp.stops[0].rgb, 255]);
    expect([...rgba.slice(4, 8)]).toEqual([...vegetationRamp.stops[4].rgb, 255]);
    expect(rgba[11]).toBe(0);
    expect(rgba[15]).toBe(0);
    expect(() => rampTable({ name: 'bad', stops: [{ at: 0.2, rgb: [0, 0, 0] }, { at: 1, rgb: [1, 1, 1] }] })).toThrow(/rising stops/);
  });
});
