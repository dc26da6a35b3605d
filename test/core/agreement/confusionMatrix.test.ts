import { describe, expect, it } from 'vitest';
import { columnShares, confusionMatrix, matrixFromCounts, rowShares, transpose } from '../../../src/core/agreement/confusionMatrix.ts';

describe('confusionMatrix', () => {
  const first = ['larix', 'pinus', 'larix', 'salix', 'larix'];
  const second = ['larix', 'larix', 'larix', 'salix', 'pinus'];

  it('counts first-interpreter rows against second-interpreter columns, classes sorted', () => {
    const m = confusionMatrix(first, second);
    expect(m.classes).toEqual(['larix', 'pinus', 'salix']);
    expect(m.counts).toEqual([[2, 1, 0], [1, 0, 0], [0, 0, 1]]);
    expect(m.rowTotals).toEqual([3, 1, 1]);
    expect(m.columnTotals).toEqual([3, 1, 1]);
    expect(m.n).toBe(5);
  });

  it('keeps a given class order, including classes nobody used', () => {
    const m = confusionMatrix(first, second, ['salix', 'pinus', 'larix', 'betula']);
    expect(m.counts[0]).toEqual([1, 0, 0, 0]);
    expect(m.counts[2]).toEqual([0, 1, 2, 0]);
    expect(m.counts[3]).toEqual([0, 0, 0, 0]);
  });

  it('swapping the interpreters transposes the matrix', () => {
    expect(confusionMatrix(second, first)).toEqual(transpose(confusionMatrix(first, second)));
  });

  it('gives row and column shares, null for an empty line', () => {
    const m = confusionMatrix(first, second, ['larix', 'pinus', 'salix', 'betula']);
    expect(rowShares(m)[0]).toEqual([2 / 3, 1 / 3, 0, 0]);
    expect(rowShares(m)[3]).toEqual([null, null, null, null]);
    expect(columnShares(m)[0][0]).toBeCloseTo(2 / 3, 12);
    expect(columnShares(m)[1][3]).toBeNull();
  });

  it('refuses calls outside the class list, lists of different length and bad tables', () => {
    expect(() => confusionMatrix(['a'], ['b'], ['a'])).toThrow(/'b' is not in the class list/);
    expect(() => confusionMatrix(['a', 'a'], ['a'])).toThrow(/differ in length/);
    expect(() => confusionMatrix(['a'], ['a'], ['a', 'a'])).toThrow(/listed twice/);
    expect(() => matrixFromCounts(['a', 'b'], [[1, 2]])).toThrow(/1 rows for 2 classes/);
    expect(() => matrixFromCounts(['a', 'b'], [[1, 2], [3]])).toThrow(/row 2 has 1 cells/);
    expect(() => matrixFromCounts(['a'], [[-1]])).toThrow(/not a count/);
  });
});
