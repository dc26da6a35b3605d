// TIFF predictors over one block (tile or strip), row by row.
// 2, horizontal differencing: each sample minus the same sample of the pixel before it.
// 3, floating point: each row's bytes split into planes, most significant byte first,
//    then differenced byte by byte (Adobe Photoshop TIFF Technical Note 3, as libtiff does).

type IntArray = Uint8Array | Int8Array | Uint16Array | Int16Array | Uint32Array | Int32Array;

/** Applies predictor 2 in place; typed-array wrap-around does the modulo arithmetic. */
export function horizontalEncode(values: IntArray, width: number, rows: number, samples: number): void {
  const rowLength = width * samples;
  for (let r = 0; r < rows; r++) {
    const start = r * rowLength;
    for (let i = start + rowLength - 1; i >= start + samples; i--) values[i] -= values[i - samples];
  }
}

/** Undoes predictor 2 in place. */
export function horizontalDecode(values: IntArray, width: number, rows: number, samples: number): void {
  const rowLength = width * samples;
  for (let r = 0; r < rows; r++) {
    const start = r * rowLength;
    const end = start + rowLength;
    for (let i = start + samples; i < end; i++) values[i] += values[i - samples];
  }
}

/**
 * Applies predictor 3 to little-endian samples of `bytesPer` bytes; returns new bytes.
 */
export function floatEncode(
  bytes: Uint8Array, width: number, rows: number, samples: number, bytesPer: number,
): Uint8Array {
  const out = new Uint8Array(bytes.length);
  const count = width * samples; // values per row
  const rowBytes = count * bytesPer;
  for (let r = 0; r < rows; r++) {
    const base = r * rowBytes;
    for (let i = 0; i < count; i++) {
      for (let b = 0; b < bytesPer; b++) out[base + b * count + i] = bytes[base + i * bytesPer + (bytesPer - 1 - b)];
    }
    for (let k = base + rowBytes - 1; k >= base + samples; k--) out[k] = (out[k] - out[k - samples]) & 0xff;
  }
  return out;
}

/** Undoes predictor 3; returns the samples as little-endian bytes. */
export function floatDecode(
  bytes: Uint8Array, width: number, rows: number, samples: number, bytesPer: number,
): Uint8Array {
  const out = new Uint8Array(bytes.length);
  const count = width * samples;
  const rowBytes = count * bytesPer;
  for (let r = 0; r < rows; r++) {
    const base = r * rowBytes;
    const end = base + rowBytes;
    for (let k = base + samples; k < end; k++) bytes[k] = (bytes[k] + bytes[k - samples]) & 0xff;
    for (let i = 0; i < count; i++) {
      for (let b = 0; b < bytesPer; b++) out[base + i * bytesPer + (bytesPer - 1 - b)] = bytes[base + b * count + i];
    }
  }
  return out;
}
