// NumPy .npy arrays (format version 1.0, as numpy.lib.format specifies): the magic
// "\x93NUMPY", version bytes 1 and 0, a little-endian uint16 header length, then a
// Python dict literal {'descr', 'fortran_order', 'shape'} padded with spaces and ended
// with a newline so the data starts on a multiple of 64 bytes; then the values in C order.

export type NpyArray = Uint8Array | Uint16Array | Int16Array | Float32Array;

function descr(array: NpyArray): string {
  if (array instanceof Uint8Array) return '|u1';
  if (array instanceof Uint16Array) return '<u2';
  if (array instanceof Int16Array) return '<i2';
  return '<f4';
}

const littleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

export function encodeNpy(array: NpyArray, shape: readonly number[]): Uint8Array {
  const count = shape.reduce((a, b) => a * b, 1);
  if (count !== array.length) throw new RangeError(`encodeNpy: shape ${shape.join(' x ')} holds ${count} values, the array ${array.length}`);
  const shapeText = shape.length === 1 ? `(${shape[0]},)` : `(${shape.join(', ')})`;
  let header = `{'descr': '${descr(array)}', 'fortran_order': False, 'shape': ${shapeText}, }`;
  const preamble = 10; // magic (6) + version (2) + header length (2)
  const total = Math.ceil((preamble + header.length + 1) / 64) * 64;
  header = header.padEnd(total - preamble - 1, ' ') + '\n';
  const out = new Uint8Array(total + array.byteLength);
  out.set([0x93, ...new TextEncoder().encode('NUMPY'), 1, 0]);
  new DataView(out.buffer).setUint16(8, header.length, true);
  out.set(new TextEncoder().encode(header), preamble);
  const data = new Uint8Array(array.buffer, array.byteOffset, array.byteLength);
  if (littleEndian || array.BYTES_PER_ELEMENT === 1) {
    out.set(data, total);
  } else {
    const size = array.BYTES_PER_ELEMENT;
    for (let i = 0; i < data.length; i += size) for (let k = 0; k < size; k++) out[total + i + k] = data[i + size - 1 - k];
  }
  return out;
}
