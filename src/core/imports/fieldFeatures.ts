import type { Position } from '../geometry/types.ts';
import { ProblemList } from './ImportError.ts';

// What every field-file reader produces: features in the file's own CRS, polygons kept
// as patches-to-be, points and lines as reference features, with their attributes.

/** More vertices than this in one polygon is a track or a raster trace, not a patch. */
export const MAX_VERTICES_PER_POLYGON = 100_000;

export type FieldGeometry =
  | { kind: 'polygon'; parts: Position[][][] }
  | { kind: 'line'; path: Position[] }
  | { kind: 'point'; position: Position };

export interface FieldFeature {
  /** position in the file, from 0 */
  index: number;
  /** the feature's id when the file gives one */
  id: string | number | null;
  geometries: FieldGeometry[];
  attributes: Record<string, unknown>;
}

/** The CRS of a file's coordinates: an EPSG code, or a proj4/WKT definition from a .prj. */
export type FieldCrs = { kind: 'epsg'; epsg: number } | { kind: 'definition'; definition: string; name: string };

export interface FieldFile {
  format: 'geojson' | 'shapefile' | 'kml' | 'gpx';
  crs: FieldCrs;
  features: FieldFeature[];
  /** features with no geometry, by index: listed for the user, not imported */
  skipped: number[];
}

export function crsLabel(crs: FieldCrs): string {
  return crs.kind === 'epsg' ? `EPSG:${crs.epsg}` : crs.name;
}

const where = (feature: FieldFeature) => `feature ${feature.index + 1}${feature.id !== null ? ` (id ${JSON.stringify(feature.id)})` : ''}`;

function positionProblem(p: unknown, geographic: boolean): string | null {
  if (!Array.isArray(p) || p.length < 2) return 'a position is not an array of two numbers';
  const [x, y] = p as unknown[];
  if (typeof x !== 'number' || typeof y !== 'number' || !Number.isFinite(x) || !Number.isFinite(y)) {
    return `position [${String(x)}, ${String(y)}] is not a pair of finite numbers`;
  }
  if (geographic && (x < -180 || x > 180 || y < -90 || y > 90)) {
    return `position [${x}, ${y}] is outside longitude -180..180 / latitude -90..90`;
  }
  return null;
}

/**
 * Checks every position and ring of a file's features: finite numbers, in range when
 * the CRS is geographic, rings of four or more positions closed on themselves, no
 * polygon larger than MAX_VERTICES_PER_POLYGON. Throws one ImportError listing them.
 */
export function checkFieldFile(fileName: string, file: FieldFile, geographic: boolean): void {
  const problems = new ProblemList();
  for (const feature of file.features) {
    for (const geometry of feature.geometries) {
      const check = (p: unknown, what: string) => {
        const problem = positionProblem(p, geographic);
        if (problem) problems.add(`${where(feature)}: ${what}: ${problem}`);
        return !problem;
      };
      if (geometry.kind === 'point') check(geometry.position, 'point');
      else if (geometry.kind === 'line') {
        if (geometry.path.length < 2) problems.add(`${where(feature)}: a line has fewer than two positions`);
        geometry.path.every((p) => check(p, 'line'));
      } else {
        let vertices = 0;
        geometry.parts.forEach((rings, part) => {
          if (rings.length === 0) problems.add(`${where(feature)}: polygon part ${part + 1} has no rings`);
          rings.forEach((ring, r) => {
            const label = `ring ${r + 1}${geometry.parts.length > 1 ? ` of part ${part + 1}` : ''}`;
            vertices += ring.length;
            if (!Array.isArray(ring) || ring.length < 4) {
              problems.add(`${where(feature)}: ${label} has ${Array.isArray(ring) ? ring.length : 0} positions; a ring needs at least 4`);
              return;
            }
            if (!ring.every((p) => check(p, label))) return;
            const first = ring[0];
            const last = ring[ring.length - 1];
            if (first[0] !== last[0] || first[1] !== last[1]) {
              problems.add(`${where(feature)}: ${label} is not closed (it starts at [${first[0]}, ${first[1]}] and ends at [${last[0]}, ${last[1]}])`);
            }
          });
        });
        if (vertices > MAX_VERTICES_PER_POLYGON) {
          problems.add(`${where(feature)}: the polygon has ${vertices.toLocaleString('en')} vertices; a patch may have at most ${MAX_VERTICES_PER_POLYGON.toLocaleString('en')} (simplify it first)`);
        }
      }
    }
  }
  problems.throwIfAny(fileName);
}
