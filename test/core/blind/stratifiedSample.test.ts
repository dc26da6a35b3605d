import { describe, expect, it } from 'vitest';
import { proportionalAllocation, stratifiedSample } from '../../../src/core/blind/stratifiedSample.ts';
import { shuffledOrder } from '../../../src/core/blind/shuffledOrder.ts';

// Proportional allocation n_h = n·N_h/N: Cochran, W. G. (1977) Sampling Techniques,
// 3rd ed., ch. 5 (recalled from memory). Rounding by largest remainder (Hamilton's
// method: Balinski & Young 1982, Fair Representation, recalled from memory). The floor
// of one patch per species is common practice. Expected values below are worked by hand.

describe('proportionalAllocation', () => {
  it('gives exact quotas when they are whole: 50, 30, 20 of 100, n = 10 → 5, 3, 2', () => {
    expect(proportionalAllocation([50, 30, 20], 10)).toEqual([5, 3, 2]);
  });

  it('rounds by largest remainder and lifts an empty rare stratum to one (worked by hand)', () => {
    // N = 30: quotas 5, 0.333, 1.667, 3 → floors 5, 0, 1, 3 (9); the one left goes to the
    // largest remainder (0.667) → 5, 0, 2, 3; the floor of one takes it back from the
    // stratum most above its quota (2 − 1.667) → 5, 1, 1, 3.
    expect(proportionalAllocation([15, 1, 5, 9], 10)).toEqual([5, 1, 1, 3]);
    expect(proportionalAllocation([15, 1, 5, 9], 10, false)).toEqual([5, 0, 2, 3]);
  });

  it('has no floor when the sample is smaller than the number of species', () => {
    // quotas 1, 0.067, 0.333, 0.6 → floors 1, 0, 0, 0; the one left goes to 0.6.
    expect(proportionalAllocation([15, 1, 5, 9], 2)).toEqual([1, 0, 0, 1]);
  });

  it('takes everything when the sample is as large as the population', () => {
    expect(proportionalAllocation([3, 0, 2], 9)).toEqual([3, 0, 2]);
  });

  it('always adds up to n and never exceeds a stratum', () => {
    const sizes = [7, 1, 1, 40, 12, 3];
    for (let n = 0; n <= 64; n++) {
      const a = proportionalAllocation(sizes, n);
      expect(a.reduce((s, x) => s + x, 0)).toBe(Math.min(n, 64));
      a.forEach((x, i) => expect(x).toBeLessThanOrEqual(sizes[i]));
    }
  });

  // scikit-learn 1.2.1 (Debian python3-sklearn), sklearn.utils._approximate_mode, the
  // allocation StratifiedShuffleSplit uses (floors, then the largest remainders); values
  // printed once by /usr/bin/python3 -c "import numpy as np; from sklearn.utils import
  // _approximate_mode as m; print(m(np.array(SIZES), N, np.random.RandomState(0)))".
  // None of these cases has tied remainders, where scikit-learn breaks ties at random.
  const sklearnCases: [number[], number, number[]][] = [
    [[15, 1, 5, 9], 10, [5, 0, 2, 3]],
    [[50, 30, 20], 10, [5, 3, 2]],
    [[7, 1, 1, 40, 12, 3], 17, [2, 0, 0, 11, 3, 1]],
    [[120, 45, 33, 8, 2], 50, [29, 11, 8, 2, 0]],
    [[13, 11, 7, 5, 3, 2], 21, [7, 6, 4, 2, 1, 1]],
    [[1000, 10, 1], 37, [37, 0, 0]],
  ];
  for (const [sizes, n, expected] of sklearnCases) {
    it(`matches scikit-learn's allocation for ${sizes.join(', ')} and n = ${n} (without the floor)`, () => {
      expect(proportionalAllocation(sizes, n, false)).toEqual(expected);
    });
  }

  it('with the floor, takes the one for a rare stratum from the one most above its quota (worked by hand)', () => {
    // quotas 28.85, 10.82, 7.93, 1.92, 0.48; drawn − quota 0.15, 0.18, 0.07, 0.08 → the second gives.
    expect(proportionalAllocation([120, 45, 33, 8, 2], 50)).toEqual([29, 10, 8, 2, 1]);
  });

  it('refuses a sample size that is not a whole number', () => {
    expect(() => proportionalAllocation([3], -1)).toThrow(/whole number/);
    expect(() => proportionalAllocation([3], 1.5)).toThrow(/whole number/);
  });
});

