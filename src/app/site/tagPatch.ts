import { CONFIDENCES, isTaggable, SiteRuleError, tagKey, type Confidence, type DisplaySettings, type Tag } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';
import { openPassFor } from './openPassFor.ts';

export interface TagInput {
  patchId: string;
  /** a roster code or a reserved class */
  species: string;
  confidence: Confidence;
  note?: string;
  /** what was on screen */
  display: DisplaySettings;
  /** the pass to tag in; default: the interpreter's open pass (started if needed) */
  passId?: string;
}

/** Sets the interpreter's tag on a patch, replacing their earlier call in the same pass. */
export async function tagPatch(ctx: SiteContext, input: TagInput): Promise<Tag> {
  if (!CONFIDENCES.includes(input.confidence)) throw new SiteRuleError(`confidence must be one of ${CONFIDENCES.join(', ')}`);
  const passId = input.passId ?? (await openPassFor(ctx)).id;
  const tag: Tag = {
    patchId: input.patchId, passId, species: input.species, confidence: input.confidence, note: input.note ?? '',
    interpreter: ctx.interpreter, time: ctx.now(), display: input.display,
  };
  await ctx.store.commitWith((state) => {
    if (!state.patches.has(input.patchId)) throw new SiteRuleError(`no patch ${input.patchId} in the site (deleted meanwhile?)`);
    if (!isTaggable(state.roster, input.species)) throw new SiteRuleError(`"${input.species}" is neither a roster code nor a reserved class`);
    const pass = state.passes.get(passId);
    if (!pass) throw new SiteRuleError(`no pass ${passId} in the site`);
    if (pass.interpreter !== ctx.interpreter) throw new SiteRuleError(`pass ${passId} belongs to ${pass.interpreter}, not ${ctx.interpreter}`);
    const previous = state.tags.get(tagKey(input.patchId, passId)) ?? null;
    return { kind: 'tag.set', payload: { patchId: input.patchId, passId, tag, previous }, actor: ctx.interpreter, time: tag.time };
  });
  return tag;
}
