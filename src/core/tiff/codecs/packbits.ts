import { CodecError } from './deflate.ts';

/** PackBits (TIFF compression 32773), each row packed on its own as TIFF 6.0 asks. */
export function packBitsEncode(raw: Uint8Array, rowBytes: number): Uint8Array {
  const out = new Uint8Array(raw.length + Math.ceil(raw.length / 128) + Math.ceil(raw.length / rowBytes) + 8);
  let o = 0;
  for (let rowStart = 0; rowStart < raw.length; rowStart += rowBytes) {
    const end = Math.min(raw.length, rowStart + rowBytes);
    let i = rowStart;
    while (i < end) {
      // A run of three or more equal bytes becomes a replicate run.
      let j = i + 1;
      while (j < end && j - i < 128 && raw[j] === raw[i]) j++;
      if (j - i >= 3) {
        out[o++] = 257 - (j - i);
        out[o++] = raw[i];
        i = j;
        continue;
      }
      // Otherwise a literal run up to the next run of three.
      const start = i;
      while (i < end && i - start < 128) {
        if (i + 2 < end && raw[i] === raw[i + 1] && raw[i] === raw[i + 2]) break;
        i++;
      }
      out[o++] = i - start - 1;
      out.set(raw.subarray(start, i), o);
      o += i - start;
    }
  }
  return out.slice(0, o);
}

/** Unpacks into exactly `expected` bytes; output past that is refused, not written. */
export function packBitsDecode(data: Uint8Array, expected: number): Uint8Array {
  const out = new Uint8Array(expected);
  let o = 0;
  let i = 0;
  while (i < data.length && o < expected) {
    const n = data[i++];
    if (n < 128) {
      const count = n + 1;
      if (o + count > expected) throw new CodecError(`unpacks past its declared ${expected} bytes`);
      if (i + count > data.length) throw new CodecError('the PackBits data ends inside a literal run');
      out.set(data.subarray(i, i + count), o);
      o += count;
      i += count;
    } else if (n > 128) {
      const count = 257 - n;
      if (o + count > expected) throw new CodecError(`unpacks past its declared ${expected} bytes`);
      if (i >= data.length) throw new CodecError('the PackBits data ends inside a replicate run');
      out.fill(data[i++], o, o + count);
      o += count;
    }
    // 128 is a no-op.
  }
  // Full: a further run means the data holds more than declared (a lone pad byte is let be).
  while (i < data.length && data[i] === 128) i++;
  if (data.length - i >= 2) throw new CodecError(`unpacks past its declared ${expected} bytes`);
  if (o < expected) throw new CodecError(`unpacks to ${o} bytes, not the declared ${expected}`);
  return out;
}
