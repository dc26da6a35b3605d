// The image signal the shift search scores: one float value per pixel of a north-up
// grid in the scene CRS (metres), NaN where there is no data. Built from the
// multispectral bands (NDVI) or the panchromatic band (brightness).

export interface SignalGrid {
  values: Float32Array;
  width: number;
  height: number;
  /** Top-left corner of the top-left pixel. */
  originX: number;
  originY: number;
  /** Positive pixel sizes; rows run south. */
  pixelX: number;
  pixelY: number;
}

/** Which signal: NDVI (Rouse et al. 1974) from the multispectral red and NIR bands, or
 * panchromatic brightness. */
export type SignalKind = 'ndvi' | 'pan';

/**
 * NDVI = (NIR - red) / (NIR + red) (Rouse, J. W., Haas, R. H., Schell, J. A. & Deering,
 * D. W. 1974, Monitoring vegetation systems in the Great Plains with ERTS, NASA SP-351).
 * No-data pixels, and pixels with NIR + red <= 0, are NaN.
 */
export function ndviValues(red: ArrayLike<number>, nir: ArrayLike<number>, nodata: number | null): Float32Array {
  const out = new Float32Array(red.length);
  for (let i = 0; i < red.length; i++) {
    const r = red[i];
    const n = nir[i];
    const sum = n + r;
    out[i] = (nodata !== null && (r === nodata || n === nodata)) || !(sum > 0) ? NaN : (n - r) / sum;
  }
  return out;
}

/**
 * Leaves out cast shadows: pixels whose NIR is below `share` of the median NIR of the
 * valid pixels become NaN. Shadowed ground lies on one side of every crown (away from
 * the sun) and reads lower in NDVI, which would pull the fit towards the sun; dark-NIR
 * thresholds are the usual first cut at shadows in very-high-resolution imagery
 * (common practice). A share of 0 keeps every pixel.
 */
export function maskShadows(values: Float32Array, nir: ArrayLike<number>, share: number): number {
  if (!(share > 0)) return 0;
  const valid: number[] = [];
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) valid.push(nir[i]);
  if (valid.length === 0) return 0;
  valid.sort((a, b) => a - b);
  const limit = share * valid[Math.floor(valid.length / 2)];
  let masked = 0;
  for (let i = 0; i < values.length; i++) {
    if (!Number.isNaN(values[i]) && nir[i] < limit) {
      values[i] = NaN;
      masked++;
    }
  }
  return masked;
}

/** Brightness as read, with no-data as NaN. */
export function brightnessValues(band: ArrayLike<number>, nodata: number | null): Float32Array {
  const out = new Float32Array(band.length);
  for (let i = 0; i < band.length; i++) out[i] = nodata !== null && band[i] === nodata ? NaN : band[i];
  return out;
}

/** True when no two valid values differ: such a grid carries no signal at all. */
export function isConstant(grid: SignalGrid): boolean {
  let first = NaN;
  for (const v of grid.values) {
    if (Number.isNaN(v)) continue;
    if (Number.isNaN(first)) first = v;
    else if (v !== first) return false;
  }
  return true;
}
