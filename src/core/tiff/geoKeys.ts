import { crsName, isGeographicEpsg } from '../crsNames.ts';
import { GeoKey, Tag } from './tags.ts';

// GeoTIFF 1.1 (OGC 19-008r4) GeoKeyDirectory: a header (version 1, revision 1.0, key
// count) then one (key, location, count, value) quadruple per key, sorted by key. A
// location of 0 keeps the value inline; 34737 points into GeoAsciiParams.

const USER_DEFINED = 32767;

export interface GeoKeyTags {
  directory: number[];
  ascii: string | null;
}

/**
 * The GeoKeys for an EPSG code, with the CRS name as its citation where we know it; for
 * null, a user-defined projected CRS (ProjectedCSType 32767) cited as `userCitation`.
 */
export function buildGeoKeys(epsg: number | null, userCitation?: string): GeoKeyTags {
  const geographic = epsg !== null && isGeographicEpsg(epsg);
  const citation = epsg === null ? (userCitation ?? null) : crsName(epsg);
  const keys: [number, number, number, number][] = [];
  let ascii = '';
  keys.push([GeoKey.GTModelType, 0, 1, geographic ? 2 : 1]);
  keys.push([GeoKey.GTRasterType, 0, 1, 1]); // PixelIsArea
  if (citation) {
    keys.push([GeoKey.GTCitation, Tag.GeoAsciiParams, citation.length + 1, 0]);
    ascii += `${citation}|`;
  }
  if (geographic) {
    keys.push([GeoKey.GeographicType, 0, 1, epsg]);
    keys.push([GeoKey.GeogAngularUnits, 0, 1, 9102]); // degree
  } else {
    keys.push([GeoKey.ProjectedCSType, 0, 1, epsg ?? USER_DEFINED]);
  }
  keys.sort((a, b) => a[0] - b[0]);
  return { directory: [1, 1, 0, keys.length, ...keys.flat()], ascii: ascii || null };
}

export interface ParsedGeoKeys {
  modelType: number | null;
  /** 1 PixelIsArea (default), 2 PixelIsPoint. */
  rasterType: number;
  epsg: number | null;
  citation: string | null;
  /** Keys present, by number, for messages. */
  keyCount: number;
}

/** Reads the keys we use; values that point into tags we did not read are skipped. */
export function parseGeoKeys(directory: ArrayLike<number>, ascii: string | null): ParsedGeoKeys {
  const result: ParsedGeoKeys = { modelType: null, rasterType: 1, epsg: null, citation: null, keyCount: 0 };
  if (directory.length < 4) return result;
  const count = Math.min(directory[3], Math.floor((directory.length - 4) / 4));
  result.keyCount = count;
  let projected: number | null = null;
  let geographic: number | null = null;
  const citations: Record<number, string> = {};
  for (let k = 0; k < count; k++) {
    const base = 4 + k * 4;
    const key = directory[base];
    const location = directory[base + 1];
    const n = directory[base + 2];
    const value = directory[base + 3];
    if (location === 0) {
      if (key === GeoKey.GTModelType) result.modelType = value;
      else if (key === GeoKey.GTRasterType) result.rasterType = value;
      else if (key === GeoKey.ProjectedCSType) projected = value;
      else if (key === GeoKey.GeographicType) geographic = value;
    } else if (location === Tag.GeoAsciiParams && ascii !== null) {
      const text = ascii.slice(value, value + n).replace(/[|\0]+$/, '').trim();
      if (text) citations[key] = text;
    }
  }
  const usable = (code: number | null) => (code !== null && code > 0 && code !== USER_DEFINED ? code : null);
  result.epsg = usable(projected) ?? (result.modelType === 1 ? null : usable(geographic));
  result.citation =
    citations[GeoKey.PCSCitation] ?? citations[GeoKey.GTCitation] ?? citations[GeoKey.GeogCitation] ?? null;
  return result;
}
