// Blind-pass benchmarks (DESIGN.md contract). The blind view is taken on every commit
// while a pass runs, so it must stay near the floor of looking at each tag once; a
// package is hashed twice (content and file), so it is set beside a plain stringify.
import { blindView } from '../src/core/blind/blindView.ts';
import { buildBlindPackage } from '../src/core/blind/blindPackage.ts';
import { emptySiteState, tagKey, type Pass, type Patch, type SiteState, type Tag } from '../src/core/site/index.ts';
import { result, seeded, time, type Benchmark, type BenchSize } from './harness.ts';

const SPECIES = ['ABFI', 'PIEX', 'PISI', 'SAIN', 'BEFA', 'VAFI', 'RHPE'];

/** A site of n patches, each called in a desk pass and a field pass, with a blind pass over n/10. */
function site(n: number): SiteState {
  const random = seeded(6);
  const patches = new Map<string, Patch>();
  const tags = new Map<string, Tag>();
  const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2025-07-24' };
  const passes = new Map<string, Pass>([
    ['field', { id: 'field', interpreter: 'crew', blind: false, startedAt: '2025-07-01T00:00:00Z', endedAt: '2025-07-02T00:00:00Z', patchIds: null }],
    ['desk', { id: 'desk', interpreter: 'ana', blind: false, startedAt: '2025-07-03T00:00:00Z', endedAt: null, patchIds: null }],
  ]);
  const blindIds: string[] = [];
  for (let i = 0; i < n; i++) {
    const id = `P${i}`;
    const x = 493000 + (i % 300) * 8;
    const y = 4429000 + Math.floor(i / 300) * 8;
    const ring: [number, number][] = [[x, y], [x + 5, y], [x + 5, y + 4 + random()], [x, y + 5], [x, y]];
    patches.set(id, { id, geometry: [[ring]], source: { kind: 'import', importId: 'imp', featureIndex: i, attributes: { species: 'ABFI' } }, createdAt: '2025-07-01T00:00:00Z', createdBy: 'crew' });
    for (const passId of ['field', 'desk']) {
      tags.set(tagKey(id, passId), { patchId: id, passId, species: SPECIES[Math.floor(random() * SPECIES.length)], confidence: 'sure', note: '', interpreter: passId === 'field' ? 'crew' : 'ana', time: '2025-07-03T00:00:00Z', display });
    }
    if (i % 10 === 0) blindIds.push(id);
  }
  passes.set('blind', { id: 'blind', interpreter: 'ben', blind: true, startedAt: '2025-07-04T00:00:00Z', endedAt: null, patchIds: blindIds });
  for (const id of blindIds.slice(0, blindIds.length / 2)) {
    tags.set(tagKey(id, 'blind'), { patchId: id, passId: 'blind', species: 'PIEX', confidence: 'likely', note: '', interpreter: 'ben', time: '2025-07-04T00:00:00Z', display });
  }
  return { ...emptySiteState(), site: { id: 's', name: 'bench', epsg: 32608, createdAt: '2025-07-01T00:00:00Z' }, patches, tags, passes };
}

async function viewBench(size: BenchSize) {
  const n = size === 'large' ? 50_000 : 10_000;
  const state = site(n);
  const ours = await time(() => blindView(state, 'ben'), { runs: 9 });
  // The floor: one look at every tag and every patch (a copy of both maps).
  const floor = await time(() => [new Map(state.tags), new Map(state.patches)], { runs: 9 });
  const beside = await time(() => blindView(state, 'ana'), { runs: 9 });
  return [
    result('blind.view', n, ours, 'copy-tags-and-patches', floor, { tags: state.tags.size, in_pass: state.passes.get('blind')!.patchIds!.length }),
    result('blind.view-beside', n, beside, 'copy-tags-and-patches', floor),
  ];
}

async function packageBench(size: BenchSize) {
  const n = size === 'large' ? 50_000 : 10_000;
  const state = site(n);
  const ours = await time(() => buildBlindPackage(state, 'blind', { time: '2025-07-05T00:00:00Z', by: 'ana' }), { runs: 5 });
  const pass = state.passes.get('blind')!;
  const floor = await time(() => JSON.stringify(pass.patchIds!.map((id) => ({ id, geometry: state.patches.get(id)!.geometry }))), { runs: 5 });
  return [result('blind.package', pass.patchIds!.length, ours, 'stringify-outlines', floor)];
}

export const benchmarks: Benchmark[] = [
  { name: 'blind.view', run: viewBench },
  { name: 'blind.package', run: packageBench },
];
