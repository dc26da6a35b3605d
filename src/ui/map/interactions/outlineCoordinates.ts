import type Feature from 'ol/Feature.js';
import type Geometry from 'ol/geom/Geometry.js';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';

/** An OpenLayers polygon or multipolygon as our rings (scene CRS, metres); null for anything else. */
export function outlineOf(feature: Feature<Geometry> | undefined | null): MultiPolygonRings | null {
  const geometry = feature?.getGeometry();
  if (!geometry) return null;
  const type = geometry.getType();
  if (type === 'Polygon') return [(geometry as unknown as { getCoordinates(): MultiPolygonRings[number] }).getCoordinates()];
  if (type === 'MultiPolygon') return (geometry as unknown as { getCoordinates(): MultiPolygonRings }).getCoordinates();
  return null;
}

/** Only outlines with three distinct corners enclose anything. */
export function enclosesArea(parts: MultiPolygonRings): boolean {
  return parts.some((rings) => rings[0] && new Set(rings[0].map((p) => `${p[0]},${p[1]}`)).size >= 3);
}
