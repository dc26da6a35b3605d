import { CodecError } from './deflate.ts';

// TIFF LZW (compression 5): codes of 9 to 12 bits, most significant bit first, with the
// "early change" of code width that libtiff writes. 256 clears the table, 257 ends.
const CLEAR = 256;
const EOI = 257;
const FIRST = 258;
const MAX_CODES = 4096;

// The encoder's string table: child code of (prefix code, next byte), 0 meaning none.
// Kept between calls and reset entry by entry, so a tile costs no 2 MB clear.
const children = new Uint16Array(MAX_CODES * 256);
const used = new Int32Array(MAX_CODES);

export function lzwEncode(raw: Uint8Array): Uint8Array {
  const out = new Uint8Array(Math.ceil(raw.length * 1.5) + 16);
  let o = 0;
  let bitBuffer = 0;
  let bitCount = 0;
  let width = 9;
  let next = FIRST;
  let usedCount = 0;

  const put = (code: number) => {
    bitBuffer = (bitBuffer << width) | code;
    bitCount += width;
    while (bitCount >= 8) {
      bitCount -= 8;
      out[o++] = (bitBuffer >>> bitCount) & 0xff;
    }
    bitBuffer &= (1 << bitCount) - 1;
  };
  const resetTable = () => {
    for (let k = 0; k < usedCount; k++) children[used[k]] = 0;
    usedCount = 0;
    next = FIRST;
  };
  // After each code the decoder adds one entry; the width grows when the table passes
  // 2^width - 1, and the table is cleared before it reaches 4095 entries (libtiff's rule).
  const afterEntry = () => {
    next++;
    if (next === MAX_CODES - 2) {
      put(CLEAR);
      resetTable();
      width = 9;
    } else if (next > (1 << width) - 1) {
      width++;
    }
  };

  put(CLEAR);
  if (raw.length > 0) {
    let prefix = raw[0];
    for (let i = 1; i < raw.length; i++) {
      const c = raw[i];
      const key = prefix * 256 + c;
      const child = children[key];
      if (child !== 0) {
        prefix = child;
        continue;
      }
      put(prefix);
      children[key] = next;
      used[usedCount++] = key;
      afterEntry();
      prefix = c;
    }
    put(prefix);
    afterEntry();
  }
  put(EOI);
  resetTable();
  if (bitCount > 0) out[o++] = (bitBuffer << (8 - bitCount)) & 0xff;
  return out.slice(0, o);
}

/** Decodes into exactly `expected` bytes; a stream that would write past them is refused. */
export function lzwDecode(data: Uint8Array, expected: number): Uint8Array {
  if (data.length >= 2 && data[0] === 0 && (data[1] & 0x01) === 1) {
    throw new CodecError('old-style (pre-TIFF 6.0) LZW is not supported');
  }
  const out = new Uint8Array(expected);
  const prefix = new Int16Array(MAX_CODES);
  const suffix = new Uint8Array(MAX_CODES);
  const first = new Uint8Array(MAX_CODES);
  const length = new Uint16Array(MAX_CODES);
  for (let k = 0; k < 256; k++) {
    suffix[k] = k;
    first[k] = k;
    length[k] = 1;
  }
  const totalBits = data.length * 8;
  let bitPos = 0;
  let width = 9;
  let next = FIRST;
  let old = -1;
  let o = 0;

  // Writes the string of `code` at the output position, last byte first.
  const emit = (code: number) => {
    const n = length[code];
    if (o + n > expected) throw new CodecError(`decodes past its declared ${expected} bytes`);
    let k = o + n - 1;
    let c = code;
    while (c >= 256) {
      out[k--] = suffix[c];
      c = prefix[c];
    }
    out[k] = c;
    o += n;
  };
  const addEntry = (p: number, c: number) => {
    if (next >= MAX_CODES) return; // a full table waits for a clear code
    prefix[next] = p;
    suffix[next] = c;
    first[next] = first[p];
    length[next] = length[p] + 1;
    next++;
    if (next >= (1 << width) - 1 && width < 12) width++;
  };

  for (;;) {
    if (bitPos + width > totalBits) break; // no end code: stop at the end of the data
    const byte = bitPos >>> 3;
    const window = (data[byte] << 16) | ((data[byte + 1] ?? 0) << 8) | (data[byte + 2] ?? 0);
    const code = (window >>> (24 - (bitPos & 7) - width)) & ((1 << width) - 1);
    bitPos += width;
    if (code === EOI) break;
    if (code === CLEAR) {
      width = 9;
      next = FIRST;
      old = -1;
      continue;
    }
    if (old === -1) {
      if (code >= 256) throw new CodecError(`corrupt LZW data (code ${code} right after a clear)`);
      emit(code);
      old = code;
      continue;
    }
    if (code < next) {
      emit(code);
      addEntry(old, first[code]);
    } else if (code === next && next < MAX_CODES) {
      addEntry(old, first[old]);
      emit(code);
    } else {
      throw new CodecError(`corrupt LZW data (code ${code} before it is defined)`);
    }
    old = code;
    if (o === expected) {
      // Full: only an end code (or nothing) may follow.
      if (bitPos + width <= totalBits) {
        const b = bitPos >>> 3;
        const w = (data[b] << 16) | ((data[b + 1] ?? 0) << 8) | (data[b + 2] ?? 0);
        const after = (w >>> (24 - (bitPos & 7) - width)) & ((1 << width) - 1);
        if (after !== EOI && after !== CLEAR) throw new CodecError(`decodes past its declared ${expected} bytes`);
      }
      break;
    }
  }
  if (o < expected) throw new CodecError(`decodes to ${o} bytes, not the declared ${expected}`);
  return out;
}
