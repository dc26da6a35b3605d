import { describe, expect, it } from 'vitest';
import { matrixFromCounts } from '../../../src/core/agreement/confusionMatrix.ts';
import { specificAgreement } from '../../../src/core/agreement/specificAgreement.ts';

describe('specificAgreement', () => {
  it('is 2a / (2a + b + c) for each class against the rest', () => {
    const m = matrixFromCounts(['a', 'b', 'c'], [[8, 2, 0], [1, 5, 1], [0, 0, 0]]);
    const [a, b, c] = specificAgreement(m);
    // a: both 8, first 10, second 9 → 16/19; b: both 5, first 7, second 7 → 10/14.
    expect(a.specific.value).toBeCloseTo(16 / 19, 14);
    expect(b.specific.value).toBeCloseTo(10 / 14, 14);
    // c: called once by the second interpreter only → 0.
    expect(c.specific.value).toBe(0);
    expect(c.secondTotal).toBe(1);
  });

  it('is undefined with a reason for a class nobody used', () => {
    const [, unused] = specificAgreement(matrixFromCounts(['a', 'b'], [[3, 0], [0, 0]]));
    expect(unused.specific.value).toBeNull();
    expect(unused.specific.reason).toMatch(/neither interpreter used b/);
  });
});
