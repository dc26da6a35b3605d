import type Map from 'ol/Map.js';
import type VectorLayer from 'ol/layer/Vector.js';
import type VectorSource from 'ol/source/Vector.js';
import type { Coordinate } from 'ol/coordinate.js';
import type { FeatureLike } from 'ol/Feature.js';
import { unByKey } from 'ol/Observable.js';

/** How far from a click (screen pixels) a patch still counts as clicked. */
const HIT_TOLERANCE_PX = 3;

/**
 * Picks the patch under a click: selects it, or (while merging) merges it into the
 * patch in hand. A click on bare imagery clears the selection. Zoomed out past the
 * outlines' resolution the patches are one painted image, so the click is looked up
 * in the layer's source instead: the patch containing it, else the nearest within
 * the tolerance.
 */
export function pickPatch(map: Map, layer: VectorLayer, picked: (id: string | null) => void): () => void {
  const key = map.on('singleclick', (event) => {
    let id: string | null = null;
    const resolution = map.getView().getResolution() ?? 0;
    if (resolution < layer.getMaxResolution()) {
      map.forEachFeatureAtPixel(event.pixel, (feature) => {
        id = String(feature.getId());
        return true;
      }, { layerFilter: (l) => l === layer, hitTolerance: HIT_TOLERANCE_PX });
    } else {
      id = patchNear(layer, event.coordinate, resolution);
    }
    picked(id);
  });
  return () => unByKey(key);
}

/** The shown patch containing `at`, else the nearest one within the tolerance; the smallest wins among nested ones. */
function patchNear(layer: VectorLayer, at: Coordinate, resolution: number): string | null {
  const source = layer.getSource() as VectorSource | null;
  const style = layer.getStyleFunction();
  if (!source) return null;
  const reach = HIT_TOLERANCE_PX * resolution;
  const [x, y] = at;
  let best: { id: string; distance: number; area: number } | null = null;
  for (const feature of source.getFeaturesInExtent([x - reach, y - reach, x + reach, y + reach])) {
    if (style && !style(feature as FeatureLike, resolution)) continue; // hidden (e.g. field polygons switched off)
    const geometry = feature.getGeometry();
    if (!geometry) continue;
    const inside = geometry.intersectsCoordinate(at);
    const closest = inside ? at : geometry.getClosestPoint(at);
    const distance = Math.hypot(closest[0] - x, closest[1] - y);
    if (distance > reach) continue;
    const extent = geometry.getExtent();
    const area = (extent[2] - extent[0]) * (extent[3] - extent[1]);
    if (!best || distance < best.distance || (distance === best.distance && area < best.area)) {
      best = { id: String(feature.getId()), distance, area };
    }
  }
  return best?.id ?? null;
}
