import { Deflate } from 'fflate';
import { FieldType, Tag } from '../../../src/core/tiff/tags.ts';
import { serializeTiff, type IfdEntry } from '../../../src/core/tiff/tiffSerializer.ts';
import { writeGeoTiff } from '../../../src/core/tiff/writeGeoTiff.ts';
import { makeBands } from './helpers.ts';

// Small bad files, each made here rather than committed.

/** A valid small GeoTIFF: 64 x 48, 2 bands, uint16, 16-pixel tiles, overviews 2 and 4. */
export function goodTiff(): Uint8Array {
  return writeGeoTiff({
    width: 64, height: 48, sampleType: 'uint16', bands: makeBands('uint16', 64, 48, 2, 3),
    epsg: 32632, origin: [600000, 5100000], pixelSize: [2, 2], tileSize: 16, overviewFactors: [2, 4],
  });
}

/** The good file cut short: its IFDs are whole, but its last tiles are missing. */
export function truncatedTiff(): Uint8Array {
  const whole = goodTiff();
  return whole.slice(0, Math.floor(whole.length * 0.6));
}

/** Entries of a 1-band uint8 tiled image, with the tile offsets and counts left to the serializer. */
function imageEntries(width: number, height: number, tile: number, extra: IfdEntry[] = []): IfdEntry[] {
  return [
    { tag: Tag.ImageWidth, type: FieldType.LONG, values: [width] },
    { tag: Tag.ImageLength, type: FieldType.LONG, values: [height] },
    { tag: Tag.BitsPerSample, type: FieldType.SHORT, values: [8] },
    { tag: Tag.Compression, type: FieldType.SHORT, values: [1] },
    { tag: Tag.Photometric, type: FieldType.SHORT, values: [1] },
    { tag: Tag.SamplesPerPixel, type: FieldType.SHORT, values: [1] },
    { tag: Tag.TileWidth, type: FieldType.LONG, values: [tile] },
    { tag: Tag.TileLength, type: FieldType.LONG, values: [tile] },
    ...extra,
  ];
}

/** A 1e6 x 1e6 pixel image declared in a file of a few hundred bytes. */
export function hugeTiff(): Uint8Array {
  return serializeTiff(
    [{ entries: imageEntries(1_000_000, 1_000_000, 256), blocks: [new Uint8Array(16)], offsetsTag: Tag.TileOffsets, byteCountsTag: Tag.TileByteCounts }],
    [0],
  );
}

/** A valid 32 x 32 uint8 TIFF with no GeoTIFF tags at all. */
export function plainTiff(): Uint8Array {
  const tile = new Uint8Array(16 * 16);
  for (let i = 0; i < tile.length; i++) tile[i] = i & 0xff;
  return serializeTiff(
    [{ entries: imageEntries(32, 32, 16), blocks: [tile, tile, tile, tile], offsetsTag: Tag.TileOffsets, byteCountsTag: Tag.TileByteCounts }],
    [0],
  );
}

/** Not a TIFF: the first bytes of a PNG, then text. */
export function notTiff(): Uint8Array {
  return new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, ...new TextEncoder().encode('not an image at all')]);
}

/**
 * 26 bytes: the header (8), then one IFD at offset 8 with one entry (ImageWidth = 1)
 * whose next-IFD offset is 8 again. A reader without a cycle check never stops.
 */
export function loopTiff(): Uint8Array {
  const bytes = new Uint8Array(26);
  const view = new DataView(bytes.buffer);
  bytes.set([0x49, 0x49, 42, 0]);
  view.setUint32(4, 8, true);
  view.setUint16(8, 1, true);
  view.setUint16(10, Tag.ImageWidth, true);
  view.setUint16(12, FieldType.SHORT, true);
  view.setUint32(14, 1, true);
  view.setUint16(18, 1, true);
  view.setUint32(22, 8, true);
  return bytes;
}

/** A chain of `count` distinct, empty IFDs. */
export function longChainTiff(count: number): Uint8Array {
  const bytes = new Uint8Array(8 + count * 6);
  const view = new DataView(bytes.buffer);
  bytes.set([0x49, 0x49, 42, 0]);
  view.setUint32(4, 8, true);
  for (let i = 0; i < count; i++) {
    const at = 8 + i * 6;
    view.setUint16(at, 0, true);
    view.setUint32(at + 2, i + 1 < count ? at + 6 : 0, true);
  }
  return bytes;
}

/**
 * A zlib stream of `megabytes` MiB of zeros, about 1 KiB per MiB. One MiB is compressed
 * after a MiB of zeros and sync-flushed to a byte boundary; since it refers only to the
 * zeros before it, the same bytes can be repeated to make the stream as long as wanted.
 */
export function zeroBomb(megabytes: number): Uint8Array {
  let parts: Uint8Array[] = [];
  const deflater = new Deflate({ level: 9 }, (chunk) => parts.push(chunk));
  const zeros = new Uint8Array(1024 * 1024);
  const take = () => {
    const taken = concat(parts);
    parts = [];
    return taken;
  };
  deflater.push(zeros);
  deflater.flush(true);
  const first = take();
  deflater.push(zeros);
  deflater.flush(true);
  const repeat = take();
  deflater.push(new Uint8Array(0), true);
  const last = take();
  const body = [first, ...new Array<Uint8Array>(Math.max(0, megabytes - 1)).fill(repeat), last];
  // The zlib header by hand; the Adler-32 trailer is left zero (readers that stop early never see it).
  return concat([new Uint8Array([0x78, 0xda]), ...body, new Uint8Array(4)]);
}

function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** A 64 x 64 uint8 deflate image of one tile that inflates to `megabytes` MiB, not 4 KiB. */
export function bombTiff(megabytes = 1024): Uint8Array {
  const entries = imageEntries(64, 64, 64).map((e) => (e.tag === Tag.Compression ? { ...e, values: [8] } : e));
  entries.push(
    { tag: Tag.ModelPixelScale, type: FieldType.DOUBLE, values: [1, 1, 0] },
    { tag: Tag.ModelTiepoint, type: FieldType.DOUBLE, values: [0, 0, 0, 500000, 5000000, 0] },
    { tag: Tag.GeoKeyDirectory, type: FieldType.SHORT, values: [1, 1, 0, 2, 1024, 0, 1, 1, 3072, 0, 1, 32632] },
  );
  return serializeTiff([{ entries, blocks: [zeroBomb(megabytes)], offsetsTag: Tag.TileOffsets, byteCountsTag: Tag.TileByteCounts }], [0]);
}
