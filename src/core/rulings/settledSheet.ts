import { cohenKappa, confusionMatrix, seenClasses, type CohenKappa } from '../agreement/index.ts';
import type { SiteState, Tag } from '../site/index.ts';
import { siteConsensus, type Consensus } from './consensus.ts';

// What the rulings did to two passes, for the agreement sheet: each pass's calls against
// the settled species (what the calls and the rulings came to), and the patches the two
// passes called differently: how many are settled, how many open, and what they were
// settled on. Each figure has one plain line, like the agreement figures beside it.

export interface PassAgainstSettled {
  passId: string;
  interpreter: string;
  /** patches this pass called whose species is settled (a species, or mixed) */
  n: number;
  /** of those, how many this pass called as they were settled */
  matched: number;
  /** the pass's calls (rows) against the settled species (columns) */
  figures: CohenKappa;
  explanations: { observed: string; kappa: string };
}

/** What a disagreement between the two passes was settled on. */
export type SettledOn = 'first' | 'second' | 'other' | 'mixed' | 'excluded';

export interface DisagreementTally {
  /** patches both passes called, with different calls */
  total: number;
  settled: number;
  open: number;
  on: Record<SettledOn, number>;
  explanation: string;
}

export interface SettledSheet {
  passes: [PassAgainstSettled, PassAgainstSettled];
  disagreements: DisagreementTally;
}

const percent = (x: number) => `${(x * 100).toFixed(1)} %`;
const patches = (n: number) => `${n} ${n === 1 ? 'patch' : 'patches'}`;

function callsOf(state: SiteState, passId: string): Map<string, Tag> {
  const calls = new Map<string, Tag>();
  for (const t of state.tags.values()) if (t.passId === passId && state.patches.has(t.patchId)) calls.set(t.patchId, t);
  return calls;
}

function againstSettled(state: SiteState, passId: string, calls: Map<string, Tag>, settled: Map<string, Consensus>): PassAgainstSettled {
  const mine: string[] = [];
  const truth: string[] = [];
  for (const [patchId, tag] of [...calls].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))) {
    const species = settled.get(patchId)?.species ?? null;
    if (species === null) continue;
    mine.push(tag.species);
    truth.push(species);
  }
  const figures = cohenKappa(confusionMatrix(mine, truth, seenClasses(mine, truth)));
  const matched = mine.filter((s, i) => s === truth[i]).length;
  const interpreter = state.passes.get(passId)?.interpreter ?? passId;
  const n = mine.length;
  return {
    passId,
    interpreter,
    n,
    matched,
    figures,
    explanations: {
      observed: n === 0
        ? `No patch ${interpreter} called in pass ${passId} is settled yet.`
        : `${interpreter}'s calls match the settled species on ${percent(matched / n)} of the ${patches(n)} it called that are settled; the settling drew on these very calls, so this overstates how often the calls are right.`,
      kappa: figures.kappa.value === null
        ? `Not defined: ${figures.kappa.reason}.`
        : `Beyond chance, ${interpreter}'s calls match the settled species ${figures.kappa.value.toFixed(3)} of the way from chance (0) to a full match (1).`,
    },
  };
}

function tally(first: Map<string, Tag>, second: Map<string, Tag>, settled: Map<string, Consensus>): DisagreementTally {
  const on: Record<SettledOn, number> = { first: 0, second: 0, other: 0, mixed: 0, excluded: 0 };
  let total = 0;
  let open = 0;
  for (const [patchId, a] of first) {
    const b = second.get(patchId);
    if (!b || a.species === b.species) continue;
    total++;
    const c = settled.get(patchId);
    if (!c || c.status === 'open' || c.status === 'untagged') open++;
    else if (c.status === 'excluded') on.excluded++;
    else if (c.species === 'mixed') on.mixed++;
    else if (c.species === a.species) on.first++;
    else if (c.species === b.species) on.second++;
    else on.other++;
  }
  const settledCount = total - open;
  const how = [
    on.first && `${on.first} on the first pass's call`,
    on.second && `${on.second} on the second's`,
    on.other && `${on.other} on another species`,
    on.mixed && `${on.mixed} as mixed`,
    on.excluded && `${on.excluded} left out of training`,
  ].filter(Boolean).join(', ');
  const explanation = total === 0
    ? 'The two passes called every patch they share alike: there was nothing to rule on.'
    : `Of the ${patches(total)} the two passes called differently, ${settledCount} ${settledCount === 1 ? 'is' : 'are'} settled${how ? ` (${how})` : ''} and ${open} ${open === 1 ? 'is' : 'are'} still open on the Rulings page.`;
  return { total, settled: settledCount, open, on, explanation };
}

/**
 * The rulings' side of the agreement sheet for two passes. Kappa between the passes
 * does not change with rulings (it is about the calls); this is what the rulings add.
 */
export function settledSheet(state: SiteState, firstId: string, secondId: string): SettledSheet {
  const settled = siteConsensus(state.patches.keys(), state.tags.values(), state.rulings.values());
  const first = callsOf(state, firstId);
  const second = callsOf(state, secondId);
  return {
    passes: [againstSettled(state, firstId, first, settled), againstSettled(state, secondId, second, settled)],
    disagreements: tally(first, second, settled),
  };
}
