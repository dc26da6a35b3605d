// Colour ramps for index layers: stops from low to high, linearly blended in sRGB.

export interface RampStop {
  /** Position of the stop within the ramp, 0 at its low end and 1 at its high end. */
  at: number;
  rgb: [number, number, number];
}

export interface ColourRamp {
  name: string;
  stops: RampStop[];
}

/** Bare ground and rock in browns, through a pale middle, to dense green vegetation. */
export const vegetationRamp: ColourRamp = {
  name: 'ground to vegetation',
  stops: [
    { at: 0, rgb: [84, 48, 5] },
    { at: 0.3, rgb: [191, 129, 45] },
    { at: 0.5, rgb: [240, 236, 210] },
    { at: 0.7, rgb: [120, 190, 110] },
    { at: 1, rgb: [0, 90, 40] },
  ],
};

/**
 * A 256-entry RGB lookup table of a ramp, so colouring a tile is one table read per
 * pixel. Stops must start at 0, end at 1 and rise.
 */
export function rampTable(ramp: ColourRamp): Uint8Array {
  const { stops } = ramp;
  if (stops.length < 2 || stops[0].at !== 0 || stops[stops.length - 1].at !== 1 || stops.some((s, i) => i > 0 && s.at <= stops[i - 1].at)) {
    throw new RangeError(`the ramp "${ramp.name}" needs rising stops from 0 to 1`);
  }
  const table = new Uint8Array(256 * 3);
  let k = 0;
  for (let i = 0; i < 256; i++) {
    const t = i / 255;
    while (k < stops.length - 2 && t > stops[k + 1].at) k++;
    const lo = stops[k], hi = stops[k + 1];
    const f = (t - lo.at) / (hi.at - lo.at);
    for (let c = 0; c < 3; c++) table[i * 3 + c] = Math.round(lo.rgb[c] + f * (hi.rgb[c] - lo.rgb[c]));
  }
  return table;
}

/**
 * Colours values between `low` and `high` through a ramp table into RGBA bytes.
 * NaN (no value) and pixels the mask leaves out (mask byte 0) are transparent.
 */
export function colourise(
  values: ArrayLike<number>, table: Uint8Array, low: number, high: number,
  mask: Uint8Array | null = null, out = new Uint8ClampedArray(values.length * 4),
): Uint8ClampedArray<ArrayBuffer> {
  if (!(high > low)) throw new RangeError(`a colour ramp needs low < high, got ${low} and ${high}`);
  const scale = 255 / (high - low);
  for (let i = 0, o = 0; i < values.length; i++, o += 4) {
    const v = values[i];
    if (Number.isNaN(v) || (mask && mask[i] === 0)) {
      out[o + 3] = 0;
      continue;
    }
    const step = Math.max(0, Math.min(255, Math.round((v - low) * scale))) * 3;
    out[o] = table[step];
    out[o + 1] = table[step + 1];
    out[o + 2] = table[step + 2];
    out[o + 3] = 255;
  }
  return out as Uint8ClampedArray<ArrayBuffer>;
}
