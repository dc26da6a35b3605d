import ImageLayer from 'ol/layer/Image.js';
import ImageCanvasSource from 'ol/source/ImageCanvas.js';
import type { Extent } from '../../core/geometry/types.ts';
import { extentOfRings } from '../../core/geometry/measure.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import type { PatchPixels } from '../../core/pixels/patchPixels.ts';
import type { PurePixels } from '../state/PurePixels.svelte.ts';

// The pure pixels on the map: each kept multispectral pixel's footprint as a square,
// lightly filled and ringed in white over a dark rim so it reads on any imagery. The
// patch in hand shows them at every zoom, with the pixels it touches but the rule
// leaves out dashed; at close zoom every patch in view shows its own. One canvas for
// all (OpenLayers' ImageCanvas), redrawn when the patches, the rule or the view change.

/** Metres per screen pixel below which every patch in view shows its pure pixels. */
export const CLOSE_RESOLUTION_M = 0.25;
/** More patches than this in view and only the patch in hand is drawn (the view is not close). */
export const MOST_PATCHES_DRAWN = 600;

export interface PixelPatches {
  /** every patch's outline */
  outlines(): Iterable<MultiPolygonRings>;
  /** the patch in hand's outline, or null */
  selected(): MultiPolygonRings | null;
}

export class PurePixelLayer {
  readonly layer: ImageLayer<ImageCanvasSource>;
  readonly #source: ImageCanvasSource;
  #extents = new WeakMap<MultiPolygonRings, Extent>();

  constructor(private readonly patches: PixelPatches, private readonly pure: PurePixels) {
    this.#source = new ImageCanvasSource({
      ratio: 1.2,
      canvasFunction: (extent, resolution, pixelRatio, size) => this.#draw(extent, resolution, pixelRatio, size),
    });
    // Over the patch outlines (added later, by the editing tools), under the tools' sketches.
    this.layer = new ImageLayer({ source: this.#source, className: 'pure-pixels-layer', zIndex: 1, visible: false });
  }

  /** Redraws on the next frame (patches, selection, rule or visibility changed). */
  changed(): void {
    this.layer.setVisible(this.pure.shown);
    if (this.pure.shown) this.#source.changed();
  }

  #draw(extent: number[], resolution: number, pixelRatio: number, size: number[]): HTMLCanvasElement {
    const canvas = document.createElement('canvas');
    canvas.width = Math.max(1, Math.round(size[0]));
    canvas.height = Math.max(1, Math.round(size[1]));
    const context = canvas.getContext('2d')!;
    const grid = this.pure.grid();
    if (!grid || !this.pure.shown) return canvas;
    const scale = canvas.width / (extent[2] - extent[0]);
    const left = extent[0], top = extent[3];
    const square = (row: number, col: number): [number, number, number, number] => [
      (grid.originX + col * grid.pixelWidth - left) * scale,
      (top - (grid.originY - row * grid.pixelHeight)) * scale,
      grid.pixelWidth * scale,
      grid.pixelHeight * scale,
    ];
    const chosen = this.patches.selected();
    const drawn: PatchPixels[] = [];
    if (resolution <= CLOSE_RESOLUTION_M) {
      for (const outline of this.patches.outlines()) {
        if (outline === chosen || !this.#meets(outline, extent)) continue;
        const pixels = this.pure.of(outline);
        if (pixels) drawn.push(pixels);
        if (drawn.length > MOST_PATCHES_DRAWN) {
          drawn.length = 0;
          break;
        }
      }
    }
    const inHand = chosen ? this.pure.of(chosen) : null;
    if (inHand) drawn.push(inHand);

    // Pure pixels: a faint fill, a dark rim, a white ring.
    context.fillStyle = 'rgba(255, 255, 255, 0.2)';
    for (const p of drawn) for (let i = 0; i < p.rows.length; i++) context.fillRect(...square(p.rows[i], p.cols[i]));
    for (const [width, colour] of [[3, 'rgba(0, 0, 0, 0.75)'], [1.2, '#ffffff']] as const) {
      context.lineWidth = width * pixelRatio;
      context.strokeStyle = colour;
      context.beginPath();
      for (const p of drawn) for (let i = 0; i < p.rows.length; i++) context.rect(...square(p.rows[i], p.cols[i]));
      context.stroke();
    }
    // The patch in hand: pixels it touches that the rule leaves out, dashed.
    if (inHand) {
      const { row0, col0, width, fraction } = inHand.coverage;
      const kept = new Set<number>();
      for (let i = 0; i < inHand.rows.length; i++) kept.add((inHand.rows[i] - row0) * width + (inHand.cols[i] - col0));
      context.setLineDash([3 * pixelRatio, 3 * pixelRatio]);
      context.lineWidth = pixelRatio;
      context.strokeStyle = 'rgba(255, 255, 255, 0.7)';
      context.beginPath();
      for (let i = 0; i < fraction.length; i++) {
        if (fraction[i] > 0 && !kept.has(i)) context.rect(...square(row0 + Math.floor(i / width), col0 + (i % width)));
      }
      context.stroke();
    }
    return canvas;
  }

  #meets(outline: MultiPolygonRings, view: number[]): boolean {
    let e = this.#extents.get(outline);
    if (!e) this.#extents.set(outline, (e = extentOfRings(outline)));
    return e[0] <= view[2] && e[2] >= view[0] && e[1] <= view[3] && e[3] >= view[1];
  }
}
