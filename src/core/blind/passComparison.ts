import {
  agreementSheet, alignById, delineationFigures, explainDelineation, explainFleiss, fleissKappa, matchByIou, ratingTable,
  type AgreementSheet, type DelineationFigures, type FleissKappa, type PairedCall,
} from '../agreement/index.ts';
import { extentOfRings, multiPolygonArea } from '../geometry/measure.ts';
import { intersect } from '../geometry/overlay.ts';
import type { Extent } from '../geometry/types.ts';
import { RESERVED_CLASSES, type Pass, type Patch, type SiteState, type Tag } from '../site/index.ts';
import { BLIND_ANSWERS } from './answers.ts';
import { BlindError } from './BlindError.ts';
import { isDelineationPass, patchesOfPass } from './blindView.ts';

// The agreement sheet of a site's passes: which patches two passes both called, paired
// for the agreement core; Fleiss' kappa over three or more passes; and for an
// independent delineation, its outlines matched one-to-one against the other pass's.

export interface PassSheet {
  first: Pass;
  second: Pass;
  pairs: PairedCall[];
  sheet: AgreementSheet;
}

function tagsOfPass(state: SiteState, passId: string): Map<string, Tag> {
  const byPatch = new Map<string, Tag>();
  for (const tag of state.tags.values()) if (tag.passId === passId && state.patches.has(tag.patchId)) byPatch.set(tag.patchId, tag);
  return byPatch;
}

function requirePass(state: SiteState, id: string): Pass {
  const pass = state.passes.get(id);
  if (!pass) throw new BlindError(`There is no pass ${id} in this site.`);
  return pass;
}

/** Matrix order: the roster's species, then the reserved classes and blind answers, keeping those seen. */
export function classOrder(state: SiteState, calls: Iterable<string>): string[] {
  const seen = new Set(calls);
  const order = [...state.roster.map((e) => e.code), ...RESERVED_CLASSES, ...BLIND_ANSWERS];
  const listed = [...new Set(order)].filter((c) => seen.has(c));
  const strays = [...seen].filter((c) => !listed.includes(c)).sort();
  return [...listed, ...strays];
}

/** The calls of two passes on the patches both called, paired (confidence and group from the first). */
export function pairPasses(state: SiteState, firstId: string, secondId: string): PairedCall[] {
  if (firstId === secondId) throw new BlindError('Choose two different passes to compare.');
  requirePass(state, firstId);
  requirePass(state, secondId);
  const first = tagsOfPass(state, firstId);
  const second = tagsOfPass(state, secondId);
  const groups = new Map(state.roster.map((e) => [e.code, e.group] as const));
  const pairs: PairedCall[] = [];
  for (const [patchId, a] of first) {
    const b = second.get(patchId);
    if (!b) continue;
    pairs.push({ id: patchId, first: a.species, second: b.species, confidence: a.confidence, group: groups.get(a.species) ?? 'other' });
  }
  if (pairs.length === 0) {
    throw new BlindError(`Passes ${firstId} (${first.size} calls) and ${secondId} (${second.size} calls) share no patch: there is nothing to compare.`);
  }
  return pairs.sort((x, y) => (x.id < y.id ? -1 : x.id > y.id ? 1 : 0));
}

export function passSheet(state: SiteState, firstId: string, secondId: string): PassSheet {
  const pairs = pairPasses(state, firstId, secondId);
  const classes = classOrder(state, pairs.flatMap((p) => [p.first, p.second]));
  return { first: requirePass(state, firstId), second: requirePass(state, secondId), pairs, sheet: agreementSheet(pairs, { classes }) };
}

export interface PassesFleiss {
  passIds: string[];
  /** patches every chosen pass called */
  patchIds: string[];
  figures: FleissKappa;
  explanation: string;
}

