import type { Pass, SiteState, Tag } from '../site/index.ts';

// The call a patch is chosen by for a blind pass: the newest tag of a pass that is not
// blind. Blind calls are the second looks themselves, so they never decide what gets a
// second look.

/** The newest non-blind tag of every tagged patch. */
export function referenceCalls(state: SiteState): Map<string, Tag> {
  const calls = new Map<string, Tag>();
  for (const tag of state.tags.values()) {
    const pass: Pass | undefined = state.passes.get(tag.passId);
    if (!pass || pass.blind) continue;
    const before = calls.get(tag.patchId);
    if (!before || tag.time > before.time || (tag.time === before.time && tag.passId > before.passId)) calls.set(tag.patchId, tag);
  }
  return calls;
}
