import { describe, expect, it } from 'vitest';
import { median, patchSpectrum, pixelsInside } from '../../../src/core/render/spectrum.ts';

describe('patch spectrum', () => {
  it('finds pixel centres inside a polygon, holes left out', () => {
    const window = { originX: 0, originY: 4, pixelWidth: 1, pixelHeight: 1, width: 4, height: 4 };
    const square = [[[0.6, 0.6], [3.4, 0.6], [3.4, 3.4], [0.6, 3.4], [0.6, 0.6]]] as [number, number][][];
    // Centres at 0.5..3.5: inside for x, y in {1.5, 2.5} -> rows 1, 2 and cols 1, 2.
    expect(pixelsInside(window, square)).toEqual([5, 6, 9, 10]);
    const holed = [square[0], [[1.2, 1.2], [1.8, 1.2], [1.8, 1.8], [1.2, 1.8], [1.2, 1.2]]] as [number, number][][];
    // The hole holds the centre (1.5, 1.5): row 2, col 1.
    expect(pixelsInside(window, holed)).toEqual([5, 6, 10]);
  });

  it('takes the median with the even-count mean', () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([])).toBeNaN();
  });

  it('brackets the median with a bootstrap interval, the same for the same seed', () => {
    const a = Array.from({ length: 101 }, (_, i) => i);
    const b = a.map((v) => 2 * v);
    const result = patchSpectrum([a, b], a.map((_, i) => i), { resamples: 500, seed: 3 });
    expect(result.pixels).toBe(101);
    expect(result.bands[0].median).toBe(50);
    expect(result.bands[1].median).toBe(100);
    expect(result.bands[0].low).toBeLessThan(50);
    expect(result.bands[0].high).toBeGreaterThan(50);
    // The median of a uniform 0..100 sample has sd about 1.25 * 29 / sqrt(101) ~ 3.6 (common practice):
    expect(result.bands[0].high - result.bands[0].low).toBeGreaterThan(6);
    expect(result.bands[0].high - result.bands[0].low).toBeLessThan(30);
    expect(patchSpectrum([a, b], a.map((_, i) => i), { resamples: 500, seed: 3 })).toEqual(result);
  });

  it('leaves out no-data pixels and reports an empty patch as NaN', () => {
    const result = patchSpectrum([[1, 2, 9], [1, 9, 3]], [0, 1, 2], { noData: 9, resamples: 50 });
    expect(result.pixels).toBe(1);
    expect(result.bands[0].median).toBe(1);
    expect(patchSpectrum([[1]], [], {}).bands[0].median).toBeNaN();
  });
});
