import { Fill, Stroke, Style } from 'ol/style.js';
import type { FeatureLike } from 'ol/Feature.js';

export interface SpeciesLook {
  code: string;
  colour: string;
}

// Patch outlines: a dark halo under the species colour keeps them legible on bright snow
// and on dark shadow alike; the fill is faint so the crown stays visible.
export function speciesStyle(looks: SpeciesLook[], property: string, fallback = '#bbbbbb') {
  const byCode = new Map(looks.map((l) => [l.code, l.colour]));
  const cache = new Map<string, Style[]>();
  return (feature: FeatureLike): Style[] => {
    const code = String(feature.get(property) ?? '');
    let styles = cache.get(code);
    if (!styles) {
      const colour = byCode.get(code) ?? fallback;
      styles = [
        new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.75)', width: 3.5 }) }),
        new Style({
          stroke: new Stroke({ color: colour, width: 1.75 }),
          fill: new Fill({ color: withAlpha(colour, 0.12) }),
        }),
      ];
      cache.set(code, styles);
    }
    return styles;
  };
}

export function withAlpha(hex: string, alpha: number): string {
  const m = /^#?([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) return hex;
  return `rgba(${parseInt(m[1], 16)},${parseInt(m[2], 16)},${parseInt(m[3], 16)},${alpha})`;
}

/** How one stored patch is drawn: its shown species, confidence and whether it is in hand. */
export interface PatchLook {
  /** roster code or reserved class of the shown tag; '' when untagged */
  species: string;
  unsure: boolean;
  selected: boolean;
}

const UNTAGGED = '#f4f4f4';

// Stored patches: the same halo-and-colour outline as field polygons; untagged patches
// white and dashed, unsure calls dashed in their colour, the patch in hand thick with a
// brighter fill and its vertices marked, so it stands out on any species colour.
export function patchLookStyle(looks: SpeciesLook[]) {
  const byCode = new Map(looks.map((l) => [l.code, l.colour]));
  const cache = new Map<string, Style[]>();
  return (look: PatchLook): Style[] => {
    const key = `${look.species}|${look.unsure ? 1 : 0}|${look.selected ? 1 : 0}`;
    let styles = cache.get(key);
    if (styles) return styles;
    const colour = look.species ? (byCode.get(look.species) ?? '#bbbbbb') : UNTAGGED;
    const dash = !look.species ? [4, 4] : look.unsure ? [6, 4] : undefined;
    styles = look.selected
      ? [
          new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.9)', width: 6 }), zIndex: 2 }),
          new Style({ stroke: new Stroke({ color: '#ffffff', width: 3.5, lineDash: dash }), fill: new Fill({ color: withAlpha(colour, 0.3) }), zIndex: 2 }),
          new Style({ stroke: new Stroke({ color: colour, width: 1.5 }), zIndex: 2 }),
        ]
      : [
          new Style({ stroke: new Stroke({ color: 'rgba(0,0,0,0.75)', width: 3.5 }) }),
          new Style({ stroke: new Stroke({ color: colour, width: 1.75, lineDash: dash }), fill: new Fill({ color: withAlpha(colour, 0.12) }) }),
        ];
    cache.set(key, styles);
    return styles;
  };
}
