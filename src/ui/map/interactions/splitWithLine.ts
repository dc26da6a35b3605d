import Draw from 'ol/interaction/Draw.js';
import type LineString from 'ol/geom/LineString.js';

/** Draws the line that cuts the patch in hand in two: click along it, double-click to end. */
export function splitWithLine(done: (line: [number, number][]) => void): Draw {
  const draw = new Draw({ type: 'LineString', stopClick: true });
  draw.on('drawend', (event) => {
    const line = (event.feature.getGeometry() as LineString).getCoordinates() as [number, number][];
    if (line.length >= 2) done(line);
  });
  return draw;
}
