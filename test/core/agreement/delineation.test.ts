import { describe, expect, it } from 'vitest';
import { delineationFigures } from '../../../src/core/agreement/delineation.ts';
import { matchByIou, type Outline } from '../../../src/core/agreement/iouMatch.ts';

const square = (id: string, x: number, y: number, s: number): Outline => ({
  id,
  rings: [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]],
});

describe('delineationFigures', () => {
  // Two pairs matched (identical 10 m squares; 4 m squares shifted by 1 m),
  // one outline only in the first delineation, one only in the second.
  const first = [square('a', 0, 0, 10), square('b', 20, 0, 4), square('c', 40, 0, 5)];
  const second = [square('x', 0, 0, 10), square('y', 21, 0, 4), square('z', 60, 0, 5)];
  const matching = matchByIou(first, second);

  it('counts matched and unmatched outlines and averages IoU', () => {
    const d = delineationFigures(matching, ['larix', 'pinus', 'salix'], ['larix', 'larix', 'salix']);
    expect(d.matched).toBe(2);
    expect(d.unmatchedFirst).toBe(1);
    expect(d.unmatchedSecond).toBe(1);
    // b and y share a 3 × 4 strip: IoU 12 / (16 + 16 − 12) = 0.6.
    expect(d.meanIou.value).toBeCloseTo((1 + 0.6) / 2, 12);
  });

  it('weights species agreement by shared area', () => {
    const d = delineationFigures(matching, ['larix', 'pinus', 'salix'], ['larix', 'larix', 'salix']);
    // Shared areas 100 (same species) and 12 (different species).
    expect(d.areaWeightedAgreement.value).toBeCloseTo(100 / 112, 12);
    expect(d.matchedAreaShareFirst.value).toBeCloseTo(116 / 141, 12);
    expect(d.matchedAreaShareSecond.value).toBeCloseTo(116 / 141, 12);
  });

  it('is undefined with a reason when nothing matched', () => {
    const none = matchByIou([square('a', 0, 0, 1)], [square('b', 5, 5, 1)]);
    const d = delineationFigures(none, ['larix'], ['larix']);
    expect(d.matched).toBe(0);
    expect(d.meanIou.value).toBeNull();
    expect(d.meanIou.reason).toMatch(/no pair of outlines reached IoU 0.5/);
    expect(d.areaWeightedAgreement.value).toBeNull();
  });
});
