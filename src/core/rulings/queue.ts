import { namesNoSpecies } from '../blind/answers.ts';
import type { Finding } from '../checks/findings.ts';
import { multiPolygonArea } from '../geometry/measure.ts';
import type { Confidence, Ruling, SiteState, Tag } from '../site/index.ts';
import { consensus, rulingInForce, type Consensus } from './consensus.ts';
import { unmatchedOutlines, type UnmatchedOutline } from './unmatchedOutlines.ts';

// The disagreement queue: every patch that needs a ruling, with what each pass said.
// A patch enters for any of four reasons (its kinds): passes called different species,
// a call names no species ("unknown", "can't tell"), an open mixed-species finding, or
// an outline one interpreter drew and the other did not match. It stays in the queue
// once ruled, marked settled, so progress (settled / open) is counted over one list.
//
// Default order: open before settled, then by the sum of three ranks (a Borda count):
// larger patches first, rarer species first, more confident disagreements first. A sum
// of ranks lets none of the three drown the others, as a sort on area alone would.

export type DisagreementKind = 'species' | 'no-species' | 'mixed' | 'unmatched';
export const DISAGREEMENT_KINDS: readonly DisagreementKind[] = ['species', 'no-species', 'mixed', 'unmatched'];

/** One pass's call on the patch, revealed. */
export interface RevealedCall {
  passId: string;
  interpreter: string;
  species: string;
  confidence: Confidence;
  note: string;
}

export interface QueueItem {
  patchId: string;
  kinds: DisagreementKind[];
  /** calls by pass, in pass start order */
  calls: RevealedCall[];
  area: number;
  /** how many patches of the site carry the rarest species this patch was called */
  rarity: number;
  /** mean confidence of the calls: sure 3, likely 2, unsure 1 */
  confidence: number;
  /** mixed-species findings and unmatched outlines, one line each */
  notes: string[];
  consensus: Consensus;
  /** the ruling in force, when one is */
  ruling: Ruling | null;
  settled: boolean;
}

export interface QueueFilter {
  kind?: DisagreementKind;
  interpreter?: string;
  /** two species, in any order: items called both */
  pair?: readonly [string, string];
  status?: 'open' | 'settled' | 'all';
}

export interface QueueProgress {
  settled: number;
  open: number;
  total: number;
}

const CONFIDENCE_WEIGHT: Record<Confidence, number> = { sure: 3, likely: 2, unsure: 1 };
const MIXED_FINDINGS = new Set<Finding['kind']>(['overlap-mixed', 'mixed-tag']);

function passOrder(state: SiteState): Map<string, number> {
  const passes = [...state.passes.values()].sort((a, b) => a.startedAt.localeCompare(b.startedAt) || a.id.localeCompare(b.id));
  return new Map(passes.map((p, i) => [p.id, i]));
}

function kindsOfCalls(tags: readonly Tag[]): DisagreementKind[] {
  const kinds: DisagreementKind[] = [];
  const named = new Set(tags.filter((t) => !namesNoSpecies(t.species)).map((t) => t.species));
  if (named.size > 1) kinds.push('species');
  if (tags.some((t) => namesNoSpecies(t.species))) kinds.push('no-species');
  return kinds;
}

/** Ranks (0 best) of values, equal values sharing the lower rank. */
function ranks(values: number[], better: (a: number, b: number) => number): number[] {
  const order = values.map((v, i) => [v, i] as const).sort((a, b) => better(a[0], b[0]));
  const out = new Array<number>(values.length);
  order.forEach(([v, i], k) => {
    out[i] = k > 0 && order[k - 1][0] === v ? out[order[k - 1][1]] : k;
  });
  return out;
}

export interface QueueInput {
  /** the site as the person ruling may see it (blindView) */
  state: SiteState;
  /** the checks' findings, of which the open mixed-species ones enter the queue */
  findings?: readonly Finding[];
  /** the IoU at which two outlines match (default 0.5, as on the agreement sheet) */
  minIou?: number;
}

