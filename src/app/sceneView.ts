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

/** A multispectral raster with its natural-colour composite, bands found by name. */
export async function multispectralView(raster: Raster, bands: BandInfo[], signal?: AbortSignal): Promise<SceneView['ms']> {
  const find = (name: string) => {
    const band = bands.find((b) => b.name.toLowerCase() === name);
    if (!band) throw new Error(`${raster.file.name}: no ${name} band in its band table, so no natural-colour view`);
    return band.index - 1;
  };
  const rgb: [number, number, number] = [find('red'), find('green'), find('blue')];
  const [r, g, b] = await Promise.all(rgb.map((band) => defaultStretch(raster, band, signal)));
  return { raster, bands, naturalColour: { bands: rgb, limits: [r, g, b] } };
}
