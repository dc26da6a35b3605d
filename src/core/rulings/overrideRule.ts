import { namesNoSpecies } from '../blind/answers.ts';
import type { RulingDecision, Tag } from '../site/types.ts';

// "Overriding both interpreters requires a reason": a ruling that takes neither
// interpreter's call must say why, so a later reader is not left guessing. Accepting a
// pass, or naming a species (or mixed) that one of the calls named, agrees with
// someone; excluding a patch or naming a species nobody called overrides them all.

/** The species a decision settles on, or null when it settles none (exclude). */
function decidedSpecies(decision: RulingDecision, tags: readonly Tag[]): string | null {
  switch (decision.kind) {
    case 'accept': return tags.find((t) => t.passId === decision.passId)?.species ?? null;
    case 'species': return decision.species;
    case 'mixed': return 'mixed';
    case 'exclude': return null;
  }
}

/** Whether the decision goes against every call on the patch (and so needs a reason). */
export function overridesEveryone(decision: RulingDecision, tags: readonly Tag[]): boolean {
  if (decision.kind === 'accept') return false;
  const species = decidedSpecies(decision, tags);
  if (species === null) return tags.length > 0;
  return !tags.some((t) => t.species === species && !namesNoSpecies(t.species));
}

/** The problem with a decision's reason, or null when it may be recorded as given. */
export function reasonProblem(decision: RulingDecision, tags: readonly Tag[], reason: string): string | null {
  if (overridesEveryone(decision, tags) && reason.trim() === '') {
    return 'this ruling overrides every interpreter\'s call: add a reason';
  }
  return null;
}
