import type { MultiPolygonRings } from '../geometry/types.ts';

// GeoPackage binary geometry (OGC GeoPackage Encoding Standard 12-128r18, §2.1.3): the
// "GP" header with version, flags, srs_id and an xy envelope, then the geometry as
// ISO/OGC well-known binary (OGC 06-103r4 Simple Features, §8.2). Little-endian
// throughout; doubles are written as they are, so the geometry is lossless.

const WKB_POLYGON = 3;
const WKB_MULTIPOLYGON = 6;
/** Flags: bit 0 little-endian, bits 1-3 envelope kind 1 = [minx, maxx, miny, maxy]. */
const FLAGS_LE_XY_ENVELOPE = 0b0000_0011;
/** Flags: little-endian, no envelope, bit 4 empty geometry. */
const FLAGS_LE_EMPTY = 0b0001_0001;

function wkbSize(parts: MultiPolygonRings): number {
  let size = 9;
  for (const rings of parts) {
    size += 9;
    for (const ring of rings) size += 4 + ring.length * 16;
  }
  return size;
}

/** One MultiPolygon as GeoPackage binary geometry in the given srs_id. */
export function geopackageGeometry(parts: MultiPolygonRings, srsId: number): Uint8Array {
  const empty = parts.every((rings) => rings.every((ring) => ring.length === 0)) || parts.length === 0;
  const header = empty ? 8 : 8 + 32;
  const bytes = new Uint8Array(header + wkbSize(parts));
  const view = new DataView(bytes.buffer);
  bytes[0] = 0x47; // 'G'
  bytes[1] = 0x50; // 'P'
  bytes[2] = 0; // version 1 is stored as 0
  bytes[3] = empty ? FLAGS_LE_EMPTY : FLAGS_LE_XY_ENVELOPE;
  view.setInt32(4, srsId, true);
  if (!empty) {
    let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
    for (const rings of parts) for (const ring of rings) for (const [x, y] of ring) {
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
    view.setFloat64(8, minX, true);
    view.setFloat64(16, maxX, true);
    view.setFloat64(24, minY, true);
    view.setFloat64(32, maxY, true);
  }
  let at = header;
  const u8 = (v: number) => { bytes[at] = v; at += 1; };
  const u32 = (v: number) => { view.setUint32(at, v, true); at += 4; };
  const f64 = (v: number) => { view.setFloat64(at, v, true); at += 8; };
  u8(1);
  u32(WKB_MULTIPOLYGON);
  u32(parts.length);
  for (const rings of parts) {
    u8(1);
    u32(WKB_POLYGON);
    u32(rings.length);
    for (const ring of rings) {
      u32(ring.length);
      for (const [x, y] of ring) { f64(x); f64(y); }
    }
  }
  return bytes;
}

/** Reads GeoPackage binary MultiPolygon geometry back (what this module writes). */
export function readGeopackageGeometry(bytes: Uint8Array): { srsId: number; parts: MultiPolygonRings } {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes[0] !== 0x47 || bytes[1] !== 0x50) throw new RangeError('not GeoPackage binary geometry (no "GP" magic)');
  const flags = bytes[3];
  const le = (flags & 1) === 1;
  const envelope = (flags >> 1) & 0b111;
  const envelopeBytes = [0, 32, 48, 48, 64][envelope];
  if (envelopeBytes === undefined) throw new RangeError(`unknown envelope kind ${envelope}`);
  const srsId = view.getInt32(4, le);
  let at = 8 + envelopeBytes;
  const order = () => { const v = bytes[at] === 1; at += 1; return v; };
  const u32 = (little: boolean) => { const v = view.getUint32(at, little); at += 4; return v; };
  const f64 = (little: boolean) => { const v = view.getFloat64(at, little); at += 8; return v; };
  const little = order();
  const type = u32(little);
  if (type !== WKB_MULTIPOLYGON) throw new RangeError(`expected a WKB MultiPolygon (6), found type ${type}`);
  const parts: MultiPolygonRings = [];
  for (let p = u32(little); p > 0; p--) {
    const pl = order();
    if (u32(pl) !== WKB_POLYGON) throw new RangeError('a MultiPolygon part is not a Polygon');
    const rings = [];
    for (let r = u32(pl); r > 0; r--) {
      const ring: [number, number][] = [];
      for (let n = u32(pl); n > 0; n--) ring.push([f64(pl), f64(pl)]);
      rings.push(ring);
    }
    parts.push(rings);
  }
  return { srsId, parts };
}
