// Pan-sharpening: multispectral bands brought to panchromatic resolution by injecting
// the pan band's spatial detail. Both methods work on bands already upsampled to the pan
// grid (see upsampleNearest) and leave values in the multispectral bands' own units, so
// the bands' stretch still applies.

export type SharpenMethod = 'brovey' | 'ihs';

export interface SharpenInput {
  /** The pan band at its resolution. */
  pan: ArrayLike<number>;
  /** The displayed multispectral bands, upsampled to the pan grid. */
  bands: ArrayLike<number>[];
  /** Weight of each band in the synthetic pan (intensity); default equal weights. */
  weights?: number[];
  /**
   * A linear gain applied to pan before it replaces the intensity, so a pan band on a
   * different radiometric scale still matches (see panGain). Default 1.
   */
  gain?: number;
  noData?: number | null;
}

function checked(input: SharpenInput): { n: number; weights: number[] } {
  const n = input.pan.length;
  if (input.bands.length === 0) throw new RangeError('pan-sharpening needs at least one multispectral band');
  for (const band of input.bands) {
    if (band.length !== n) throw new RangeError(`every band must be upsampled to the pan grid: ${band.length} values against ${n}`);
  }
  const weights = input.weights ?? input.bands.map(() => 1 / input.bands.length);
  if (weights.length !== input.bands.length) throw new RangeError(`${weights.length} weights for ${input.bands.length} bands`);
  if (!weights.every((w) => w >= 0) || !(weights.reduce((a, b) => a + b, 0) > 0)) throw new RangeError('weights must be non-negative and not all zero');
  return { n, weights };
}

/**
 * Weighted Brovey transform: out_k = ms_k * pan / I with I = sum_i w_i * ms_i. With
 * equal weights 1/3 on red, green and blue this is the Brovey transform of Gillespie,
 * Kahle & Walker (1987) scaled to keep the bands' units; the weighted form is the one
 * GDAL's pan-sharpening implements ("WeightedBrovey", GDAL VRT documentation). A pixel
 * with zero intensity stays zero.
 */
export function brovey(input: SharpenInput): Float32Array[] {
  const { n, weights } = checked(input);
  const gain = input.gain ?? 1;
  const intensity = weightedSum(input.bands, weights, n);
  const out = input.bands.map(() => new Float32Array(n));
  const pan = input.pan;
  for (let i = 0; i < n; i++) {
    const sum = intensity[i];
    intensity[i] = sum > 0 ? (gain * pan[i]) / sum : 0; // now the factor
  }
  for (let k = 0; k < out.length; k++) {
    const band = input.bands[k], target = out[k];
    for (let i = 0; i < n; i++) target[i] = band[i] * intensity[i];
  }
  markNoData(input, out);
  return out;
}

/**
 * Fast (generalised) IHS fusion of Tu, Su, Shyu & Huang (2001), "A new look at IHS-like
 * image fusion methods", Information Fusion 2:177-186: out_k = ms_k + (pan - I) with
 * I = sum_i w_i * ms_i (w = 1/3 each for red, green, blue: the linear IHS transform's
 * intensity). It equals transforming to IHS, replacing I with pan and transforming back.
 */
export function fastIhs(input: SharpenInput): Float32Array[] {
  const { n, weights } = checked(input);
  const gain = input.gain ?? 1;
  const detail = weightedSum(input.bands, weights, n);
  const out = input.bands.map(() => new Float32Array(n));
  const pan = input.pan;
  for (let i = 0; i < n; i++) detail[i] = gain * pan[i] - detail[i];
  for (let k = 0; k < out.length; k++) {
    const band = input.bands[k], target = out[k];
    for (let i = 0; i < n; i++) {
      const v = band[i] + detail[i];
      target[i] = v > 0 ? v : 0;
    }
  }
  markNoData(input, out);
  return out;
}

/** The synthetic pan (intensity) sum_k w_k * band_k, band by band (one pass each keeps loops simple and fast). */
function weightedSum(bands: ArrayLike<number>[], weights: number[], n: number): Float64Array {
  const sum = new Float64Array(n);
  for (let k = 0; k < bands.length; k++) {
    const band = bands[k], w = weights[k];
    for (let i = 0; i < n; i++) sum[i] += w * band[i];
  }
  return sum;
}

export function sharpen(method: SharpenMethod, input: SharpenInput): Float32Array[] {
  return method === 'brovey' ? brovey(input) : fastIhs(input);
}

function markNoData(input: SharpenInput, out: Float32Array[]): void {
  const noData = input.noData;
  if (noData === null || noData === undefined) return;
  for (let i = 0; i < input.pan.length; i++) {
    let missing = input.pan[i] === noData;
    for (const band of input.bands) if (band[i] === noData) missing = true;
    if (missing) for (const band of out) band[i] = NaN;
  }
}

/**
 * The gain that puts pan on the intensity's scale: the ratio of their means over a
 * sample of the scene (a global match, so tiles show no seams). Common practice.
 */
export function panGain(panMean: number, intensityMean: number): number {
  return panMean > 0 && intensityMean > 0 ? intensityMean / panMean : 1;
}

/**
 * Resamples a window of a coarser grid onto a finer one by nearest neighbour: target
 * pixel (c, r) takes source pixel (floor(x0 + (c + 0.5) * step), floor(y0 + (r + 0.5) * step)),
 * with x0, y0 the target's top-left corner in source pixels and step the ratio of pixel
 * sizes. Pixels that fall outside the source read as `outside`.
 */
export function upsampleNearest(
  source: ArrayLike<number>, sourceWidth: number, sourceHeight: number,
  targetWidth: number, targetHeight: number, x0: number, y0: number, step: number, outside = NaN,
): Float32Array {
  const out = new Float32Array(targetWidth * targetHeight);
  const columns = new Int32Array(targetWidth);
  for (let c = 0; c < targetWidth; c++) columns[c] = Math.floor(x0 + (c + 0.5) * step);
  for (let r = 0; r < targetHeight; r++) {
    const row = Math.floor(y0 + (r + 0.5) * step);
    const base = r * targetWidth;
    if (row < 0 || row >= sourceHeight) {
      out.fill(outside, base, base + targetWidth);
      continue;
    }
    const from = row * sourceWidth;
    for (let c = 0; c < targetWidth; c++) {
      const col = columns[c];
      out[base + c] = col >= 0 && col < sourceWidth ? source[from + col] : outside;
    }
  }
  return out;
}
