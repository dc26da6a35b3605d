import { describe, expect, it } from 'vitest';
import { consensus, rulingInForce, type ConsensusStatus } from '../../../src/core/export/consensus.ts';
import type { Ruling, Tag } from '../../../src/core/site/types.ts';

// The consensus rules over a table of cases: each row gives the calls, the rulings and
// the outcome the rules in consensus.ts promise.

const tag = (passId: string, species: string): Tag => ({
  patchId: 'P1', passId, species, confidence: 'sure', note: '', interpreter: passId, time: `2025-07-24T10:00:0${passId.charCodeAt(0) % 10}Z`,
  display: { composite: 'natural', stretch: 'minmax', date: '2025-07-24' },
});
const ruling = (id: string, decision: Ruling['decision'], time: string, reopened = false): Ruling => ({
  id, patchId: 'P1', decision, passIds: ['a', 'b'], by: 'cleo', time, reason: 'why',
  reopened: reopened ? { by: 'cleo', time: '2025-07-25T00:00:00Z', reason: 'looked again' } : null,
});

const cases: { name: string; tags: Tag[]; rulings: Ruling[]; status: ConsensusStatus; species: string | null; ruling?: string }[] = [
  { name: 'no tags', tags: [], rulings: [], status: 'untagged', species: null },
  { name: 'one tag', tags: [tag('a', 'ABFI')], rulings: [], status: 'single', species: 'ABFI' },
  { name: 'two agreeing tags', tags: [tag('a', 'ABFI'), tag('b', 'ABFI')], rulings: [], status: 'agreed', species: 'ABFI' },
  { name: 'two differing tags', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [], status: 'open', species: null },
  { name: 'a lone can\'t tell', tags: [tag('a', 'unknown')], rulings: [], status: 'open', species: null },
  { name: 'a species beside a can\'t tell', tags: [tag('a', 'ABFI'), tag('b', 'unknown')], rulings: [], status: 'open', species: null },
  { name: 'two mixed calls agree', tags: [tag('a', 'mixed'), tag('b', 'mixed')], rulings: [], status: 'agreed', species: 'mixed' },
  { name: 'ruling accepts pass b', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'accept', passId: 'b' }, '2025-07-24T12:00:00Z')], status: 'ruled', species: 'SAIN', ruling: 'R1' },
  { name: 'ruling accepts a pass with no tag', tags: [tag('a', 'ABFI')], rulings: [ruling('R1', { kind: 'accept', passId: 'c' }, '2025-07-24T12:00:00Z')], status: 'open', species: null, ruling: 'R1' },
  { name: 'ruling accepts a can\'t tell', tags: [tag('a', 'unknown'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'accept', passId: 'a' }, '2025-07-24T12:00:00Z')], status: 'open', species: null, ruling: 'R1' },
  { name: 'ruling names a third species', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'species', species: 'PIEX' }, '2025-07-24T12:00:00Z')], status: 'ruled', species: 'PIEX', ruling: 'R1' },
  { name: 'ruling marks mixed', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'mixed' }, '2025-07-24T12:00:00Z')], status: 'ruled', species: 'mixed', ruling: 'R1' },
  { name: 'ruling excludes', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'exclude' }, '2025-07-24T12:00:00Z')], status: 'excluded', species: null, ruling: 'R1' },
  { name: 'a ruling overrides agreeing tags', tags: [tag('a', 'ABFI'), tag('b', 'ABFI')], rulings: [ruling('R1', { kind: 'species', species: 'SAIN' }, '2025-07-24T12:00:00Z')], status: 'ruled', species: 'SAIN', ruling: 'R1' },
  { name: 'a reopened ruling no longer settles', tags: [tag('a', 'ABFI'), tag('b', 'SAIN')], rulings: [ruling('R1', { kind: 'accept', passId: 'a' }, '2025-07-24T12:00:00Z', true)], status: 'open', species: null },
  {
    name: 'reopened and ruled again: the new ruling stands',
    tags: [tag('a', 'ABFI'), tag('b', 'SAIN')],
    rulings: [ruling('R1', { kind: 'accept', passId: 'a' }, '2025-07-24T12:00:00Z', true), ruling('R2', { kind: 'accept', passId: 'b' }, '2025-07-25T09:00:00Z')],
    status: 'ruled', species: 'SAIN', ruling: 'R2',
  },
  {
    name: 'two rulings in force: the later wins',
    tags: [tag('a', 'ABFI'), tag('b', 'SAIN')],
    rulings: [ruling('R2', { kind: 'mixed' }, '2025-07-26T09:00:00Z'), ruling('R1', { kind: 'accept', passId: 'a' }, '2025-07-24T12:00:00Z')],
    status: 'ruled', species: 'mixed', ruling: 'R2',
  },
  {
    name: 'two rulings at the same time: the id later in plain text order wins (R9 after R10), whatever the order given',
    tags: [tag('a', 'ABFI'), tag('b', 'SAIN')],
    rulings: [ruling('R9', { kind: 'accept', passId: 'b' }, '2025-07-24T12:00:00Z'), ruling('R10', { kind: 'accept', passId: 'a' }, '2025-07-24T12:00:00Z')],
    status: 'ruled', species: 'SAIN', ruling: 'R9',
  },
];

describe('consensus over a table of tags and rulings', () => {
  for (const c of cases) {
    it(c.name, () => {
      const got = consensus(c.tags, c.rulings);
      expect(got.status).toBe(c.status);
      expect(got.species).toBe(c.species);
      expect(got.rulingId).toBe(c.ruling ?? null);
      expect(got.reason.length).toBeGreaterThan(5);
      // The order the tags and rulings arrive in never changes the outcome.
      expect(consensus([...c.tags].reverse(), [...c.rulings].reverse())).toEqual(got);
    });
  }

  it('rulingInForce skips reopened rulings and returns null when all are reopened', () => {
    expect(rulingInForce([ruling('R1', { kind: 'mixed' }, '2025-07-24T12:00:00Z', true)])).toBeNull();
    expect(rulingInForce([])).toBeNull();
  });
});
