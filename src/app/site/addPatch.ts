import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import type { Patch } from '../../core/site/index.ts';
import { newId, type SiteContext } from './context.ts';
import { checkPatchGeometry } from './geometryRules.ts';

/** Adds a drawn patch (site CRS metres); resolves once it is durable. */
export async function addPatch(ctx: SiteContext, geometry: MultiPolygonRings): Promise<Patch> {
  checkPatchGeometry(geometry);
  const patch: Patch = { id: newId('patch'), geometry, source: { kind: 'drawn' }, createdAt: ctx.now(), createdBy: ctx.interpreter };
  await ctx.store.commit({ kind: 'patch.added', payload: { patch, tags: [] }, actor: ctx.interpreter, time: patch.createdAt });
  return patch;
}
