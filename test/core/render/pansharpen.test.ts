import { describe, expect, it } from 'vitest';
import { brovey, fastIhs, panGain, upsampleNearest } from '../../../src/core/render/pansharpen.ts';

// Hand cases of the published formulas; the GDAL comparison is in
// test/reference/render-gdal.test.ts.

describe('Brovey transform (Gillespie, Kahle & Walker 1987; GDAL WeightedBrovey)', () => {
  it('scales each band by pan over the weighted intensity', () => {
    // R, G, B = 30, 60, 90: I = 60 with equal weights; pan 120 doubles every band.
    const [r, g, b] = brovey({ pan: [120], bands: [[30], [60], [90]] });
    expect([r[0], g[0], b[0]]).toEqual([60, 120, 180]);
  });
  it('keeps band ratios and uses the given weights', () => {
    // weights 0.5, 0.25, 0.25: I = 0.5*40 + 0.25*80 + 0.25*120 = 70; pan 35 halves.
    const out = brovey({ pan: [35], bands: [[40], [80], [120]], weights: [0.5, 0.25, 0.25] });
    expect(out.map((b) => b[0])).toEqual([20, 40, 60]);
  });
  it('leaves zero intensity at zero and marks no-data as NaN', () => {
    const out = brovey({ pan: [50, 0], bands: [[0, 5], [0, 5], [0, 5]], noData: 0 });
    expect(out[0][0]).toBeNaN();
    expect(out[0][1]).toBeNaN();
    const plain = brovey({ pan: [50], bands: [[0], [0], [0]] });
    expect(plain[0][0]).toBe(0);
  });
  it('refuses mismatched inputs', () => {
    expect(() => brovey({ pan: [1, 2], bands: [[1]] })).toThrow(/upsampled to the pan grid/);
    expect(() => brovey({ pan: [1], bands: [[1]], weights: [1, 2] })).toThrow(/weights/);
  });
});

describe('fast IHS fusion (Tu et al. 2001)', () => {
  it('adds pan minus intensity to every band', () => {
    const [r, g, b] = fastIhs({ pan: [100], bands: [[30], [60], [90]] });
    expect([r[0], g[0], b[0]]).toEqual([70, 100, 130]);
  });

  it('equals the linear IHS transform with I replaced by pan', () => {
    // The linear IHS forward transform quoted by Tu et al. (2001), eq. 1 (matrix from memory):
    // I = (R+G+B)/3, v1 = (-sqrt2 R - sqrt2 G + 2 sqrt2 B)/6, v2 = (R - G)/sqrt2.
    const s2 = Math.SQRT2;
    const forward = [[1 / 3, 1 / 3, 1 / 3], [-s2 / 6, -s2 / 6, (2 * s2) / 6], [1 / s2, -1 / s2, 0]];
    const rgb = [412, 730, 198], pan = 611;
    const ihs = forward.map((row) => row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2]);
    ihs[0] = pan;
    const back = solve3(forward, ihs);
    const fused = fastIhs({ pan: [pan], bands: rgb.map((v) => [v]) }).map((b) => b[0]);
    for (let k = 0; k < 3; k++) expect(fused[k]).toBeCloseTo(back[k], 3);
  });

  it('clips at zero and matches scales by the ratio of means', () => {
    expect(fastIhs({ pan: [0], bands: [[10], [20], [90]] }).map((b) => b[0])).toEqual([0, 0, 50]);
    expect(panGain(200, 50)).toBe(0.25);
    expect(panGain(0, 50)).toBe(1);
  });
});

describe('nearest-neighbour upsampling', () => {
  it('maps each target pixel centre to its source pixel', () => {
    // A 2 x 2 source at four times the pixel size, read from its corner.
    const out = upsampleNearest([1, 2, 3, 4], 2, 2, 8, 8, 0, 0, 0.25);
    expect(out[0]).toBe(1);
    expect(out[3]).toBe(1);
    expect(out[4]).toBe(2);
    expect(out[8 * 4]).toBe(3);
    expect(out[63]).toBe(4);
  });
  it('reads outside the source as the given value', () => {
    const out = upsampleNearest([1, 2, 3, 4], 2, 2, 4, 1, 1.5, 0, 0.5, -1);
    // centres at x = 1.75, 2.25, 2.75, 3.25: columns 1, 2, 2, 3 -> 2, -1, -1, -1
    expect([...out]).toEqual([2, -1, -1, -1]);
  });
});

/** Solves A x = b for a 3 x 3 matrix by Cramer's rule. */
function solve3(a: number[][], b: number[]): number[] {
  const det = (m: number[][]) =>
    m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  const d = det(a);
  return [0, 1, 2].map((k) => det(a.map((row, i) => row.map((v, j) => (j === k ? b[i] : v)))) / d);
}
