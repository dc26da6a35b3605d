import TileLayer from 'ol/layer/Tile.js';
import LayerGroup from 'ol/layer/Group.js';
import type RenderEvent from 'ol/render/Event.js';
import type { ProjectionLike } from 'ol/proj.js';
import type { OpenSite } from '../../app/site.ts';
import { dropReadAhead, layerSource, readAhead, stopReadAhead } from './rasterSource.ts';
import type DataTile from 'ol/source/DataTile.js';
import type { Extent } from 'ol/extent.js';
import { specKey, type CompareSpec, type LayerSpec } from './layerSpec.ts';

const FLICKER_MS = 700;
/** Layers kept ready (each with its tile cache); older ones are dropped. */
const KEPT_LAYERS = 4;
/**
 * Finished tiles each layer keeps (least recently used out): 4 layers x 192 tiles of
 * 256 x 256 RGBA is under 200 MB however far the user pans.
 */
const TILES_PER_LAYER = 192;

/**
 * The imagery of the map: one tile layer per layer spec, made when first shown and kept
 * for quick switching (a few, least recently used first out); a second date over it,
 * clipped by a swipe or flickered. The map holds `group`; nothing else here knows the map.
 */
export class ImageryLayers {
  readonly group = new LayerGroup();
  #site: OpenSite;
  #projection: ProjectionLike;
  #layers = new Map<string, TileLayer>();
  #main: TileLayer | null = null;
  #top: TileLayer | null = null;
  #swipe = 0.5;
  #flicker: ReturnType<typeof setInterval> | null = null;
  #clip = (event: RenderEvent) => this.#clipTop(event);
  #unclip = (event: RenderEvent) => this.#drawSwipeLine(event);

  constructor(site: OpenSite, projection: ProjectionLike) {
    this.#site = site;
    this.#projection = projection;
  }

  /** Shows a layer spec, and a second date over it when compared; a null spec keeps what is shown. */
  show(spec: LayerSpec | null, compare: CompareSpec | null): void {
    if (!spec) return;
    const main = this.#layer(spec);
    const top = compare ? this.#layer(compare.layer, 'ol-layer imagery-compare') : null;
    this.#stopFlicker();
    if (this.#top && this.#top !== top) this.#detachClip(this.#top);
    for (const layer of this.#layers.values()) {
      const shown = layer === main || layer === top;
      layer.setVisible(shown);
      const source = layer.getSource();
      if (!shown && source) dropReadAhead(source as DataTile);
    }
    main?.setZIndex(0);
    this.#main = main;
    this.#top = top;
    if (top && compare) {
      top.setZIndex(1);
      if (compare.mode === 'swipe') {
        this.#swipe = compare.position;
        this.#attachClip(top);
        top.changed();
      } else {
        this.#detachClip(top);
        let on = true;
        this.#flicker = setInterval(() => {
          on = !on;
          top.setVisible(on);
        }, FLICKER_MS);
      }
    }
  }

  /** Whether any imagery is shown yet (the map is not ready before it is). */
  get showing(): boolean {
    return this.#main !== null;
  }

  /** Where the swipe line is (0-1 of the map's width), or null when the dates are not swiped. */
  get swipePosition(): number | null {
    return this.#top && this.#flicker === null && this.#top.getVisible() ? this.#swipe : null;
  }

  /** Moves the swipe line at once (while it is dragged); the view state follows. */
  moveSwipe(position: number): void {
    this.#swipe = position;
    this.#top?.changed();
  }

  /**
   * Reads ahead the shown imagery over `extents` (nearest first) at `resolution`, beside
   * the view `shown`: the screens the user may move to next are made while the workers
   * are idle.
   */
  readAhead(extents: Extent[], resolution: number, shown: Extent): void {
    for (const layer of [this.#main, this.#top]) {
      const source = layer?.getSource();
      if (source) readAhead(source as DataTile, extents, resolution, shown);
    }
  }

  dispose(): void {
    this.#stopFlicker();
    for (const layer of this.#layers.values()) this.#close(layer);
    this.#layers.clear();
  }

  #close(layer: TileLayer): void {
    const source = layer.getSource();
    if (source) stopReadAhead(source as DataTile);
    source?.dispose();
    layer.dispose();
  }

  #layer(spec: LayerSpec, className = 'ol-layer imagery-layer'): TileLayer | null {
    const key = `${className}:${specKey(spec)}`;
    let layer = this.#layers.get(key);
    if (layer) {
      this.#layers.delete(key); // re-insert: most recently used last
      this.#layers.set(key, layer);
      return layer;
    }
    const scene = this.#site.scenes[spec.scene];
    const source = scene ? layerSource(scene, spec, this.#projection) : null;
    if (!source) return null;
    layer = new TileLayer({ source, visible: false, className, preload: 0, cacheSize: TILES_PER_LAYER });
    this.#layers.set(key, layer);
    this.group.getLayers().push(layer);
    this.#evict();
    return layer;
  }

  #evict(): void {
    for (const [key, layer] of this.#layers) {
      if (this.#layers.size <= KEPT_LAYERS) break;
      if (layer === this.#main || layer === this.#top) continue;
      this.#layers.delete(key);
      this.group.getLayers().remove(layer);
      this.#close(layer);
    }
  }

  #attachClip(layer: TileLayer): void {
    layer.un('prerender', this.#clip);
    layer.un('postrender', this.#unclip);
    layer.on('prerender', this.#clip);
    layer.on('postrender', this.#unclip);
  }

  #detachClip(layer: TileLayer): void {
    layer.un('prerender', this.#clip);
    layer.un('postrender', this.#unclip);
  }

  /** The second date shows left of the swipe line only. */
  #clipTop(event: RenderEvent): void {
    const context = event.context as CanvasRenderingContext2D | undefined;
    if (!context) return;
    const { width, height } = context.canvas;
    context.save();
    context.beginPath();
    context.rect(0, 0, Math.round(width * this.#swipe), height);
    context.clip();
  }

  /**
   * Ends the clip, and draws the swipe line so the edge between the dates is plain to
   * see, with a grip at its middle that says it can be dragged.
   */
  #drawSwipeLine(event: RenderEvent): void {
    const context = event.context as CanvasRenderingContext2D | undefined;
    if (!context) return;
    context.restore();
    const { width, height } = context.canvas;
    const x = Math.round(width * this.#swipe) + 0.5;
    const y = Math.round(height / 2);
    context.save();
    context.strokeStyle = 'rgba(255,255,255,0.9)';
    context.lineWidth = 1.5;
    context.beginPath();
    context.moveTo(x, 0);
    context.lineTo(x, height);
    context.stroke();
    context.fillStyle = 'rgba(20,24,28,0.85)';
    context.beginPath();
    context.roundRect(x - 9, y - 16, 18, 32, 5);
    context.fill();
    context.stroke();
    context.fillStyle = 'rgba(255,255,255,0.95)';
    for (const side of [-1, 1]) {
      context.beginPath();
      context.moveTo(x + side * 6, y);
      context.lineTo(x + side * 2, y - 5);
      context.lineTo(x + side * 2, y + 5);
      context.closePath();
      context.fill();
    }
    context.restore();
  }

  #stopFlicker(): void {
    if (this.#flicker !== null) clearInterval(this.#flicker);
    this.#flicker = null;
  }
}
