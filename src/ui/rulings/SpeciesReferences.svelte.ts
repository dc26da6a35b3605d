import { SpeciesSpectra, type PixelSource, type SpeciesReference } from '../../app/rulings/speciesSpectra.ts';
import { spectraInWorker } from '../../app/rulings/spectraRunner.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { describeRule, type PixelRule } from '../../core/pixels/rule.ts';
import type { BandSpectrum } from '../../core/render/spectrum.ts';

// The species spectra shown beside the patch in hand on the Rulings page: one line per
// species the calls name, filled in as each is worked out (in a worker, kept per
// species while its settled patches stay the same), with a plain note when a species
// has no pure pixel to show.

export interface ReferenceLine {
  key: string;
  label: string;
  colour: string;
  /** null while it is worked out, or when there is nothing to draw */
  bands: BandSpectrum[] | null;
  /** pixels and patches behind it, or why there is no line */
  note: string;
}

export interface WantedSpecies {
  species: string;
  name: string;
  colour: string;
  outlines: readonly MultiPolygonRings[];
}

export class SpeciesReferences {
  lines = $state.raw<ReferenceLine[]>([]);
  #spectra = new SpeciesSpectra(spectraInWorker());
  #asked = 0;

  /** Shows the spectra of these species on this raster under the rule; an older request is dropped. */
  show(source: PixelSource | null, wanted: readonly WantedSpecies[], rule: PixelRule | null): void {
    const asked = ++this.#asked;
    if (!source || !rule) {
      this.lines = [];
      return;
    }
    const label = (w: WantedSpecies) => `${w.species} ${w.name}: median of its settled patches`;
    this.lines = wanted.map((w) => ({ key: w.species, label: label(w), colour: w.colour, bands: null, note: w.outlines.length ? 'working it out…' : 'no settled patch of this species yet' }));
    for (const w of wanted) {
      if (!w.outlines.length) continue;
      this.#spectra.of(source, w.species, w.outlines, rule).then(
        (ref) => this.#fill(asked, w.species, ref.spectrum.pixels ? ref.spectrum.bands : null, noteOf(ref, rule)),
        (error: Error) => { if (error.name !== 'AbortError') this.#fill(asked, w.species, null, error.message); },
      );
    }
  }

  #fill(asked: number, species: string, bands: BandSpectrum[] | null, note: string): void {
    if (asked !== this.#asked) return;
    this.lines = this.lines.map((l) => (l.key === species ? { ...l, bands, note } : l));
  }

  dispose(): void {
    this.#asked++;
    this.#spectra.dispose();
  }
}

function noteOf(ref: SpeciesReference, rule: PixelRule): string {
  const { pixels, patches: withPixels } = ref.spectrum;
  const noData = ref.noData ? `; ${ref.noData} no-data pixel(s) left out` : '';
  if (pixels === 0) return `none of its ${ref.patches} settled patch(es) holds a pure pixel (${describeRule(rule)})${noData}`;
  return `${pixels} pure px in ${withPixels} of ${ref.patches} settled patch(es)${noData}`;
}
