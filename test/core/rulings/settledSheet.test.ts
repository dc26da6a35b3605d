import { describe, expect, it } from 'vitest';
import { recordRuling } from '../../../src/app/rulings/recordRuling.ts';
import Papa from 'papaparse';
import { agreementCsv, agreementReport, passSheet } from '../../../src/core/blind/index.ts';
import { settledSheet } from '../../../src/core/rulings/index.ts';
import { at, ruledSite } from '../../app/rulings/ruledSite.ts';

// The rulings' side of the agreement sheet, worked by hand. Kappa is Cohen's (1960)
// κ = (po − pe) / (1 − pe), the same function checked against published tables and
// reference libraries in test/reference/agreement-*.test.ts.

const ruler = () => ({ interpreter: 'cy', time: at() });

describe('the passes against the settled species', () => {
  it('scores each pass against what its calls and the rulings came to, and tallies how the disagreements were settled', async () => {
    const { site, blindPassId } = await ruledSite([
      { size: 10, first: 'PICE', second: { species: 'ALVI' } }, // P1: ruled on bo's ALVI
      { size: 9, first: 'PICE', second: { species: 'LADE' } }, // P2: ruled PICE (ak's)
      { size: 8, first: 'ALVI', second: { species: "can't tell" } }, // P3: open
      { size: 7, first: 'PICE', second: { species: 'PICE' } }, // P4: agreed
      { size: 6, first: 'ALVI', second: { species: 'ALVI' } }, // P5: agreed
      { size: 5, first: 'PICE' }, // P6: ak alone
      { size: 4, first: 'LADE', second: { species: 'ALVI' } }, // P7: left out of training
    ]);
    const rule = (patchId: string, decision: Parameters<typeof recordRuling>[1]['decision'], reason = '') =>
      recordRuling(site, { patchId, decision, reason, seen: null }, ruler());
    await rule('P1', { kind: 'accept', passId: blindPassId });
    await rule('P2', { kind: 'species', species: 'PICE' });
    await rule('P7', { kind: 'exclude' }, 'half in shadow');

    const sheet = settledSheet(site.state, 'pass-ak', blindPassId);
    const [ak, bo] = sheet.passes;
    // ak against the settled species on P1 P2 P4 P5 P6 (P3 open, P7 excluded):
    //   calls PICE PICE PICE ALVI PICE, settled ALVI PICE PICE ALVI PICE -> 4 of 5.
    //   Matrix (rows ak: ALVI, PICE) [[1, 0], [1, 3]]; po = 0.8, pe = (1·2 + 4·3) / 25 = 0.56,
    //   κ = 0.24 / 0.44 = 6/11.
    expect(ak).toMatchObject({ passId: 'pass-ak', interpreter: 'ak', n: 5, matched: 4 });
    expect(ak.figures.observed.value).toBeCloseTo(0.8, 12);
    expect(ak.figures.kappa.value).toBeCloseTo(6 / 11, 12);
    // bo on P1 P2 P4 P5: calls ALVI LADE PICE ALVI, settled ALVI PICE PICE ALVI -> 3 of 4.
    //   Rows ALVI 2, LADE 1, PICE 1; columns ALVI 2, LADE 0, PICE 2; pe = 6/16, κ = 0.375 / 0.625 = 0.6.
    expect(bo).toMatchObject({ interpreter: 'bo', n: 4, matched: 3 });
    expect(bo.figures.kappa.value).toBeCloseTo(0.6, 12);
    expect(ak.explanations.observed).toMatch(/^ak's calls match the settled species on 80\.0 % of the 5 patches .* overstates/);
    expect(bo.explanations.kappa).toMatch(/0\.600 of the way from chance/);

    // Called differently: P1 P2 P3 P7.
    expect(sheet.disagreements).toMatchObject({ total: 4, settled: 3, open: 1, on: { first: 1, second: 1, other: 0, mixed: 0, excluded: 1 } });
    expect(sheet.disagreements.explanation).toBe(
      "Of the 4 patches the two passes called differently, 3 are settled (1 on the first pass's call, 1 on the second's, 1 left out of training) and 1 is still open on the Rulings page.");
  });

  it('says so when the passes share no disagreement or no settled patch', async () => {
    const { site, blindPassId } = await ruledSite([{ size: 5, first: 'PICE', second: { species: "can't tell" } }]);
    const sheet = settledSheet(site.state, 'pass-ak', blindPassId);
    expect(sheet.passes[0].n).toBe(0);
    expect(sheet.passes[0].explanations.observed).toBe('No patch ak called in pass pass-ak is settled yet.');
    expect(sheet.passes[0].explanations.kappa).toMatch(/^Not defined: no paired calls/);
    const alike = await ruledSite([{ size: 5, first: 'PICE', second: { species: 'PICE' } }]);
    expect(settledSheet(alike.site.state, 'pass-ak', alike.blindPassId).disagreements.explanation).toMatch(/nothing to rule on/);
  });

  it('goes into the saved sheet: CSV rows (read back by PapaParse, RFC 4180) and report lines', async () => {
    const { site, blindPassId } = await ruledSite([
      { size: 10, first: 'PICE', second: { species: 'ALVI' } },
      { size: 9, first: 'PICE', second: { species: 'LADE' } },
      { size: 7, first: 'PICE', second: { species: 'PICE' } },
    ]);
    await recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: blindPassId }, reason: '', seen: null }, ruler());
    const settled = settledSheet(site.state, 'pass-ak', blindPassId);
    const sheet = passSheet(site.state, 'pass-ak', blindPassId);
    const rows = Papa.parse<Record<string, string>>(agreementCsv({ sheet, settled }), { header: true, skipEmptyLines: true });
    expect(rows.errors).toEqual([]);
    const get = (row: string, column: string) => rows.data.find((r) => r.section === 'after the rulings' && r.row === row && r.column === column);
    expect(get('disagreements', 'total')!.value).toBe('2');
    expect(get('disagreements', 'settled')).toMatchObject({ value: '1', explanation: settled.disagreements.explanation });
    expect(get('disagreements', 'open')!.value).toBe('1');
    expect(get('settled on', 'second')!.value).toBe('1');
    const ak = settled.passes[0];
    expect(Number(get('pass-ak (ak)', 'n')!.value)).toBe(ak.n);
    expect(Number(get('pass-ak (ak)', 'observed')!.value)).toBe(ak.figures.observed.value);
    const report = agreementReport({ sheet, settled }, 'test').map((l) => l.text);
    expect(report).toContain('Disagreements settled: 1 of 2, 1 open');
    expect(report.some((t) => t.startsWith('pass-ak (ak): 2 settled patches called'))).toBe(true);
    // Without rulings asked for, the sheet is as before.
    expect(agreementCsv({ sheet })).not.toContain('after the rulings');
  });
});
