import { FieldType, fieldTypeSize } from './tags.ts';

// Lays out and writes a classic little-endian TIFF: the header, every IFD with its
// out-of-line values (so a reader finds all directories in the first bytes of the
// file), then the image blocks in the order given.

export interface IfdEntry {
  tag: number;
  type: number;
  /** Numbers, or an ASCII string (written with its terminating NUL). */
  values: ArrayLike<number> | string;
}

export interface ImageToWrite {
  /** Entries except the block offsets and byte counts, which are added here. */
  entries: IfdEntry[];
  blocks: Uint8Array[];
  offsetsTag: number;
  byteCountsTag: number;
}

const MAX_CLASSIC = 2 ** 32 - 1;

const utf8 = new TextEncoder();

/** Strings become their UTF-8 bytes and a NUL (GDAL's metadata is UTF-8). */
function asNumbers(entry: IfdEntry): { tag: number; type: number; values: ArrayLike<number> } {
  if (typeof entry.values !== 'string') return entry as { tag: number; type: number; values: ArrayLike<number> };
  const bytes = utf8.encode(entry.values);
  const values = new Uint8Array(bytes.length + 1);
  values.set(bytes);
  return { tag: entry.tag, type: entry.type, values };
}

function entryCount(entry: IfdEntry): number {
  return entry.values.length;
}

function entryBytes(entry: IfdEntry): number {
  return entryCount(entry) * fieldTypeSize(entry.type);
}

/** Serializes images chained in the given order; block data goes in `dataOrder`. */
export function serializeTiff(images: ImageToWrite[], dataOrder: number[]): Uint8Array {
  // The full entry list of each IFD, with offset and byte-count arrays to fill in.
  const full = images.map((image) => {
    const offsets = new Uint32Array(image.blocks.length);
    const counts = new Uint32Array(image.blocks.map((b) => b.length));
    const entries = [
      ...image.entries.map(asNumbers),
      { tag: image.offsetsTag, type: FieldType.LONG, values: offsets },
      { tag: image.byteCountsTag, type: FieldType.LONG, values: counts },
    ].sort((a, b) => a.tag - b.tag);
    return { entries, offsets, blocks: image.blocks };
  });

  // Pass 1: where each IFD and each out-of-line value goes.
  let pos = 8;
  const ifdOffsets: number[] = [];
  const valueOffsets: number[][] = [];
  for (const image of full) {
    ifdOffsets.push(pos);
    pos += 2 + image.entries.length * 12 + 4;
    const offsets: number[] = [];
    for (const entry of image.entries) {
      const bytes = entryBytes(entry);
      if (bytes <= 4) {
        offsets.push(-1);
        continue;
      }
      pos += pos & 1; // values start on a word boundary
      offsets.push(pos);
      pos += bytes;
    }
    valueOffsets.push(offsets);
  }
  for (const index of dataOrder) {
    const image = full[index];
    for (let b = 0; b < image.blocks.length; b++) {
      image.offsets[b] = pos;
      pos += image.blocks[b].length;
      if (pos > MAX_CLASSIC) throw new RangeError('the image is too large for a classic TIFF (over 4 GiB)');
    }
  }

  // Pass 2: write.
  const out = new Uint8Array(pos);
  const view = new DataView(out.buffer);
  out.set([0x49, 0x49, 42, 0]);
  view.setUint32(4, ifdOffsets[0] ?? 0, true);
  full.forEach((image, i) => {
    let p = ifdOffsets[i];
    view.setUint16(p, image.entries.length, true);
    p += 2;
    image.entries.forEach((entry, e) => {
      view.setUint16(p, entry.tag, true);
      view.setUint16(p + 2, entry.type, true);
      view.setUint32(p + 4, entryCount(entry), true);
      const at = valueOffsets[i][e];
      if (at < 0) {
        writeValues(view, p + 8, entry);
      } else {
        view.setUint32(p + 8, at, true);
        writeValues(view, at, entry);
      }
      p += 12;
    });
    view.setUint32(p, ifdOffsets[i + 1] ?? 0, true);
  });
  for (const image of full) {
    image.blocks.forEach((block, b) => out.set(block, image.offsets[b]));
  }
  return out;
}

function writeValues(view: DataView, at: number, entry: IfdEntry): void {
  const { values, type } = entry as { values: ArrayLike<number>; type: number };
  const size = fieldTypeSize(type);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const p = at + i * size;
    switch (type) {
      case FieldType.BYTE:
      case FieldType.ASCII:
      case FieldType.UNDEFINED:
        view.setUint8(p, v);
        break;
      case FieldType.SHORT:
        view.setUint16(p, v, true);
        break;
      case FieldType.SSHORT:
        view.setInt16(p, v, true);
        break;
      case FieldType.LONG:
        view.setUint32(p, v, true);
        break;
      case FieldType.SLONG:
        view.setInt32(p, v, true);
        break;
      case FieldType.FLOAT:
        view.setFloat32(p, v, true);
        break;
      case FieldType.DOUBLE:
        view.setFloat64(p, v, true);
        break;
      default:
        throw new RangeError(`cannot write TIFF field type ${type}`);
    }
  }
}
