import { gridOfSummary } from '../../core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { patchPixels } from '../../core/pixels/patchPixels.ts';
import type { PixelRule } from '../../core/pixels/rule.ts';
import { poolPixels, pooledSpectrum, type PooledPixels, type PooledSpectrum } from '../../core/rulings/speciesSpectrum.ts';
import type { TiffSummary } from '../../core/tiff/inspectTiff.ts';
import { inlineRunner, type JobRunner } from '../jobs/jobWorker.ts';

// The spectrum of each species across the site, for reading a disputed patch against:
// the pure pixels (core/pixels, the same rule as the training set) of every patch
// settled as the species, read from the multispectral raster a window per patch, pooled
// and summarised in a worker (core/rulings/speciesSpectrum.ts). A species' spectrum is
// kept while its settled patches and their outlines stay the same, so stepping through
// the queue reads each species once.

/** What the pixels are read from: a multispectral raster (src/imagery's Raster fits). */
export interface PixelSource {
  summary: Pick<TiffSummary, 'origin' | 'pixelSize' | 'width' | 'height' | 'bands' | 'nodata' | 'epsg'>;
  readWindow(level: number, box: { x0: number; y0: number; x1: number; y1: number }, bands: number[], signal?: AbortSignal): Promise<Float32Array[]>;
}

export interface SpectrumJob {
  pooled: PooledPixels;
  resamples: number;
  seed: number;
}

export type SpectrumRunner = JobRunner<SpectrumJob, PooledSpectrum>;

/** The job the worker runs, and what tests run inline. */
export const spectrumOfJob = (job: SpectrumJob): PooledSpectrum => pooledSpectrum(job.pooled, { resamples: job.resamples, seed: job.seed });

export const inlineSpectra: SpectrumRunner = inlineRunner(spectrumOfJob);

export interface SpeciesReference {
  species: string;
  /** patches settled as the species */
  patches: number;
  /** their pooled spectrum; `spectrum.pixels` is 0 when none holds a pure pixel */
  spectrum: PooledSpectrum;
  /** pure pixels left out for holding no data */
  noData: number;
}

/** Patches read at once: enough to keep the decoders busy, few enough to stop soon when cancelled. */
const READ_AHEAD = 8;

/** The pure pixels of each outline under the rule: every band's value, no-data pixels left out. */
export async function readPurePixels(source: PixelSource, outlines: readonly MultiPolygonRings[], rule: PixelRule, signal?: AbortSignal): Promise<{ pooled: PooledPixels; noData: number }> {
  const { bands, nodata } = source.summary;
  const grid = gridOfSummary(source.summary);
  const all = Array.from({ length: bands }, (_, i) => i);
  const perPatch: number[][][] = [];
  let noData = 0;
  const readOne = async (outline: MultiPolygonRings): Promise<number[][]> => {
    const chosen = patchPixels(outline, grid, rule);
    if (chosen.rows.length === 0) return [];
    const { row0, col0, width, height } = chosen.coverage;
    const values = await source.readWindow(0, { x0: col0, y0: row0, x1: col0 + width, y1: row0 + height }, all, signal);
    const pixels: number[][] = [];
    for (let i = 0; i < chosen.rows.length; i++) {
      const at = (chosen.rows[i] - row0) * width + (chosen.cols[i] - col0);
      const pixel = values.map((band) => band[at]);
      if (pixel.some((v) => Number.isNaN(v) || v === nodata)) noData++;
      else pixels.push(pixel);
    }
    return pixels;
  };
  for (let i = 0; i < outlines.length; i += READ_AHEAD) {
    signal?.throwIfAborted();
    perPatch.push(...(await Promise.all(outlines.slice(i, i + READ_AHEAD).map(readOne))));
  }
  return { pooled: poolPixels(bands, perPatch), noData };
}

const ruleKey = (rule: PixelRule) => (rule.kind === 'inside' ? `inside:${rule.buffer}` : rule.kind === 'cover' ? `cover:${rule.minCover}` : 'centre');

interface Kept {
  outlines: readonly MultiPolygonRings[];
  result: Promise<SpeciesReference>;
}

/**
 * Species spectra of one site, kept per raster, species and rule while the species'
 * settled outlines are the very same ones (outlines are replaced, never changed in place,
 * when a patch is edited). Work started stops only on dispose: a species asked for
 * again while stepping through the queue is then ready.
 */
export class SpeciesSpectra {
  #kept = new WeakMap<PixelSource, Map<string, Kept>>();
  #stop = new AbortController();

  constructor(
    private readonly runner: SpectrumRunner,
    private readonly options: { resamples: number; seed: number } = { resamples: 1000, seed: 1 },
  ) {}

  /** The spectrum of `species` over its settled patches' outlines. */
  of(source: PixelSource, species: string, outlines: readonly MultiPolygonRings[], rule: PixelRule): Promise<SpeciesReference> {
    let bySource = this.#kept.get(source);
    if (!bySource) this.#kept.set(source, (bySource = new Map()));
    const key = `${species}|${ruleKey(rule)}`;
    const kept = bySource.get(key);
    if (kept && sameOutlines(kept.outlines, outlines)) return kept.result;
    const result = this.#work(source, species, outlines, rule);
    bySource.set(key, { outlines, result });
    // A failed read is not kept: the next request tries again.
    result.catch(() => {
      if (bySource.get(key)?.result === result) bySource.delete(key);
    });
    return result;
  }

  async #work(source: PixelSource, species: string, outlines: readonly MultiPolygonRings[], rule: PixelRule): Promise<SpeciesReference> {
    const signal = this.#stop.signal;
    const { pooled, noData } = await readPurePixels(source, outlines, rule, signal);
    const spectrum = await this.runner.run({ pooled, ...this.options }, signal);
    return { species, patches: outlines.length, spectrum, noData };
  }

  dispose(): void {
    this.#stop.abort();
  }
}

function sameOutlines(a: readonly MultiPolygonRings[], b: readonly MultiPolygonRings[]): boolean {
  return a.length === b.length && a.every((o, i) => o === b[i]);
}
