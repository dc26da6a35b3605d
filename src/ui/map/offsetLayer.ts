import Feature from 'ol/Feature.js';
import MultiPolygon from 'ol/geom/MultiPolygon.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import { Stroke, Style } from 'ol/style.js';
import type { OutlineShow, ShiftOutlines } from '../state/OffsetDesk.svelte.ts';

// Before and after a field-to-imagery shift: where the field put each polygon (dashed,
// warm) and where the shift puts it (solid, cool), over a dark halo so both read on
// bright and dark imagery. Line colours only, never a fill, so species colours stay.

const FIELD = '#ffcf4a';
const SHIFTED = '#5fd4ff';

const fieldStyle = [
  new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.75)', width: 3 }) }),
  new Style({ stroke: new Stroke({ color: FIELD, width: 1.5, lineDash: [5, 4] }) }),
];
const shiftedStyle = [
  new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.75)', width: 3 }) }),
  new Style({ stroke: new Stroke({ color: SHIFTED, width: 1.5 }) }),
];

export const OFFSET_OUTLINE_COLOURS = { field: FIELD, shifted: SHIFTED } as const;

export function offsetLayer() {
  const source = new VectorSource<Feature<MultiPolygon>>({ wrapX: false });
  const layer = new VectorLayer({
    source,
    className: 'offset-layer',
    // Over the stored patches (added later by the editing tools), so the dashed field
    // outline shows where it lies under a patch not yet moved.
    zIndex: 1,
    style: (feature) => (feature.get('position') === 'field' ? fieldStyle : shiftedStyle),
    updateWhileInteracting: false,
  });
  let last: ShiftOutlines | null = null;
  let lastShow: OutlineShow | null = null;
  return {
    layer,
    /** Draws the outlines (none for null); the same outlines and choice again is a no-op. */
    show(outlines: ShiftOutlines | null, which: OutlineShow) {
      if (outlines === last && which === lastShow) return;
      last = outlines;
      lastShow = which;
      source.clear(true);
      if (!outlines || which === 'none') return;
      const features: Feature<MultiPolygon>[] = [];
      const add = (list: ShiftOutlines['field'], position: 'field' | 'shifted') => {
        for (const g of list) {
          const f = new Feature(new MultiPolygon(g));
          f.set('position', position);
          features.push(f);
        }
      };
      if (which === 'both' || which === 'field') add(outlines.field, 'field');
      if (which === 'both' || which === 'shifted') add(outlines.shifted, 'shifted');
      source.addFeatures(features);
    },
  };
}
