import type { ConfusionMatrix } from './confusionMatrix.ts';
import { defined, undefinedBecause, type Figure } from './figure.ts';

export interface ClassAgreement {
  name: string;
  /** Pairs both interpreters put in this class. */
  both: number;
  firstTotal: number;
  secondTotal: number;
  /** 2·n_ii / (n_i. + n_.i): of the calls of this class by either interpreter, the share the other shared. */
  specific: Figure;
}

/**
 * Specific (positive) agreement per class, 2a / (2a + b + c) in the 2×2 view of each
 * class against the rest (Dice 1945; Fleiss 1975; Cicchetti & Feinstein 1990).
 */
export function specificAgreement(m: ConfusionMatrix): ClassAgreement[] {
  return m.classes.map((name, i) => {
    const both = m.counts[i][i];
    const firstTotal = m.rowTotals[i];
    const secondTotal = m.columnTotals[i];
    const denominator = firstTotal + secondTotal;
    return {
      name,
      both,
      firstTotal,
      secondTotal,
      specific: denominator > 0
        ? defined((2 * both) / denominator)
        : undefinedBecause(`neither interpreter used ${name}`),
    };
  });
}
