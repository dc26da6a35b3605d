import { transformer, utmEpsgForLonLat } from '../crs.ts';
import type { MultiPolygonRings, PolygonRings, Position, Ring } from '../geometry/types.ts';

// Reads a GeoJSON FeatureCollection of labelled patches into metres.
// RFC 7946 coordinates are lon/lat (WGS 84); they are measured in the UTM zone of the
// collection's centre, or in `targetEpsg` when given (the scene's CRS). Files written
// before RFC 7946 may carry a `crs` member naming a projected EPSG code; we honour it.
// Geometry is kept as found (even when invalid, with null/NaN positions turned into NaN)
// so the checks can report it; only structure that cannot be a polygon is an error.

/** One interpreter's species call on a patch (the `tags` property, see below). */
export interface LabelTag {
  species: string;
  interpreter?: string;
  confidence?: string;
}

export interface LabelledPatch {
  /** The feature's `id` (or `properties.id` when the member is missing). */
  id: string | number;
  /** The `species` property: the patch's primary species code. */
  species: string;
  /**
   * Further calls from the `tags` property: an array of species codes or of
   * `{species, interpreter?, confidence?}` objects. Empty when the property is absent.
   */
  tags: LabelTag[];
  /** Outline in metres: parts, each outer ring then holes. */
  rings: MultiPolygonRings;
  /** The feature's properties as read. */
  properties: Record<string, unknown>;
  /** Position of the feature in the file, from 0. */
  index: number;
}

export interface LabelFile {
  patches: LabelledPatch[];
  /** The CRS of `rings` (metres). */
  epsg: number;
  /** The CRS the file's coordinates were written in (4326 for RFC 7946 lon/lat). */
  sourceEpsg: number;
}

export interface ReadLabelOptions {
  /** Measure in this CRS instead of the UTM zone (e.g. the scene's CRS). */
  targetEpsg?: number;
  /** The CRS of the coordinates when the file does not name one and they are not lon/lat. */
  assumeEpsg?: number;
}

/** A label file that cannot be read: the message names the file and the problem. */
export class LabelFileError extends Error {
  constructor(readonly fileName: string, readonly problem: string) {
    super(`${fileName}: ${problem}`);
    this.name = 'LabelFileError';
  }
}

type Json = Record<string, unknown>;

const isObject = (value: unknown): value is Json =>
  typeof value === 'object' && value !== null && !Array.isArray(value);

export function readLabelFile(text: string, fileName: string, options: ReadLabelOptions = {}): LabelFile {
  const fail = (problem: string): never => {
    throw new LabelFileError(fileName, problem);
  };
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    return fail(`not valid JSON (${(error as Error).message})`);
  }
  if (!isObject(doc) || doc.type !== 'FeatureCollection') {
    return fail(`expected a GeoJSON FeatureCollection, found ${describe(doc)}`);
  }
  if (!Array.isArray(doc.features)) return fail('the FeatureCollection has no "features" array');

  const declared = declaredEpsg(doc.crs, fail);
  const seen = new Map<string, number>();
  const raw = doc.features.map((feature, index) => readFeature(feature, index, seen, fail));

  const sourceEpsg = declared ?? options.assumeEpsg ?? 4326;
  if (sourceEpsg === 4326) checkLonLat(raw, fail);
  const epsg = sourceEpsg === 4326
    ? options.targetEpsg ?? utmForCentre(raw)
    : options.targetEpsg ?? sourceEpsg;
  if (epsg === 4326) fail('cannot measure in lon/lat: give a projected target CRS');
  if (epsg !== sourceEpsg) reproject(raw, sourceEpsg, epsg, fail);
  return { patches: raw, epsg, sourceEpsg };
}

function describe(value: unknown): string {
  if (Array.isArray(value)) return 'an array';
  if (isObject(value)) return typeof value.type === 'string' ? `a ${value.type}` : 'an object without "type"';
  return value === null ? 'null' : `a ${typeof value}`;
}

/** The EPSG code of a legacy (GeoJSON 2008) named `crs` member, if any. */
function declaredEpsg(crs: unknown, fail: (p: string) => never): number | null {
  if (crs === undefined || crs === null) return null;
  const name = isObject(crs) && isObject(crs.properties) ? crs.properties.name : undefined;
  if (typeof name !== 'string') return fail('the "crs" member has no properties.name');
  if (/CRS84$/i.test(name)) return 4326;
  const match = /EPSG:{1,2}(\d+)$/i.exec(name);
  if (!match) return fail(`unsupported "crs" name '${name}' (expected an EPSG code)`);
  return Number(match[1]);
}

function featureLabel(feature: unknown, index: number): string {
  const id = isObject(feature) ? feature.id ?? (isObject(feature.properties) ? feature.properties.id : undefined) : undefined;
  return typeof id === 'string' || typeof id === 'number' ? `feature ${index} (id ${JSON.stringify(id)})` : `feature ${index}`;
}

