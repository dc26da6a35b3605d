// Reduced-resolution copies of a band: each output pixel is the mean of the block of
// factor x factor input pixels it covers (the last row and column of blocks may be
// smaller), ignoring no-data (and NaN for floats). A block with no valid pixel is no-data.

export type BandArray = Uint8Array | Uint16Array | Int16Array | Float32Array;

export function overviewSize(width: number, height: number, factor: number): [number, number] {
  return [Math.ceil(width / factor), Math.ceil(height / factor)];
}

export function averageOverview(
  band: BandArray, width: number, height: number, factor: number, noData?: number,
): BandArray {
  const [ow, oh] = overviewSize(width, height, factor);
  const isFloat = band instanceof Float32Array;
  const out = new (band.constructor as { new (n: number): BandArray })(ow * oh);
  const hasNoData = noData !== undefined && !Number.isNaN(noData);
  const skip = hasNoData ? (isFloat ? Math.fround(noData) : noData) : NaN;
  const fill = noData ?? (isFloat ? NaN : 0);
  const column = new Int32Array(width);
  for (let x = 0; x < width; x++) column[x] = Math.floor(x / factor);
  const sums = new Float64Array(ow);
  const counts = new Uint32Array(ow);

  for (let oy = 0; oy < oh; oy++) {
    sums.fill(0);
    counts.fill(0);
    const yEnd = Math.min(height, (oy + 1) * factor);
    for (let y = oy * factor; y < yEnd; y++) {
      const row = y * width;
      for (let x = 0; x < width; x++) {
        const v = band[row + x];
        // NaN fails v === v, and no-data is skipped; both stay out of the mean.
        if (v === skip || v !== v) continue;
        const ox = column[x];
        sums[ox] += v;
        counts[ox]++;
      }
    }
    const base = oy * ow;
    for (let ox = 0; ox < ow; ox++) {
      const n = counts[ox];
      out[base + ox] = n === 0 ? fill : isFloat ? sums[ox] / n : Math.round(sums[ox] / n);
    }
  }
  return out;
}
