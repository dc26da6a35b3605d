import type { StretchLimits } from './stretch.ts';

// A band's sample: its valid values, sorted, taken from an overview or a window (never
// the full image of a large scene). Every stretch rule and the histogram read it, so
// switching rules costs no new reading.

export interface BandSample {
  /** Valid values (no no-data, no NaN), ascending. */
  sorted: Float64Array;
  mean: number;
  /** Population standard deviation. */
  sd: number;
}

/** How the display limits of a band are chosen. */
export type StretchRule =
  | { kind: 'percentile'; low: number; high: number }
  | { kind: 'minmax' }
  | { kind: 'stddev'; k: number }
  | { kind: 'manual'; min: number; max: number };

/** The default: 2-98 % (common practice for very-high-resolution imagery). */
export const defaultRule: StretchRule = { kind: 'percentile', low: 2, high: 98 };

/**
 * Gathers the valid values of a band; with `maxCount`, every k-th value is kept so the
 * sample stays small (a regular subsample, so it is the same on every run).
 */
export function bandSample(values: ArrayLike<number>, noData: number | null = null, maxCount = Infinity): BandSample {
  const stride = values.length > maxCount ? Math.ceil(values.length / maxCount) : 1;
  const kept = new Float64Array(Math.ceil(values.length / stride));
  let n = 0;
  for (let i = 0; i < values.length; i += stride) {
    const v = values[i];
    if (v !== noData && Number.isFinite(v)) kept[n++] = v;
  }
  return sampleOf(kept.subarray(0, n));
}

/** A sample from values already gathered (they are sorted in place). */
export function sampleOf(values: Float64Array): BandSample {
  sortAscending(values);
  let sum = 0;
  for (let i = 0; i < values.length; i++) sum += values[i];
  const mean = values.length ? sum / values.length : 0;
  let squares = 0;
  for (let i = 0; i < values.length; i++) squares += (values[i] - mean) ** 2;
  return { sorted: values, mean, sd: values.length ? Math.sqrt(squares / values.length) : 0 };
}

/** The widest value range sorted by counting (a 4 MB count table); wider goes to the comparison sort. */
const COUNTING_RANGE = 1 << 20;

/**
 * Sorts in place, as `Float64Array.prototype.sort` does. Imagery samples are mostly
 * integers of a narrow range (8- to 16-bit counts), which a counting sort orders in
 * linear time: a quarter-million values in a few milliseconds rather than tens.
 */
export function sortAscending(values: Float64Array): void {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    // Not a plain integer (a fraction, NaN, -0, or out of the exact range): compare instead.
    if (!Number.isSafeInteger(v) || Object.is(v, -0)) {
      values.sort();
      return;
    }
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  // A table much longer than the sample would cost more than it saves.
  if (values.length < 2 || hi - lo >= COUNTING_RANGE || hi - lo > 8 * values.length) {
    values.sort();
    return;
  }
  const counts = new Uint32Array(hi - lo + 1);
  for (let i = 0; i < values.length; i++) counts[values[i] - lo]++;
  let at = 0;
  for (let k = 0; k < counts.length; k++) {
    for (let c = counts[k]; c > 0; c--) values[at++] = k + lo;
  }
}

/**
 * The value at percentile p of a sorted sample by nearest rank, the inverse of the
 * empirical distribution function (Hyndman & Fan 1996, definition 1).
 */
export function percentileOfSorted(sorted: ArrayLike<number>, p: number): number {
  if (sorted.length === 0) return 0;
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length - 1, Math.max(0, rank - 1))];
}

/** Display limits of a band under a rule; an empty or flat sample still gives max > min. */
export function limitsFor(sample: BandSample, rule: StretchRule, gamma = 1): StretchLimits {
  const { sorted } = sample;
  let min: number, max: number;
  switch (rule.kind) {
    case 'percentile':
      if (!(rule.low >= 0 && rule.high <= 100 && rule.low < rule.high)) {
        throw new RangeError(`percentile limits must satisfy 0 <= low < high <= 100, got ${rule.low} and ${rule.high}`);
      }
      min = percentileOfSorted(sorted, rule.low);
      max = percentileOfSorted(sorted, rule.high);
      break;
    case 'minmax':
      min = sorted.length ? sorted[0] : 0;
      max = sorted.length ? sorted[sorted.length - 1] : 1;
      break;
    case 'stddev':
      if (!(rule.k > 0)) throw new RangeError(`a standard-deviation stretch needs k > 0, got ${rule.k}`);
      min = sample.mean - rule.k * sample.sd;
      max = sample.mean + rule.k * sample.sd;
      if (sorted.length) {
        // Limits past the data's own range only waste display levels.
        min = Math.max(min, sorted[0]);
        max = Math.min(max, sorted[sorted.length - 1]);
      }
      break;
    case 'manual':
      if (!Number.isFinite(rule.min) || !Number.isFinite(rule.max) || rule.min >= rule.max) {
        throw new RangeError(`manual limits need a minimum below the maximum, got ${rule.min} and ${rule.max}`);
      }
      min = rule.min;
      max = rule.max;
      break;
  }
  if (!(gamma > 0) || !Number.isFinite(gamma)) throw new RangeError(`gamma must be a positive number, got ${gamma}`);
  if (!(max > min)) max = min + 1;
  return { min, max, gamma };
}

export interface Histogram {
  /** Lower edge of the first bin and upper edge of the last. */
  min: number;
  max: number;
  counts: Uint32Array;
}

/**
 * Equal-width bins over [min, max] (default: the sample's range); values outside are
 * left out, the last bin includes its upper edge (as numpy.histogram does).
 */
export function histogramOf(sample: BandSample, bins = 128, range?: [number, number]): Histogram {
  const { sorted } = sample;
  const min = range ? range[0] : sorted.length ? sorted[0] : 0;
  let max = range ? range[1] : sorted.length ? sorted[sorted.length - 1] : 1;
  if (!(max > min)) max = min + 1;
  const counts = new Uint32Array(bins);
  const scale = bins / (max - min);
  for (let i = 0; i < sorted.length; i++) {
    const v = sorted[i];
    if (v < min || v > max) continue;
    counts[Math.min(bins - 1, Math.floor((v - min) * scale))]++;
  }
  return { min, max, counts };
}
