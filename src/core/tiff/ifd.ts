import { ByteSource } from './byteSource.ts';
import { TiffError } from './errors.ts';
import { FieldType, fieldTypeSize } from './tags.ts';

// Walking the IFD chain and reading tag values, safely: every offset is checked against
// the file size before it is read, the chain is followed with a visited set and a limit,
// and no tag value larger than the limit is ever read.

export interface RawEntry {
  tag: number;
  type: number;
  count: number;
  /** The value bytes when they fit in the entry, else null. */
  inline: Uint8Array | null;
  /** Where the value bytes are when they do not fit in the entry. */
  offset: number;
}

export interface RawIfd {
  offset: number;
  entries: Map<number, RawEntry>;
}

export interface Header {
  littleEndian: boolean;
  bigTiff: boolean;
  firstIfd: number;
}

const MAX_ENTRIES = 10000;

export class IfdReader {
  constructor(
    readonly source: ByteSource,
    readonly header: Header,
    readonly maxTagBytes: number,
  ) {}

  get fileName(): string {
    return this.source.fileName;
  }

  /** The chain of IFDs from the header's first one. */
  async walk(maxIfds: number): Promise<RawIfd[]> {
    const ifds: RawIfd[] = [];
    const visited = new Set<number>();
    let offset = this.header.firstIfd;
    while (offset !== 0) {
      if (visited.has(offset)) {
        throw new TiffError('ifd-loop', this.fileName, `the IFD chain loops back to offset ${offset} (a damaged or hostile file)`);
      }
      if (ifds.length >= maxIfds) {
        throw new TiffError('too-many-ifds', this.fileName, `more than ${maxIfds} image directories (IFDs); refusing to read on`);
      }
      visited.add(offset);
      const { ifd, next } = await this.readIfd(offset, ifds.length);
      ifds.push(ifd);
      offset = next;
    }
    if (ifds.length === 0) throw new TiffError('not-tiff', this.fileName, 'the TIFF header points to no image directory');
    return ifds;
  }

  private async readIfd(offset: number, index: number): Promise<{ ifd: RawIfd; next: number }> {
    const big = this.header.bigTiff;
    const countSize = big ? 8 : 2;
    const entrySize = big ? 20 : 12;
    const nextSize = big ? 8 : 4;
    const what = `image directory ${index} (IFD at offset ${offset})`;
    const countBytes = await this.source.read(offset, countSize, what);
    const count = big ? this.u64(countBytes, 0, what) : this.view(countBytes).getUint16(0, this.header.littleEndian);
    if (count > MAX_ENTRIES) throw new TiffError('too-large', this.fileName, `${what} declares ${count} tags`);
    const body = await this.source.read(offset + countSize, count * entrySize + nextSize, what);
    const view = this.view(body);
    const le = this.header.littleEndian;
    const entries = new Map<number, RawEntry>();
    for (let i = 0; i < count; i++) {
      const p = i * entrySize;
      const tag = view.getUint16(p, le);
      const type = view.getUint16(p + 2, le);
      const n = big ? this.u64(body, p + 4, what) : view.getUint32(p + 4, le);
      const valueAt = p + (big ? 12 : 8);
      const slot = big ? 8 : 4;
      const size = fieldTypeSize(type) * n;
      const fits = fieldTypeSize(type) > 0 && size <= slot;
      const entry: RawEntry = {
        tag, type, count: n,
        inline: fits ? body.subarray(valueAt, valueAt + size) : null,
        offset: fits ? 0 : big ? this.u64(body, valueAt, what) : view.getUint32(valueAt, le),
      };
      if (!entries.has(tag)) entries.set(tag, entry);
    }
    const nextAt = count * entrySize;
    const next = big ? this.u64(body, nextAt, what) : view.getUint32(nextAt, le);
    return { ifd: { offset, entries }, next };
  }

