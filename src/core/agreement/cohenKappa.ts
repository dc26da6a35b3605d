import type { ConfusionMatrix } from './confusionMatrix.ts';
import { defined, undefinedBecause, type Figure } from './figure.ts';

/** The two-sided 97.5 % point of the standard normal distribution. */
const Z_975 = 1.959963984540054;

export interface CohenKappa {
  /** Number of paired calls. */
  n: number;
  /** Share of pairs on the diagonal (po). */
  observed: Figure;
  /** Agreement expected by chance from the two interpreters' class shares (pe). */
  expected: Figure;
  /** (po − pe) / (1 − pe), Cohen (1960). */
  kappa: Figure;
  /** Large-sample standard error, not under the null hypothesis (Fleiss, Cohen & Everitt 1969). */
  standardError: Figure;
  /** kappa ± 1.96 · standardError, clipped to kappa's range [−1, 1]. */
  ci95: Figure<[number, number]>;
  /** Standard error under the null hypothesis kappa = 0 (for a test against chance). */
  standardErrorNull: Figure;
}

/** Why kappa has no value for a matrix, or null when it has one. */
export function kappaUndefinedReason(m: ConfusionMatrix, expected: number): string | null {
  if (m.n === 0) return 'no paired calls to compare';
  if (expected >= 1 - 1e-12) {
    const used = m.classes.filter((_, i) => m.rowTotals[i] + m.columnTotals[i] > 0);
    return used.length <= 1
      ? `both interpreters used one class only (${used[0] ?? 'none'}), so chance agreement is 1 and kappa is undefined`
      : 'expected agreement is 1, so kappa is undefined';
  }
  return null;
}

/**
 * Cohen's kappa with its large-sample standard error. The variance follows
 * Fleiss, Cohen & Everitt (1969), eq. for unweighted kappa:
 *   var = [Σ p_ii (1 − (p_i. + p_.i)(1 − κ))² + (1 − κ)² Σ_{i≠j} p_ij (p_.i + p_j.)²
 *          − (κ − pe (1 − κ))²] / (n (1 − pe)²)
 */
export function cohenKappa(m: ConfusionMatrix): CohenKappa {
  const n = m.n;
  const k = m.classes.length;
  if (n === 0) {
    const reason = 'no paired calls to compare';
    return {
      n,
      observed: undefinedBecause(reason),
      expected: undefinedBecause(reason),
      kappa: undefinedBecause(reason),
      standardError: undefinedBecause(reason),
      ci95: undefinedBecause(reason),
      standardErrorNull: undefinedBecause(reason),
    };
  }
  const row = m.rowTotals.map((t) => t / n);
  const col = m.columnTotals.map((t) => t / n);
  // Sums of counts first, one division last: perfect agreement then gives exactly 1.
  let agreeing = 0;
  let marginProducts = 0;
  for (let i = 0; i < k; i++) {
    agreeing += m.counts[i][i];
    marginProducts += m.rowTotals[i] * m.columnTotals[i];
  }
  const po = agreeing / n;
  const pe = marginProducts / (n * n);
  const reason = kappaUndefinedReason(m, pe);
  if (reason) {
    return {
      n,
      observed: defined(po),
      expected: defined(Math.min(pe, 1)),
      kappa: undefinedBecause(reason),
      standardError: undefinedBecause(reason),
      ci95: undefinedBecause(reason),
      standardErrorNull: undefinedBecause(reason),
    };
  }
  const kappa = (po - pe) / (1 - pe);

  let diagonalTerm = 0;
  let offDiagonalTerm = 0;
  let nullTerm = 0;
  for (let i = 0; i < k; i++) {
    diagonalTerm += (m.counts[i][i] / n) * (1 - (row[i] + col[i]) * (1 - kappa)) ** 2;
    nullTerm += row[i] * col[i] * (row[i] + col[i]);
    for (let j = 0; j < k; j++) {
      if (i !== j) offDiagonalTerm += (m.counts[i][j] / n) * (col[i] + row[j]) ** 2;
    }
  }
  const variance =
    (diagonalTerm + (1 - kappa) ** 2 * offDiagonalTerm - (kappa - pe * (1 - kappa)) ** 2) / ((1 - pe) ** 2 * n);
  const varianceNull = (pe + pe * pe - nullTerm) / ((1 - pe) ** 2 * n);
  // Where the variance is zero in exact arithmetic (perfect agreement, one side using a
  // single class) rounding leaves ±1e-17 or so; report it as zero, not as its root.
  const se = Math.sqrt(variance > 1e-15 ? variance : 0);
  const seNull = Math.sqrt(varianceNull > 1e-15 ? varianceNull : 0);
  const low = Math.max(-1, kappa - Z_975 * se);
  const high = Math.min(1, kappa + Z_975 * se);
  return {
    n,
    observed: defined(po),
    expected: defined(pe),
    kappa: defined(kappa),
    standardError: defined(se),
    ci95: defined([low, high]),
    standardErrorNull: defined(seNull),
  };
}
