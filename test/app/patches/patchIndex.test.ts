import { describe, expect, it } from 'vitest';
import { emptySiteState, type Pass, type Patch, type SiteState, type Tag } from '../../../src/core/site/index.ts';
import { findPatchId, hiddenPasses, newPatchId, nextMatching, patchOrder, shownTag, tagsByPatch } from '../../../src/app/patches/patchIndex.ts';

// The desk's walk through patches and the tag each one shows (rules of our own, worked
// by hand on small sites).

const square = (x: number): Patch['geometry'] => [[[[x, 0], [x + 1, 0], [x + 1, 1], [x, 1], [x, 0]]]];
const patch = (id: string, x = 0): Patch => ({ id, geometry: square(x), source: { kind: 'drawn' }, createdAt: 't', createdBy: 'ak' });
const tag = (patchId: string, passId: string, species: string, time: string, confidence: Tag['confidence'] = 'likely'): Tag => ({
  patchId, passId, species, confidence, note: '', interpreter: passId, time, display: { composite: 'natural', stretch: 'p2-98', date: '2025-07-24' },
});
const pass = (id: string, interpreter: string, blind = false): Pass => ({ id, interpreter, blind, startedAt: 't', endedAt: null, patchIds: null });

function site(patches: Patch[], tags: Tag[], passes: Pass[] = []): SiteState {
  return {
    ...emptySiteState(),
    patches: new Map(patches.map((p) => [p.id, p])),
    tags: new Map(tags.map((t) => [`${t.patchId}|${t.passId}`, t])),
    passes: new Map(passes.map((p) => [p.id, p])),
  };
}

describe('patch order and walking', () => {
  it('orders ids with their numbers as numbers', () => {
    expect(patchOrder([patch('P10'), patch('P2'), patch('F001'), patch('P1')])).toEqual(['F001', 'P1', 'P2', 'P10']);
  });

  it('finds the next matching patch after the one in hand, wrapping round', () => {
    const order = ['a', 'b', 'c', 'd'];
    const wanted = (id: string) => id === 'a' || id === 'c';
    expect(nextMatching(order, null, wanted)).toBe('a');
    expect(nextMatching(order, 'a', wanted)).toBe('c');
    expect(nextMatching(order, 'c', wanted)).toBe('a');
    expect(nextMatching(order, 'd', wanted)).toBe('a');
    // The patch in hand itself comes last, so a lone match is found again.
    expect(nextMatching(order, 'c', (id) => id === 'c')).toBe('c');
    expect(nextMatching(order, 'b', () => false)).toBeNull();
    expect(nextMatching([], null, () => true)).toBeNull();
  });

  it('finds a typed id exactly, then ignoring case and spaces', () => {
    const state = site([patch('F001'), patch('P0003')], []);
    expect(findPatchId(state, 'F001')).toBe('F001');
    expect(findPatchId(state, '  p0003 ')).toBe('P0003');
    expect(findPatchId(state, 'P3')).toBeNull();
    expect(findPatchId(state, '')).toBeNull();
  });

  it('numbers a new drawn patch after the highest drawn one', () => {
    expect(newPatchId(site([], []))).toBe('P0001');
    expect(newPatchId(site([patch('P0001'), patch('P0007'), patch('F123')], []))).toBe('P0008');
  });
});

describe('the tag a patch shows', () => {
  const tags = [
    tag('a', 'field', 'PIEX', '2026-07-01T08:00:00Z'),
    tag('a', 'ak-1', 'ABFI', '2026-07-01T09:00:00Z', 'unsure'),
    tag('a', 'blind-1', 'SAIN', '2026-07-01T10:00:00Z'),
  ];
  const state = site([patch('a'), patch('b')], tags, [pass('field', 'crew'), pass('ak-1', 'ak'), pass('blind-1', 'bo', true)]);

  it('groups tags by patch', () => {
    const grouped = tagsByPatch(state);
    expect(grouped.get('a')).toHaveLength(3);
    expect(grouped.get('b')).toBeUndefined();
  });

  it('shows the pass in hand first, else the newest tag outside blind passes', () => {
    const grouped = tagsByPatch(state);
    const hidden = hiddenPasses(state, 'ak');
    expect([...hidden]).toEqual(['blind-1']);
    expect(shownTag(grouped.get('a'), 'field', hidden)?.species).toBe('PIEX');
    expect(shownTag(grouped.get('a'), null, hidden)?.species).toBe('ABFI');
    // The blind interpreter sees their own call.
    expect(shownTag(grouped.get('a'), 'blind-1', hiddenPasses(state, 'bo'))?.species).toBe('SAIN');
    expect(shownTag(grouped.get('b'), 'ak-1', hidden)).toBeNull();
  });
});
