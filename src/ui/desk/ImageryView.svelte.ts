import type { OpenSite, SceneView } from '../../app/site.ts';
import { defaultRule, limitsFor, percentileOfSorted, type BandSample, type StretchRule } from '../../core/render/bandSample.ts';
import { bandForRole, indexBands, indexDefinitions, type IndexName } from '../../core/render/indices.ts';
import { panGain, type SharpenMethod } from '../../core/render/pansharpen.ts';
import type { StretchLimits } from '../../core/render/stretch.ts';
import type { Raster } from '../../imagery/Raster.ts';
import type { ImageryMode } from '../map/imageryMode.ts';
import type { CompareSpec, LayerSpec } from '../map/layerSpec.ts';

/** What the map shows: the pan band, a composite, the pan-sharpened composite, or an index. */
export type Display = 'pan' | 'composite' | 'sharpened' | 'index';
export type CompositePreset = 'natural' | 'infrared' | 'custom';
export type CompareMode = 'none' | 'swipe' | 'flicker';

/** Index values at the ends of the colour ramp (common practice for vegetation). */
export const indexRanges: Record<IndexName, [number, number]> = { ndvi: [-0.2, 0.9], ndre: [-0.1, 0.6], gndvi: [-0.1, 0.8] };

interface BandStretch {
  rule: StretchRule;
  gamma: number;
}

/**
 * How the imagery is shown on the desk: date, view, composite bands, stretch per band,
 * pan-sharpening method, index and mask, a second date to compare. Shared by the map and
 * the panels. Band samples are read once per band (from an overview, in the worker pool);
 * every stretch rule is then computed from them without reading again.
 */
export class ImageryView {
  sceneIndex = $state(0);
  display = $state<Display>('composite');
  preset = $state<CompositePreset>('natural');
  customBands = $state<[number, number, number]>([0, 0, 0]);
  method = $state<SharpenMethod>('brovey');
  index = $state<IndexName>('ndvi');
  vegetationOnly = $state(false);
  threshold = $state(0.3);
  compare = $state<CompareMode>('none');
  swipe = $state(0.5);
  /**
   * Stretch per date and band, by `<date index>|<band key>` (band key 'pan' or
   * 'ms:<0-based band>'): each date keeps its own, so a late-season scene is not shown
   * through the early one's limits.
   */
  stretches = $state<Record<string, BandStretch>>({});
  /** Samples as they arrive, by scene and band key. */
  samples = $state.raw<Readonly<Record<string, BandSample>>>({});
  /** A message when the chosen view cannot be shown (a band the table lacks, a failed read). */
  problem = $state<string | null>(null);
  /** Tiles that could not be shown (a damaged block in the middle of a file): the latest message and the count. */
  tileProblem = $state<string | null>(null);
  /** Bumped when the user edits a band table, so what reads the tables reads them again. */
  tableVersion = $state(0);
  readonly site: OpenSite;
  /** Sample reads under way, by scene and band key (not shown, so not reactive). */
  #loading: Record<string, boolean> = {};
  #viewport: { extent: number[]; resolution: number } | null = null;

  constructor(site: OpenSite) {
    this.site = site;
    const first = site.scenes[0];
    if (!first.ms) this.display = 'pan';
    if (first.ms) this.customBands = [...first.ms.naturalColour.bands];
    for (const scene of site.scenes) {
      for (const raster of [scene.pan?.raster, scene.ms?.raster]) {
        raster?.onProblem((message, count) => {
          this.tileProblem = count === 1 ? `A tile could not be shown: ${message}` : `${count} tiles could not be shown; the latest: ${message}`;
        });
      }
    }
    this.#load();
  }

  get scene(): SceneView {
    return this.site.scenes[this.sceneIndex];
  }

  /** The older two-way mode, kept for callers that only tell pan from colour. */
  get mode(): ImageryMode {
    return this.display === 'pan' ? 'pan' : 'natural';
  }

  /** The three displayed multispectral bands (0-based), or null when the band table cannot give them. */
  get compositeBands(): [number, number, number] | null {
    void this.tableVersion;
    const ms = this.scene.ms;
    if (!ms) return null;
    if (this.preset === 'natural') {
      const named = (['red', 'green', 'blue'] as const).map((role) => bandForRole(ms.bands, role));
      return named.every((b) => b !== null) ? (named as [number, number, number]) : ms.naturalColour.bands;
    }
    if (this.preset === 'custom') return this.customBands;
    const roles = (['nir', 'red', 'green'] as const).map((role) => bandForRole(ms.bands, role));
    return roles.every((b) => b !== null) ? (roles as [number, number, number]) : null;
  }

