import type { Raster } from '../imagery/Raster.ts';
import type { StretchLimits } from '../core/render/stretch.ts';
import type { BandInfo, SceneView } from './site.ts';

async function defaultStretch(raster: Raster, band: number, signal?: AbortSignal): Promise<StretchLimits> {
  return { ...(await raster.bandLimits(band, 2, 98, signal)), gamma: 1 };
}

/** A panchromatic raster with its default 2-98 % stretch. */
export async function panchromaticView(raster: Raster, signal?: AbortSignal): Promise<SceneView['pan']> {
  return { raster, limits: await defaultStretch(raster, 0, signal) };
}

/**
 * A multispectral raster with its natural-colour composite, bands found by name. A
 * raster without red, green and blue gets its first three bands (or fewer, repeated)
 * and a note saying so, so it can still be seen.
 */
export async function multispectralView(raster: Raster, bands: BandInfo[], signal?: AbortSignal, notes: string[] = []): Promise<SceneView['ms']> {
  const find = (name: string) => bands.find((b) => b.name.toLowerCase() === name)?.index;
  const named = ['red', 'green', 'blue'].map(find);
  let rgb: [number, number, number];
  if (named.every((i) => i !== undefined)) rgb = named.map((i) => i! - 1) as [number, number, number];
  else {
    const n = raster.summary.bands;
    rgb = [0, Math.min(1, n - 1), Math.min(2, n - 1)];
    notes.push(`${raster.file.name}: its band table (${bands.map((b) => b.name).join(', ')}) has no red, green and blue, so the composite shows bands ${rgb.map((b) => b + 1).join(', ')}; choose others under Custom`);
  }
  const [r, g, b] = await Promise.all(rgb.map((band) => defaultStretch(raster, band, signal)));
  return { raster, bands, naturalColour: { bands: rgb, limits: [r, g, b] } };
}
