// Names and kinds of the CRSs Fellfield can place, from the EPSG dataset, without proj4:
// the TIFF inspector names a file's CRS in a worker that should stay small.

export function wgs84Utm(epsg: number): { zone: number; south: boolean } | null {
  if (epsg >= 32601 && epsg <= 32660) return { zone: epsg - 32600, south: false };
  if (epsg >= 32701 && epsg <= 32760) return { zone: epsg - 32700, south: true };
  return null;
}

export function etrs89Utm(epsg: number): number | null {
  return epsg >= 25828 && epsg <= 25838 ? epsg - 25800 : null;
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

/** Geographic (longitude/latitude) CRSs among those named above. */
const geographic = new Set([4326, 4258, 4269, 4277]);

/**
 * Whether an EPSG code is a geographic (longitude/latitude) CRS: known for the codes
 * Fellfield can place, else by the EPSG dataset's numbering, where 4000-4999 holds the
 * geographic 2D CRSs (common practice; a few projected codes elsewhere are not covered).
 */
export function isGeographicEpsg(epsg: number): boolean {
  if (geographic.has(epsg)) return true;
  if (crsName(epsg) !== null) return false;
  return epsg >= 4000 && epsg < 5000;
}

/** The unit of a CRS's coordinates, for display. */
export function crsUnits(epsg: number | null): 'metre' | 'degree' | 'pixel' {
  if (epsg === null) return 'pixel';
  return isGeographicEpsg(epsg) ? 'degree' : 'metre';
}
