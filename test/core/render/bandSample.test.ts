import { describe, expect, it } from 'vitest';
import { bandSample, histogramOf, limitsFor, percentileOfSorted, sortAscending } from '../../../src/core/render/bandSample.ts';
import { stretchValue } from '../../../src/core/render/stretch.ts';

describe('band samples and stretch rules', () => {
  const sample = bandSample([5, 1, 4, 2, 3, 0, 7, 9, 8, 6, 65535], 65535);

  it('keeps valid values only, sorted, with population mean and sd', () => {
    expect([...sample.sorted]).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(sample.mean).toBe(4.5);
    // Population sd of 0..9: sqrt((n^2 - 1) / 12) for n = 10 consecutive integers.
    expect(sample.sd).toBeCloseTo(Math.sqrt(99 / 12), 12);
  });

  it('takes percentiles by nearest rank (Hyndman & Fan 1996, definition 1)', () => {
    // Ten values: the 25th percentile is the 3rd smallest (rank ceil(2.5) = 3).
    expect(percentileOfSorted(sample.sorted, 25)).toBe(2);
    expect(percentileOfSorted(sample.sorted, 100)).toBe(9);
    expect(percentileOfSorted(sample.sorted, 0)).toBe(0);
  });

  it('gives limits under each rule', () => {
    expect(limitsFor(sample, { kind: 'percentile', low: 10, high: 90 })).toEqual({ min: 0, max: 8, gamma: 1 });
    expect(limitsFor(sample, { kind: 'minmax' }, 2)).toEqual({ min: 0, max: 9, gamma: 2 });
    const sd = limitsFor(sample, { kind: 'stddev', k: 1 });
    expect(sd.min).toBeCloseTo(4.5 - Math.sqrt(99 / 12), 12);
    expect(sd.max).toBeCloseTo(4.5 + Math.sqrt(99 / 12), 12);
    // Three sd reach past the data: clipped to its range.
    expect(limitsFor(sample, { kind: 'stddev', k: 3 })).toEqual({ min: 0, max: 9, gamma: 1 });
    expect(limitsFor(sample, { kind: 'manual', min: 100, max: 200 })).toEqual({ min: 100, max: 200, gamma: 1 });
  });

  it('refuses bad rules with a message', () => {
    expect(() => limitsFor(sample, { kind: 'manual', min: 5, max: 5 })).toThrow(/minimum below the maximum/);
    expect(() => limitsFor(sample, { kind: 'percentile', low: 98, high: 2 })).toThrow(/low < high/);
    expect(() => limitsFor(sample, { kind: 'stddev', k: 0 })).toThrow(/k > 0/);
    expect(() => limitsFor(sample, { kind: 'minmax' }, 0)).toThrow(/gamma/);
  });

  it('keeps max above min for a flat or empty band', () => {
    expect(limitsFor(bandSample([7, 7, 7]), { kind: 'minmax' })).toEqual({ min: 7, max: 8, gamma: 1 });
    expect(limitsFor(bandSample([]), { kind: 'percentile', low: 2, high: 98 })).toEqual({ min: 0, max: 1, gamma: 1 });
  });

  it('subsamples regularly when asked for fewer values', () => {
    const big = Array.from({ length: 1000 }, (_, i) => i);
    expect(bandSample(big, null, 100).sorted.length).toBe(100);
    expect(bandSample(big, null, 100).sorted[1]).toBe(10);
  });

  it('bins like numpy.histogram: equal widths, last bin closed', () => {
    // numpy.histogram([0..9], bins=3) -> counts [3, 3, 4] (bin edges 0, 3, 6, 9).
    expect([...histogramOf(sample, 3).counts]).toEqual([3, 3, 4]);
    expect([...histogramOf(sample, 2, [2, 5]).counts]).toEqual([2, 2]);
  });

  it('applies gamma as 255 * t^(1/gamma)', () => {
    // t = 0.25 with gamma 2: 255 * 0.5 = 127.5 -> 128.
    expect(stretchValue(25, { min: 0, max: 100, gamma: 2 })).toBe(128);
    expect(stretchValue(-5, { min: 0, max: 100, gamma: 1 })).toBe(0);
    expect(stretchValue(500, { min: 0, max: 100, gamma: 1 })).toBe(255);
  });

  // Reference: ECMA-262 %TypedArray%.prototype.sort with no comparator (numeric order,
  // -0 before +0, NaN last), as the engine implements it.
  it('sorts every sample exactly as the typed-array sort does, counted or compared', () => {
    let seed = 7;
    const random = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const cases: number[][] = [
      Array.from({ length: 50_000 }, () => Math.floor(random() * 2048)), // 11-bit counts
      Array.from({ length: 50_000 }, () => Math.floor(random() * 65536) - 32768), // int16
      Array.from({ length: 3000 }, () => Math.floor(random() * 1e9)), // too wide to count
      Array.from({ length: 3000 }, () => random() * 100), // fractions
      [3, -0, 0, 2, 1, 0, -0], // signed zeros
      [5, NaN, 1, Infinity, -Infinity, 2],
      [], [4],
    ];
    for (const values of cases) {
      const ours = Float64Array.from(values);
      sortAscending(ours);
      const reference = Float64Array.from(values).sort();
      expect(ours.length).toBe(reference.length);
      let differing = 0;
      for (let i = 0; i < ours.length; i++) if (!Object.is(ours[i], reference[i])) differing++;
      expect(differing).toBe(0);
    }
  });
});
