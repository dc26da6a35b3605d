import { breakdownBy, type GroupAgreement } from './breakdown.ts';
import { cohenKappa, type CohenKappa } from './cohenKappa.ts';
import { columnShares, confusionMatrix, rowShares, seenClasses, type ConfusionMatrix } from './confusionMatrix.ts';
import { explainKappa, explainSpecific, type KappaExplanations } from './explanations.ts';
import type { Figure } from './figure.ts';
import type { PairedCall } from './pairedCall.ts';
import { pabak } from './pabak.ts';
import { specificAgreement, type ClassAgreement } from './specificAgreement.ts';

export interface ClassAgreementLine extends ClassAgreement {
  explanation: string;
}

/** Everything the agreement sheet shows for two passes over the same patches. */
export interface AgreementSheet {
  matrix: ConfusionMatrix;
  /** Cells as shares of their row (first interpreter) and of their column (second). */
  rowShares: (number | null)[][];
  columnShares: (number | null)[][];
  figures: CohenKappa;
  pabak: Figure;
  explanations: KappaExplanations;
  perClass: ClassAgreementLine[];
  /** By the first interpreter's confidence, when the calls carry it. */
  byConfidence: GroupAgreement[];
  /** By species group, when the calls carry it. */
  byGroup: GroupAgreement[];
}

export interface SheetOptions {
  /** Matrix order, e.g. the roster's; default: classes seen in either pass, sorted. */
  classes?: readonly string[];
  /** Order of the confidence breakdown; default sure, likely, unsure, then others as met. */
  confidenceOrder?: readonly string[];
}

const CONFIDENCE_ORDER = ['sure', 'likely', 'unsure'];

/** Computes the agreement sheet from paired calls. */
export function agreementSheet(pairs: readonly PairedCall[], options: SheetOptions = {}): AgreementSheet {
  const first = pairs.map((p) => p.first);
  const second = pairs.map((p) => p.second);
  const classes = options.classes ? [...options.classes] : seenClasses(first, second);
  const matrix = confusionMatrix(first, second, classes);
  const figures = cohenKappa(matrix);
  const adjusted = pabak(matrix);
  return {
    matrix,
    rowShares: rowShares(matrix),
    columnShares: columnShares(matrix),
    figures,
    pabak: adjusted,
    explanations: explainKappa(figures, adjusted, classes.length),
    perClass: specificAgreement(matrix).map((c) => ({ ...c, explanation: explainSpecific(c.name, c.specific) })),
    byConfidence: breakdownBy(pairs, (p) => p.confidence, classes, options.confidenceOrder ?? CONFIDENCE_ORDER),
    byGroup: breakdownBy(pairs, (p) => p.group, classes),
  };
}
