// The page of the map.patches benchmark: an OpenLayers map in the demo's CRS with n
// seeded crown-sized patches, drawn by the desk's StoredPatchLayer or by a naive vector
// layer (no spatial index, new styles on every draw). Node drives it through
// window.mapBench and reads back the time of each redraw, measured in the page.
import Map from 'ol/Map.js';
import View from 'ol/View.js';
import Feature from 'ol/Feature.js';
import MultiPolygon from 'ol/geom/MultiPolygon.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import { Fill, Stroke, Style } from 'ol/style.js';
import { olProjection } from '../../src/ui/map/projection.ts';
import { StoredPatchLayer, type PatchFeatureData } from '../../src/ui/map/patchLayer.ts';
import { seeded } from '../harness.ts';

const EPSG = 32608;
const EXTENT: [number, number, number, number] = [493000, 4428771.2, 494228.8, 4430000];
const COLOURS = ['#009E73', '#0072B2', '#56B4E9', '#F0E442', '#E69F00', '#D55E00', '#CC79A7'];
const looks = COLOURS.map((colour, i) => ({ code: `S${i}`, colour }));

/** n crowns: 10-16 corners, 0.8-3 m across, anywhere in the scene; a tenth untagged, a tenth unsure. */
function patches(n: number, seed: number): PatchFeatureData[] {
  const random = seeded(seed);
  const out: PatchFeatureData[] = [];
  for (let i = 0; i < n; i++) {
    const cx = EXTENT[0] + random() * (EXTENT[2] - EXTENT[0]);
    const cy = EXTENT[1] + random() * (EXTENT[3] - EXTENT[1]);
    const radius = 0.8 + random() * 2.2;
    const corners = 10 + Math.floor(random() * 7);
    const ring: number[][] = [];
    for (let k = 0; k < corners; k++) {
      const a = (k / corners) * 2 * Math.PI;
      const r = radius * (0.75 + 0.25 * random());
      ring.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
    }
    ring.push(ring[0]);
    const u = random();
    out.push({
      id: `P${i}`,
      geometry: [[ring]],
      imported: false,
      look: { species: u < 0.1 ? '' : `S${Math.floor(random() * COLOURS.length)}`, unsure: u > 0.9, selected: i === 0 },
    });
  }
  return out;
}

/** The naive layer: every feature in a plain list, styles built anew on each draw. */
function naiveLayer(data: PatchFeatureData[]) {
  const byCode = new globalThis.Map(looks.map((l) => [l.code, l.colour]));
  const features = data.map((d) => {
    const f = new Feature(new MultiPolygon(d.geometry));
    f.set('species', d.look.species);
    return f;
  });
  return new VectorLayer({
    source: new VectorSource({ features, useSpatialIndex: false }),
    style: (f) => {
      const colour = byCode.get(f.get('species')) ?? '#f4f4f4';
      return [
        new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.75)', width: 3.5 }) }),
        new Style({ stroke: new Stroke({ color: colour, width: 1.75 }), fill: new Fill({ color: 'rgba(255,255,255,0.12)' }) }),
      ];
    },
  });
}

let map: Map | null = null;

function setup(kind: 'ours' | 'naive', n: number, seed: number): number {
  map?.setTarget(undefined);
  const projection = olProjection(EPSG);
  const data = patches(n, seed);
  let layer;
  if (kind === 'ours') {
    const stored = new StoredPatchLayer(looks);
    stored.sync(data);
    layer = stored.layers;
  } else layer = naiveLayer(data);
  map = new Map({ target: 'map', layers: [layer], controls: [], view: new View({ projection }) });
  map.getView().fit(EXTENT);
  map.renderSync();
  return data.length;
}

/** Zooms to a view `width` metres across at the scene's centre (the near view draws outlines). */
function zoomTo(width: number): void {
  const view = map!.getView();
  const cx = (EXTENT[0] + EXTENT[2]) / 2, cy = (EXTENT[1] + EXTENT[3]) / 2;
  view.fit([cx - width / 2, cy - width / 2, cx + width / 2, cy + width / 2]);
  map!.renderSync();
}

/** One redraw after a pan by half the screen (alternating) or a zoom by one level (in, then out). */
function redraw(action: 'pan' | 'zoom', step: number): number {
  const view = map!.getView();
  if (action === 'pan') {
    const [x, y] = view.getCenter()!;
    const shift = (map!.getSize()![0] / 2) * view.getResolution()!;
    view.setCenter([x + (step % 2 ? -shift : shift), y]);
  } else {
    view.setResolution(view.getResolution()! * (step % 2 ? 2 : 0.5));
  }
  const start = performance.now();
  map!.renderSync();
  return performance.now() - start;
}

(window as unknown as { mapBench: unknown }).mapBench = { setup, redraw, zoomTo };
