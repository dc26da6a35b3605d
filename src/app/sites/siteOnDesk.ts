import { crsName } from '../../core/crs.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import type { OpenSite, SceneView } from '../site.ts';
import type { SiteImagery } from './sceneImagery.ts';

// A stored site as the desk takes it: its store, and its imagery when the user gave it.
// Without imagery the desk still shows and edits the patches, on a blank map spanning
// them (a site keeps no footprint of its scenes), one empty scene per date.

/** The site's patches' extent, or null when it has none. */
function patchesExtent(store: SiteStore): [number, number, number, number] | null {
  let out: [number, number, number, number] | null = null;
  for (const patch of store.state.patches.values()) {
    const [x0, y0, x1, y1] = extentOfRings(patch.geometry);
    out = out ? [Math.min(out[0], x0), Math.min(out[1], y0), Math.max(out[2], x1), Math.max(out[3], y1)] : [x0, y0, x1, y1];
  }
  if (!out) return null;
  // A margin, so a lone small patch is not shown edge to edge.
  const pad = Math.max(20, 0.1 * Math.max(out[2] - out[0], out[3] - out[1]));
  return [out[0] - pad, out[1] - pad, out[2] + pad, out[3] + pad];
}

/**
 * Joins a stored site with its imagery (null: none); closing the site closes both.
 * `notes` say what is missing. Refused only when there is nothing to show at all (no
 * imagery and no patch); the caller still owns the store then.
 */
export function siteOnDesk(store: SiteStore, imagery: SiteImagery | null, notes: string[] = []): OpenSite {
  const state = store.state;
  const site = state.site!;
  const extent = imagery?.extent ?? patchesExtent(store);
  if (!extent) {
    throw new Error(`Site "${site.name}" has no patches yet, so there is nothing to show without its imagery; pick its imagery files.`);
  }
  const sceneRefs = [...state.scenes.values()].sort((a, b) => a.date.localeCompare(b.date));
  const scenes: SceneView[] = imagery?.scenes ?? (sceneRefs.length ? sceneRefs : [{ date: 'no imagery' }]).map((s) => ({ date: s.date, pan: null, ms: null }));
  return {
    name: site.name,
    epsg: site.epsg,
    crsName: imagery?.crsName ?? crsName(site.epsg) ?? `EPSG:${site.epsg}`,
    extent,
    scenes,
    roster: [...state.roster],
    fieldPolygons: { type: 'FeatureCollection', features: [] },
    notes: [...notes, ...(imagery?.notes ?? [])],
    store,
    dispose: () => {
      store.close();
      imagery?.dispose();
    },
  };
}
