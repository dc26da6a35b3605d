import { describe, expect, it } from 'vitest';
import { classOrder, delineationSheet, pairPasses, passesFleiss, passSheet } from '../../../src/core/blind/passComparison.ts';
import { square } from '../export/siteBuilder.ts';
import { blindSite, startPass } from './blindSite.ts';

// Pairing the calls of passes for the agreement sheet. Expected figures are worked by
// hand from Cohen (1960): κ = (po − pe) / (1 − pe); Fleiss (1971) for three raters.

async function twoPasses() {
  const b = await blindSite();
  await startPass(b, { id: 'b', interpreter: 'ben', blind: true, patchIds: ['P11', 'P12', 'P13', 'P14', 'P15', 'P16', 'P17', 'P18', 'P19', 'P20'] });
  const calls: Record<string, string> = { P11: 'ABFI', P12: 'ABFI', P13: 'ABFI', P14: 'ABFI', P15: 'SAIN', P16: 'SAIN', P17: 'SAIN', P18: 'SAIN', P19: 'ABFI', P20: "can't tell" };
  for (const [id, species] of Object.entries(calls)) await b.tag(id, 'b', species, 'ben');
  return b;
}

describe('passSheet', () => {
  it('pairs the patches both passes called, with the first call confidence and species group', async () => {
    const b = await twoPasses();
    const pairs = pairPasses(b.state, 'a', 'b');
    expect(pairs).toHaveLength(10);
    expect(pairs.find((p) => p.id === 'P15')).toEqual({ id: 'P15', first: 'ABFI', second: 'SAIN', confidence: 'unsure', group: 'conifer' });
    expect(pairs.find((p) => p.id === 'P16')!.group).toBe('broadleaf shrub');
  });

  it('gives the hand-worked figures: po 0.7, pe 0.45, kappa 0.4545', async () => {
    const b = await twoPasses();
    const { sheet } = passSheet(b.state, 'a', 'b');
    // Rows (ana): ABFI 4 1 0 · SAIN 1 3 1 · can't tell 0 0 0.
    expect(sheet.matrix.classes).toEqual(['ABFI', 'SAIN', "can't tell"]);
    expect(sheet.matrix.counts).toEqual([[4, 1, 0], [1, 3, 1], [0, 0, 0]]);
    expect(sheet.figures.observed.value).toBeCloseTo(0.7, 12);
    // pe = 0.5·0.5 + 0.5·0.4 + 0·0.1 = 0.45
    expect(sheet.figures.expected.value).toBeCloseTo(0.45, 12);
    expect(sheet.figures.kappa.value).toBeCloseTo(0.25 / 0.55, 12);
    // PABAK with k = 3 classes: (3·0.7 − 1) / 2 = 0.55
    expect(sheet.pabak.value).toBeCloseTo(0.55, 12);
    // Specific agreement ABFI: 2·4 / (5 + 5) = 0.8
    expect(sheet.perClass[0].specific.value).toBeCloseTo(0.8, 12);
  });

  it('refuses two passes with no patch in common, or the same pass twice', async () => {
    const b = await blindSite();
    await startPass(b, { id: 'b', interpreter: 'ben', blind: true, patchIds: ['P1'] });
    expect(() => pairPasses(b.state, 'a', 'b')).toThrow('Passes a (30 calls) and b (0 calls) share no patch: there is nothing to compare.');
    expect(() => pairPasses(b.state, 'a', 'a')).toThrow(/two different passes/);
    expect(() => pairPasses(b.state, 'a', 'zz')).toThrow(/no pass zz/);
  });

  it('orders classes as the roster, then reserved classes and blind answers, then strays', async () => {
    const b = await blindSite();
    expect(classOrder(b.state, ['zzz', "can't tell", 'SAIN', 'mixed', 'ABFI'])).toEqual(['ABFI', 'SAIN', 'mixed', "can't tell", 'zzz']);
  });
});

describe('passesFleiss', () => {
  it('computes Fleiss kappa over the patches all three passes called (worked by hand)', async () => {
    const b = await twoPasses();
    await startPass(b, { id: 'c', interpreter: 'cleo', blind: true, patchIds: ['P11', 'P12', 'P16', 'P17'] });
    for (const [id, s] of [['P11', 'ABFI'], ['P12', 'SAIN'], ['P16', 'SAIN'], ['P17', 'SAIN']]) await b.tag(id, 'c', s, 'cleo');
    const f = passesFleiss(b.state, ['a', 'b', 'c']);
    expect(f.patchIds).toEqual(['P11', 'P12', 'P16', 'P17']);
    // Subjects: P11 ABFI×3; P12 ABFI×2 SAIN×1; P16, P17 SAIN×3. P_i = 1, 1/3, 1, 1 → P̄ = 5/6.
    // p_ABFI = 5/12, p_SAIN = 7/12 → P̄e = (25 + 49)/144 = 74/144.
    const pe = 74 / 144;
    expect(f.figures.observed.value).toBeCloseTo(5 / 6, 12);
    expect(f.figures.kappa.value).toBeCloseTo((5 / 6 - pe) / (1 - pe), 12);
    expect(f.explanation).toMatch(/among all 3 interpreters on 4 patches/);
    expect(() => passesFleiss(b.state, ['a', 'b'])).toThrow(/three or more passes/);
  });
});

