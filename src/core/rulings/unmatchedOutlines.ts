import { delineationSheet, isDelineationPass, patchesOfPass } from '../blind/index.ts';
import { extentOfRings } from '../geometry/measure.ts';
import type { Extent } from '../geometry/types.ts';
import type { SiteState } from '../site/index.ts';

// Outlines one interpreter saw and the other did not: after an independent delineation
// has ended, each of its outlines with no IoU match among another pass's patches, and
// each of that pass's patches inside the delineated area with no match among the
// delineation's. Matching is the agreement sheet's own (delineationSheet), so the
// queue and the sheet never disagree about what matched.

export interface UnmatchedOutline {
  patchId: string;
  /** the pass the outline belongs to, and the pass it found no match in */
  passId: string;
  otherPassId: string;
  /** the interpreter who drew or called it */
  interpreter: string;
}

function meets(a: Extent, b: Extent): boolean {
  return a[0] <= b[2] && a[2] >= b[0] && a[1] <= b[3] && a[3] >= b[1];
}

/** Every unmatched outline between an ended delineation and each pass that is not blind. */
export function unmatchedOutlines(state: SiteState, minIou = 0.5): UnmatchedOutline[] {
  const out: UnmatchedOutline[] = [];
  const passes = [...state.passes.values()];
  for (const delineation of passes) {
    if (!isDelineationPass(delineation) || delineation.endedAt === null) continue;
    const drawn = patchesOfPass(state, delineation);
    if (drawn.length === 0) continue;
    const drawnIds = new Set(drawn.map((p) => p.id));
    for (const first of passes) {
      if (first.blind) continue;
      const calledIds = new Set([...state.tags.values()].filter((t) => t.passId === first.id).map((t) => t.patchId));
      if (calledIds.size === 0) continue;
      const sheet = delineationSheet(state, first.id, delineation.id, minIou);
      const matchedFirst = new Set(sheet.pairs.map((p) => p.first));
      const matchedDrawn = new Set(sheet.pairs.map((p) => p.second));
      for (const p of drawn) {
        if (!matchedDrawn.has(p.id)) out.push({ patchId: p.id, passId: delineation.id, otherPassId: first.id, interpreter: delineation.interpreter });
      }
      for (const id of calledIds) {
        const patch = state.patches.get(id);
        if (!patch || drawnIds.has(id) || matchedFirst.has(id) || !meets(extentOfRings(patch.geometry), sheet.area)) continue;
        out.push({ patchId: id, passId: first.id, otherPassId: delineation.id, interpreter: first.interpreter });
      }
    }
  }
  return out;
}
