import Feature from 'ol/Feature.js';
import Point from 'ol/geom/Point.js';
import MultiPolygon from 'ol/geom/MultiPolygon.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import { Circle, Fill, Stroke, Style } from 'ol/style.js';
import type { Finding } from '../../core/checks/findings.ts';

// Where each finding is: overlap polygons and off-image parts as a dashed outline over a
// faint fill, self-intersections and other point problems as rings. Drawn in white and
// dark so it never reads as a species colour.
const areaStyle = [
  new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.8)', width: 3 }) }),
  new Style({ stroke: new Stroke({ color: '#ffffff', width: 1.5, lineDash: [4, 3] }), fill: new Fill({ color: 'rgba(255,255,255,0.25)' }) }),
];
const pointStyle = new Style({
  image: new Circle({ radius: 7, stroke: new Stroke({ color: '#ffffff', width: 2 }), fill: new Fill({ color: 'rgba(0,0,0,0.35)' }) }),
});

export function findingsLayer() {
  const source = new VectorSource();
  const layer = new VectorLayer({
    source,
    className: 'findings-layer',
    style: (feature) => (feature.getGeometry() instanceof Point ? pointStyle : areaStyle),
  });
  return {
    layer,
    show(findings: Finding[]) {
      source.clear(true);
      const features: Feature[] = [];
      for (const finding of findings) {
        const g = finding.geometry;
        if (!g) continue;
        features.push(new Feature(g.type === 'Point' ? new Point(g.coordinates) : new MultiPolygon(g.coordinates)));
      }
      source.addFeatures(features);
    },
  };
}
