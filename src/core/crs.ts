import proj4 from 'proj4';

// CRS definitions come from proj4's own EPSG:4326 / 4269 / 3857 and, for the codes
// below, from their EPSG parameters: WGS 84 / UTM zone N (EPSG:326NN north, 327NN
// south), ETRS89 / UTM zone N (EPSG:258NN), OSGB36 / British National Grid (EPSG:27700,
// with the 7-parameter OSGB36 → WGS 84 shift of EPSG transformation 1314, good to a few
// metres) and its geographic CRS OSGB36 (EPSG:4277). Names are the EPSG dataset's.

export function utmZoneEpsg(zone: number, south: boolean): number {
  if (!Number.isInteger(zone) || zone < 1 || zone > 60) throw new RangeError(`UTM zone must be 1-60, got ${zone}`);
  return (south ? 32700 : 32600) + zone;
}

/** The UTM zone (standard, no Norway/Svalbard exceptions) holding a longitude/latitude. */
export function utmEpsgForLonLat(lon: number, lat: number): number {
  const zone = Math.min(60, Math.max(1, Math.floor((lon + 180) / 6) + 1));
  return utmZoneEpsg(zone, lat < 0);
}

const OSGB36_TO_WGS84 = '+towgs84=446.448,-125.157,542.06,0.15,0.247,0.842,-20.489';
const BNG = `+proj=tmerc +lat_0=49 +lon_0=-2 +k=0.9996012717 +x_0=400000 +y_0=-100000 +ellps=airy ${OSGB36_TO_WGS84} +units=m +no_defs`;

function wgs84Utm(epsg: number): { zone: number; south: boolean } | null {
  if (epsg >= 32601 && epsg <= 32660) return { zone: epsg - 32600, south: false };
  if (epsg >= 32701 && epsg <= 32760) return { zone: epsg - 32700, south: true };
  return null;
}

function etrs89Utm(epsg: number): number | null {
  return epsg >= 25828 && epsg <= 25838 ? epsg - 25800 : null;
}

/** Registers an EPSG code with proj4 when we know how; returns its proj4 name or null. */
export function ensureEpsg(epsg: number): string | null {
  const name = `EPSG:${epsg}`;
  if (proj4.defs(name)) return name;
  const utm = wgs84Utm(epsg);
  if (utm) {
    proj4.defs(name, `+proj=utm +zone=${utm.zone}${utm.south ? ' +south' : ''} +datum=WGS84 +units=m +no_defs`);
    return name;
  }
  const etrsZone = etrs89Utm(epsg);
  if (etrsZone !== null) {
    proj4.defs(name, `+proj=utm +zone=${etrsZone} +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs`);
    return name;
  }
  if (epsg === 4258) {
    proj4.defs(name, '+proj=longlat +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +no_defs');
    return name;
  }
  if (epsg === 27700) {
    proj4.defs(name, BNG);
    return name;
  }
  if (epsg === 4277) {
    proj4.defs(name, `+proj=longlat +ellps=airy ${OSGB36_TO_WGS84} +no_defs`);
    return name;
  }
  return null;
}

/** A point transformer between two EPSG codes; throws on a code we cannot handle. */
export function transformer(fromEpsg: number, toEpsg: number): (xy: [number, number]) => [number, number] {
  const from = ensureEpsg(fromEpsg);
  const to = ensureEpsg(toEpsg);
  if (!from) throw new RangeError(`unsupported CRS EPSG:${fromEpsg}`);
  if (!to) throw new RangeError(`unsupported CRS EPSG:${toEpsg}`);
  const converter = proj4(from, to);
  return (xy) => converter.forward(xy) as [number, number];
}

const names: Record<number, string> = {
  4326: 'WGS 84',
  4258: 'ETRS89',
  4269: 'NAD83',
  4277: 'OSGB36',
  3857: 'WGS 84 / Pseudo-Mercator',
  27700: 'OSGB36 / British National Grid',
};

/** The EPSG dataset's name of a CRS we know, or null. */
export function crsName(epsg: number): string | null {
  if (names[epsg]) return names[epsg];
  const utm = wgs84Utm(epsg);
  if (utm) return `WGS 84 / UTM zone ${utm.zone}${utm.south ? 'S' : 'N'}`;
  const etrsZone = etrs89Utm(epsg);
  if (etrsZone !== null) return `ETRS89 / UTM zone ${etrsZone}N`;
  return null;
}

/**
 * Whether an EPSG code is a geographic (longitude/latitude) CRS: by proj4's definition
 * when registered, else by the EPSG dataset's numbering, where 4000-4999 holds the
 * geographic 2D CRSs (common practice; a few projected codes elsewhere are not covered).
 */
export function isGeographicEpsg(epsg: number): boolean {
  const name = ensureEpsg(epsg);
  if (name) {
    const def = proj4.defs(name) as { projName?: string } | undefined;
    if (def?.projName) return def.projName === 'longlat';
  }
  return epsg >= 4000 && epsg < 5000;
}

/** The unit of a CRS's coordinates, for display. */
export function crsUnits(epsg: number | null): 'metre' | 'degree' | 'pixel' {
  if (epsg === null) return 'pixel';
  return isGeographicEpsg(epsg) ? 'degree' : 'metre';
}
