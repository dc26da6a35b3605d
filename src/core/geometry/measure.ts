import type { Extent, MultiPolygonRings, PolygonRings, Ring } from './types.ts';

/**
 * Signed area of a ring by the shoelace formula: positive when counter-clockwise.
 * Coordinates are taken relative to the first vertex, so UTM-sized values (10^6-10^7 m)
 * keep their sub-millimetre precision in the products.
 */
export function ringSignedArea(ring: Ring): number {
  const n = ring.length;
  if (n === 0) return 0;
  const y0 = ring[0][1]; // x enters only as differences
  let sum = 0;
  for (let i = 0, j = n - 1; i < n; j = i++) {
    sum += (ring[j][0] - ring[i][0]) * (ring[j][1] - y0 + ring[i][1] - y0);
  }
  return sum / 2;
}

/** Area of a polygon: outer ring minus its holes, whatever their winding. */
export function polygonArea(rings: PolygonRings): number {
  if (rings.length === 0) return 0;
  let area = Math.abs(ringSignedArea(rings[0]));
  for (let i = 1; i < rings.length; i++) area -= Math.abs(ringSignedArea(rings[i]));
  return area;
}

export function multiPolygonArea(parts: MultiPolygonRings): number {
  let area = 0;
  for (const part of parts) area += polygonArea(part);
  return area;
}

export function extentOfRings(rings: PolygonRings | MultiPolygonRings): Extent {
  const extent: Extent = [Infinity, Infinity, -Infinity, -Infinity];
  const visit = (ring: Ring) => {
    for (const [x, y] of ring) {
      if (x < extent[0]) extent[0] = x;
      if (y < extent[1]) extent[1] = y;
      if (x > extent[2]) extent[2] = x;
      if (y > extent[3]) extent[3] = y;
    }
  };
  for (const item of rings) {
    if (typeof item[0][0] === 'number') visit(item as Ring);
    else for (const ring of item as PolygonRings) visit(ring);
  }
  return extent;
}
