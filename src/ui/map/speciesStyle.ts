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
