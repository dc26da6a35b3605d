import { stretchTable, stretchValue, type StretchLimits } from './stretch.ts';

export type BandValues = ArrayLike<number>;

/**
 * Paints up to three stretched bands into RGBA bytes. One band gives grey; three give
 * red, green and blue. Pixels equal to noData, or NaN (no value), in any band become
 * transparent.
 */
export function compositeRgba(
  bands: BandValues[],
  limits: StretchLimits[],
  pixelCount: number,
  noData: number | null = null,
  out: Uint8ClampedArray<ArrayBuffer> = new Uint8ClampedArray(pixelCount * 4),
): Uint8ClampedArray<ArrayBuffer> {
  if (bands.length !== 1 && bands.length !== 3) throw new RangeError(`a composite takes 1 or 3 bands, got ${bands.length}`);
  if (limits.length !== bands.length) throw new RangeError('one stretch per band is needed');
  const channels = bands.length === 1 ? [bands[0], bands[0], bands[0]] : bands;
  const channelLimits = bands.length === 1 ? [limits[0], limits[0], limits[0]] : limits;
  for (let c = 0; c < 3; c++) {
    const band = channels[c];
    const integer = band instanceof Uint8Array || band instanceof Uint16Array;
    const table = integer ? stretchTable(channelLimits[c], band instanceof Uint8Array ? 256 : 65536) : null;
    for (let i = 0, o = c; i < pixelCount; i++, o += 4) {
      out[o] = table ? table[band[i]] : stretchValue(band[i], channelLimits[c]);
    }
  }
  for (let i = 0, o = 3; i < pixelCount; i++, o += 4) {
    let opaque = 255;
    for (const band of bands) {
      const v = band[i];
      if (v === noData || v !== v) opaque = 0;
    }
    out[o] = opaque;
  }
  return out;
}