describe('delineationSheet', () => {
  it('matches a delineation against the first pass in its area by IoU', async () => {
    const b = await blindSite();
    await startPass(b, { id: 'draw', interpreter: 'ben', blind: true, patchIds: [] });
    // P1 is square(493020, 4429000, 6); B1 shifted 1 m: IoU = 30/42. P2 square(493040…); B2 far off it.
    const add = (id: string, x: number) => b.commit({ kind: 'patch.added', payload: { patch: { id, geometry: square(x, 4429000, 6), source: { kind: 'drawn' }, createdAt: b.time(), createdBy: 'ben' }, tags: [] } }, 'ben');
    await add('B1', 493021);
    await add('B2', 493044);
    await b.tag('B1', 'draw', 'ABFI', 'ben');
    await b.tag('B2', 'draw', 'SAIN', 'ben');
    const d = delineationSheet(b.state, 'a', 'draw');
    expect(d.area).toEqual([493021, 4429000, 493050, 4429006]);
    expect(d.pairs).toEqual([{ first: 'P1', second: 'B1', iou: expect.closeTo(30 / 42, 12) }]);
    expect(d.figures.firstCount).toBe(2); // P1 and P2 meet the area
    expect(d.figures.unmatchedFirst).toBe(1);
    expect(d.figures.unmatchedSecond).toBe(1);
    expect(d.figures.areaWeightedAgreement.value).toBe(1); // both called P1/B1 ABFI
    expect(d.within).toBe('outline extent');
    expect(() => delineationSheet(b.state, 'a', 'a')).toThrow(/not an independent delineation/);
  });

  // Areas and IoUs below are worked by hand on axis-aligned squares (plain arithmetic).
  async function delineationIn(area: [number, number, number, number]) {
    const b = await blindSite();
    const [x0, y0, x1, y1] = area;
    const rings = [[[[x0, y0], [x1, y0], [x1, y1], [x0, y1], [x0, y0]]]] as [number, number][][][];
    await startPass(b, { id: 'draw', interpreter: 'ben', blind: true, patchIds: [], area: rings });
    const add = (id: string, x: number) => b.commit({ kind: 'patch.added', payload: { patch: { id, geometry: square(x, 4429000, 6), source: { kind: 'drawn' }, createdAt: b.time(), createdBy: 'ben' }, tags: [] } }, 'ben');
    await add('B1', 493021);
    await add('B2', 493044);
    await b.tag('B1', 'draw', 'ABFI', 'ben');
    await b.tag('B2', 'draw', 'SAIN', 'ben');
    return delineationSheet(b.state, 'a', 'draw');
  }

  it('compares within the area drawn for the delineation, leaving out what lies outside it', async () => {
    // The area holds P1 (x 493020-493026) and B1 (493021-493027), not P2 or B2 (x >= 493040).
    const d = await delineationIn([493015, 4428990, 493030, 4429010]);
    expect(d.within).toBe('drawn area');
    expect(d.area).toEqual([493015, 4428990, 493030, 4429010]);
    expect(d.pairs).toEqual([{ first: 'P1', second: 'B1', iou: expect.closeTo(30 / 42, 12) }]);
    expect(d.figures.firstCount).toBe(1);
    expect(d.figures.unmatchedFirst).toBe(0);
    expect(d.figures.unmatchedSecond).toBe(0);
  });

  it('cuts outlines at the edge of the area before matching', async () => {
    // Cut at x = 493024: P1 keeps 4 x 6 = 24 m², B1 keeps 3 x 6 = 18 m², all of it inside
    // P1's part, so IoU = 18 / 24.
    const d = await delineationIn([493015, 4428990, 493024, 4429010]);
    expect(d.pairs).toEqual([{ first: 'P1', second: 'B1', iou: expect.closeTo(0.75, 9) }]);
  });

  it('says so when no outline of the delineation lies in its area', async () => {
    await expect(delineationIn([493100, 4428990, 493110, 4429010])).rejects.toThrow(/No outline of delineation draw lies in its area/);
  });
});
