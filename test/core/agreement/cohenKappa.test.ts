import { describe, expect, it } from 'vitest';
import { cohenKappa } from '../../../src/core/agreement/cohenKappa.ts';
import { confusionMatrix, matrixFromCounts, transpose } from '../../../src/core/agreement/confusionMatrix.ts';
import { pabak } from '../../../src/core/agreement/pabak.ts';

const table = matrixFromCounts(['a', 'b', 'c'], [[21, 4, 3], [6, 17, 2], [1, 5, 11]]);

describe('cohenKappa', () => {
  it('computes po, pe and kappa by their definitions (Cohen 1960)', () => {
    // Worked by hand: n = 70, po = 49/70, pe = (28·28 + 25·26 + 17·16) / 70².
    const k = cohenKappa(table);
    const po = 49 / 70;
    const pe = (28 * 28 + 25 * 26 + 17 * 16) / 4900;
    expect(k.observed.value).toBeCloseTo(po, 14);
    expect(k.expected.value).toBeCloseTo(pe, 14);
    expect(k.kappa.value).toBeCloseTo((po - pe) / (1 - pe), 14);
  });

  it('is unchanged when the interpreters are swapped', () => {
    const k = cohenKappa(table);
    const swapped = cohenKappa(transpose(table));
    expect(swapped.kappa.value).toBeCloseTo(k.kappa.value!, 14);
    expect(swapped.standardError.value).toBeCloseTo(k.standardError.value!, 14);
    expect(swapped.standardErrorNull.value).toBeCloseTo(k.standardErrorNull.value!, 14);
  });

  it('is unchanged when the classes are listed in another order', () => {
    const first = ['a', 'b', 'b', 'c', 'a', 'c', 'c', 'a'];
    const second = ['a', 'b', 'c', 'c', 'b', 'c', 'a', 'a'];
    const k1 = cohenKappa(confusionMatrix(first, second));
    const k2 = cohenKappa(confusionMatrix(first, second, ['c', 'a', 'b']));
    expect(k2.kappa.value).toBeCloseTo(k1.kappa.value!, 14);
    expect(k2.standardError.value).toBeCloseTo(k1.standardError.value!, 14);
  });

  it('keeps kappa and shrinks the standard error by √4 when every count is multiplied by 4', () => {
    const bigger = matrixFromCounts(table.classes, table.counts.map((r) => r.map((c) => 4 * c)));
    expect(cohenKappa(bigger).kappa.value).toBeCloseTo(cohenKappa(table).kappa.value!, 14);
    expect(cohenKappa(bigger).standardError.value).toBeCloseTo(cohenKappa(table).standardError.value! / 2, 14);
  });

  it('gives 1 with a zero standard error for perfect agreement', () => {
    const calls = ['a', 'b', 'c', 'a', 'b', 'a'];
    const k = cohenKappa(confusionMatrix(calls, calls));
    expect(k.kappa.value).toBe(1);
    expect(k.standardError.value).toBe(0);
    expect(k.ci95.value).toEqual([1, 1]);
    expect(pabak(confusionMatrix(calls, calls)).value).toBe(1);
  });

  it('reaches −1 for two classes always swapped with even shares', () => {
    const k = cohenKappa(matrixFromCounts(['a', 'b'], [[0, 5], [5, 0]]));
    expect(k.kappa.value).toBeCloseTo(-1, 14);
    expect(k.ci95.value![0]).toBeGreaterThanOrEqual(-1);
  });

  it('is undefined with a reason, never NaN, when both used one class only', () => {
    const calls = ['larix', 'larix', 'larix'];
    const k = cohenKappa(confusionMatrix(calls, calls));
    expect(k.observed.value).toBe(1);
    expect(k.expected.value).toBe(1);
    expect(k.kappa.value).toBeNull();
    expect(k.kappa.reason).toMatch(/one class only \(larix\)/);
    expect(k.standardError.value).toBeNull();
    expect(k.ci95.value).toBeNull();
    expect(pabak(confusionMatrix(calls, calls)).value).toBeNull();
    expect(pabak(confusionMatrix(calls, calls)).reason).toMatch(/only one class/);
  });

  it('is undefined when expected agreement is 1 even with unused classes in the list', () => {
    const m = confusionMatrix(['a', 'a'], ['a', 'a'], ['a', 'b', 'c']);
    const k = cohenKappa(m);
    expect(k.kappa.value).toBeNull();
    expect(k.kappa.reason).toMatch(/chance agreement is 1/);
    // PABAK still has a value: chance is fixed at 1/k whatever the shares.
    expect(pabak(m).value).toBe(1);
  });

  it('is undefined for no pairs at all', () => {
    const k = cohenKappa(confusionMatrix([], []));
    expect(k.observed.value).toBeNull();
    expect(k.kappa.reason).toMatch(/no paired calls/);
    expect(pabak(confusionMatrix([], [])).value).toBeNull();
  });

  it('has a defined kappa of 0 and a zero standard error when one side used a single class', () => {
    // pe = po whenever one interpreter used one class; the FCE variance is exactly 0 there.
    const k = cohenKappa(confusionMatrix(['a', 'b', 'a'], ['a', 'a', 'a']));
    expect(k.kappa.value).toBeCloseTo(0, 14);
    expect(k.standardError.value).toBe(0);
  });
});

describe('pabak', () => {
  it('is 2·po − 1 for two classes and (k·po − 1)/(k − 1) beyond', () => {
    expect(pabak(matrixFromCounts(['a', 'b'], [[6, 1], [3, 10]])).value).toBeCloseTo(2 * 0.8 - 1, 14);
    expect(pabak(table).value).toBeCloseTo((3 * (49 / 70) - 1) / 2, 14);
  });
});
