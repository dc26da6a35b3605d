import Feature from 'ol/Feature.js';
import MultiPolygon from 'ol/geom/MultiPolygon.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import { Stroke, Style } from 'ol/style.js';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';

// The area an independent delineation covers: a long-dashed white line over a dark halo,
// no fill, so it reads on any imagery and never hides a patch's colour.

const style = [
  new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.7)', width: 4 }) }),
  new Style({ stroke: new Stroke({ color: '#f4f6f8', width: 2, lineDash: [12, 6] }) }),
];

export function areaLayer() {
  const source = new VectorSource<Feature<MultiPolygon>>({ wrapX: false });
  const layer = new VectorLayer({ source, className: 'area-layer', zIndex: 1, style, updateWhileInteracting: false });
  let last: MultiPolygonRings | null = null;
  return {
    layer,
    /** Draws the area (nothing for null); the same area again is a no-op. */
    show(area: MultiPolygonRings | null) {
      if (area === last) return;
      last = area;
      source.clear(true);
      if (area) source.addFeature(new Feature(new MultiPolygon(area)));
    },
  };
}
