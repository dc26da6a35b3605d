import type { SiteStore } from '../../store/SiteStore.ts';
import { isTaggable, tagKey, type Confidence, type DisplaySettings, type LedgerEvent, type Tag } from '../../core/site/index.ts';
import { ensureOpenPass } from './passes.ts';

// Tagging on the desk: a species key, a confidence key or a note each change the
// interpreter's tag of the patch in their open pass. Every change records who, when,
// in which pass and what was on screen.

export interface TagChange {
  species?: string;
  confidence?: Confidence;
  note?: string;
}

export class TagRefused extends Error {
  override name = 'TagRefused';
}

export interface TagContext {
  interpreter: string;
  time: string;
  display: DisplaySettings;
}

/** A new species is called 'likely' until the interpreter says otherwise (common practice: no silent 'sure'). */
export const DEFAULT_CONFIDENCE: Confidence = 'likely';

export async function tagPatch(store: SiteStore, patchId: string, change: TagChange, context: TagContext): Promise<LedgerEvent | null> {
  const passId = await ensureOpenPass(store, context.interpreter, context.time);
  return store.commitWith((state) => {
    if (!state.patches.has(patchId)) throw new TagRefused(`There is no patch ${patchId} in this site.`);
    if (change.species !== undefined && !isTaggable(state.roster, change.species)) {
      throw new TagRefused(`'${change.species}' is neither a roster code nor a reserved class.`);
    }
    const previous = state.tags.get(tagKey(patchId, passId)) ?? null;
    const species = change.species ?? previous?.species;
    if (species === undefined) throw new TagRefused(`Patch ${patchId} has no species in your pass yet: press a species key first.`);
    const tag: Tag = {
      patchId,
      passId,
      species,
      confidence: change.confidence ?? previous?.confidence ?? DEFAULT_CONFIDENCE,
      note: change.note ?? previous?.note ?? '',
      interpreter: context.interpreter,
      time: context.time,
      display: context.display,
    };
    if (previous && previous.species === tag.species && previous.confidence === tag.confidence && previous.note === tag.note) return null;
    return { kind: 'tag.set', payload: { patchId, passId, tag, previous }, actor: context.interpreter, time: context.time };
  });
}
