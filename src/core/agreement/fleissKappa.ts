import { defined, undefinedBecause, type Figure } from './figure.ts';

export interface FleissKappa {
  /** Number of subjects (patches). */
  subjects: number;
  /** Raters per subject (the same for every subject). */
  raters: number;
  categories: string[];
  /** Share of all calls that fell in each category (p_j). */
  categoryShares: number[];
  /** Mean agreement over subjects (P̄). */
  observed: Figure;
  /** Chance agreement Σ p_j² (P̄e). */
  expected: Figure;
  /** (P̄ − P̄e) / (1 − P̄e), Fleiss (1971). */
  kappa: Figure;
  /** Standard error under kappa = 0 (Fleiss, Nee & Landis 1979), for a test against chance. */
  standardErrorNull: Figure;
}

/**
 * Fleiss' kappa for m ≥ 2 raters per subject from a subjects × categories table:
 * table[i][j] is how many raters put subject i in category j. Every subject must be
 * rated by the same number of raters.
 */
export function fleissKappa(categories: readonly string[], table: readonly (readonly number[])[]): FleissKappa {
  const q = categories.length;
  const subjects = table.length;
  if (subjects === 0) throw new RangeError('no subjects to compare');
  const raters = table[0].reduce((s, c) => s + c, 0);
  table.forEach((row, i) => {
    if (row.length !== q) throw new RangeError(`subject ${i + 1} has ${row.length} cells for ${q} categories`);
    const total = row.reduce((s, c) => s + c, 0);
    if (row.some((c) => !Number.isInteger(c) || c < 0)) throw new RangeError(`subject ${i + 1} holds a count that is not a whole number`);
    if (total !== raters) {
      throw new RangeError(`subject ${i + 1} has ${total} ratings, subject 1 has ${raters}; Fleiss' kappa needs the same number for every subject`);
    }
  });
  if (raters < 2) throw new RangeError(`each subject needs at least two ratings, found ${raters}`);

  const shares = categories.map((_, j) => table.reduce((s, row) => s + row[j], 0) / (subjects * raters));
  let observedSum = 0;
  for (const row of table) {
    let pairsAgreeing = 0;
    for (const c of row) pairsAgreeing += c * (c - 1);
    observedSum += pairsAgreeing / (raters * (raters - 1));
  }
  const observed = observedSum / subjects;
  const expected = shares.reduce((s, p) => s + p * p, 0);
  const base = { subjects, raters, categories: [...categories], categoryShares: shares };
  if (expected >= 1 - 1e-12) {
    const reason = 'every call fell in one category, so chance agreement is 1 and kappa is undefined';
    return { ...base, observed: defined(observed), expected: defined(1), kappa: undefinedBecause(reason), standardErrorNull: undefinedBecause(reason) };
  }
  const kappa = (observed - expected) / (1 - expected);
  // Fleiss, Nee & Landis (1979), eq. (12): variance of kappa when it is zero.
  let pq = 0;
  let pqSpread = 0;
  for (const p of shares) {
    pq += p * (1 - p);
    pqSpread += p * (1 - p) * (1 - 2 * p);
  }
  const variance = (2 / (subjects * raters * (raters - 1))) * (pq * pq - pqSpread) / (pq * pq);
  return {
    ...base,
    observed: defined(observed),
    expected: defined(expected),
    kappa: defined(kappa),
    standardErrorNull: defined(Math.sqrt(Math.max(0, variance))),
  };
}

/**
 * Counts calls per subject and category from raw calls: calls[i] holds every rater's
 * class for subject i. Categories default to all seen, in code-point order.
 */
export function ratingTable(calls: readonly (readonly string[])[], categories?: readonly string[]): { categories: string[]; table: number[][] } {
  const order = categories
    ? [...categories]
    : [...new Set(calls.flat())].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const index = new Map(order.map((c, j) => [c, j] as const));
  const table = calls.map((subject, i) => {
    const row = new Array<number>(order.length).fill(0);
    for (const call of subject) {
      const j = index.get(call);
      if (j === undefined) throw new RangeError(`subject ${i + 1}: class '${call}' is not in the category list`);
      row[j] += 1;
    }
    return row;
  });
  return { categories: order, table };
}