const strata = [
  { key: 'ABFI', ids: Array.from({ length: 15 }, (_, i) => `A${i}`) },
  { key: 'SAIN', ids: Array.from({ length: 9 }, (_, i) => `S${i}`) },
  { key: 'PIEX', ids: Array.from({ length: 5 }, (_, i) => `P${i}`) },
  { key: 'JUNO', ids: ['J0'] },
];

describe('stratifiedSample', () => {
  it('draws the allocation from each species', () => {
    const s = stratifiedSample(strata, 10, 7);
    expect(s.strata).toEqual([
      { key: 'ABFI', size: 15, drawn: 5 }, { key: 'JUNO', size: 1, drawn: 1 }, { key: 'PIEX', size: 5, drawn: 1 }, { key: 'SAIN', size: 9, drawn: 3 },
    ]);
    expect(s.ids.filter((id) => id.startsWith('A'))).toHaveLength(5);
    expect(s.ids).toContain('J0');
    expect(new Set(s.ids).size).toBe(10);
  });

  it('is the same for the same seed whatever the input order, and differs for another seed', () => {
    const a = stratifiedSample(strata, 10, 7).ids;
    const reversed = [...strata].reverse().map((s) => ({ key: s.key, ids: [...s.ids].reverse() }));
    expect(stratifiedSample(reversed, 10, 7).ids).toEqual(a);
    expect(stratifiedSample(strata, 10, 8).ids).not.toEqual(a);
  });

  it('keeps the draw of a species when another species joins the site', () => {
    const before = stratifiedSample([strata[0], strata[1]], 8, 11);
    const after = stratifiedSample([strata[0], strata[1], { key: 'ZZZZ', ids: ['Z0', 'Z1', 'Z2', 'Z3', 'Z4', 'Z5', 'Z6', 'Z7', 'Z8'] }], 11, 11);
    // ABFI gets 5 of 8 · 15/24 → 5 and of 11 · 15/33 → 5: the same five patches.
    expect(after.ids.filter((id) => id.startsWith('A'))).toEqual(before.ids.filter((id) => id.startsWith('A')));
  });

  it('gives each patch of a stratum the same chance of being drawn (2,000 seeds)', () => {
    // Within ABFI 5 of 15 are drawn: each id should be in about 1/3 of the samples. The
    // binomial sd for 2,000 draws is sqrt(2000 · 1/3 · 2/3) ≈ 21; allow 5 sd.
    const counts = new Map<string, number>();
    for (let seed = 0; seed < 2000; seed++) {
      for (const id of stratifiedSample(strata, 10, seed).ids) counts.set(id, (counts.get(id) ?? 0) + 1);
    }
    for (const id of strata[0].ids) expect(Math.abs((counts.get(id) ?? 0) - 2000 / 3)).toBeLessThan(5 * 21.1);
  });

  it('refuses a species listed twice', () => {
    expect(() => stratifiedSample([strata[0], strata[0]], 3, 1)).toThrow(/twice/);
  });
});

describe('shuffledOrder', () => {
  it('is a permutation fixed by the seed, not by the input order', () => {
    const ids = Array.from({ length: 40 }, (_, i) => `P${i}`);
    const a = shuffledOrder(ids, 3);
    expect([...a].sort()).toEqual([...ids].sort());
    expect(shuffledOrder([...ids].reverse(), 3)).toEqual(a);
    expect(a).not.toEqual([...ids].sort());
    expect(shuffledOrder(ids, 4)).not.toEqual(a);
  });
});
