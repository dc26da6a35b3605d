import type { Patch, SiteState, Tag } from '../../core/site/index.ts';

// Which tag a patch shows on the desk, and the order "next untagged" / "next unsure" walk.
// A site holds up to tens of thousands of tags, so tags are grouped by patch once per
// state rather than scanned per patch.

/** The tags of every patch, grouped once for a state. */
export function tagsByPatch(state: SiteState): Map<string, Tag[]> {
  const grouped = new Map<string, Tag[]>();
  for (const tag of state.tags.values()) {
    const list = grouped.get(tag.patchId);
    if (list) list.push(tag);
    else grouped.set(tag.patchId, [tag]);
  }
  return grouped;
}

/**
 * The tag a patch shows: the one of the pass in hand when it has one, else the newest
 * tag of any pass that is not blind (a blind pass's calls stay out of sight).
 */
export function shownTag(tags: readonly Tag[] | undefined, passId: string | null, blindPasses: ReadonlySet<string>): Tag | null {
  if (!tags || tags.length === 0) return null;
  let newest: Tag | null = null;
  for (const tag of tags) {
    if (passId !== null && tag.passId === passId) return tag;
    if (blindPasses.has(tag.passId)) continue;
    if (!newest || tag.time > newest.time) newest = tag;
  }
  return newest;
}

/** Patch ids in reading order: numeric parts compared as numbers, so P2 comes before P10. */
export function patchOrder(patches: Iterable<Patch>): string[] {
  const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
  return [...patches].map((p) => p.id).sort(collator.compare);
}

/**
 * The next patch after `from` (wrapping round) that `wanted` accepts, or null when no
 * patch does. With no `from` the search starts at the first patch.
 */
export function nextMatching(order: readonly string[], from: string | null, wanted: (id: string) => boolean): string | null {
  const n = order.length;
  if (n === 0) return null;
  const start = from === null ? -1 : order.indexOf(from);
  for (let step = 1; step <= n; step++) {
    const id = order[(start + step + n) % n];
    if (wanted(id)) return id;
  }
  return null;
}

/** A patch id as a user may type it: exact first, then ignoring case and surrounding space. */
export function findPatchId(state: SiteState, typed: string): string | null {
  const text = typed.trim();
  if (!text) return null;
  if (state.patches.has(text)) return text;
  const lower = text.toLowerCase();
  for (const id of state.patches.keys()) if (id.toLowerCase() === lower) return id;
  return null;
}

/** A fresh id for a drawn patch: P and the next number no patch uses. */
export function newPatchId(state: SiteState, alsoTaken: Iterable<string> = []): string {
  let highest = 0;
  for (const id of [...state.patches.keys(), ...alsoTaken]) {
    const m = /^P(\d+)$/.exec(id);
    if (m) highest = Math.max(highest, Number(m[1]));
  }
  return `P${String(highest + 1).padStart(4, '0')}`;
}

/** Blind passes of other interpreters: their calls stay hidden from this one. */
export function hiddenPasses(state: SiteState, interpreter: string): Set<string> {
  const hidden = new Set<string>();
  for (const pass of state.passes.values()) if (pass.blind && pass.interpreter !== interpreter) hidden.add(pass.id);
  return hidden;
}
