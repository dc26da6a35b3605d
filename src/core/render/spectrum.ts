import { Random } from '../random.ts';
import type { PolygonRings } from '../geometry/types.ts';

// The spectrum of a patch: for each band, the median over the multispectral pixels whose
// centres lie inside the polygon, with a percentile-bootstrap 95 % interval (Efron &
// Tibshirani 1993, An Introduction to the Bootstrap, ch. 13). Pixels are resampled
// whole, all bands together, so the bands' intervals come from the same resamples.

/** A window of a north-up grid: the outer corner of its top-left pixel and pixel sizes. */
export interface PixelWindow {
  originX: number;
  originY: number;
  pixelWidth: number;
  pixelHeight: number;
  width: number;
  height: number;
}

/** Indices (row * width + col) of the window's pixels whose centres lie inside the polygon (even-odd rule). */
export function pixelsInside(window: PixelWindow, polygon: PolygonRings): number[] {
  const inside: number[] = [];
  const crossings: number[] = [];
  for (let r = 0; r < window.height; r++) {
    const y = window.originY - (r + 0.5) * window.pixelHeight;
    crossings.length = 0;
    for (const ring of polygon) {
      for (let i = 1; i < ring.length; i++) {
        const [x1, y1] = ring[i - 1], [x2, y2] = ring[i];
        if ((y1 > y) !== (y2 > y)) crossings.push(x1 + ((y - y1) * (x2 - x1)) / (y2 - y1));
      }
    }
    if (crossings.length < 2) continue;
    crossings.sort((a, b) => a - b);
    for (let c = 0; c < window.width; c++) {
      const x = window.originX + (c + 0.5) * window.pixelWidth;
      let count = 0;
      for (const cx of crossings) if (cx < x) count++;
      if (count % 2 === 1) inside.push(r * window.width + c);
    }
  }
  return inside;
}

/** Median of values (mean of the middle two for an even count); NaN for none. */
export function median(values: ArrayLike<number>): number {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  if (n === 0) return NaN;
  return n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
}

export interface BandSpectrum {
  band: number;
  median: number;
  /** Percentile-bootstrap 95 % interval of the median. */
  low: number;
  high: number;
}

export interface SpectrumOptions {
  resamples?: number;
  seed?: number;
  /** Pixels whose value in any band equals this are left out. */
  noData?: number | null;
}

/**
 * The per-band median spectrum of chosen pixels. bands[k][i] is band k's value at
 * pixel i of the window; `pixels` lists which pixels belong to the patch.
 */
export function patchSpectrum(bands: ArrayLike<number>[], pixels: number[], options: SpectrumOptions = {}): { pixels: number; bands: BandSpectrum[] } {
  const resamples = options.resamples ?? 1000;
  const noData = options.noData ?? null;
  const kept = noData === null ? pixels : pixels.filter((p) => bands.every((b) => b[p] !== noData));
  const n = kept.length;
  const values = bands.map((band) => Float64Array.from(kept, (p) => band[p]));
  if (n === 0) return { pixels: 0, bands: bands.map((_, band) => ({ band, median: NaN, low: NaN, high: NaN })) };
  const random = new Random(options.seed ?? 1);
  const medians = bands.map(() => new Float64Array(resamples));
  const draw = new Float64Array(n);
  const picks = new Int32Array(n);
  for (let r = 0; r < resamples; r++) {
    for (let i = 0; i < n; i++) picks[i] = random.int(n);
    for (let k = 0; k < bands.length; k++) {
      for (let i = 0; i < n; i++) draw[i] = values[k][picks[i]];
      medians[k][r] = median(draw);
    }
  }
  return {
    pixels: n,
    bands: values.map((v, band) => {
      const sorted = medians[band].sort();
      return { band, median: median(v), low: quantile(sorted, 0.025), high: quantile(sorted, 0.975) };
    }),
  };
}

/** Linear interpolation between order statistics (Hyndman & Fan 1996, definition 7). */
export function quantile(sorted: Float64Array, q: number): number {
  const h = (sorted.length - 1) * q;
  const lo = Math.floor(h);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
