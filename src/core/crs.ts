import proj4 from 'proj4';

// CRS definitions come from proj4's own EPSG:4326 / 3857 and, for UTM, from the
// EPSG parameters of WGS 84 / UTM zone N (EPSG:326NN north, 327NN south).

export function utmZoneEpsg(zone: number, south: boolean): number {
  if (!Number.isInteger(zone) || zone < 1 || zone > 60) throw new RangeError(`UTM zone must be 1-60, got ${zone}`);
  return (south ? 32700 : 32600) + zone;
}

/** The UTM zone (standard, no Norway/Svalbard exceptions) holding a longitude/latitude. */
export function utmEpsgForLonLat(lon: number, lat: number): number {
  const zone = Math.min(60, Math.max(1, Math.floor((lon + 180) / 6) + 1));
  return utmZoneEpsg(zone, lat < 0);
}

/** Registers an EPSG code with proj4 when we know how; returns its proj4 name or null. */
export function ensureEpsg(epsg: number): string | null {
  const name = `EPSG:${epsg}`;
  if (proj4.defs(name)) return name;
  const north = epsg >= 32601 && epsg <= 32660;
  const south = epsg >= 32701 && epsg <= 32760;
  if (north || south) {
    const zone = epsg % 100;
    proj4.defs(name, `+proj=utm +zone=${zone}${south ? ' +south' : ''} +datum=WGS84 +units=m +no_defs`);
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
