import { unzipSync } from 'fflate';
import { ImportError } from './ImportError.ts';
import { checkFieldFile, type FieldFile } from './fieldFeatures.ts';
import { readGeoJson } from './readGeoJson.ts';
import { readKmlGpx } from './readKmlGpx.ts';
import { readShapefile } from './readShapefile.ts';
import { isGeographic, toSiteCrs } from './toSiteCrs.ts';

// One entry for every field format: chosen by the file's extension, checked position by
// position in the file's own CRS, then reprojected into the site's CRS.

export type FieldFormat = FieldFile['format'];

export function formatOf(fileName: string): FieldFormat | 'kmz' | null {
  const ext = fileName.slice(fileName.lastIndexOf('.') + 1).toLowerCase();
  if (ext === 'geojson' || ext === 'json') return 'geojson';
  if (ext === 'zip') return 'shapefile';
  if (ext === 'kml' || ext === 'gpx' || ext === 'kmz') return ext;
  return null;
}

export interface ReadFieldOptions {
  /** the site's CRS: every position comes back in it */
  siteEpsg: number;
  /** the file's CRS when it does not say (GeoJSON without `crs`, a shapefile without .prj) */
  assumeEpsg?: number;
}

function decodeText(fileName: string, bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new ImportError(fileName, ['the file is not UTF-8 text']);
  }
}

/** Reads, checks and reprojects a field file; nothing is stored yet. */
export function readFieldFile(fileName: string, bytes: Uint8Array, options: ReadFieldOptions): { file: FieldFile; sourceCrsGeographic: boolean; original: FieldFile } {
  const format = formatOf(fileName);
  let file: FieldFile;
  switch (format) {
    case 'geojson':
      file = readGeoJson(fileName, decodeText(fileName, bytes), options);
      break;
    case 'shapefile':
      file = readShapefile(fileName, bytes, options);
      break;
    case 'kml':
    case 'gpx':
      file = readKmlGpx(fileName, decodeText(fileName, bytes), format);
      break;
    case 'kmz': {
      let inner: Record<string, Uint8Array>;
      try {
        inner = unzipSync(bytes, { filter: (f) => f.name.toLowerCase().endsWith('.kml') });
      } catch (error) {
        throw new ImportError(fileName, [`not a readable KMZ (zip) file (${(error as Error).message})`]);
      }
      const [name] = Object.keys(inner).sort((a, b) => Number(b === 'doc.kml') - Number(a === 'doc.kml'));
      if (!name) throw new ImportError(fileName, ['the KMZ holds no .kml document']);
      file = readKmlGpx(fileName, decodeText(fileName, inner[name]), 'kml');
      break;
    }
    default:
      throw new ImportError(fileName, ['not a field file we read: use GeoJSON (.geojson, .json), a zipped shapefile (.zip), KML, KMZ or GPX']);
  }
  const geographic = isGeographic(file.crs);
  checkFieldFile(fileName, file, geographic);
  if (file.features.length === 0) throw new ImportError(fileName, ['it holds no features with a geometry']);
  return { file: toSiteCrs(fileName, file, options.siteEpsg), sourceCrsGeographic: geographic, original: file };
}
