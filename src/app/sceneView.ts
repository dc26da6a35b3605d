import type { Raster } from '../imagery/Raster.ts';
import type { BandInfo, SceneView } from './site.ts';

/** A panchromatic raster as a scene shows it (its stretch comes from its own sample, on the desk). */
export function panchromaticView(raster: Raster): SceneView['pan'] {
  return { raster };
}

/**
 * A multispectral raster with its natural-colour composite, bands found by name. A
 * raster without red, green and blue gets its first three bands (or fewer, repeated)
 * and a note saying so, so it can still be seen.
 */
export function multispectralView(raster: Raster, bands: BandInfo[], notes: string[] = []): SceneView['ms'] {
  const find = (name: string) => bands.find((b) => b.name.toLowerCase() === name)?.index;
  const named = ['red', 'green', 'blue'].map(find);
  let rgb: [number, number, number];
  if (named.every((i) => i !== undefined)) rgb = named.map((i) => i! - 1) as [number, number, number];
  else {
    const n = raster.summary.bands;
    rgb = [0, Math.min(1, n - 1), Math.min(2, n - 1)];
    notes.push(`${raster.file.name}: its band table (${bands.map((b) => b.name).join(', ')}) has no red, green and blue, so the composite shows bands ${rgb.map((b) => b + 1).join(', ')}; choose others under Custom`);
  }
  return { raster, bands, naturalColour: { bands: rgb } };
}

/**
 * Starts reading the band samples the first view of a scene stretches by (the pan band
 * and the natural-colour bands, each from a small overview, in the render pool), so they
 * are ready or under way by the time the desk asks. Nothing waits for them here; a
 * failure is told when the desk asks again.
 */
export function startDefaultStretch(scene: SceneView): void {
  const reads = [
    ...(scene.pan ? [scene.pan.raster.sample(0)] : []),
    ...(scene.ms ? scene.ms.naturalColour.bands.map((band) => scene.ms!.raster.sample(band)) : []),
  ];
  for (const read of reads) read.catch(() => {});
}
