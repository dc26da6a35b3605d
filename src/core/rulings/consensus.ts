import { namesNoSpecies } from '../blind/answers.ts';
import type { Ruling, Tag } from '../site/types.ts';

// The settled species of a patch, derived from its tags and rulings and never typed
// twice: a ruling that accepts a pass points at that pass's tag, so a tag changed
// later changes the outcome with it. The rules, in order:
//  1. The latest ruling that has not been reopened settles the patch: accept a pass's
//     tag, name a species, mark it mixed, or exclude it from training.
//  2. Without one, the tags decide: none is "untagged", one is "single", several with
//     the same species are "agreed", different species are "open" (a disagreement).
//  3. A call that names no species ("unknown", "can't tell") never settles a patch:
//     alone it leaves the patch open, beside a species it is a disagreement.

export type ConsensusStatus = 'untagged' | 'single' | 'agreed' | 'ruled' | 'open' | 'excluded';

export interface Consensus {
  status: ConsensusStatus;
  /** The settled species (a roster code or 'mixed'), or null when nothing is settled. */
  species: string | null;
  /** The ruling that settles it, when one does. */
  rulingId: string | null;
  /** One plain line: why this is the outcome. */
  reason: string;
}

/** The ruling in force: the latest (by time, then id) that has not been reopened. */
export function rulingInForce(rulings: readonly Ruling[]): Ruling | null {
  let best: Ruling | null = null;
  for (const r of rulings) {
    if (r.reopened) continue;
    if (!best || r.time > best.time || (r.time === best.time && r.id > best.id)) best = r;
  }
  return best;
}

function fromRuling(ruling: Ruling, tags: readonly Tag[]): Consensus {
  const d = ruling.decision;
  const base = { rulingId: ruling.id };
  switch (d.kind) {
    case 'accept': {
      const tag = tags.find((t) => t.passId === d.passId);
      if (!tag) return { ...base, status: 'open', species: null, reason: `ruling ${ruling.id} accepts pass ${d.passId}, which has no tag on this patch any more` };
      if (namesNoSpecies(tag.species)) return { ...base, status: 'open', species: null, reason: `ruling ${ruling.id} accepts a call that names no species ("${tag.species}")` };
      return { ...base, status: 'ruled', species: tag.species, reason: `ruling ${ruling.id} accepts the call of pass ${d.passId}` };
    }
    case 'species':
      return { ...base, status: 'ruled', species: d.species, reason: `ruling ${ruling.id} names the species` };
    case 'mixed':
      return { ...base, status: 'ruled', species: 'mixed', reason: `ruling ${ruling.id} marks the patch mixed` };
    case 'exclude':
      return { ...base, status: 'excluded', species: null, reason: `ruling ${ruling.id} excludes the patch from training` };
  }
}

/** The consensus of one patch from all its tags and all its rulings (reopened ones included). */
export function consensus(tags: readonly Tag[], rulings: readonly Ruling[]): Consensus {
  const ruling = rulingInForce(rulings);
  if (ruling) return fromRuling(ruling, tags);
  if (tags.length === 0) return { status: 'untagged', species: null, rulingId: null, reason: 'no interpreter has tagged this patch' };
  const calls = [...new Set(tags.map((t) => t.species))].sort();
  if (calls.some(namesNoSpecies)) {
    const reason = calls.length === 1 ? `the only call names no species ("${calls[0]}")` : `the calls differ: ${calls.join(', ')}`;
    return { status: 'open', species: null, rulingId: null, reason };
  }
  if (calls.length > 1) return { status: 'open', species: null, rulingId: null, reason: `the calls differ: ${calls.join(', ')}` };
  if (tags.length === 1) return { status: 'single', species: calls[0], rulingId: null, reason: 'one interpreter\'s call' };
  return { status: 'agreed', species: calls[0], rulingId: null, reason: `${tags.length} calls agree` };
}

/** The consensus of every patch of a site, from its tag and ruling maps. */
export function siteConsensus(
  patchIds: Iterable<string>, tags: Iterable<Tag>, rulings: Iterable<Ruling>,
): Map<string, Consensus> {
  const tagsOf = new Map<string, Tag[]>();
  for (const t of tags) tagsOf.set(t.patchId, [...(tagsOf.get(t.patchId) ?? []), t]);
  const rulingsOf = new Map<string, Ruling[]>();
  for (const r of rulings) rulingsOf.set(r.patchId, [...(rulingsOf.get(r.patchId) ?? []), r]);
  const out = new Map<string, Consensus>();
  for (const id of patchIds) out.set(id, consensus(tagsOf.get(id) ?? [], rulingsOf.get(id) ?? []));
  return out;
}
