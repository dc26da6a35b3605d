import type Map from 'ol/Map.js';
import type VectorLayer from 'ol/layer/Vector.js';
import { unByKey } from 'ol/Observable.js';

/**
 * Picks the patch under a click: selects it, or (while merging) merges it into the
 * patch in hand. A click on bare imagery clears the selection.
 */
export function pickPatch(map: Map, layer: VectorLayer, picked: (id: string | null) => void): () => void {
  const key = map.on('singleclick', (event) => {
    let id: string | null = null;
    map.forEachFeatureAtPixel(event.pixel, (feature) => {
      id = String(feature.getId());
      return true;
    }, { layerFilter: (l) => l === layer, hitTolerance: 3 });
    picked(id);
  });
  return () => unByKey(key);
}
