import Draw from 'ol/interaction/Draw.js';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';
import { enclosesArea, outlineOf } from './outlineCoordinates.ts';
import { measureWhileDrawing } from './sketchMeasure.ts';

/**
 * Draws a new patch corner by corner: a click per vertex, a click on the first vertex or
 * a double click closes it. Nothing is added to any source here: `done` commits it.
 */
export function drawByClicks(done: (outline: MultiPolygonRings) => void, sketch: (outline: MultiPolygonRings | null) => void): Draw {
  const draw = new Draw({ type: 'Polygon', stopClick: true });
  measureWhileDrawing(draw, sketch);
  draw.on('drawend', (event) => {
    const outline = outlineOf(event.feature);
    if (outline && enclosesArea(outline)) done(outline);
  });
  return draw;
}
