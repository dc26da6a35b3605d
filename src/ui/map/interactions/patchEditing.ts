import type Map from 'ol/Map.js';
import type Interaction from 'ol/interaction/Interaction.js';
import { getCenter, getHeight, getWidth } from 'ol/extent.js';
import type { PatchDesk } from '../../state/PatchDesk.svelte.ts';
import type { Tool } from '../../state/patchKeys.ts';
import { StoredPatchLayer } from '../patchLayer.ts';
import type { SpeciesLook } from '../speciesStyle.ts';
import { drawByClicks } from './drawByClicks.ts';
import { drawFreehand } from './drawFreehand.ts';
import { editVertices } from './editVertices.ts';
import { movePatch } from './movePatch.ts';
import { splitWithLine } from './splitWithLine.ts';
import { snapToPatches } from './snapToPatches.ts';
import { pickPatch } from './pickPatch.ts';
import { pickedPatch, type PickedPatch } from '../pickedPatch.ts';

/** Least width of the view when the map goes to a patch, metres: enough to see its neighbours. */
const FOCUS_SPAN_M = 40;

/**
 * Puts the stored patches on a map and wires the desk's tools to it: the layer follows
 * the desk's state, the tool in hand decides which one interaction is on (plus snapping),
 * and "go to a patch" moves the view.
 */
export function attachPatchEditing(map: Map, desk: PatchDesk, looks: SpeciesLook[], onPick?: (patch: PickedPatch | null) => void) {
  // Colours come from the stored roster (so an edited roster recolours the map), and
  // from the site's files until a roster is stored.
  const patches = new StoredPatchLayer(desk.roster.length ? desk.roster : looks);
  map.addLayer(patches.layers);
  let active: Interaction[] = [];
  let current: { tool: Tool; selected: string | null; snap: boolean } | null = null;
  const sketch = (outline: Parameters<PatchDesk['measureSketch']>[0]) => desk.measureSketch(outline);

  const interactionsFor = (tool: Tool, selected: string | null): Interaction[] => {
    const feature = selected ? patches.feature(selected) : null;
    const snap = desk.snap ? [snapToPatches(patches.source)] : [];
    const edited = (outline: Parameters<PatchDesk['add']>[0]) => {
      if (!selected) return;
      void desk.editGeometry(selected, outline).then(() => patches.restore(selected));
    };
    switch (tool) {
      case 'draw':
        return [drawByClicks((outline) => void desk.add(outline), sketch), ...snap];
      case 'freehand':
        return [drawFreehand((outline) => void desk.add(outline), sketch), ...snap];
      case 'edit':
        return feature ? [editVertices(feature, edited, sketch), ...snap] : [];
      case 'move':
        return feature ? [movePatch(feature, edited)] : [];
      case 'split':
        return feature ? [splitWithLine((line) => void desk.split(line)), ...snap] : [];
      default:
        return [];
    }
  };

  const follow = () => {
    if (desk.roster.length) patches.setLooks(desk.roster);
    patches.sync(desk.features().map((f) => ({
      id: f.id,
      geometry: f.geometry,
      imported: f.imported,
      look: { species: f.species, unsure: f.unsure, selected: f.selected },
    })));
    const wanted = { tool: desk.tool, selected: desk.selectedId, snap: desk.snap };
    if (current && current.tool === wanted.tool && current.selected === wanted.selected && current.snap === wanted.snap) return;
    for (const interaction of active) map.removeInteraction(interaction);
    active = interactionsFor(wanted.tool, wanted.selected);
    for (const interaction of active) map.addInteraction(interaction);
    current = wanted;
  };

  const goTo = (id: string) => {
    const geometry = patches.feature(id)?.getGeometry();
    if (!geometry) return;
    // The map may have just come out from behind another page: read its size first.
    map.updateSize();
    const extent = geometry.getExtent();
    const span = Math.max(FOCUS_SPAN_M, getWidth(extent) * 3, getHeight(extent) * 3);
    const [cx, cy] = getCenter(extent);
    map.getView().fit([cx - span / 2, cy - span / 2, cx + span / 2, cy + span / 2], { duration: 0 });
  };

  const unpick = pickPatch(map, patches.layer, (id) => {
    if (desk.tool === 'merge') {
      if (id && id !== desk.selectedId) void desk.mergeWith(id);
    } else if (desk.tool === 'select') {
      desk.select(id);
      const feature = id ? patches.feature(id) : null;
      onPick?.(feature ? pickedPatch(feature) : null);
    }
  });
  const stopChange = desk.onChange(follow);
  const stopFocus = desk.onFocus(goTo);
  follow();

  return {
    layer: patches,
    /** Field polygons (imported patches) shown or hidden with the desk's F key. */
    setShowImported: (show: boolean) => patches.setShowImported(show),
    dispose: () => {
      unpick();
      stopChange();
      stopFocus();
      for (const interaction of active) map.removeInteraction(interaction);
      map.removeLayer(patches.layers);
      patches.dispose();
    },
  };
}
