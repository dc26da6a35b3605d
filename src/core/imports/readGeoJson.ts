import type { Position } from '../geometry/types.ts';
import { ImportError } from './ImportError.ts';
import type { FieldCrs, FieldFeature, FieldFile, FieldGeometry } from './fieldFeatures.ts';

// GeoJSON per RFC 7946 (longitude/latitude, WGS 84). Files written to the 2008 draft may
// carry a `crs` member naming another CRS ("name" with an EPSG URN, or "EPSG" with a
// code); we honour it, and otherwise the user's choice, else RFC 7946's WGS 84.

type Json = Record<string, unknown>;

/** The EPSG code a legacy `crs` member names, or null when it has none. */
export function legacyCrsEpsg(fileName: string, crs: unknown): number | null {
  if (crs === undefined || crs === null) return null;
  const member = crs as Json;
  const props = (member.properties ?? {}) as Json;
  if (member.type === 'EPSG' && Number.isInteger(Number(props.code))) return Number(props.code);
  if (member.type === 'name' && typeof props.name === 'string') {
    const name = props.name;
    if (/CRS84$/i.test(name)) return 4326;
    const match = /^(?:urn:ogc:def:crs:EPSG:[\d.]*:|EPSG:)(\d+)$/i.exec(name);
    if (match) return Number(match[1]);
    throw new ImportError(fileName, [`the crs member names "${name}", which is not an EPSG code; choose the file's CRS instead`]);
  }
  throw new ImportError(fileName, ['the crs member is neither a "name" nor an "EPSG" CRS; choose the file\'s CRS instead']);
}

function geometriesOf(geometry: unknown, fail: (msg: string) => never): FieldGeometry[] {
  if (geometry === null || geometry === undefined) return [];
  const g = geometry as Json;
  const coords = g.coordinates as unknown;
  const needArray = () => {
    if (!Array.isArray(coords)) fail(`${String(g.type)} has no coordinates array`);
    return coords as unknown[];
  };
  switch (g.type) {
    case 'Polygon':
      return [{ kind: 'polygon', parts: [needArray() as Position[][]] }];
    case 'MultiPolygon':
      return [{ kind: 'polygon', parts: needArray() as Position[][][] }];
    case 'LineString':
      return [{ kind: 'line', path: needArray() as Position[] }];
    case 'MultiLineString':
      return (needArray() as Position[][]).map((path) => ({ kind: 'line', path }));
    case 'Point':
      return [{ kind: 'point', position: needArray() as unknown as Position }];
    case 'MultiPoint':
      return (needArray() as Position[]).map((position) => ({ kind: 'point', position }));
    case 'GeometryCollection': {
      if (!Array.isArray(g.geometries)) fail('GeometryCollection has no geometries array');
      // A collection's polygons are one patch of several parts (KML MultiGeometry).
      const inner = (g.geometries as unknown[]).flatMap((item) => geometriesOf(item, fail));
      const parts = inner.flatMap((x) => (x.kind === 'polygon' ? x.parts : []));
      const others = inner.filter((x) => x.kind !== 'polygon');
      return parts.length ? [{ kind: 'polygon' as const, parts }, ...others] : others;
    }
    default:
      return fail(`"${String(g.type)}" is not a GeoJSON geometry type`);
  }
}

/** Reads a GeoJSON FeatureCollection, Feature or bare geometry, in the file's own CRS. */
export function readGeoJson(fileName: string, text: string, options: { assumeEpsg?: number } = {}): FieldFile {
  let doc: Json;
  try {
    doc = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (error) {
    throw new ImportError(fileName, [`not valid JSON (${(error as Error).message})`]);
  }
  if (!doc || typeof doc !== 'object' || Array.isArray(doc)) throw new ImportError(fileName, ['not a GeoJSON object']);
  const legacy = legacyCrsEpsg(fileName, doc.crs);
  const epsg = legacy ?? options.assumeEpsg ?? 4326;
  const crs: FieldCrs = { kind: 'epsg', epsg };

  let rawFeatures: unknown[];
  if (doc.type === 'FeatureCollection') {
    if (!Array.isArray(doc.features)) throw new ImportError(fileName, ['the FeatureCollection has no features array']);
    rawFeatures = doc.features;
  } else if (doc.type === 'Feature') rawFeatures = [doc];
  else rawFeatures = [{ type: 'Feature', geometry: doc, properties: {} }];

  const features: FieldFeature[] = [];
  const skipped: number[] = [];
  rawFeatures.forEach((raw, index) => {
    const f = raw as Json;
    const id = typeof f?.id === 'string' || typeof f?.id === 'number' ? f.id : null;
    const fail = (msg: string): never => {
      throw new ImportError(fileName, [`feature ${index + 1}${id !== null ? ` (id ${JSON.stringify(id)})` : ''}: ${msg}`]);
    };
    if (!f || f.type !== 'Feature') fail('not a Feature');
    const geometries = geometriesOf(f.geometry, fail);
    if (geometries.length === 0) {
      skipped.push(index);
      return;
    }
    const attributes = f.properties && typeof f.properties === 'object' ? (f.properties as Record<string, unknown>) : {};
    features.push({ index, id, geometries, attributes });
  });
  return { format: 'geojson', crs, features, skipped };
}
