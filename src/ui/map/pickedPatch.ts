import type { FeatureLike } from 'ol/Feature.js';
import type { Geometry, MultiPolygon, Polygon } from 'ol/geom.js';
import type { PolygonRings } from '../../core/geometry/types.ts';

/** A polygon the user clicked on the map, in the site's CRS (the map's projection). */
export interface PickedPatch {
  id: string;
  species: string;
  /** Outer ring then holes; a multipolygon gives its largest part. */
  rings: PolygonRings;
}

export function pickedPatch(feature: FeatureLike): PickedPatch | null {
  const geometry = feature.getGeometry() as Geometry | undefined;
  let rings: PolygonRings | null = null;
  if (geometry?.getType() === 'Polygon') rings = (geometry as Polygon).getCoordinates() as PolygonRings;
  else if (geometry?.getType() === 'MultiPolygon') {
    const parts = (geometry as MultiPolygon).getPolygons();
    parts.sort((p, q) => q.getArea() - p.getArea());
    rings = parts[0] ? (parts[0].getCoordinates() as PolygonRings) : null;
  }
  if (!rings) return null;
  return { id: String(feature.get('id') ?? feature.getId() ?? ''), species: String(feature.get('species') ?? ''), rings };
}
