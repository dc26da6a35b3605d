import { describe, expect, it } from 'vitest';
import { cohenKappa } from '../../src/core/agreement/cohenKappa.ts';
import { matrixFromCounts } from '../../src/core/agreement/confusionMatrix.ts';
import { fleissKappa, ratingTable } from '../../src/core/agreement/fleissKappa.ts';
import { pabak } from '../../src/core/agreement/pabak.ts';
import inputs from './fixtures/agreement/inputs.json' with { type: 'json' };

// Published worked examples. Each check names its source; "from memory" marks tables
// recalled rather than looked up again (see SOURCES.md).

const value = (figure: { value: unknown }) => figure.value as number;

describe("Cohen's kappa against published worked examples", () => {
  it('matches the SAS PROC FREQ printout quoted in the statsmodels tests', () => {
    // Source: SAS/STAT PROC FREQ "Simple Kappa Coefficient" printout for the table
    // [[0,4,1],[0,8,0],[0,1,5]], as quoted in statsmodels/stats/tests/test_inter_rater.py:
    // kappa 0.4842, ASE 0.1380, 95 % limits 0.2137 and 0.7547, ASE under H0 0.1484.
    // SAS documents its ASE as the large-sample variance of Fleiss, Cohen & Everitt (1969).
    const m = matrixFromCounts(['1', '2', '3'], [[0, 4, 1], [0, 8, 0], [0, 1, 5]]);
    const k = cohenKappa(m);
    expect(value(k.kappa)).toBeCloseTo(0.4842, 4);
    expect(value(k.standardError)).toBeCloseTo(0.138, 4);
    expect(k.ci95.value![0]).toBeCloseTo(0.2137, 4);
    expect(k.ci95.value![1]).toBeCloseTo(0.7547, 4);
    expect(value(k.standardErrorNull)).toBeCloseTo(0.1484, 4);
  });

  it('matches Cohen (1960), Table 1 (from memory)', () => {
    // Cohen, J. (1960) Educ. Psychol. Meas. 20:37-46, Table 1: 200 subjects, three
    // categories; po = .70, pc = .41, kappa = .492. Counts recalled from memory.
    const m = matrixFromCounts(['1', '2', '3'], [[88, 14, 18], [10, 40, 10], [2, 6, 12]]);
    const k = cohenKappa(m);
    expect(value(k.observed)).toBeCloseTo(0.7, 10);
    expect(value(k.expected)).toBeCloseTo(0.41, 10);
    expect(value(k.kappa)).toBeCloseTo(0.492, 3);
  });

  it('matches the diagnostic example of Fleiss, Levin & Paik (2003), ch. 18 (from memory)', () => {
    // Fleiss, Levin & Paik, Statistical Methods for Rates and Proportions, 3rd ed.,
    // ch. 18: 100 patients, psychotic / neurotic / organic, proportions
    // .75 .01 .04 / .05 .04 .01 / .00 .00 .10; po = .89, pe = .66, kappa = .68.
    // Table recalled from memory.
    const m = matrixFromCounts(['psychotic', 'neurotic', 'organic'], [[75, 1, 4], [5, 4, 1], [0, 0, 10]]);
    const k = cohenKappa(m);
    expect(value(k.observed)).toBeCloseTo(0.89, 10);
    expect(value(k.expected)).toBeCloseTo(0.66, 10);
    expect(value(k.kappa)).toBeCloseTo(0.68, 2);
  });

  it("matches the two-rater example of Wikipedia's Cohen's kappa article (from memory)", () => {
    // 50 applications, yes/no: 20 both yes, 15 both no, 5 and 10 split; po = 0.7,
    // pe = 0.5, kappa = 0.4. Recalled from memory.
    const k = cohenKappa(matrixFromCounts(['yes', 'no'], [[20, 5], [10, 15]]));
    expect(value(k.observed)).toBeCloseTo(0.7, 10);
    expect(value(k.expected)).toBeCloseTo(0.5, 10);
    expect(value(k.kappa)).toBeCloseTo(0.4, 10);
  });
});

describe('PABAK against the paradox tables', () => {
  // Feinstein & Cicchetti (1990) J. Clin. Epidemiol. 43:543-549, the two tables with
  // po = 0.85 but kappa 0.70 and 0.32; Byrt, Bishop & Carlin (1993) J. Clin. Epidemiol.
  // 46:423-429 answer them with PABAK = 2·po − 1 = 0.70 for both. Tables from memory.
  it.each([
    { cells: [[40, 9], [6, 45]], kappa: 0.7 },
    { cells: [[80, 10], [5, 5]], kappa: 0.32 },
  ])('table $cells: kappa $kappa, PABAK 0.70', ({ cells, kappa }) => {
    const m = matrixFromCounts(['+', '-'], cells);
    expect(value(cohenKappa(m).observed)).toBeCloseTo(0.85, 10);
    expect(value(cohenKappa(m).kappa)).toBeCloseTo(kappa, 2);
    expect(value(pabak(m))).toBeCloseTo(0.7, 10);
  });

  it('generalises to k classes as (k·po − 1)/(k − 1), kappa with chance fixed at 1/k', () => {
    // With both interpreters' shares uniform (1/k each), Cohen's pe is exactly 1/k, so
    // PABAK and kappa coincide: the generalisation used here (common practice).
    const m = matrixFromCounts(['a', 'b', 'c'], [[6, 2, 2], [2, 6, 2], [2, 2, 6]]);
    expect(value(pabak(m))).toBeCloseTo(value(cohenKappa(m).kappa), 12);
    expect(value(pabak(m))).toBeCloseTo((3 * 0.6 - 1) / 2, 12);
  });
});

describe("Fleiss' kappa against Fleiss (1971)", () => {
  it('matches the 30 patients rated by 6 psychiatrists each', () => {
    // Fleiss, J. L. (1971) Psychol. Bull. 76:378-382: kappa = .430. The raw calls come from
    // statsmodels' test suite (the `diagnoses` data of R's irr package); R irr's
    // kappam.fleiss gives kappa 0.4302445 and z = 17.65183, both quoted there.
    const diagnoses = inputs.fleiss.find((c) => c.name === 'Fleiss (1971) diagnoses')!;
    const { categories, table } = ratingTable(diagnoses.calls);
    const f = fleissKappa(categories, table);
    expect(f.subjects).toBe(30);
    expect(f.raters).toBe(6);
    expect(value(f.kappa)).toBeCloseTo(0.4302445, 7);
    expect(value(f.kappa) / value(f.standardErrorNull)).toBeCloseTo(17.65183, 4);
  });

  it("matches the worked example of Wikipedia's Fleiss' kappa article", () => {
    // 10 subjects, 14 raters, 5 categories: kappa 0.210, as printed in the article and
    // quoted in statsmodels/stats/tests/test_inter_rater.py (`table1`).
    const table = [
      [0, 0, 0, 0, 14], [0, 2, 6, 4, 2], [0, 0, 3, 5, 6], [0, 3, 9, 2, 0], [2, 2, 8, 1, 1],
      [7, 7, 0, 0, 0], [3, 2, 6, 3, 0], [2, 5, 3, 2, 2], [6, 5, 2, 1, 0], [0, 2, 2, 3, 7],
    ];
    const f = fleissKappa(['1', '2', '3', '4', '5'], table);
    expect(value(f.observed)).toBeCloseTo(0.378, 3);
    expect(value(f.expected)).toBeCloseTo(0.213, 3);
    expect(value(f.kappa)).toBeCloseTo(0.21, 3);
  });
});
