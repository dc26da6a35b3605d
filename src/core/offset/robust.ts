// Order statistics for the residual and bootstrap summaries.

/** The q-quantile (0-1) by linear interpolation between order statistics (R's type 7). */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export const median = (values: readonly number[]) => quantile(values, 0.5);

/** Median absolute deviation from the median (unscaled). */
export function mad(values: readonly number[]): number {
  const m = median(values);
  return median(values.map((v) => Math.abs(v - m)));
}

/**
 * Modified z-scores 0.6745 (x - median) / MAD (Iglewicz, B. & Hoaglin, D. C. 1993, How
 * to Detect and Handle Outliers, ASQC, who suggest flagging |z| > 3.5). A zero MAD
 * gives 0 for values at the median and Infinity for the rest.
 */
export function modifiedZ(values: readonly number[]): number[] {
  const m = median(values);
  const d = mad(values);
  return values.map((v) => (d > 0 ? (0.6745 * (v - m)) / d : v === m ? 0 : Infinity));
}
