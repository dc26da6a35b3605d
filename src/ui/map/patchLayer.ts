import GeoJSON from 'ol/format/GeoJSON.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import type { ProjectionLike } from 'ol/proj.js';
import { speciesStyle, type SpeciesLook } from './speciesStyle.ts';

/** GeoJSON (RFC 7946, lon/lat) polygons drawn in the map's projection, coloured by species. */
export function patchLayer(geojson: object, projection: ProjectionLike, looks: SpeciesLook[], speciesProperty = 'species') {
  const features = new GeoJSON().readFeatures(geojson, { dataProjection: 'EPSG:4326', featureProjection: projection });
  return new VectorLayer({
    source: new VectorSource({ features }),
    style: speciesStyle(looks, speciesProperty),
    className: 'patches-layer',
    updateWhileInteracting: false,
  });
}
