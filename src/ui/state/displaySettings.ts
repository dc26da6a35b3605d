import type { DisplaySettings } from '../../core/site/index.ts';
import type { StretchRule } from '../../core/render/bandSample.ts';
import type { ImageryView } from '../desk/ImageryView.svelte.ts';

// What was on screen when a tag was made, in words a reviewer reads later:
// the composite (with its bands), the stretch of each shown band, and the date.

function ruleText(rule: StretchRule, gamma: number): string {
  const base =
    rule.kind === 'percentile' ? `percentile ${rule.low}-${rule.high}`
    : rule.kind === 'minmax' ? 'min-max'
    : rule.kind === 'stddev' ? `mean ± ${rule.k} sd`
    : `manual ${rule.min}-${rule.max}`;
  return gamma === 1 ? base : `${base}, gamma ${gamma}`;
}

export function displaySettings(view: ImageryView): DisplaySettings {
  const ms = view.scene.ms;
  const bandName = (b: number) => ms?.bands[b]?.name ?? `band ${b + 1}`;
  const bands = view.compositeBands;
  let composite: string;
  if (view.display === 'pan') composite = 'panchromatic';
  else if (view.display === 'index') composite = `${view.index}${view.vegetationOnly ? ` above ${view.threshold}` : ''}`;
  else {
    const named = bands ? ` (${bands.map(bandName).join(', ')})` : '';
    composite = `${view.preset}${named}${view.display === 'sharpened' ? `, pan-sharpened ${view.method}` : ''}`;
  }
  const keys = view.stretchedKeys;
  const stretches = [...new Set(keys.map((key) => {
    const { rule, gamma } = view.stretchOf(key);
    return ruleText(rule, gamma);
  }))];
  const stretch = view.display === 'index' ? 'index colour ramp' : stretches.join('; ') || 'none';
  const compare = view.compare !== 'none' ? ` (with ${view.site.scenes[(view.sceneIndex + 1) % view.site.scenes.length]?.date} in ${view.compare})` : '';
  return { composite, stretch, date: `${view.scene.date}${compare}` };
}
