import { median, quantile, type BandSpectrum } from '../render/spectrum.ts';
import { Random } from '../random.ts';
import type { SiteState } from '../site/index.ts';
import { siteConsensus } from './consensus.ts';

// The spectrum a species shows across the site, to read a disputed patch against: per
// band, the median of the pure pixels of every patch settled as that species, pooled.
// Its 95 % interval comes from a cluster bootstrap: whole patches are resampled with
// replacement and their pixels pooled again (the first-stage resampling of Davison, A. C.
// & Hinkley, D. V. 1997, Bootstrap Methods and their Application, §3.8, recalled from
// memory), because pixels of one crown share its light and soil and are not
// independent; resampling pixels alone would draw the band too narrow. Percentile
// interval as in spectrum.ts (Efron & Tibshirani 1993, ch. 13).

/**
 * Pure pixels grouped by patch: `values` holds every pixel's bands one after another
 * (pixel-major), and patch g owns pixels starts[g] .. starts[g + 1] - 1.
 */
export interface PooledPixels {
  bands: number;
  values: Float32Array;
  starts: Int32Array;
}

export interface PooledSpectrum {
  /** patches with at least one pixel */
  patches: number;
  pixels: number;
  bands: BandSpectrum[];
}

export interface PooledOptions {
  resamples?: number;
  seed?: number;
}

/** Groups per-patch pixel lists (each pixel an array of band values) into PooledPixels. */
export function poolPixels(bands: number, patches: readonly (readonly ArrayLike<number>[])[]): PooledPixels {
  const starts = new Int32Array(patches.length + 1);
  let n = 0;
  patches.forEach((pixels, g) => {
    starts[g] = n;
    n += pixels.length;
  });
  starts[patches.length] = n;
  const values = new Float32Array(n * bands);
  let at = 0;
  for (const pixels of patches) for (const pixel of pixels) for (let k = 0; k < bands; k++) values[at++] = pixel[k];
  return { bands, values, starts };
}

/** Median per band over all pixels, with the cluster-bootstrap 95 % interval. */
export function pooledSpectrum(pooled: PooledPixels, options: PooledOptions = {}): PooledSpectrum {
  const { bands, values, starts } = pooled;
  const resamples = options.resamples ?? 1000;
  // Patches without pixels take no part: a resample of them would draw nothing.
  const groups: number[] = [];
  for (let g = 0; g + 1 < starts.length; g++) if (starts[g + 1] > starts[g]) groups.push(g);
  const m = groups.length;
  const pixels = m ? starts[starts.length - 1] - starts[0] : 0;
  if (m === 0) return { patches: 0, pixels: 0, bands: Array.from({ length: bands }, (_, band) => ({ band, median: NaN, low: NaN, high: NaN })) };

  const bandValues = (picks: ArrayLike<number>, count: number, k: number, out: Float64Array): Float64Array => {
    let n = 0;
    for (let i = 0; i < count; i++) {
      const g = groups[picks[i]];
      for (let p = starts[g]; p < starts[g + 1]; p++) out[n++] = values[p * bands + k];
    }
    return out.subarray(0, n);
  };

  const all = Int32Array.from(groups, (_, i) => i);
  // A resample may draw the largest patch every time: room for m of them.
  const largest = Math.max(...groups.map((g) => starts[g + 1] - starts[g]));
  const scratch = new Float64Array(Math.max(pixels, largest * m));
  const medians = Array.from({ length: bands }, (_, k) => median(bandValues(all, m, k, scratch)));

  const random = new Random(options.seed ?? 1);
  const draws = Array.from({ length: bands }, () => new Float64Array(resamples));
  const picks = new Int32Array(m);
  for (let r = 0; r < resamples; r++) {
    for (let i = 0; i < m; i++) picks[i] = random.int(m);
    for (let k = 0; k < bands; k++) draws[k][r] = median(bandValues(picks, m, k, scratch));
  }
  return {
    patches: m,
    pixels,
    bands: medians.map((med, band) => {
      const sorted = draws[band].sort();
      return { band, median: med, low: quantile(sorted, 0.025), high: quantile(sorted, 0.975) };
    }),
  };
}

/** The patches settled as each species (a single call, agreed calls, or a ruling), in id order. */
export function settledPatchesBySpecies(state: SiteState): Map<string, string[]> {
  const settled = siteConsensus(state.patches.keys(), state.tags.values(), state.rulings.values());
  const out = new Map<string, string[]>();
  for (const [id, c] of settled) {
    if (c.species === null || c.status === 'open' || c.status === 'excluded') continue;
    (out.get(c.species) ?? out.set(c.species, []).get(c.species)!).push(id);
  }
  for (const ids of out.values()) ids.sort();
  return out;
}
