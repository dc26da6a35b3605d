import type { Pass } from '../../core/site/index.ts';
import { newId, type SiteContext } from './context.ts';

/** The interpreter's open, non-blind pass; one is started (and recorded) when there is none. */
export async function openPassFor(ctx: SiteContext): Promise<Pass> {
  const find = () => [...ctx.store.state.passes.values()].find((p) => p.interpreter === ctx.interpreter && !p.blind && p.endedAt === null);
  const existing = find();
  if (existing) return existing;
  await ctx.store.commitWith((state) => {
    if ([...state.passes.values()].some((p) => p.interpreter === ctx.interpreter && !p.blind && p.endedAt === null)) return null;
    const pass: Pass = { id: newId('pass'), interpreter: ctx.interpreter, blind: false, startedAt: ctx.now(), endedAt: null, patchIds: null };
    return { kind: 'pass.started', payload: { pass }, actor: ctx.interpreter, time: pass.startedAt };
  });
  return find()!;
}
