import { describe, expect, it } from 'vitest';
import { fleissKappa, ratingTable } from '../../../src/core/agreement/fleissKappa.ts';

describe('fleissKappa', () => {
  it("equals Scott's pi for two raters", () => {
    // With two raters Fleiss' kappa reduces to Scott's (1955) pi: chance from the pooled
    // shares of both raters, pe = Σ ((p_i. + p_.i)/2)² (Fleiss 1971, p. 379).
    const first = ['a', 'a', 'b', 'c', 'b', 'a', 'c', 'c', 'b', 'a'];
    const second = ['a', 'b', 'b', 'c', 'b', 'a', 'a', 'c', 'c', 'a'];
    const { categories, table } = ratingTable(first.map((f, i) => [f, second[i]]));
    const n = first.length;
    const po = first.filter((f, i) => f === second[i]).length / n;
    const pe = categories.reduce((s, c) => {
      const pooled = (first.filter((x) => x === c).length + second.filter((x) => x === c).length) / (2 * n);
      return s + pooled * pooled;
    }, 0);
    const f = fleissKappa(categories, table);
    expect(f.observed.value).toBeCloseTo(po, 14);
    expect(f.kappa.value).toBeCloseTo((po - pe) / (1 - pe), 14);
  });

  it('gives 1 for unanimous raters using several categories', () => {
    const f = fleissKappa(['a', 'b'], [[3, 0], [0, 3], [3, 0]]);
    expect(f.kappa.value).toBe(1);
  });

  it('is undefined with a reason when every call is the same category', () => {
    const f = fleissKappa(['a', 'b'], [[4, 0], [4, 0]]);
    expect(f.kappa.value).toBeNull();
    expect(f.kappa.reason).toMatch(/one category/);
    expect(f.standardErrorNull.value).toBeNull();
  });

  it('does not depend on the order of subjects or categories', () => {
    const table = [[1, 2, 0], [3, 0, 0], [0, 1, 2], [1, 1, 1]];
    const reordered = [table[2], table[0], table[3], table[1]].map((r) => [r[2], r[0], r[1]]);
    expect(fleissKappa(['c', 'a', 'b'], reordered).kappa.value).toBeCloseTo(fleissKappa(['a', 'b', 'c'], table).kappa.value!, 14);
  });

  it('refuses tables it cannot measure', () => {
    expect(() => fleissKappa(['a', 'b'], [])).toThrow(/no subjects/);
    expect(() => fleissKappa(['a', 'b'], [[2, 1], [1, 1]])).toThrow(/subject 2 has 2 ratings, subject 1 has 3/);
    expect(() => fleissKappa(['a', 'b'], [[1, 0]])).toThrow(/at least two ratings/);
    expect(() => fleissKappa(['a', 'b'], [[1, 0.5, 1]])).toThrow(/3 cells for 2 categories/);
    expect(() => ratingTable([['a', 'z']], ['a'])).toThrow(/'z' is not in the category list/);
  });
});
