import { stretchTable, type StretchLimits } from './stretch.ts';

// Lookup tables of recent stretches: building one costs as much as stretching a tile,
// and a view reuses the same few limits for every tile.
const tables = new Map<string, Uint8Array>();
const KEPT_TABLES = 24;

function cachedTable(limits: StretchLimits, size: number): Uint8Array {
  const key = `${size}:${limits.min}:${limits.max}:${limits.gamma}`;
  let table = tables.get(key);
  if (!table) {
    table = stretchTable(limits, size);
    if (tables.size >= KEPT_TABLES) tables.delete(tables.keys().next().value!);
    tables.set(key, table);
  }
  return table;
}

/** Stretches float values to bytes: linear, or through gamma (as stretchValue does). */
function stretchFloats(band: BandValues, limits: StretchLimits, out: Uint8ClampedArray, channel: number, pixelCount: number): void {
  const scale = 1 / (limits.max - limits.min);
  const inverse = 1 / limits.gamma;
  const linear = limits.gamma === 1;
  for (let i = 0, o = channel; i < pixelCount; i++, o += 4) {
    const t = (band[i] - limits.min) * scale;
    // (x + 0.5) | 0 rounds a non-negative x half up, as Math.round does.
    out[o] = !(t > 0) ? 0 : t >= 1 ? 255 : (255 * (linear ? t : Math.pow(t, inverse)) + 0.5) | 0;
  }
}

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
    if (!integer) {
      stretchFloats(band, channelLimits[c], out, c, pixelCount);
      continue;
    }
    const table = cachedTable(channelLimits[c], band instanceof Uint8Array ? 256 : 65536);
    for (let i = 0, o = c; i < pixelCount; i++, o += 4) out[o] = table[band[i]];
  }
  const checkAll = noData !== null || bands.some((b) => !(b instanceof Uint8Array || b instanceof Uint16Array));
  for (let i = 0, o = 3; i < pixelCount; i++, o += 4) {
    let opaque = 255;
    if (checkAll) {
      for (const band of bands) {
        const v = band[i];
        if (v === noData || v !== v) opaque = 0;
      }
    }
    out[o] = opaque;
  }
  return out;
}