/** Every patch needing a ruling, in the default order. */
export function disagreementQueue({ state, findings = [], minIou = 0.5 }: QueueInput): QueueItem[] {
  const order = passOrder(state);
  const tagsOf = new Map<string, Tag[]>();
  for (const t of state.tags.values()) if (state.patches.has(t.patchId)) tagsOf.set(t.patchId, [...(tagsOf.get(t.patchId) ?? []), t]);
  const rulingsOf = new Map<string, Ruling[]>();
  for (const r of state.rulings.values()) rulingsOf.set(r.patchId, [...(rulingsOf.get(r.patchId) ?? []), r]);

  const kinds = new Map<string, Set<DisagreementKind>>();
  const notes = new Map<string, string[]>();
  const add = (id: string, kind: DisagreementKind, note?: string) => {
    if (!state.patches.has(id)) return;
    kinds.set(id, (kinds.get(id) ?? new Set()).add(kind));
    if (note) notes.set(id, [...(notes.get(id) ?? []), note]);
  };
  for (const [id, tags] of tagsOf) for (const k of kindsOfCalls(tags)) add(id, k);
  for (const f of findings) {
    if (!MIXED_FINDINGS.has(f.kind)) continue;
    for (const id of f.patches) add(String(id), 'mixed', f.message);
  }
  for (const u of unmatchedOutlines(state, minIou)) add(u.patchId, 'unmatched', unmatchedNote(u));

  // How often each species was called, to find the rare ones.
  const speciesCount = new Map<string, number>();
  for (const tags of tagsOf.values()) for (const s of new Set(tags.map((t) => t.species))) speciesCount.set(s, (speciesCount.get(s) ?? 0) + 1);

  const items: QueueItem[] = [...kinds].map(([patchId, k]) => {
    const tags = [...(tagsOf.get(patchId) ?? [])].sort((a, b) => (order.get(a.passId) ?? 0) - (order.get(b.passId) ?? 0));
    const rulings = rulingsOf.get(patchId) ?? [];
    const c = consensus(tags, rulings);
    const ruling = rulingInForce(rulings);
    return {
      patchId,
      kinds: DISAGREEMENT_KINDS.filter((d) => k.has(d)),
      calls: tags.map((t) => ({ passId: t.passId, interpreter: t.interpreter, species: t.species, confidence: t.confidence, note: t.note })),
      area: multiPolygonArea(state.patches.get(patchId)!.geometry),
      rarity: tags.length ? Math.min(...tags.map((t) => speciesCount.get(t.species) ?? 0)) : 0,
      confidence: tags.length ? tags.reduce((s, t) => s + CONFIDENCE_WEIGHT[t.confidence], 0) / tags.length : 0,
      notes: notes.get(patchId) ?? [],
      consensus: c,
      ruling,
      settled: ruling !== null && c.status !== 'open',
    };
  });
  const byArea = ranks(items.map((i) => i.area), (a, b) => b - a);
  const byRarity = ranks(items.map((i) => i.rarity), (a, b) => a - b);
  const byConfidence = ranks(items.map((i) => i.confidence), (a, b) => b - a);
  const score = new Map(items.map((it, i) => [it.patchId, byArea[i] + byRarity[i] + byConfidence[i]]));
  return items.sort((a, b) => Number(a.settled) - Number(b.settled)
    || score.get(a.patchId)! - score.get(b.patchId)!
    || b.area - a.area
    || a.patchId.localeCompare(b.patchId));
}

function unmatchedNote(u: UnmatchedOutline): string {
  return `outline of pass ${u.passId} (${u.interpreter}) has no match in pass ${u.otherPassId}`;
}

/** The items a filter keeps, in queue order. */
export function filterQueue(items: readonly QueueItem[], filter: QueueFilter): QueueItem[] {
  return items.filter((it) => {
    if (filter.kind && !it.kinds.includes(filter.kind)) return false;
    if (filter.interpreter && !it.calls.some((c) => c.interpreter === filter.interpreter)) return false;
    if (filter.pair) {
      const called = new Set(it.calls.map((c) => c.species));
      if (!called.has(filter.pair[0]) || !called.has(filter.pair[1])) return false;
    }
    const status = filter.status ?? 'all';
    return status === 'all' || (status === 'settled') === it.settled;
  });
}

/** Settled and open items of a queue. */
export function queueProgress(items: readonly QueueItem[]): QueueProgress {
  const settled = items.filter((i) => i.settled).length;
  return { settled, open: items.length - settled, total: items.length };
}

/** The species pairs that disagree in the queue, for the filter's choices. */
export function speciesPairs(items: readonly QueueItem[]): [string, string][] {
  const seen = new Map<string, [string, string]>();
  for (const it of items) {
    const species = [...new Set(it.calls.map((c) => c.species))].sort();
    for (let i = 0; i < species.length; i++) for (let j = i + 1; j < species.length; j++) seen.set(`${species[i]}|${species[j]}`, [species[i], species[j]]);
  }
  return [...seen.values()].sort((a, b) => a[0].localeCompare(b[0]) || a[1].localeCompare(b[1]));
}