  /** Bands whose stretch the current view uses, by key. */
  get stretchedKeys(): string[] {
    if (this.display === 'pan') return this.scene.pan ? ['pan'] : [];
    if (this.display === 'index') return [];
    return (this.compositeBands ?? []).map((b) => `ms:${b}`);
  }

  /** A band's stretch on a date (by default the date shown): its rule and gamma. */
  stretchOf(key: string, sceneIndex = this.sceneIndex): BandStretch {
    return this.stretches[`${sceneIndex}|${key}`] ?? { rule: defaultRule, gamma: 1 };
  }

  rasterOf(key: string, scene = this.scene): Raster | null {
    return key === 'pan' ? (scene.pan?.raster ?? null) : (scene.ms?.raster ?? null);
  }

  sampleOf(key: string, sceneIndex = this.sceneIndex): BandSample | null {
    return this.samples[`${sceneIndex}|${key}`] ?? null;
  }

  /**
   * Display limits of a band on a date (by default the date shown) under that date's
   * rule, from that date's own sample; null while the sample is being read.
   */
  limitsOf(key: string, sceneIndex = this.sceneIndex): StretchLimits | null {
    const sample = this.sampleOf(key, sceneIndex);
    if (!sample) return null;
    const { rule, gamma } = this.stretchOf(key, sceneIndex);
    try {
      return limitsFor(sample, rule, gamma);
    } catch {
      return null;
    }
  }

  /** The layer the map shows now; null while its samples are read or when it cannot be shown. */
  get layer(): LayerSpec | null {
    return this.#layerFor(this.sceneIndex);
  }

  /**
   * The view, or the other date compared with it, waits for its stretch samples (not a
   * view that cannot be shown): the map shows what it showed before meanwhile.
   */
  get waiting(): boolean {
    if (this.problem !== null) return false;
    const missing = (scene: number) => this.stretchedKeys.some((key) => this.sampleOf(key, scene) === null);
    if (this.layer === null && missing(this.sceneIndex)) return true;
    if (this.compare === 'none' || this.site.scenes.length < 2) return false;
    const other = (this.sceneIndex + 1) % this.site.scenes.length;
    return this.compareLayer === null && missing(other);
  }

  /** The other date over this one, when comparing. */
  get compareLayer(): CompareSpec | null {
    if (this.compare === 'none' || this.site.scenes.length < 2) return null;
    const other = (this.sceneIndex + 1) % this.site.scenes.length;
    const layer = this.#layerFor(other);
    return layer ? { mode: this.compare, layer, position: this.swipe } : null;
  }

  #layerFor(scene: number): LayerSpec | null {
    void this.tableVersion;
    const s = this.site.scenes[scene];
    const limits = (keys: string[]) => {
      const found = keys.map((k) => this.limitsOf(k, scene));
      return found.every((l) => l !== null) ? (found as StretchLimits[]) : null;
    };
    if (this.display === 'pan') {
      const l = s.pan ? limits(['pan']) : null;
      return l ? { kind: 'pan', scene, limits: l[0] } : null;
    }
    if (this.display === 'index') {
      if (!s.ms) return null;
      const found = indexBands(s.ms.bands, this.index);
      if ('problem' in found) return null;
      const [low, high] = indexRanges[this.index];
      return { kind: 'index', scene, index: this.index, a: found.a, b: found.b, low, high, threshold: this.vegetationOnly ? this.threshold : null };
    }
    const bands = this.compositeBands;
    const l = bands ? limits(bands.map((b) => `ms:${b}`)) : null;
    if (!bands || !l) return null;
    if (this.display === 'sharpened') {
      if (!s.pan) return null;
      return { kind: 'sharpened', scene, method: this.method, bands, limits: l, gain: this.#gain(bands, scene) };
    }
    return { kind: 'bands', scene, bands, limits: l };
  }

