import Coordinate from 'jsts/org/locationtech/jts/geom/Coordinate.js';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import { ringSignedArea } from './measure.ts';
import type { MultiPolygonRings, PolygonRings, Position, Ring } from './types.ts';

// The one place that turns our plain rings into JSTS geometry and back, so the rest of
// core speaks GeoJSON-style arrays. JSTS needs closed rings of at least four positions:
// callers check structure first (see validity.ts).

/** A JSTS geometry; its API is untyped, so we keep it opaque outside this file and its users. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any
export type JstsGeometry = any;

export const factory = new GeometryFactory();

const toCoordinates = (ring: Ring) => ring.map(([x, y]) => new Coordinate(x, y));

export function jstsPolygon(rings: PolygonRings): JstsGeometry {
  const shell = factory.createLinearRing(toCoordinates(rings[0]));
  const holes = rings.slice(1).map((ring) => factory.createLinearRing(toCoordinates(ring)));
  return factory.createPolygon(shell, holes);
}

/** One part becomes a Polygon, several a MultiPolygon (as JTS would read them from WKT). */
export function jstsShape(parts: MultiPolygonRings): JstsGeometry {
  if (parts.length === 1) return jstsPolygon(parts[0]);
  return factory.createMultiPolygon(parts.map(jstsPolygon));
}

export function jstsLines(parts: MultiPolygonRings): JstsGeometry {
  const lines = parts.flatMap((rings) => rings.map((ring) => factory.createLineString(toCoordinates(ring))));
  return factory.createMultiLineString(lines);
}

/** A JSTS ring as positions, wound as RFC 7946 asks: outer rings counter-clockwise, holes clockwise. */
function ringOf(lineString: JstsGeometry, outer: boolean): Ring {
  const ring: Ring = lineString.getCoordinates().map((c: { x: number; y: number }): Position => [c.x, c.y]);
  return (ringSignedArea(ring) > 0) === outer ? ring : ring.reverse();
}

/** The polygonal parts of a JSTS geometry as rings; lines and points are dropped. */
export function fromJsts(geometry: JstsGeometry): MultiPolygonRings {
  const parts: MultiPolygonRings = [];
  const visit = (g: JstsGeometry) => {
    const type = g.getGeometryType();
    if (type === 'Polygon') {
      if (g.isEmpty()) return;
      const rings: PolygonRings = [ringOf(g.getExteriorRing(), true)];
      for (let i = 0; i < g.getNumInteriorRing(); i++) rings.push(ringOf(g.getInteriorRingN(i), false));
      parts.push(rings);
    } else if (type === 'MultiPolygon' || type === 'GeometryCollection') {
      for (let i = 0; i < g.getNumGeometries(); i++) visit(g.getGeometryN(i));
    }
  };
  visit(geometry);
  return parts;
}
