import { Inflate, zlibSync } from 'fflate';

/** Deflate (TIFF compression 8): a zlib stream, as libtiff and GDAL write it. */
export function deflateBlock(raw: Uint8Array, level: 0 | 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9 = 6): Uint8Array {
  return zlibSync(raw, { level });
}

/** Why a capped inflate failed; decodeTile turns it into a TiffError. */
export class CodecError extends Error {}

// Compressed bytes fed to the inflater per step. Deflate expands at most ~1032:1, so one
// step never makes more than ~8.5 MB, however hostile the stream.
const STEP = 8 * 1024;

/**
 * Inflates a zlib (or raw deflate) stream into exactly `expected` bytes. Stops as soon as
 * the output would pass `expected`, so a tile that inflates to gigabytes costs at most
 * one step's worth of work and memory past its declared size.
 */
export function inflateCapped(data: Uint8Array, expected: number): Uint8Array {
  const out = new Uint8Array(expected);
  let written = 0;
  let overflow = false;
  const inflater = new Inflate((chunk) => {
    if (overflow) return;
    if (written + chunk.length > expected) {
      overflow = true;
      return;
    }
    out.set(chunk, written);
    written += chunk.length;
  });

  let start = 0;
  if (data.length >= 2 && (data[0] & 0x0f) === 8 && ((data[0] << 8) | data[1]) % 31 === 0) {
    if (data[1] & 0x20) throw new CodecError('the zlib stream asks for a preset dictionary');
    start = 2; // zlib header; the Adler-32 trailer after the deflate stream is ignored.
  }
  try {
    for (let pos = start; pos < data.length && !overflow; pos += STEP) {
      const end = Math.min(data.length, pos + STEP);
      inflater.push(data.subarray(pos, end), end === data.length);
    }
  } catch (error) {
    if (overflow) throw new CodecError(`inflates past its declared ${expected} bytes`);
    throw new CodecError(`corrupt deflate data (${(error as Error).message})`);
  }
  if (overflow) throw new CodecError(`inflates past its declared ${expected} bytes`);
  if (written < expected) throw new CodecError(`inflates to ${written} bytes, not the declared ${expected}`);
  return out;
}