  /** The numeric values of a tag (at most `maxCount` of them are read). */
  async numbers(entry: RawEntry, what: string, maxCount = Infinity): Promise<Float64Array> {
    const size = fieldTypeSize(entry.type);
    if (size === 0) throw new TiffError('unsupported', this.fileName, `${what} has an unknown field type ${entry.type}`);
    const n = Math.min(entry.count, maxCount);
    const bytes = await this.valueBytes(entry, n * size, what);
    const view = this.view(bytes);
    const le = this.header.littleEndian;
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const p = i * size;
      switch (entry.type) {
        case FieldType.BYTE:
        case FieldType.ASCII:
        case FieldType.UNDEFINED:
          out[i] = view.getUint8(p);
          break;
        case FieldType.SBYTE:
          out[i] = view.getInt8(p);
          break;
        case FieldType.SHORT:
          out[i] = view.getUint16(p, le);
          break;
        case FieldType.SSHORT:
          out[i] = view.getInt16(p, le);
          break;
        case FieldType.LONG:
        case FieldType.IFD:
          out[i] = view.getUint32(p, le);
          break;
        case FieldType.SLONG:
          out[i] = view.getInt32(p, le);
          break;
        case FieldType.RATIONAL:
          out[i] = view.getUint32(p, le) / view.getUint32(p + 4, le);
          break;
        case FieldType.SRATIONAL:
          out[i] = view.getInt32(p, le) / view.getInt32(p + 4, le);
          break;
        case FieldType.FLOAT:
          out[i] = view.getFloat32(p, le);
          break;
        case FieldType.DOUBLE:
          out[i] = view.getFloat64(p, le);
          break;
        case FieldType.LONG8:
        case FieldType.IFD8:
          out[i] = Number(view.getBigUint64(p, le));
          break;
        case FieldType.SLONG8:
          out[i] = Number(view.getBigInt64(p, le));
          break;
      }
    }
    return out;
  }

  /** An ASCII (or byte) tag as text, without its terminating NULs. */
  async text(entry: RawEntry, what: string): Promise<string> {
    const size = fieldTypeSize(entry.type);
    if (size !== 1) throw new TiffError('unsupported', this.fileName, `${what} is not text (field type ${entry.type})`);
    const bytes = await this.valueBytes(entry, entry.count, what);
    return new TextDecoder('utf-8', { fatal: false }).decode(bytes).replace(/\0+$/, '');
  }

  private async valueBytes(entry: RawEntry, length: number, what: string): Promise<Uint8Array> {
    if (length > this.maxTagBytes) {
      throw new TiffError('too-large', this.fileName, `${what} holds ${length} bytes, past the limit of ${this.maxTagBytes}`);
    }
    if (entry.inline) return entry.inline.subarray(0, length);
    return this.source.read(entry.offset, length, what);
  }

  private view(bytes: Uint8Array): DataView {
    return new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  }

  private u64(bytes: Uint8Array, at: number, what: string): number {
    const value = this.view(bytes).getBigUint64(at, this.header.littleEndian);
    if (value > BigInt(Number.MAX_SAFE_INTEGER)) {
      throw new TiffError('too-large', this.fileName, `${what} holds a 64-bit value too large to use (${value})`);
    }
    return Number(value);
  }
}

/** Reads the 8- or 16-byte header; 'not-tiff' when the bytes are no TIFF. */
export async function readHeader(source: ByteSource): Promise<Header> {
  const name = source.fileName;
  const bytes = await source.read(0, Math.min(16, source.fileSize), 'the TIFF header');
  if (source.fileSize < 8) {
    const prefix = [0x49, 0x49, 42, 0].every((b, i) => i >= bytes.length || bytes[i] === b) ||
      [0x4d, 0x4d, 0, 42].every((b, i) => i >= bytes.length || bytes[i] === b);
    if (bytes.length >= 2 && prefix) throw new TiffError('truncated', name, `the TIFF header is cut short at ${bytes.length} bytes: the file is truncated`);
    throw new TiffError('not-tiff', name, `not a TIFF file (only ${source.fileSize} bytes)`);
  }
  const order = String.fromCharCode(bytes[0], bytes[1]);
  if (order !== 'II' && order !== 'MM') {
    throw new TiffError('not-tiff', name, `not a TIFF file (it starts with ${describeMagic(bytes)})`);
  }
  const littleEndian = order === 'II';
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const magic = view.getUint16(2, littleEndian);
  if (magic === 42) return { littleEndian, bigTiff: false, firstIfd: view.getUint32(4, littleEndian) };
  if (magic === 43) {
    if (bytes.length < 16) throw new TiffError('truncated', name, 'the BigTIFF header is cut short: the file is truncated');
    if (view.getUint16(4, littleEndian) !== 8 || view.getUint16(6, littleEndian) !== 0) {
      throw new TiffError('not-tiff', name, 'not a TIFF file (a BigTIFF header with an unknown offset size)');
    }
    const first = view.getBigUint64(8, littleEndian);
    if (first > BigInt(Number.MAX_SAFE_INTEGER)) throw new TiffError('truncated', name, 'the first IFD offset is past any file');
    return { littleEndian, bigTiff: true, firstIfd: Number(first) };
  }
  throw new TiffError('not-tiff', name, `not a TIFF file (byte-order mark ${order} but version ${magic}, not 42 or 43)`);
}

function describeMagic(bytes: Uint8Array): string {
  const head = Array.from(bytes.subarray(0, 4));
  const printable = head.every((b) => b >= 0x20 && b < 0x7f);
  const hex = head.map((b) => b.toString(16).padStart(2, '0')).join(' ');
  return printable ? `"${String.fromCharCode(...head)}" (${hex})` : `bytes ${hex}`;
}
