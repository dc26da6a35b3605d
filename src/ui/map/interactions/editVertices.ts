import Collection from 'ol/Collection.js';
import type Feature from 'ol/Feature.js';
import type MultiPolygon from 'ol/geom/MultiPolygon.js';
import Modify from 'ol/interaction/Modify.js';
import { altKeyOnly, primaryAction, singleClick } from 'ol/events/condition.js';
import type { MapBrowserEvent } from 'ol';
import type { MultiPolygonRings } from '../../../core/geometry/types.ts';
import { outlineOf } from './outlineCoordinates.ts';

/**
 * Edits the outline of the patch in hand: drag a vertex to move it, drag a point on an
 * edge to add one, Alt+click a vertex to remove it. The outline is measured while it
 * changes and committed when the drag ends.
 */
export function editVertices(
  feature: Feature<MultiPolygon>,
  done: (outline: MultiPolygonRings) => void,
  sketch: (outline: MultiPolygonRings | null) => void,
): Modify {
  const modify = new Modify({
    features: new Collection([feature]),
    condition: primaryAction,
    deleteCondition: (event: MapBrowserEvent) => altKeyOnly(event) && singleClick(event),
    pixelTolerance: 8,
  });
  const onChange = () => sketch(outlineOf(feature));
  modify.on('modifystart', () => feature.getGeometry()?.on('change', onChange));
  modify.on('modifyend', () => {
    feature.getGeometry()?.un('change', onChange);
    sketch(null);
    const outline = outlineOf(feature);
    if (outline) done(outline);
  });
  return modify;
}
