import { namesNoSpecies, openBlindPassOf } from '../../core/blind/index.ts';
import { reasonProblem, rulingInForce, RulingError } from '../../core/rulings/index.ts';
import { isTaggable, tagsOfPatch, type Ruling, type RulingDecision, type SiteState } from '../../core/site/index.ts';
import { StorageError } from '../../store/StorageError.ts';
import type { SiteWriter } from '../blind/siteWriter.ts';

// Recording a ruling: one 'ruling.recorded' event carrying who, when, what, why and
// which passes. The checks run inside the commit, on the state at its turn, so a ruling
// made from a stale screen (another window ruled the patch first) is refused rather
// than silently stacked on the other; the person is told what is in force and that
// they can reopen it.

export interface RulingInput {
  patchId: string;
  decision: RulingDecision;
  reason?: string;
  /** the id of the ruling in force when the screen showed the patch; null for none */
  seen: string | null;
}

export interface RulingActor {
  interpreter: string;
  time: string;
}

export function describeDecision(decision: RulingDecision): string {
  switch (decision.kind) {
    case 'accept': return `accept the call of pass ${decision.passId}`;
    case 'species': return `species ${decision.species}`;
    case 'mixed': return 'mixed';
    case 'exclude': return 'exclude from training';
  }
}

function nextRulingId(state: SiteState): string {
  let n = state.rulings.size + 1;
  while (state.rulings.has(`ruling-${n}`)) n++;
  return `ruling-${n}`;
}

function checkDecision(state: SiteState, patchId: string, decision: RulingDecision): void {
  if (decision.kind === 'accept') {
    if (!state.passes.has(decision.passId)) throw new RulingError(`There is no pass ${decision.passId} in this site.`, patchId);
    const tag = state.tags.get(`${patchId}|${decision.passId}`);
    if (!tag) throw new RulingError(`Pass ${decision.passId} has no call on patch ${patchId} to accept.`, patchId);
    if (namesNoSpecies(tag.species)) throw new RulingError(`The call of pass ${decision.passId} is "${tag.species}", which names no species: choose a species instead.`, patchId);
  }
  if (decision.kind === 'species') {
    if (namesNoSpecies(decision.species) || decision.species === 'mixed' || !isTaggable(state.roster, decision.species)) {
      throw new RulingError(`"${decision.species}" is not a species of the roster.`, patchId);
    }
  }
}

/** Records a ruling on a patch and returns it; refuses, recording nothing, when it cannot stand. */
export async function recordRuling(store: SiteWriter, input: RulingInput, actor: RulingActor): Promise<Ruling> {
  const by = actor.interpreter.trim();
  if (!by) throw new RulingError('Choose who is ruling first.', input.patchId);
  let made: Ruling | null = null;
  try {
    await store.commitWith((state) => {
      const { patchId, decision } = input;
      const blind = openBlindPassOf(state, by);
      if (blind) throw new RulingError(`${by} is in blind pass ${blind.id}: rulings reveal every call, so they wait until that pass ends.`, patchId);
      if (!state.patches.has(patchId)) {
        throw new RulingError(`Patch ${patchId} is no longer in the site (deleted meanwhile?): nothing was recorded. Undo the deletion on the desk to rule on it.`, patchId);
      }
      const inForce = rulingInForce([...state.rulings.values()].filter((r) => r.patchId === patchId));
      if ((inForce?.id ?? null) !== input.seen) {
        const what = inForce
          ? `${inForce.by} ruled it at ${inForce.time} (${describeDecision(inForce.decision)}); reopen that ruling to change it`
          : `its ruling ${input.seen} was reopened meanwhile; look at it again`;
        throw new RulingError(`Patch ${patchId} changed since you looked: ${what}. Nothing was recorded.`, patchId);
      }
      checkDecision(state, patchId, decision);
      const tags = tagsOfPatch(state, patchId);
      const reason = (input.reason ?? '').trim();
      const problem = reasonProblem(decision, tags, reason);
      if (problem) throw new RulingError(`Patch ${patchId}: ${problem}.`, patchId);
      const passIds = [...new Set(tags.map((t) => t.passId))].sort();
      const ruling: Ruling = { id: nextRulingId(state), patchId, decision, passIds, by, time: actor.time, reason, reopened: null };
      made = ruling;
      return { kind: 'ruling.recorded', payload: { ruling }, actor: by, time: actor.time };
    });
  } catch (error) {
    throw staleAsRulingError(error, input.patchId);
  }
  return made!;
}

/** Another window wrote first: say so in ruling terms; nothing of ours was written. */
export function staleAsRulingError(error: unknown, patchId: string): unknown {
  if (error instanceof StorageError && error.kind === 'stale') {
    return new RulingError(`This site was changed in another window (perhaps a ruling on patch ${patchId}); nothing was recorded here. Reopen the site to see the other window's work, then rule again.`, patchId);
  }
  return error;
}
