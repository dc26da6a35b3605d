import ImageLayer from 'ol/layer/Image.js';
import ImageCanvasSource from 'ol/source/ImageCanvas.js';
import type { PatchFeatureData } from './patchLayer.ts';
import type { SpeciesLook } from './speciesStyle.ts';
import { burnOutline, packColour } from './rasterOutlines.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';

/**
 * Metres per screen pixel beyond which the patches are drawn by the overview below
 * instead of as vector features: a crown is then a few pixels, and thousands of outline
 * paths with halos cost hundreds of milliseconds per redraw.
 */
export const OVERVIEW_RESOLUTION_M = 0.5;

const UNTAGGED = '#f4f4f4';

/**
 * The far view of the stored patches: one canvas, every patch burnt into its pixels in
 * its species colour (rasterOutlines.ts), so a redraw of 10,000 patches is one image.
 * The canvas covers more than the screen (OpenLayers' ratio), so short pans reuse it.
 */
export class PatchOverview {
  readonly layer: ImageLayer<ImageCanvasSource>;
  readonly #source: ImageCanvasSource;
  #colours = new Map<string, string>();

  constructor(
    private readonly patches: () => Iterable<PatchFeatureData>,
    private readonly shown: (data: PatchFeatureData) => boolean,
    looks: readonly SpeciesLook[],
  ) {
    this.setLooks(looks);
    this.#source = new ImageCanvasSource({
      ratio: 1.5,
      canvasFunction: (extent, resolution, pixelRatio, size) => this.#draw(extent, resolution, pixelRatio, size),
    });
    this.layer = new ImageLayer({ source: this.#source, minResolution: OVERVIEW_RESOLUTION_M, className: 'patches-layer stored-patches-layer' });
  }

  setLooks(looks: readonly SpeciesLook[]): void {
    this.#colours = new Map(looks.map((l) => [l.code, l.colour]));
  }

  /** Redraws on the next frame (patches, looks or visibility changed). */
  changed(): void {
    this.#source.changed();
  }

  #draw(extent: number[], resolution: number, pixelRatio: number, size: number[]): HTMLCanvasElement {
    const canvas = document.createElement('canvas');
    // OpenLayers hands a size in fractional pixels; rows must be whole pixels wide.
    canvas.width = Math.max(1, Math.round(size[0]));
    canvas.height = Math.max(1, Math.round(size[1]));
    const { width, height } = canvas;
    const context = canvas.getContext('2d')!;
    const image = context.createImageData(width, height);
    const pixels = new Uint32Array(image.data.buffer);
    const frame = { left: extent[0], top: extent[3], resolution: (extent[2] - extent[0]) / width, width, height };
    const rim = packColour('#000000', 170);
    const packed = new Map<string, number>();
    const selected: PatchFeatureData[] = [];
    for (const data of this.patches()) {
      if (!this.shown(data)) continue;
      if (data.look.selected) selected.push(data);
      const colour = data.look.species ? (this.#colours.get(data.look.species) ?? '#bbbbbb') : UNTAGGED;
      let fill = packed.get(colour);
      if (fill === undefined) packed.set(colour, (fill = packColour(colour, 255)));
      burnOutline(pixels, frame, data.geometry as MultiPolygonRings, fill, rim);
    }
    context.putImageData(image, 0, 0);
    // The patch in hand: a white ring wide enough to find at any zoom.
    for (const data of selected) {
      const [x, y] = data.geometry[0][0][0];
      context.beginPath();
      context.arc((x - frame.left) / frame.resolution, (frame.top - y) / frame.resolution, 7 * pixelRatio, 0, 2 * Math.PI);
      context.lineWidth = 2.5 * pixelRatio;
      context.strokeStyle = '#ffffff';
      context.stroke();
    }
    return canvas;
  }
}
