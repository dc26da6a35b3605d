import GeoJSON from 'ol/format/GeoJSON.js';
import VectorLayer from 'ol/layer/Vector.js';
import VectorSource from 'ol/source/Vector.js';
import type { ProjectionLike } from 'ol/proj.js';
import Feature from 'ol/Feature.js';
import MultiPolygon from 'ol/geom/MultiPolygon.js';
import LayerGroup from 'ol/layer/Group.js';
import { patchLookStyle, speciesStyle, type PatchLook, type SpeciesLook } from './speciesStyle.ts';
import { OVERVIEW_RESOLUTION_M, PatchOverview } from './patchOverview.ts';

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

/** One stored patch as the map draws it (outline in the scene CRS, metres). */
export interface PatchFeatureData {
  id: string;
  geometry: number[][][][];
  look: PatchLook;
  /** imported from a field file (hidden with the field polygons) */
  imported: boolean;
}

/**
 * The stored patches of a site. `sync` takes the whole list and touches only the
 * features whose outline or look changed, so a commit in a 10,000-patch site redraws
 * without rebuilding the source.
 */
export class StoredPatchLayer {
  /** near: outlines as vector features, which the tools edit */
  readonly layer: VectorLayer<VectorSource<Feature<MultiPolygon>>>;
  /** far: every patch filled on one canvas */
  readonly overview: PatchOverview;
  /** both, for the map */
  readonly layers: LayerGroup;
  readonly source = new VectorSource<Feature<MultiPolygon>>({ wrapX: false });
  #showImported = true;
  #known = new Map<string, PatchFeatureData>();

  #style: ReturnType<typeof patchLookStyle>;
  #looks: readonly SpeciesLook[];

  constructor(looks: readonly SpeciesLook[]) {
    this.#looks = looks;
    this.#style = patchLookStyle([...looks]);
    this.layer = new VectorLayer({
      source: this.source,
      className: 'patches-layer stored-patches-layer',
      style: (feature) => {
        const data = this.#known.get(String(feature.getId()));
        if (!data || !this.#shown(data)) return undefined;
        return this.#style(data.look);
      },
      updateWhileAnimating: false,
      updateWhileInteracting: false,
      maxResolution: OVERVIEW_RESOLUTION_M,
    });
    this.overview = new PatchOverview(() => this.#known.values(), (data) => this.#shown(data), looks);
    this.layers = new LayerGroup({ layers: [this.overview.layer, this.layer] });
  }

  #shown(data: PatchFeatureData): boolean {
    return !(data.imported && !this.#showImported && !data.look.selected);
  }

  /** New species colours (the roster changed); the same list is a no-op. */
  setLooks(looks: readonly SpeciesLook[]): void {
    if (looks === this.#looks) return;
    this.#looks = looks;
    this.#style = patchLookStyle([...looks]);
    this.overview.setLooks(looks);
    this.layer.changed();
    this.overview.changed();
  }

  setShowImported(show: boolean): void {
    if (show === this.#showImported) return;
    this.#showImported = show;
    this.layer.changed();
    this.overview.changed();
  }

  feature(id: string): Feature<MultiPolygon> | null {
    return this.source.getFeatureById(id) as Feature<MultiPolygon> | null;
  }

  sync(patches: readonly PatchFeatureData[]): void {
    const seen = new Set<string>();
    const added: Feature<MultiPolygon>[] = [];
    let restyled = false;
    for (const data of patches) {
      seen.add(data.id);
      const before = this.#known.get(data.id);
      this.#known.set(data.id, data);
      if (!before) {
        const feature = new Feature(new MultiPolygon(data.geometry));
        feature.setId(data.id);
        feature.set('species', data.look.species, true);
        added.push(feature);
        continue;
      }
      const feature = this.feature(data.id);
      feature?.set('species', data.look.species, true);
      if (before.geometry !== data.geometry && feature) feature.setGeometry(new MultiPolygon(data.geometry));
      else if (!sameLook(before.look, data.look) && feature) {
        restyled = true;
        feature.changed();
      }
    }
    for (const id of [...this.#known.keys()]) {
      if (seen.has(id)) continue;
      this.#known.delete(id);
      const feature = this.feature(id);
      if (feature) this.source.removeFeature(feature);
    }
    if (added.length) this.source.addFeatures(added);
    if (restyled) this.layer.changed();
    this.overview.changed();
  }

  /** Puts a feature's outline back to the stored one (after an edit was refused). */
  restore(id: string): void {
    const data = this.#known.get(id);
    const feature = this.feature(id);
    if (data && feature) feature.setGeometry(new MultiPolygon(data.geometry));
  }

  dispose(): void {
    this.source.clear(true);
    this.layer.dispose();
    this.overview.layer.dispose();
    this.layers.dispose();
  }
}

function sameLook(a: PatchLook, b: PatchLook): boolean {
  return a.species === b.species && a.unsure === b.unsure && a.selected === b.selected;
}
