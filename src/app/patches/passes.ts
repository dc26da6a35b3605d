import type { SiteStore } from '../../store/SiteStore.ts';
import type { Pass, SiteState } from '../../core/site/index.ts';

// The pass an interpreter tags in on the desk: their open, non-blind pass over all
// patches. It is started on the first tag, so opening a site records nothing.

export function openPassOf(state: SiteState, interpreter: string): Pass | null {
  let found: Pass | null = null;
  for (const pass of state.passes.values()) {
    if (pass.interpreter === interpreter && !pass.blind && pass.endedAt === null && pass.patchIds === null) {
      if (!found || pass.startedAt > found.startedAt) found = pass;
    }
  }
  return found;
}

/** The interpreter's open pass, started (one durable event) when there is none. */
export async function ensureOpenPass(store: SiteStore, interpreter: string, time: string): Promise<string> {
  const existing = openPassOf(store.state, interpreter);
  if (existing) return existing.id;
  await store.commitWith((state) => {
    if (openPassOf(state, interpreter)) return null;
    return { kind: 'pass.started', payload: { pass: newPass(state, interpreter, time) }, actor: interpreter, time };
  });
  return openPassOf(store.state, interpreter)!.id;
}

function newPass(state: SiteState, interpreter: string, time: string): Pass {
  const slug = interpreter.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '') || 'interpreter';
  let n = 1;
  while (state.passes.has(`${slug}-${n}`)) n++;
  return { id: `${slug}-${n}`, interpreter, blind: false, startedAt: time, endedAt: null, patchIds: null };
}
