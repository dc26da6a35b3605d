// Rulings benchmarks (DESIGN.md contract): the disagreement queue of a large site beside
// the obvious per-patch scan of every tag and ruling, and the Rulings page's queue (with
// the checks run for mixed-species findings) beside the checks alone, its floor.
import { rulingsQueue } from '../src/app/rulings/rulingsQueue.ts';
import { runChecks } from '../src/core/checks/runChecks.ts';
import { consensus, disagreementQueue } from '../src/core/rulings/index.ts';
import { emptySiteState, tagKey, type Confidence, type Pass, type Patch, type Ruling, type SiteState, type Tag } from '../src/core/site/index.ts';
import { result, seeded, time, type Benchmark } from './harness.ts';

const SPECIES = ['ABFI', 'PIEX', 'PISI', 'SAIN', 'BEFA', 'VAFI', 'RHPE'];
const CONFIDENCES: Confidence[] = ['sure', 'likely', 'unsure'];
const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };

/** A site of n crowns on a grid, called by a field pass and a blind second look (25 % differ), a tenth of those ruled. */
function site(n: number): SiteState {
  const random = seeded(7);
  const passes: Pass[] = [
    { id: 'field', interpreter: 'field crew', blind: false, startedAt: '2026-07-01T07:00:00Z', endedAt: null, patchIds: null },
    { id: 'blind-b', interpreter: 'b', blind: true, startedAt: '2026-07-02T07:00:00Z', endedAt: '2026-07-02T17:00:00Z', patchIds: [] },
  ];
  const patches = new Map<string, Patch>();
  const tags = new Map<string, Tag>();
  const rulings = new Map<string, Ruling>();
  const side = Math.ceil(Math.sqrt(n));
  for (let i = 0; i < n; i++) {
    const id = `F${i}`;
    const x = (i % side) * 12, y = Math.floor(i / side) * 12, s = 2 + random() * 6;
    patches.set(id, { id, geometry: [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]], source: { kind: 'drawn' }, createdAt: '2026-07-01T07:00:00Z', createdBy: 'field crew' });
    const first = SPECIES[Math.min(SPECIES.length - 1, Math.floor(-Math.log(1 - random()) * 2))];
    const second = random() < 0.25 ? SPECIES[Math.floor(random() * SPECIES.length)] : first;
    for (const [passId, species] of [['field', first], ['blind-b', second]] as const) {
      tags.set(tagKey(id, passId), { patchId: id, passId, species, confidence: CONFIDENCES[Math.floor(random() * 3)], note: '', interpreter: passId, time: '2026-07-02T08:00:00Z', display });
    }
    passes[1].patchIds!.push(id);
    if (first !== second && random() < 0.1) {
      const rid = `ruling-${rulings.size + 1}`;
      rulings.set(rid, { id: rid, patchId: id, decision: { kind: 'accept', passId: 'field' }, passIds: ['blind-b', 'field'], by: 'c', time: '2026-07-03T08:00:00Z', reason: '', reopened: null });
    }
  }
  return { ...emptySiteState(), passes: new Map(passes.map((p) => [p.id, p])), patches, tags, rulings };
}

/** The obvious version: for each patch, scan every tag and every ruling. */
function naiveQueue(state: SiteState): number {
  const tags = [...state.tags.values()];
  const rulings = [...state.rulings.values()];
  let open = 0;
  for (const id of state.patches.keys()) {
    const mine = tags.filter((t) => t.patchId === id);
    if (new Set(mine.map((t) => t.species)).size < 2) continue;
    if (consensus(mine, rulings.filter((r) => r.patchId === id)).status === 'open') open++;
  }
  return open;
}

export const benchmarks: Benchmark[] = [
  {
    name: 'rulings.queue',
    async run(size) {
      const n = size === 'large' ? 10_000 : 2_000;
      const state = site(n);
      const ours = await time(() => disagreementQueue({ state }));
      const naive = await time(() => naiveQueue(state));
      const items = disagreementQueue({ state }).length;
      return [result('rulings.queue', n, ours, 'per-patch scan', naive, { items })];
    },
  },
  {
    name: 'rulings.page-queue',
    async run(size) {
      const n = size === 'large' ? 10_000 : 2_000;
      const state = site(n);
      const ours = await time(() => rulingsQueue(state, 'c'));
      const floor = await time(() => runChecks([...state.patches.values()].map((p) => ({ id: p.id, species: 'ABFI', rings: p.geometry }))));
      return [result('rulings.page-queue', n, ours, 'checks alone (floor)', floor)];
    },
  },
];
