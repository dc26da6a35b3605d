import { describe, expect, it } from 'vitest';
import type { PairedCall } from '../../../src/core/agreement/pairedCall.ts';
import { agreementSheet } from '../../../src/core/agreement/sheet.ts';

describe('agreementSheet', () => {
  const pairs: PairedCall[] = [
    { id: '1', first: 'pinus', second: 'pinus', confidence: 'unsure' },
    { id: '2', first: 'larix', second: 'larix', confidence: 'sure' },
    { id: '3', first: 'larix', second: 'pinus', confidence: 'sure' },
    { id: '4', first: 'salix', second: 'salix', confidence: 'likely' },
  ];

  it('gathers matrix, shares, figures, per-class lines and breakdowns in one place', () => {
    const sheet = agreementSheet(pairs);
    expect(sheet.matrix.classes).toEqual(['larix', 'pinus', 'salix']);
    expect(sheet.matrix.counts).toEqual([[1, 1, 0], [0, 1, 0], [0, 0, 1]]);
    expect(sheet.rowShares[0]).toEqual([0.5, 0.5, 0]);
    expect(sheet.columnShares[0][1]).toBe(0.5);
    expect(sheet.figures.observed.value).toBe(0.75);
    expect(sheet.pabak.value).toBeCloseTo((3 * 0.75 - 1) / 2, 14);
    expect(sheet.perClass.map((c) => c.name)).toEqual(['larix', 'pinus', 'salix']);
    expect(sheet.perClass[2].explanation).toMatch(/salix.*100.0 %/);
    expect(sheet.byConfidence.map((g) => g.key)).toEqual(['sure', 'likely', 'unsure']);
    expect(sheet.byGroup).toEqual([]);
  });

  it('uses a given class order, e.g. the roster’s', () => {
    const sheet = agreementSheet(pairs, { classes: ['salix', 'pinus', 'larix', 'betula'] });
    expect(sheet.matrix.classes).toEqual(['salix', 'pinus', 'larix', 'betula']);
    expect(sheet.perClass[3].specific.value).toBeNull();
  });
});
