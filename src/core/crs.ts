import proj4 from 'proj4';
import { etrs89Utm, wgs84Utm } from './crsNames.ts';

export { crsName, crsUnits, isGeographicEpsg } from './crsNames.ts';

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