function readFeature(
  feature: unknown,
  index: number,
  seen: Map<string, number>,
  fail: (p: string) => never,
): LabelledPatch {
  const label = featureLabel(feature, index);
  if (!isObject(feature) || feature.type !== 'Feature') return fail(`${label}: expected a Feature, found ${describe(feature)}`);
  const properties = isObject(feature.properties) ? feature.properties : {};
  const id = feature.id ?? properties.id;
  if (typeof id !== 'string' && typeof id !== 'number') return fail(`${label}: has no "id" (a string or number)`);
  const key = `${typeof id}:${id}`;
  const earlier = seen.get(key);
  if (earlier !== undefined) return fail(`${label}: repeats the id of feature ${earlier}`);
  seen.set(key, index);

  const species = properties.species;
  if (typeof species !== 'string' || species.trim() === '') {
    return fail(`${label}: has no "species" property (a non-empty string)`);
  }
  const tags = readTags(properties.tags, (p) => fail(`${label}: ${p}`));
  const rings = readGeometry(feature.geometry, (p) => fail(`${label}: ${p}`));
  return { id, species, tags, rings, properties, index };
}

function readTags(value: unknown, fail: (p: string) => never): LabelTag[] {
  if (value === undefined || value === null) return [];
  if (!Array.isArray(value)) return fail('"tags" must be an array of species codes or {species} objects');
  return value.map((tag, i) => {
    if (typeof tag === 'string' && tag.trim() !== '') return { species: tag };
    if (isObject(tag) && typeof tag.species === 'string' && tag.species.trim() !== '') {
      const out: LabelTag = { species: tag.species };
      if (typeof tag.interpreter === 'string') out.interpreter = tag.interpreter;
      if (typeof tag.confidence === 'string') out.confidence = tag.confidence;
      return out;
    }
    return fail(`tags[${i}] is neither a species code nor an object with "species"`);
  });
}

function readGeometry(geometry: unknown, fail: (p: string) => never): MultiPolygonRings {
  if (!isObject(geometry)) return fail('has no geometry');
  if (geometry.type === 'Polygon') return [readPolygon(geometry.coordinates, 'coordinates', fail)];
  if (geometry.type === 'MultiPolygon') {
    if (!Array.isArray(geometry.coordinates)) return fail('MultiPolygon coordinates are not an array');
    return geometry.coordinates.map((p, i) => readPolygon(p, `coordinates[${i}]`, fail));
  }
  return fail(`geometry is a ${String(geometry.type)}, expected Polygon or MultiPolygon`);
}

function readPolygon(value: unknown, where: string, fail: (p: string) => never): PolygonRings {
  if (!Array.isArray(value) || value.length === 0) return fail(`${where} must be a non-empty array of rings`);
  return value.map((ring, r) => {
    if (!Array.isArray(ring)) return fail(`${where}[${r}] is not an array of positions`);
    return ring.map((pos, p): Position => {
      if (!Array.isArray(pos) || pos.length < 2) return fail(`${where}[${r}][${p}] is not a position [x, y]`);
      // null or non-numbers become NaN: an invalid vertex the checks report, not a crash.
      const x = typeof pos[0] === 'number' ? pos[0] : NaN;
      const y = typeof pos[1] === 'number' ? pos[1] : NaN;
      return [x, y];
    }) as Ring;
  });
}

function forEachPosition(patches: LabelledPatch[], visit: (pos: Position, patch: LabelledPatch) => void) {
  for (const patch of patches) for (const part of patch.rings) for (const ring of part) for (const pos of ring) visit(pos, patch);
}

function checkLonLat(patches: LabelledPatch[], fail: (p: string) => never) {
  forEachPosition(patches, ([x, y], patch) => {
    if (Math.abs(x) > 180 || Math.abs(y) > 90) {
      fail(`${featureLabel({ id: patch.id }, patch.index)}: position [${x}, ${y}] is not lon/lat; ` +
        'name the projected CRS in a "crs" member or give its EPSG code');
    }
  });
}

/** The UTM zone holding the centre of all finite positions. */
function utmForCentre(patches: LabelledPatch[]): number {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  forEachPosition(patches, ([x, y]) => {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    minX = Math.min(minX, x); maxX = Math.max(maxX, x);
    minY = Math.min(minY, y); maxY = Math.max(maxY, y);
  });
  if (minX > maxX) return utmEpsgForLonLat(0, 0);
  return utmEpsgForLonLat((minX + maxX) / 2, (minY + maxY) / 2);
}

function reproject(patches: LabelledPatch[], from: number, to: number, fail: (p: string) => never) {
  let forward: (xy: [number, number]) => [number, number];
  try {
    forward = transformer(from, to);
  } catch (error) {
    return fail((error as Error).message);
  }
  forEachPosition(patches, (pos) => {
    if (!Number.isFinite(pos[0]) || !Number.isFinite(pos[1])) return;
    const [x, y] = forward([pos[0], pos[1]]);
    pos[0] = x;
    pos[1] = y;
  });
}