/** Fleiss' kappa over the patches every one of three or more passes called. */
export function passesFleiss(state: SiteState, passIds: readonly string[]): PassesFleiss {
  if (passIds.length < 3) throw new BlindError(`Fleiss' kappa here is for three or more passes; ${passIds.length} chosen.`);
  const lists = passIds.map((id) => {
    requirePass(state, id);
    return tagsOfPass(state, id);
  });
  const shared = [...lists[0].keys()].filter((id) => lists.every((l) => l.has(id))).sort();
  if (shared.length === 0) throw new BlindError(`No patch was called in all of ${passIds.join(', ')}.`);
  const aligned = alignById(lists.map((l) => shared.map((id) => ({ id, species: l.get(id)!.species }))));
  if (!aligned.ok) throw new BlindError('The passes could not be lined up by patch.');
  const { categories, table } = ratingTable(aligned.aligned.calls, classOrder(state, aligned.aligned.calls.flat()));
  const figures = fleissKappa(categories, table);
  return { passIds: [...passIds], patchIds: shared, figures, explanation: explainFleiss(figures) };
}

export interface DelineationSheet {
  firstPassId: string;
  delineationPassId: string;
  /** the extent of the area compared */
  area: Extent;
  /** what the area is: the one drawn when the delineation started, or the extent of its outlines */
  within: 'drawn area' | 'outline extent';
  figures: DelineationFigures;
  explanations: ReturnType<typeof explainDelineation>;
  /** matched patch ids, first then second, with their IoU */
  pairs: { first: string; second: string; iou: number }[];
}

function meets(a: Extent, b: Extent): boolean {
  return a[0] <= b[2] && a[2] >= b[0] && a[1] <= b[3] && a[3] >= b[1];
}

/**
 * Compares an independent delineation with the patches another pass called: the area
 * is the one drawn for the delineation (outlines cut at its edge) or else the extent of
 * its outlines; the first pass's patches in it are
 * matched one-to-one by IoU (optimal assignment, matchByIou), and species agreement is
 * weighted by shared area.
 */
export function delineationSheet(state: SiteState, firstId: string, delineationId: string, minIou = 0.5): DelineationSheet {
  const delineation = requirePass(state, delineationId);
  if (!isDelineationPass(delineation)) throw new BlindError(`Pass ${delineationId} is not an independent delineation.`);
  const drawn = patchesOfPass(state, delineation);
  if (drawn.length === 0) throw new BlindError(`No outline was drawn in delineation ${delineationId} yet.`);
  // Within the area drawn for the delineation, every outline is cut at its edge; without
  // one, the patches of the first pass meeting the extent of the drawn outlines count.
  const region = delineation.area ?? null;
  const area = region ? extentOfRings(region) : drawn.map((p) => extentOfRings(p.geometry)).reduce((a, e) => [Math.min(a[0], e[0]), Math.min(a[1], e[1]), Math.max(a[2], e[2]), Math.max(a[3], e[3])]);
  const inArea = (p: Patch) => ({ id: p.id, rings: region ? intersect(p.geometry, region) : p.geometry });
  const kept = (s: { rings: Patch['geometry'] }) => multiPolygonArea(s.rings) > 0;
  const firstTags = tagsOfPass(state, firstId);
  requirePass(state, firstId);
  const drawnIds = new Set(drawn.map((p) => p.id));
  const first = [...firstTags.keys()].map((id) => state.patches.get(id)!)
    .filter((p) => !drawnIds.has(p.id) && meets(extentOfRings(p.geometry), area)).map(inArea).filter(kept);
  const second = drawn.map(inArea).filter(kept);
  if (second.length === 0) throw new BlindError(`No outline of delineation ${delineationId} lies in its area.`);
  const secondTags = tagsOfPass(state, delineationId);
  const matching = matchByIou(first, second, { minIou });
  const figures = delineationFigures(
    matching,
    first.map((p) => firstTags.get(p.id)?.species ?? ''),
    second.map((p) => secondTags.get(p.id)?.species ?? ''),
  );
  return {
    firstPassId: firstId,
    delineationPassId: delineationId,
    area,
    within: region ? 'drawn area' : 'outline extent',
    figures,
    explanations: explainDelineation(figures),
    pairs: matching.pairs.map((m) => ({ first: first[m.first].id, second: second[m.second].id, iou: m.iou })),
  };
}
