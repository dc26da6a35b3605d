import type { SiteState } from '../site/index.ts';
import { BlindError } from './BlindError.ts';
import { referenceCalls } from './referenceCall.ts';
import { stratifiedSample, type StratumDraw } from './stratifiedSample.ts';

// Which patches get a second, blind look. Each rule works on the reference call of a
// patch (its newest non-blind tag, see referenceCall.ts).

export type PatchSelection =
  /** every patch whose reference call is "unsure" */
  | { kind: 'unsure' }
  /** every patch whose reference call is one of these roster codes (or reserved classes) */
  | { kind: 'species'; species: readonly string[] }
  /** a random sample of `size` tagged patches, stratified by species, reproducible by `seed` */
  | { kind: 'sample'; size: number; seed: number }
  /** exactly these patches */
  | { kind: 'picked'; patchIds: readonly string[] };

export interface SelectedPatches {
  /** in code-point order; the pass shuffles them (see shuffledOrder) */
  patchIds: string[];
  /** for a sample: how many were drawn of each species */
  strata: StratumDraw[] | null;
  /** one line saying what was chosen */
  summary: string;
}

const byCodePoint = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
const plural = (n: number, one: string, many = `${one}es`) => `${n} ${n === 1 ? one : many}`;

export function selectPatches(state: SiteState, selection: PatchSelection): SelectedPatches {
  const calls = referenceCalls(state);
  const chosen = (ids: string[], summary: string, strata: StratumDraw[] | null = null): SelectedPatches => {
    if (ids.length === 0) throw new BlindError(`No patch fits: ${summary}.`);
    return { patchIds: [...ids].sort(byCodePoint), strata, summary: `${plural(ids.length, 'patch')}: ${summary}` };
  };
  switch (selection.kind) {
    case 'unsure': {
      const ids = [...calls.values()].filter((t) => t.confidence === 'unsure' && state.patches.has(t.patchId)).map((t) => t.patchId);
      return chosen(ids, 'every patch last tagged unsure');
    }
    case 'species': {
      if (selection.species.length === 0) throw new BlindError('Choose at least one species.');
      const wanted = new Set(selection.species);
      const ids = [...calls.values()].filter((t) => wanted.has(t.species) && state.patches.has(t.patchId)).map((t) => t.patchId);
      return chosen(ids, `every patch last tagged ${[...wanted].join(' or ')}`);
    }
    case 'sample': {
      const { size, seed } = selection;
      if (!Number.isInteger(size) || size < 1) throw new BlindError(`The sample size must be a whole number of at least 1, not ${size}.`);
      if (!Number.isSafeInteger(seed) || seed < 0) throw new BlindError(`The seed must be a whole number of at least 0, not ${seed}.`);
      const bySpecies = new Map<string, string[]>();
      for (const tag of calls.values()) {
        if (!state.patches.has(tag.patchId)) continue;
        const list = bySpecies.get(tag.species);
        if (list) list.push(tag.patchId);
        else bySpecies.set(tag.species, [tag.patchId]);
      }
      const total = [...bySpecies.values()].reduce((s, l) => s + l.length, 0);
      if (total === 0) throw new BlindError('No patch is tagged yet, so there is nothing to sample by species.');
      const sample = stratifiedSample([...bySpecies].map(([key, ids]) => ({ key, ids })), size, seed);
      const note = size > total ? ` (all ${total} tagged patches: fewer than the ${size} asked for)` : '';
      return chosen(sample.ids, `a sample stratified by species, seed ${seed}${note}`, sample.strata);
    }
    case 'picked': {
      const missing = selection.patchIds.filter((id) => !state.patches.has(id));
      if (missing.length) throw new BlindError(`No patch ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? ` and ${missing.length - 5} more` : ''} in this site.`);
      return chosen([...new Set(selection.patchIds)], 'picked by hand');
    }
  }
}
