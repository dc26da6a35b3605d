import { Inflate, zlibSync } from 'fflate';

/** Deflate (TIFF compression 8): a zlib stream, as libtiff and GDAL write it. */
export function deflateBlock(raw: Uint8Array, level: 0 | 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9 = 6): Uint8Array {
  return zlibSync(raw, { level });
}

/** Why a capped inflate failed; decodeTile turns it into a TiffError. */
export class CodecError extends Error {}

// Compressed bytes fed to the inflater per step. Deflate expands at most ~1032:1, so one
// step never makes more than ~33 MB, however hostile the stream. The first step is
// smaller, so a plain bomb is caught after ~8 MB of work; later steps are larger because
// each step costs every ordinary tile a copy of the 32 KiB window and of its output.
const FIRST_STEP = 8 * 1024;
const STEP = 32 * 1024;

/**
 * Inflates a zlib (or raw deflate) stream into exactly `expected` bytes. The stream is fed
 * in steps and inflating stops at the first step whose output passes `expected`, so a
 * tile that would inflate to gigabytes costs at most one step's output (~33 MB) of work
 * and memory.
 */
export function inflateCapped(data: Uint8Array, expected: number): Uint8Array {
  let start = 0;
  if (data.length >= 2 && (data[0] & 0x0f) === 8 && ((data[0] << 8) | data[1]) % 31 === 0) {
    if (data[1] & 0x20) throw new CodecError('the zlib stream asks for a preset dictionary');
    start = 2; // zlib header; the Adler-32 trailer after the deflate stream is ignored.
  }
  return inflateStepwise(data.subarray(start), expected);
}

function inflateStepwise(payload: Uint8Array, expected: number): Uint8Array {
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
  try {
    for (let pos = 0; pos < payload.length && !overflow;) {
      const end = Math.min(payload.length, pos + (pos === 0 ? FIRST_STEP : STEP));
      inflater.push(payload.subarray(pos, end), end === payload.length);
      pos = end;
    }
  } catch (error) {
    if (overflow) throw new CodecError(`inflates past its declared ${expected} bytes`);
    throw new CodecError(`corrupt deflate data (${(error as Error).message})`);
  }
  if (overflow) throw new CodecError(`inflates past its declared ${expected} bytes`);
  if (written < expected) throw new CodecError(`inflates to ${written} bytes, not the declared ${expected}`);
  return out;
}
