import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { SiteRuleError } from '../../core/site/index.ts';
import type { SiteContext } from './context.ts';
import { checkPatchGeometry } from './geometryRules.ts';

/** Replaces a patch's outline (a vertex moved, added or removed, a move, a reshape). */
export async function editPatchGeometry(ctx: SiteContext, patchId: string, geometry: MultiPolygonRings): Promise<void> {
  checkPatchGeometry(geometry);
  await ctx.store.commitWith((state) => {
    const patch = state.patches.get(patchId);
    if (!patch) throw new SiteRuleError(`no patch ${patchId} in the site (deleted meanwhile?)`);
    return { kind: 'patch.geometry', payload: { patchId, geometry, previous: patch.geometry }, actor: ctx.interpreter, time: ctx.now() };
  });
}
