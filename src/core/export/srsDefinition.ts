import { crsName } from '../crs.ts';
import { ExportError } from './ExportError.ts';

// OGC WKT (version 1, OGC 01-009) definitions for gpkg_spatial_ref_sys, written for the
// CRSs a site can hold: WGS 84, and the UTM zones on WGS 84 and ETRS89. Parameters are
// the EPSG dataset's (Transverse Mercator, k0 0.9996, false easting 500 000 m, false
// northing 10 000 000 m in the south); the layout follows the WKT 1 grammar.

const WGS84_DATUM = 'DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]]';
const ETRS89_DATUM = 'DATUM["European_Terrestrial_Reference_System_1989",SPHEROID["GRS 1980",6378137,298.257222101,AUTHORITY["EPSG","7019"]],AUTHORITY["EPSG","6258"]]';
const PRIMEM = 'PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]]';
const DEGREE = 'UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]]';

function geogcs(name: string, datum: string, code: number, axes: boolean): string {
  return `GEOGCS["${name}",${datum},${PRIMEM},${DEGREE},${axes ? 'AXIS["Latitude",NORTH],AXIS["Longitude",EAST],' : ''}AUTHORITY["EPSG","${code}"]]`;
}

function utm(name: string, geog: string, zone: number, south: boolean, code: number): string {
  const params = [
    ['latitude_of_origin', 0], ['central_meridian', zone * 6 - 183], ['scale_factor', 0.9996],
    ['false_easting', 500000], ['false_northing', south ? 10000000 : 0],
  ].map(([k, v]) => `PARAMETER["${k}",${v}]`).join(',');
  return `PROJCS["${name}",${geog},PROJECTION["Transverse_Mercator"],${params},UNIT["metre",1,AUTHORITY["EPSG","9001"]],AXIS["Easting",EAST],AXIS["Northing",NORTH],AUTHORITY["EPSG","${code}"]]`;
}

export interface SrsRow {
  srs_name: string;
  srs_id: number;
  organization: string;
  organization_coordsys_id: number;
  definition: string;
}

/** The gpkg_spatial_ref_sys row of an EPSG code; refuses a CRS it cannot define. */
export function srsRow(epsg: number): SrsRow {
  const name = crsName(epsg);
  const row = (definition: string): SrsRow => ({ srs_name: name!, srs_id: epsg, organization: 'EPSG', organization_coordsys_id: epsg, definition });
  if (epsg === 4326) return row(geogcs('WGS 84', WGS84_DATUM, 4326, true));
  if (epsg === 4258) return row(geogcs('ETRS89', ETRS89_DATUM, 4258, true));
  if (epsg >= 32601 && epsg <= 32660) return row(utm(name!, geogcs('WGS 84', WGS84_DATUM, 4326, false), epsg - 32600, false, epsg));
  if (epsg >= 32701 && epsg <= 32760) return row(utm(name!, geogcs('WGS 84', WGS84_DATUM, 4326, false), epsg - 32700, true, epsg));
  if (epsg >= 25828 && epsg <= 25838) return row(utm(name!, geogcs('ETRS89', ETRS89_DATUM, 4258, false), epsg - 25800, false, epsg));
  throw new ExportError(`a GeoPackage export cannot yet define the site's CRS EPSG:${epsg}; export GeoJSON instead, or use a WGS 84 or ETRS89 UTM site`);
}
