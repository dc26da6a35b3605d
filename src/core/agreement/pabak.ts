import type { ConfusionMatrix } from './confusionMatrix.ts';
import { defined, undefinedBecause, type Figure } from './figure.ts';

/**
 * Prevalence- and bias-adjusted kappa: kappa with chance agreement fixed at 1/k, i.e.
 * (k·po − 1)/(k − 1). For two classes this is Byrt, Bishop & Carlin's (1993) 2·po − 1.
 * k counts the classes in the matrix (by default those seen in either pass).
 */
export function pabak(m: ConfusionMatrix): Figure {
  const k = m.classes.length;
  if (m.n === 0) return undefinedBecause('no paired calls to compare');
  if (k < 2) return undefinedBecause(`only one class (${m.classes[0] ?? 'none'}) was used, so PABAK is undefined`);
  let agreeing = 0;
  for (let i = 0; i < k; i++) agreeing += m.counts[i][i];
  const po = agreeing / m.n;
  return defined((k * po - 1) / (k - 1));
}
