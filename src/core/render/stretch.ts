// Contrast stretch: map raw band values to display values 0-255. Limits come from the
// data's own percentiles (common practice: 2-98 %), never from the type's full range,
// which would show 11-bit data held in uint16 as a black image.

export interface StretchLimits {
  min: number;
  max: number;
  /** Display gamma; 1 is linear, above 1 brightens the dark end. */
  gamma: number;
}

export type Samples = ArrayLike<number>;

/** Histogram with one bin per integer value (for integer data) up to maxValue. */
export function integerHistogram(values: Samples, maxValue: number, noData?: number | null): Uint32Array {
  const bins = new Uint32Array(maxValue + 1);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v === noData || !(v >= 0)) continue;
    bins[v > maxValue ? maxValue : v | 0]++;
  }
  return bins;
}

/** The value below which `p` percent of the counted samples fall (nearest rank). */
export function histogramPercentile(bins: Uint32Array, p: number): number {
  let total = 0;
  for (let i = 0; i < bins.length; i++) total += bins[i];
  if (total === 0) return 0;
  const rank = Math.max(1, Math.ceil((p / 100) * total));
  let seen = 0;
  for (let i = 0; i < bins.length; i++) {
    seen += bins[i];
    if (seen >= rank) return i;
  }
  return bins.length - 1;
}

/** Percentile limits of a sample of values (any numeric type), ignoring no-data and NaN. */
export function percentileLimits(values: Samples, low = 2, high = 98, noData?: number | null): { min: number; max: number } {
  const kept: number[] = [];
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v !== noData && Number.isFinite(v)) kept.push(v);
  }
  if (kept.length === 0) return { min: 0, max: 1 };
  const sorted = Float64Array.from(kept).sort();
  const at = (p: number) => sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))];
  const min = at(low);
  let max = at(high);
  if (max <= min) max = min + 1;
  return { min, max };
}

/** Stretches one value to 0-255. */
export function stretchValue(value: number, limits: StretchLimits): number {
  const t = (value - limits.min) / (limits.max - limits.min);
  if (!(t > 0)) return 0;
  if (t >= 1) return 255;
  return Math.round(255 * (limits.gamma === 1 ? t : Math.pow(t, 1 / limits.gamma)));
}

/**
 * A lookup table from integer values 0..size-1 to display bytes, so stretching a tile
 * is one array read per pixel.
 */
export function stretchTable(limits: StretchLimits, size: number): Uint8Array {
  const table = new Uint8Array(size);
  for (let v = 0; v < size; v++) table[v] = stretchValue(v, limits);
  return table;
}
