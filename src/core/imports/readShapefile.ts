import { unzipSync } from 'fflate';
import { parseDbf, parseShp } from 'shpjs';
import type { Position } from '../geometry/types.ts';
import { ImportError } from './ImportError.ts';
import type { FieldCrs, FieldFeature, FieldFile, FieldGeometry } from './fieldFeatures.ts';

// A zipped ESRI shapefile: .shp geometry, .dbf attributes decoded by the .cpg code page
// (UTF-8 without one, as GDAL writes), .prj naming the CRS. shpjs reads the parts; we
// open the zip ourselves so a missing .prj is told rather than guessed, and so the
// coordinates stay in the file's CRS until we reproject them once.

interface ShpGeometry {
  type: string;
  coordinates: unknown;
}

function prjName(wkt: string): string {
  const match = /^\s*(?:PROJCS|GEOGCS|PROJCRS|GEOGCRS)\s*\[\s*"([^"]+)"/i.exec(wkt);
  return match ? match[1] : 'the .prj CRS';
}

function toGeometries(g: ShpGeometry | null): FieldGeometry[] {
  if (!g) return [];
  switch (g.type) {
    case 'Polygon':
      return [{ kind: 'polygon', parts: [g.coordinates as Position[][]] }];
    case 'MultiPolygon':
      return [{ kind: 'polygon', parts: g.coordinates as Position[][][] }];
    case 'LineString':
      return [{ kind: 'line', path: g.coordinates as Position[] }];
    case 'MultiLineString':
      return (g.coordinates as Position[][]).map((path) => ({ kind: 'line', path }));
    case 'Point':
      return [{ kind: 'point', position: g.coordinates as Position }];
    case 'MultiPoint':
      return (g.coordinates as Position[]).map((position) => ({ kind: 'point', position }));
    default:
      return [];
  }
}

export function readShapefile(fileName: string, zip: Uint8Array, options: { assumeEpsg?: number } = {}): FieldFile {
  let entries: Record<string, Uint8Array>;
  try {
    entries = unzipSync(zip, { filter: (f) => !f.name.includes('__MACOSX') && /\.(shp|dbf|prj|cpg)$/i.test(f.name) });
  } catch (error) {
    throw new ImportError(fileName, [`not a readable zip file (${(error as Error).message})`]);
  }
  const byExt = new Map<string, [string, Uint8Array][]>();
  for (const [name, bytes] of Object.entries(entries)) {
    const ext = name.slice(name.lastIndexOf('.') + 1).toLowerCase();
    byExt.set(ext, [...(byExt.get(ext) ?? []), [name, bytes]]);
  }
  const shps = byExt.get('shp') ?? [];
  if (shps.length === 0) throw new ImportError(fileName, ['the zip holds no .shp file']);
  if (shps.length > 1) throw new ImportError(fileName, [`the zip holds ${shps.length} shapefiles (${shps.map(([n]) => n).join(', ')}); zip one at a time`]);
  const [shpName, shpBytes] = shps[0];
  const base = shpName.slice(0, -4).toLowerCase();
  const part = (ext: string) => (byExt.get(ext) ?? []).find(([n]) => n.slice(0, -4).toLowerCase() === base)?.[1];
  const dbf = part('dbf');
  const cpg = part('cpg');
  const prj = part('prj');

  let crs: FieldCrs;
  if (prj) {
    const wkt = new TextDecoder().decode(prj).trim();
    crs = { kind: 'definition', definition: wkt, name: prjName(wkt) };
  } else if (options.assumeEpsg) {
    crs = { kind: 'epsg', epsg: options.assumeEpsg };
  } else {
    throw new ImportError(fileName, [`${shpName} has no .prj beside it, so its coordinate system is unknown; add the .prj to the zip or choose the CRS`]);
  }

  let shapes: (ShpGeometry | null)[];
  let rows: Record<string, unknown>[] = [];
  try {
    shapes = parseShp(shpBytes) as (ShpGeometry | null)[];
    if (dbf) rows = parseDbf(dbf, cpg ? new TextDecoder().decode(cpg) : undefined) as Record<string, unknown>[];
  } catch (error) {
    throw new ImportError(fileName, [`${shpName} cannot be read (${(error as Error).message})`]);
  }
  if (dbf && rows.length !== shapes.length) {
    throw new ImportError(fileName, [`the .dbf has ${rows.length} rows but the .shp ${shapes.length} shapes`]);
  }
  const features: FieldFeature[] = [];
  const skipped: number[] = [];
  shapes.forEach((shape, index) => {
    const geometries = toGeometries(shape);
    if (geometries.length === 0) skipped.push(index);
    else features.push({ index, id: null, geometries, attributes: rows[index] ?? {} });
  });
  return { format: 'shapefile', crs, features, skipped };
}
