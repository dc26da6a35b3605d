import { union } from 'polyclip-ts';
import Polygonizer from 'jsts/org/locationtech/jts/operation/polygonize/Polygonizer.js';
import UnaryUnionOp from 'jsts/org/locationtech/jts/operation/union/UnaryUnionOp.js';
import InteriorPointArea from 'jsts/org/locationtech/jts/algorithm/InteriorPointArea.js';
import SimplePointInAreaLocator from 'jsts/org/locationtech/jts/algorithm/locate/SimplePointInAreaLocator.js';
import Location from 'jsts/org/locationtech/jts/geom/Location.js';
import Coordinate from 'jsts/org/locationtech/jts/geom/Coordinate.js';
import { factory, fromJsts, jstsLines, jstsShape } from '../../core/geometry/jstsBridge.ts';
import { multiPolygonArea } from '../../core/geometry/measure.ts';
import type { MultiPolygonRings, Position } from '../../core/geometry/types.ts';

// Splitting a patch with a line and merging two patches: geometry only, no storage.
// Split: the outline's boundary noded with the line is polygonized (JSTS), and the faces
// inside the outline are kept. Merge: the union of the two outlines (polyclip-ts).

export class OutlineEditError extends Error {
  override name = 'OutlineEditError';
}

/**
 * The pieces a line cuts an outline into, largest first. Throws when the line does not
 * cross the outline from outside to outside (it leaves a single piece).
 */
export function splitOutline(parts: MultiPolygonRings, line: Position[]): MultiPolygonRings[] {
  if (line.length < 2) throw new OutlineEditError('the cutting line needs at least two points');
  const shape = jstsShape(parts);
  const cut = factory.createLineString(line.map(([x, y]) => new Coordinate(x, y)));
  // The union of the rings and the line nodes them where they cross.
  const noded = UnaryUnionOp.union(factory.createGeometryCollection([jstsLines(parts), cut]));
  const polygonizer = new Polygonizer();
  polygonizer.add(noded);
  const faces: MultiPolygonRings[] = [];
  for (const face of polygonizer.getPolygons().toArray()) {
    // A face belongs to the outline when a point surely inside it is inside the outline.
    const inner = InteriorPointArea.getInteriorPoint(face);
    if (SimplePointInAreaLocator.locate(inner, shape) === Location.INTERIOR) faces.push(fromJsts(face));
  }
  if (faces.length < 2) throw new OutlineEditError('the line must cross the patch from one side to the other');
  return faces.sort((a, b) => multiPolygonArea(b) - multiPolygonArea(a));
}

/** The union of two outlines; throws when they neither touch nor overlap. */
export function mergeOutlines(a: MultiPolygonRings, b: MultiPolygonRings): MultiPolygonRings {
  const merged = union(a as never, b as never) as unknown as MultiPolygonRings;
  if (merged.length !== 1) throw new OutlineEditError('the two patches neither touch nor overlap, so they cannot become one');
  return merged;
}
