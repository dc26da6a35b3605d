import type Draw from 'ol/interaction/Draw.js';
import type { EventsKey } from 'ol/events.js';
import { unByKey } from 'ol/Observable.js';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';
import { outlineOf } from './outlineCoordinates.ts';

/** Reports the outline of a Draw's sketch as it grows, and null when the sketch ends. */
export function measureWhileDrawing(draw: Draw, report: (outline: MultiPolygonRings | null) => void): void {
  let key: EventsKey | null = null;
  draw.on('drawstart', (event) => {
    const feature = event.feature;
    key = feature.getGeometry()!.on('change', () => report(outlineOf(feature)));
  });
  const stop = () => {
    if (key) unByKey(key);
    key = null;
    report(null);
  };
  draw.on('drawend', stop);
  draw.on('drawabort', stop);
}
