import type { CohenKappa } from './cohenKappa.ts';
import type { DelineationFigures } from './delineation.ts';
import type { Figure } from './figure.ts';
import type { FleissKappa } from './fleissKappa.ts';

// One plain sentence per figure, for the agreement sheet and the CLI's text output.
// Each says what the number means for these patches, or why there is no number.

const percent = (x: number) => `${(x * 100).toFixed(1)} %`;
const fixed = (x: number) => x.toFixed(3);
const patches = (n: number) => `${n} ${n === 1 ? 'patch' : 'patches'}`;

function said<T>(figure: Figure<T>, sentence: (value: T) => string): string {
  return figure.value === null ? `Not defined: ${figure.reason}.` : sentence(figure.value);
}

export interface KappaExplanations {
  observed: string;
  expected: string;
  kappa: string;
  standardError: string;
  ci95: string;
  pabak: string;
}

export function explainKappa(figures: CohenKappa, pabak: Figure, classCount: number): KappaExplanations {
  return {
    observed: said(figures.observed, (po) =>
      `The two interpreters gave the same class to ${percent(po)} of the ${patches(figures.n)}.`),
    expected: said(figures.expected, (pe) =>
      `Two interpreters calling at random with these same class shares would agree on ${percent(pe)}.`),
    kappa: said(figures.kappa, (k) => k >= 0
      ? `Agreement beyond chance: ${fixed(k)} of the way from chance level (0) to perfect agreement (1).`
      : `Less agreement than chance would give (${fixed(k)}): 0 is chance level, 1 perfect agreement.`),
    standardError: said(figures.standardError, (se) =>
      `The uncertainty of kappa from having only ${patches(figures.n)}: about ±${fixed(se)} for one standard error.`),
    ci95: said(figures.ci95, ([low, high]) =>
      `With 95 % confidence, kappa over many such patches lies between ${fixed(low)} and ${fixed(high)}.`),
    pabak: said(pabak, (p) =>
      `Kappa as if all ${classCount} classes were equally common and both interpreters used them alike: ${fixed(p)}.`),
  };
}

export function explainSpecific(name: string, specific: Figure): string {
  return said(specific, (s) =>
    `Of the calls of ${name} by either interpreter, ${percent(s)} were shared by the other.`);
}

export function explainFleiss(figures: FleissKappa): string {
  return said(figures.kappa, (k) => k >= 0
    ? `Agreement beyond chance among all ${figures.raters} interpreters on ${patches(figures.subjects)}: ${fixed(k)} (0 chance, 1 perfect).`
    : `Less agreement than chance among the ${figures.raters} interpreters on ${patches(figures.subjects)} (${fixed(k)}; 0 chance, 1 perfect).`);
}

export interface DelineationExplanations {
  matched: string;
  unmatched: string;
  meanIou: string;
  areaWeightedAgreement: string;
}

export function explainDelineation(d: DelineationFigures): DelineationExplanations {
  return {
    matched: `${d.matched} outlines of the first delineation (of ${d.firstCount}) found a partner in the second (of ${d.secondCount}) with IoU of at least ${d.minIou}.`,
    unmatched: `${d.unmatchedFirst} outlines were drawn only by the first interpreter and ${d.unmatchedSecond} only by the second.`,
    meanIou: said(d.meanIou, (m) =>
      `On average a matched pair shares ${percent(m)} of the area the two outlines cover together.`),
    areaWeightedAgreement: said(d.areaWeightedAgreement, (a) =>
      `Of the area shared by matched pairs, ${percent(a)} carries the same species from both interpreters.`),
  };
}
