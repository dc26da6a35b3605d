import type { BandEntry } from '../bandTable.ts';
import { indexBands, normalisedDifference, type IndexName } from './indices.ts';

// "Show only vegetation": a pixel mask from an index and a threshold. Other tools (the
// checks, the offset search) reuse it to count or match vegetated pixels.

export interface Threshold {
  index: IndexName;
  /** Pixels whose index is at or above this value are kept. */
  min: number;
}

/** 1 where value >= min, 0 elsewhere (NaN, i.e. no data, is never kept). */
export function thresholdMask(values: ArrayLike<number>, min: number): Uint8Array {
  const mask = new Uint8Array(values.length);
  for (let i = 0; i < values.length; i++) mask[i] = values[i] >= min ? 1 : 0;
  return mask;
}

/**
 * The vegetation mask of multispectral pixels: bands holds every band of the raster
 * (one array each, same length), the table names them. Throws a RangeError naming the
 * missing band when the table cannot feed the index.
 */
export function vegetationMask(bands: ArrayLike<number>[], table: BandEntry[], threshold: Threshold, noData: number | null = null): Uint8Array {
  const found = indexBands(table, threshold.index);
  if ('problem' in found) throw new RangeError(found.problem);
  if (found.a >= bands.length || found.b >= bands.length) {
    throw new RangeError(`the band table names band ${Math.max(found.a, found.b) + 1}, but only ${bands.length} bands were given`);
  }
  return thresholdMask(normalisedDifference(bands[found.a], bands[found.b], noData), threshold.min);
}

/** Share of kept pixels: a quick figure for a patch or a view. */
export function maskShare(mask: Uint8Array): number {
  let kept = 0;
  for (let i = 0; i < mask.length; i++) kept += mask[i];
  return mask.length ? kept / mask.length : 0;
}
