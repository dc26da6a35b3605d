import { describe, expect, it } from 'vitest';
import { demoRoster } from '../../../src/core/demo/roster.ts';
import { baselines, classBalance, type BalanceItem } from '../../../src/core/training/balance.ts';
import { applyScheme, groupScheme, oneAgainstRestScheme, schemeProblem, speciesScheme } from '../../../src/core/training/scheme.ts';

// Balance and baselines. The two baselines are Morrison's (1969) chance criteria for a
// classifier: C_max = the largest class share, C_pro = Σ p² (Journal of Marketing
// Research 6, 156-163; the formulas as recalled from memory, the sums worked by hand here).

const codes = demoRoster.map((s) => s.code);
const items: BalanceItem[] = [
  { id: 1, species: 'ABFI', area: 10, pure: 50 },
  { id: 2, species: 'ABFI', area: 6, pure: 30 },
  { id: 3, species: 'PIEX', area: 8, pure: 30 },
  { id: 4, species: 'SAIN', area: 5, pure: 15 },
  { id: 5, species: 'BEFA', area: 3, pure: 5 },
  { id: 6, species: 'RHPE', area: 1, pure: 0 },
];

describe('schemes', () => {
  it('maps every species to itself, by group, or one against the rest', () => {
    expect(speciesScheme(codes).classOf.SAIN).toBe('SAIN');
    const conifers = groupScheme(demoRoster, 'conifer');
    expect(conifers.classOf).toMatchObject({ ABFI: 'ABFI', PIEX: 'PIEX', PISI: 'PISI', SAIN: 'other', RHPE: 'other' });
    const one = oneAgainstRestScheme(codes, 'PISI');
    expect(new Set(Object.values(one.classOf))).toEqual(new Set(['PISI', 'not PISI']));
  });

  it('names each unmapped species once, with its count', () => {
    const scheme = { name: 'two only', classOf: { ABFI: 'fir', PIEX: 'pine' } };
    const applied = applyScheme(scheme, ['ABFI', 'SAIN', 'PIEX', 'SAIN', 'XXXX']);
    expect(applied.classes).toEqual(['fir', null, 'pine', null, null]);
    expect(applied.unmapped).toEqual(['SAIN', 'XXXX']);
    expect(applied.messages[0]).toBe('scheme "two only" leaves species SAIN unmapped: its 2 patch(es) are left out until it is given a class');
    // "constructor" and friends are species codes like any other, not object members.
    expect(applyScheme(scheme, ['constructor']).unmapped).toEqual(['constructor']);
  });

  it('refuses nameless or empty schemes', () => {
    expect(schemeProblem({ name: '', classOf: { A: 'a' } })).toMatch(/name/);
    expect(schemeProblem({ name: 'x', classOf: {} })).toMatch(/maps no species/);
    expect(schemeProblem({ name: 'x', classOf: { A: ' ' } })).toMatch(/species A an empty class/);
  });
});

describe('class balance', () => {
  it('counts, shares and baselines per class, worked by hand', () => {
    const b = classBalance(items, groupScheme(demoRoster, 'conifer'), { rareCount: 10, rareShare: 0.05 });
    // Pure pixels: ABFI 80, PIEX 30, other 20 (15 + 5 + 0), PISI 0: total 130.
    expect(b.classes.map((c) => [c.name, c.patches, c.pure])).toEqual([['ABFI', 2, 80], ['PIEX', 1, 30], ['other', 3, 20], ['PISI', 0, 0]]);
    expect(b.totals).toEqual({ patches: 6, area: 33, pure: 130 });
    expect(b.classes[0].areaShare).toBeCloseTo(16 / 33, 12);
    expect(b.baselines.pixels.majorityClass).toBe('ABFI');
    expect(b.baselines.pixels.majorityAccuracy).toBeCloseTo(80 / 130, 12);
    expect(b.baselines.pixels.frequencyAccuracy).toBeCloseTo((80 ** 2 + 30 ** 2 + 20 ** 2) / 130 ** 2, 12);
    // On patches: 2, 1, 3 of 6 → majority "other" at 0.5, Σ p² = (4 + 1 + 9) / 36.
    expect(b.baselines.patches).toEqual({ majorityClass: 'other', majorityAccuracy: 0.5, frequencyAccuracy: 14 / 36 });
    expect(b.warnings).toEqual(['class PISI is rare: 0 pure pixel(s), under 10']);
  });

  it('warns of rare classes by share as well as count, and of unmapped species', () => {
    const b = classBalance(items, { name: 'partial', classOf: { ABFI: 'ABFI', PIEX: 'PIEX', BEFA: 'BEFA', RHPE: 'RHPE' } }, { rareShare: 0.1, rareCount: 1 });
    expect(b.unmapped).toEqual(['SAIN']);
    expect(b.totals.pure).toBe(115);
    expect(b.warnings).toContain('class BEFA is rare: 4.3 % of the pure pixels, under 10.0 %');
    expect(b.warnings).toContain('class RHPE is rare: 0 pure pixel(s), under 1');
    expect(b.warnings[0]).toMatch(/leaves species SAIN unmapped/);
  });

  it('gives the textbook values for three classes at 0.5, 0.3 and 0.2', () => {
    const b = baselines(new Map([['a', 50], ['b', 30], ['c', 20]]));
    expect(b.majorityAccuracy).toBe(0.5);
    expect(b.frequencyAccuracy).toBeCloseTo(0.38, 12); // 0.25 + 0.09 + 0.04
    expect(baselines(new Map())).toEqual({ majorityClass: null, majorityAccuracy: 0, frequencyAccuracy: 0 });
  });
});
