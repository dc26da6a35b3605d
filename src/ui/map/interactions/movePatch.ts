import Collection from 'ol/Collection.js';
import type Feature from 'ol/Feature.js';
import type MultiPolygon from 'ol/geom/MultiPolygon.js';
import Translate from 'ol/interaction/Translate.js';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';
import { outlineOf } from './outlineCoordinates.ts';

/** Moves the patch in hand by dragging it; the new position is committed on release. */
export function movePatch(feature: Feature<MultiPolygon>, done: (outline: MultiPolygonRings) => void): Translate {
  const translate = new Translate({ features: new Collection([feature]) });
  translate.on('translateend', () => {
    const outline = outlineOf(feature);
    if (outline) done(outline);
  });
  return translate;
}
