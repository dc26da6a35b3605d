import { SiteRuleError, tagsOfPatch } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';

/** Deletes a patch with its tags, all kept in the event so an undo brings them back. */
export async function deletePatch(ctx: SiteContext, patchId: string): Promise<void> {
  await ctx.store.commitWith((state) => {
    const patch = state.patches.get(patchId);
    if (!patch) throw new SiteRuleError(`no patch ${patchId} in the site (deleted meanwhile?)`);
    return { kind: 'patch.deleted', payload: { patch, tags: tagsOfPatch(state, patchId) }, actor: ctx.interpreter, time: ctx.now() };
  });
}
