import { describe, expect, it } from 'vitest';
import { cohenKappa } from '../../../src/core/agreement/cohenKappa.ts';
import { confusionMatrix, matrixFromCounts } from '../../../src/core/agreement/confusionMatrix.ts';
import { explainFleiss, explainKappa, explainSpecific } from '../../../src/core/agreement/explanations.ts';
import { undefinedBecause } from '../../../src/core/agreement/figure.ts';
import { fleissKappa } from '../../../src/core/agreement/fleissKappa.ts';
import { pabak } from '../../../src/core/agreement/pabak.ts';

describe('explanations', () => {
  it('give one line per figure that carries its value', () => {
    const m = matrixFromCounts(['a', 'b'], [[20, 5], [10, 15]]);
    const e = explainKappa(cohenKappa(m), pabak(m), 2);
    expect(e.observed).toBe('The two interpreters gave the same class to 70.0 % of the 50 patches.');
    expect(e.expected).toMatch(/agree on 50.0 %/);
    expect(e.kappa).toMatch(/^Agreement beyond chance: 0.400/);
    expect(e.ci95).toMatch(/between 0\.\d{3} and 0\.\d{3}/);
    expect(e.pabak).toMatch(/all 2 classes .*: 0.400/);
    for (const line of Object.values(e)) expect(line).not.toMatch(/\n|NaN|undefined/);
  });

  it('say plainly when agreement is worse than chance', () => {
    const m = matrixFromCounts(['a', 'b'], [[1, 4], [4, 1]]);
    expect(explainKappa(cohenKappa(m), pabak(m), 2).kappa).toBe('Less agreement than chance would give (-0.600): 0 is chance level, 1 perfect agreement.');
  });

  it('say why a figure is missing', () => {
    const m = confusionMatrix(['a'], ['a']);
    const e = explainKappa(cohenKappa(m), pabak(m), 1);
    expect(e.kappa).toMatch(/^Not defined: both interpreters used one class only \(a\)/);
    expect(explainSpecific('salix', undefinedBecause('neither interpreter used salix'))).toBe('Not defined: neither interpreter used salix.');
  });

  it("explain Fleiss' kappa with raters and patches", () => {
    expect(explainFleiss(fleissKappa(['a', 'b'], [[3, 0], [0, 3]]))).toMatch(/all 3 interpreters on 2 patches: 1.000/);
  });
});