  /** Pan scaled to the composite's mean intensity on a date, from that date's overview samples. */
  #gain(bands: number[], scene: number): number {
    const pan = this.sampleOf('pan', scene);
    const ms = bands.map((b) => this.sampleOf(`ms:${b}`, scene));
    if (!pan || ms.some((s) => !s)) return 1;
    return panGain(pan.mean, ms.reduce((sum, s) => sum + s!.mean, 0) / ms.length);
  }

  // --- user intent ---

  show(display: Display): void {
    const s = this.scene;
    if ((display === 'pan' && !s.pan) || (display !== 'pan' && !s.ms) || (display === 'sharpened' && !s.pan)) return;
    this.display = display;
    this.problem = display === 'index' && s.ms ? this.#indexProblem() : display !== 'pan' && !this.compositeBands ? this.#compositeProblem() : null;
    this.#load();
  }

  choosePreset(preset: CompositePreset): void {
    this.preset = preset;
    if (this.display === 'pan' || this.display === 'index') this.display = 'composite';
    this.problem = this.compositeBands ? null : this.#compositeProblem();
    this.#load();
  }

  setCustomBand(channel: 0 | 1 | 2, band: number): void {
    const next = [...this.customBands] as [number, number, number];
    next[channel] = band;
    this.customBands = next;
    this.preset = 'custom';
    this.#load();
  }

  /**
   * Edits one band of this date's band table (name, centre wavelength in nm). Returns a
   * message when the edit is refused: an empty name, a name another band has, or a
   * wavelength outside 300-2500 nm.
   */
  editBand(band: number, change: { name?: string; centre_nm?: number | null }): string | null {
    const table = this.scene.ms?.bands;
    if (!table || !table[band]) return `there is no band ${band + 1}`;
    const name = change.name !== undefined ? change.name.trim() : table[band].name;
    if (!name) return `band ${band + 1} needs a name`;
    if (table.some((b, i) => i !== band && b.name.toLowerCase() === name.toLowerCase())) return `another band is already called ${name}`;
    const nm = change.centre_nm !== undefined ? change.centre_nm : table[band].centre_nm;
    if (nm !== null && !(nm >= 300 && nm <= 2500)) return `a centre wavelength of ${nm} nm is outside 300-2500 nm`;
    table[band] = { ...table[band], name, centre_nm: nm };
    this.tableVersion++;
    this.problem = this.display === 'index' ? this.#indexProblem() : this.compositeBands ? null : this.#compositeProblem();
    this.#load();
    return null;
  }

  chooseIndex(index: IndexName): void {
    this.index = index;
    this.display = 'index';
    this.problem = this.#indexProblem();
  }

  /** Changes a band's stretch on a date (by default the date shown); other dates keep theirs. */
  setStretch(key: string, change: Partial<BandStretch>, sceneIndex = this.sceneIndex): void {
    this.stretches = { ...this.stretches, [`${sceneIndex}|${key}`]: { ...this.stretchOf(key, sceneIndex), ...change } };
  }

  /** One rule for every band the view shows, on the date shown. */
  setRuleForShown(rule: StretchRule): void {
    for (const key of this.stretchedKeys) this.setStretch(key, { rule });
  }

  setGammaForShown(gamma: number): void {
    for (const key of this.stretchedKeys) this.setStretch(key, { gamma });
  }

  nextDate(): void {
    this.sceneIndex = (this.sceneIndex + 1) % this.site.scenes.length;
    this.#load();
  }

  chooseDate(index: number): void {
    this.sceneIndex = index;
    this.#load();
  }

  toggleCompare(mode: 'swipe' | 'flicker'): void {
    if (this.site.scenes.length < 2) return;
    this.compare = this.compare === mode ? 'none' : mode;
    this.#load();
  }

  /** Where the map is now: the extent and resolution "stretch to what is on screen" uses. */
  setViewport(extent: number[], resolution: number): void {
    this.#viewport = { extent, resolution };
  }

  /**
   * Manual limits per shown band from the 2-98 % of the pixels on screen: for the date
   * shown, and for the compared date from its own pixels.
   */
  async stretchToScreen(): Promise<void> {
    const viewport = this.#viewport;
    if (!viewport) return;
    const dates = [this.sceneIndex];
    if (this.compare !== 'none' && this.site.scenes.length > 1) dates.push((this.sceneIndex + 1) % this.site.scenes.length);
    try {
      await Promise.all(dates.flatMap((date) => this.stretchedKeys.map(async (key) => {
        const raster = this.rasterOf(key, this.site.scenes[date]);
        if (!raster) return;
        const where = screenWindow(raster, viewport.extent, viewport.resolution);
        if (!where) return;
        const sample = await raster.sample(key === 'pan' ? 0 : Number(key.slice(3)), where);
        if (sample.sorted.length === 0) return;
        const min = percentileOfSorted(sample.sorted, 2), max = percentileOfSorted(sample.sorted, 98);
        this.setStretch(key, { rule: { kind: 'manual', min, max: max > min ? max : min + 1 } }, date);
      })));
    } catch (error) {
      this.problem = `Could not read the pixels on screen: ${(error as Error).message}`;
    }
  }

  /** Single-key shortcuts of the imagery (listed in src/ui/shortcuts.ts); true when the key was one. */
  handleKey(key: string): boolean {
    switch (key) {
      case 'p': this.show('pan'); break;
      case 'n': this.choosePreset('natural'); this.show('composite'); break;
      case 'c': this.choosePreset('infrared'); this.show('composite'); break;
      case 's': this.show('sharpened'); break;
      case 'v': this.show('index'); break;
      case 'm': this.vegetationOnly = !this.vegetationOnly; this.show('index'); break;
      case 'd': this.nextDate(); break;
      case 'w': this.toggleCompare('swipe'); break;
      case 'b': this.toggleCompare('flicker'); break;
      case 'e': void this.stretchToScreen(); break;
      default: return false;
    }
    return true;
  }

  #indexProblem(): string | null {
    const ms = this.scene.ms;
    if (!ms) return 'This scene has no multiband raster for an index.';
    const found = indexBands(ms.bands, this.index);
    return 'problem' in found ? `${ms.raster.file.name}: ${found.problem}.` : null;
  }

  #compositeProblem(): string {
    const ms = this.scene.ms;
    return ms ? `${ms.raster.file.name}: its band table (${ms.bands.map((b) => b.name).join(', ')}) has no near-infrared, red and green bands for colour infrared.` : 'This scene has no multiband raster.';
  }

  /** Reads the samples of every band of this date (the inspector shows every band stretched). */
  loadAllSamples(): void {
    this.#load(true);
  }

  /** Reads the samples the current view (and the compared date) needs, once each. */
  #load(all = false): void {
    const keys = [...this.stretchedKeys];
    if (all) {
      if (this.scene.pan) keys.push('pan');
      for (let b = 0; b < (this.scene.ms?.bands.length ?? 0); b++) keys.push(`ms:${b}`);
    }
    if (this.display === 'sharpened') keys.push('pan');
    const scenes = [this.sceneIndex];
    if (this.compare !== 'none' && this.site.scenes.length > 1) scenes.push((this.sceneIndex + 1) % this.site.scenes.length);
    for (const scene of scenes) {
      for (const key of keys) {
        const id = `${scene}|${key}`;
        if (this.samples[id] || this.#loading[id]) continue;
        const raster = this.rasterOf(key, this.site.scenes[scene]);
        if (!raster) continue;
        this.#loading[id] = true;
        raster.sample(key === 'pan' ? 0 : Number(key.slice(3)))
          .then((sample) => {
            this.samples = { ...this.samples, [id]: sample };
          })
          .catch((error: Error) => {
            if (error.name !== 'AbortError') this.problem = error.message;
          })
          .finally(() => delete this.#loading[id]);
      }
    }
  }
}

/** The level and pixel box of a raster under the screen, at most about 1024 x 1024 pixels. */
function screenWindow(raster: Raster, extent: number[], resolution: number) {
  let level = raster.levelFor(resolution);
  const box = () => {
    const res = raster.resolution(level);
    const [ox, oy] = raster.summary.origin;
    return {
      x0: Math.max(0, Math.floor((extent[0] - ox) / res)), x1: Math.min(raster.summary.levels[level].width, Math.ceil((extent[2] - ox) / res)),
      y0: Math.max(0, Math.floor((oy - extent[3]) / res)), y1: Math.min(raster.summary.levels[level].height, Math.ceil((oy - extent[1]) / res)),
    };
  };
  let b = box();
  while ((b.x1 - b.x0) * (b.y1 - b.y0) > 1 << 20 && level < raster.levelCount - 1) {
    level++;
    b = box();
  }
  return b.x1 > b.x0 && b.y1 > b.y0 ? { level, box: b } : null;
}

export { indexDefinitions };
