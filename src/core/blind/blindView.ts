import type { Pass, Patch, SiteState, Tag } from '../site/index.ts';

// What a site looks like to one interpreter while blind passes run. This is the one
// filter every screen reads through (map, lists, findings, history, exports), so a
// call can only leak if a screen reads the raw state instead.
//
// - An interpreter in an open blind pass sees only that pass's patches and their own
//   calls in it: no one else's tags, confidences or notes, no rulings, and no file
//   attributes of imported patches or reference points (a field file's species column
//   is a call too). Colours follow calls, so with no earlier calls none are left.
// - Everyone else does not see the calls of blind passes still open, nor the outlines
//   drawn in an open independent delineation, so the second look stays independent
//   both ways. Once a pass ends its calls are visible to all.

/** A blind pass that asks for no existing patch: its interpreter draws the patches (independent delineation). */
export function isDelineationPass(pass: Pass): boolean {
  return pass.blind && pass.patchIds !== null && pass.patchIds.length === 0;
}

/** The interpreter's open blind pass (the newest, should there be more), or null. */
export function openBlindPassOf(state: SiteState, interpreter: string): Pass | null {
  let found: Pass | null = null;
  for (const pass of state.passes.values()) {
    if (pass.blind && pass.endedAt === null && pass.interpreter === interpreter && (!found || pass.startedAt > found.startedAt)) found = pass;
  }
  return found;
}

/** Whether a patch was drawn in a delineation pass (by its interpreter while it ran). */
export function drawnIn(pass: Pass, patch: Patch): boolean {
  return isDelineationPass(pass) && patch.createdBy === pass.interpreter && patch.createdAt >= pass.startedAt
    && (pass.endedAt === null || patch.createdAt <= pass.endedAt);
}

/** The patches a blind pass is about: those it asks for, or those drawn in it. */
export function patchesOfPass(state: SiteState, pass: Pass): Patch[] {
  if (isDelineationPass(pass)) return [...state.patches.values()].filter((p) => drawnIn(pass, p));
  if (pass.patchIds === null) return [...state.patches.values()];
  return pass.patchIds.map((id) => state.patches.get(id)).filter((p): p is Patch => p !== undefined);
}

function withoutAttributes(patch: Patch): Patch {
  return patch.source.kind === 'import' ? { ...patch, source: { ...patch.source, attributes: {} } } : patch;
}

function inBlindPass(state: SiteState, pass: Pass): SiteState {
  const patches = new Map(patchesOfPass(state, pass).map((p) => [p.id, withoutAttributes(p)] as const));
  const tags = new Map<string, Tag>();
  for (const [key, tag] of state.tags) if (tag.passId === pass.id && patches.has(tag.patchId)) tags.set(key, tag);
  return {
    ...state,
    patches,
    tags,
    passes: new Map([[pass.id, pass]]),
    rulings: new Map(),
    references: new Map([...state.references].map(([id, r]) => [id, { ...r, attributes: {} }] as const)),
    imports: new Map([...state.imports].map(([id, r]) => [id, { ...r, mapping: null }] as const)),
  };
}

function besideBlindPasses(state: SiteState, interpreter: string): SiteState {
  const hiddenPasses = new Set<string>();
  const delineations: Pass[] = [];
  for (const pass of state.passes.values()) {
    if (!pass.blind || pass.endedAt !== null || pass.interpreter === interpreter) continue;
    hiddenPasses.add(pass.id);
    if (isDelineationPass(pass)) delineations.push(pass);
  }
  if (hiddenPasses.size === 0) return state;
  // Outlines are copied only when an open delineation has some to hide.
  let patches: ReadonlyMap<string, Patch> = state.patches;
  if (delineations.length) {
    const kept = new Map(state.patches);
    for (const patch of state.patches.values()) if (delineations.some((d) => drawnIn(d, patch))) kept.delete(patch.id);
    patches = kept;
  }
  const tags = new Map<string, Tag>();
  for (const [key, tag] of state.tags) if (!hiddenPasses.has(tag.passId) && patches.has(tag.patchId)) tags.set(key, tag);
  return { ...state, patches, tags };
}

/** The site as `interpreter` may see it now (the same object when nothing is hidden). */
export function blindView(state: SiteState, interpreter: string): SiteState {
  const pass = openBlindPassOf(state, interpreter);
  return pass ? inBlindPass(state, pass) : besideBlindPasses(state, interpreter);
}
