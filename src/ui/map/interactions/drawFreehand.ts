import Draw from 'ol/interaction/Draw.js';
import type Polygon from 'ol/geom/Polygon.js';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';
import { enclosesArea, outlineOf } from './outlineCoordinates.ts';
import { measureWhileDrawing } from './sketchMeasure.ts';

/** Vertices closer than this to the traced line are dropped (metres; common practice: well under a pan pixel). */
export const FREEHAND_TOLERANCE_M = 0.1;

/** Draws a new patch by dragging round it; the traced line is thinned (Douglas-Peucker) before it is kept. */
export function drawFreehand(done: (outline: MultiPolygonRings) => void, sketch: (outline: MultiPolygonRings | null) => void): Draw {
  const draw = new Draw({ type: 'Polygon', freehand: true, stopClick: true });
  measureWhileDrawing(draw, sketch);
  draw.on('drawend', (event) => {
    const thinned = (event.feature.getGeometry() as Polygon).simplify(FREEHAND_TOLERANCE_M) as Polygon;
    event.feature.setGeometry(thinned);
    const outline = outlineOf(event.feature);
    if (outline && enclosesArea(outline)) done(outline);
  });
  return draw;
}
