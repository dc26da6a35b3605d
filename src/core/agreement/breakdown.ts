import { cohenKappa, type CohenKappa } from './cohenKappa.ts';
import { confusionMatrix } from './confusionMatrix.ts';
import type { PairedCall } from './pairedCall.ts';

export interface GroupAgreement {
  /** The group's value (a confidence level, a species group). */
  key: string;
  n: number;
  figures: CohenKappa;
}

/**
 * Agreement within each group of pairs (e.g. by the first interpreter's confidence):
 * each group keeps the overall class list, so its kappa uses the same matrix order.
 * Pairs whose key is undefined are left out; groups come in first-seen order unless
 * `order` lists them.
 */
export function breakdownBy(
  pairs: readonly PairedCall[],
  keyOf: (pair: PairedCall) => string | undefined,
  classes: readonly string[],
  order?: readonly string[],
): GroupAgreement[] {
  const groups = new Map<string, PairedCall[]>();
  for (const key of order ?? []) groups.set(key, []);
  for (const pair of pairs) {
    const key = keyOf(pair);
    if (key === undefined) continue;
    let list = groups.get(key);
    if (!list) groups.set(key, (list = []));
    list.push(pair);
  }
  const result: GroupAgreement[] = [];
  for (const [key, list] of groups) {
    if (list.length === 0) continue;
    const m = confusionMatrix(list.map((p) => p.first), list.map((p) => p.second), classes);
    result.push({ key, n: list.length, figures: cohenKappa(m) });
  }
  return result;
}
