import { intersection } from 'polyclip-ts';
import { multiPolygonArea } from './measure.ts';
import type { MultiPolygonRings, PolygonRings } from './types.ts';

type Shape = PolygonRings | MultiPolygonRings;

/** The overlap of two polygons as a multipolygon (polyclip-ts does the clipping). */
export function intersect(a: Shape, b: Shape): MultiPolygonRings {
  return intersection(a as never, b as never) as unknown as MultiPolygonRings;
}

/** Area shared by two polygons, in the squared units of their coordinates. */
export function intersectionArea(a: Shape, b: Shape): number {
  return multiPolygonArea(intersect(a, b));
}
