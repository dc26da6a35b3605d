import { describe, expect, it } from 'vitest';
import { consensus, rulingInForce, siteConsensus, type ConsensusStatus } from '../../../src/core/rulings/index.ts';
import type { Confidence, Ruling, RulingDecision, Tag } from '../../../src/core/site/types.ts';

// The consensus rules (src/core/rulings/consensus.ts) over a table of cases: every kind
// of call (species, same or different, "unknown", "can't tell", mixed) against every
// kind of ruling (none, accept, species, mixed, exclude), reopened or not, and a ruling
// reopened and changed. The rules are the project's own (issue 7); that a later
// adjudication supersedes an earlier one and that an adjudicator may only settle on a
// call, a named class or exclusion is common practice in double-interpretation work.

const tag = (passId: string, species: string, confidence: Confidence = 'sure'): Tag => ({
  patchId: 'P1', passId, species, confidence, note: '', interpreter: `i-${passId}`, time: '2026-07-01T10:00:00Z',
  display: { composite: 'natural', stretch: 'minmax', date: '2026-07-01' },
});
const ruling = (id: string, decision: RulingDecision, time: string, reopened = false): Ruling => ({
  id, patchId: 'P1', decision, passIds: ['a', 'b'], by: 'cleo', time, reason: 'why',
  reopened: reopened ? { by: 'cleo', time: '2026-07-03T00:00:00Z', reason: 'looked again' } : null,
});
const T1 = '2026-07-02T10:00:00Z';
const T2 = '2026-07-02T11:00:00Z';

interface Case { name: string; tags: Tag[]; rulings: Ruling[]; status: ConsensusStatus; species: string | null; ruling?: string }
const cases: Case[] = [
  // tags alone
  { name: 'no tags', tags: [], rulings: [], status: 'untagged', species: null },
  { name: 'one species call', tags: [tag('a', 'PICE')], rulings: [], status: 'single', species: 'PICE' },
  { name: 'one mixed call', tags: [tag('a', 'mixed')], rulings: [], status: 'single', species: 'mixed' },
  { name: 'one "unknown"', tags: [tag('a', 'unknown')], rulings: [], status: 'open', species: null },
  { name: 'one "can\'t tell"', tags: [tag('a', "can't tell")], rulings: [], status: 'open', species: null },
  { name: 'two agree', tags: [tag('a', 'PICE'), tag('b', 'PICE', 'unsure')], rulings: [], status: 'agreed', species: 'PICE' },
  { name: 'three agree', tags: [tag('a', 'PICE'), tag('b', 'PICE'), tag('c', 'PICE')], rulings: [], status: 'agreed', species: 'PICE' },
  { name: 'two differ', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [], status: 'open', species: null },
  { name: 'species and mixed differ', tags: [tag('a', 'PICE'), tag('b', 'mixed')], rulings: [], status: 'open', species: null },
  { name: 'species and can\'t tell', tags: [tag('a', 'PICE'), tag('b', "can't tell")], rulings: [], status: 'open', species: null },
  { name: 'two majority, one against', tags: [tag('a', 'PICE'), tag('b', 'PICE'), tag('c', 'ALVI')], rulings: [], status: 'open', species: null },
  // each ruling decision on a disagreement
  { name: 'accept A', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'accept', passId: 'a' }, T1)], status: 'ruled', species: 'PICE', ruling: 'r1' },
  { name: 'accept B', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'accept', passId: 'b' }, T1)], status: 'ruled', species: 'ALVI', ruling: 'r1' },
  { name: 'another species', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'species', species: 'LADE' }, T1)], status: 'ruled', species: 'LADE', ruling: 'r1' },
  { name: 'mixed', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'mixed' }, T1)], status: 'ruled', species: 'mixed', ruling: 'r1' },
  { name: 'exclude', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'exclude' }, T1)], status: 'excluded', species: null, ruling: 'r1' },
  { name: 'species on a lone can\'t tell', tags: [tag('a', "can't tell")], rulings: [ruling('r1', { kind: 'species', species: 'PICE' }, T1)], status: 'ruled', species: 'PICE', ruling: 'r1' },
  { name: 'ruling on agreed calls overrides them', tags: [tag('a', 'PICE'), tag('b', 'PICE')], rulings: [ruling('r1', { kind: 'species', species: 'ALVI' }, T1)], status: 'ruled', species: 'ALVI', ruling: 'r1' },
  // accept that cannot settle
  { name: 'accept a pass with no tag here', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'accept', passId: 'z' }, T1)], status: 'open', species: null, ruling: 'r1' },
  { name: 'accept a can\'t tell call', tags: [tag('a', 'PICE'), tag('b', "can't tell")], rulings: [ruling('r1', { kind: 'accept', passId: 'b' }, T1)], status: 'open', species: null, ruling: 'r1' },
  // reopened
  { name: 'reopened: back to the calls', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'accept', passId: 'a' }, T1, true)], status: 'open', species: null },
  { name: 'reopened on agreed calls: agreed again', tags: [tag('a', 'PICE'), tag('b', 'PICE')], rulings: [ruling('r1', { kind: 'exclude' }, T1, true)], status: 'agreed', species: 'PICE' },
  { name: 'reopened and changed: the new ruling holds', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'accept', passId: 'a' }, T1, true), ruling('r2', { kind: 'accept', passId: 'b' }, T2)], status: 'ruled', species: 'ALVI', ruling: 'r2' },
  { name: 'reopened and changed to exclude', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'mixed' }, T1, true), ruling('r2', { kind: 'exclude' }, T2)], status: 'excluded', species: null, ruling: 'r2' },
  { name: 'both reopened', tags: [tag('a', 'PICE'), tag('b', 'ALVI')], rulings: [ruling('r1', { kind: 'mixed' }, T1, true), ruling('r2', { kind: 'exclude' }, T2, true)], status: 'open', species: null },
  { name: 'order of the list does not matter', tags: [tag('b', 'ALVI'), tag('a', 'PICE')], rulings: [ruling('r2', { kind: 'accept', passId: 'b' }, T2), ruling('r1', { kind: 'accept', passId: 'a' }, T1, true)], status: 'ruled', species: 'ALVI', ruling: 'r2' },
];

describe('consensus over every combination of tags and rulings', () => {
  it.each(cases)('$name', ({ tags, rulings, status, species, ruling: rid }) => {
    const c = consensus(tags, rulings);
    expect(c.status).toBe(status);
    expect(c.species).toBe(species);
    expect(c.rulingId).toBe(rid ?? null);
    expect(c.reason.length).toBeGreaterThan(0);
  });

  it('follows the accepted pass when its tag changes later: the species is never typed twice', () => {
    const r = [ruling('r1', { kind: 'accept', passId: 'b' }, T1)];
    expect(consensus([tag('a', 'PICE'), tag('b', 'ALVI')], r).species).toBe('ALVI');
    expect(consensus([tag('a', 'PICE'), tag('b', 'LADE')], r).species).toBe('LADE');
  });

  it('takes the latest ruling not reopened, ties broken by id', () => {
    const a = ruling('r1', { kind: 'mixed' }, T1);
    const b = ruling('r2', { kind: 'exclude' }, T1);
    expect(rulingInForce([a, b])?.id).toBe('r2');
    expect(rulingInForce([b, a])?.id).toBe('r2');
    expect(rulingInForce([])).toBeNull();
  });

  it('gives every patch of a site its consensus, untagged ones included', () => {
    const all = siteConsensus(['P1', 'P2'], [tag('a', 'PICE'), tag('b', 'ALVI')], [ruling('r1', { kind: 'accept', passId: 'a' }, T1)]);
    expect(all.get('P1')?.species).toBe('PICE');
    expect(all.get('P2')?.status).toBe('untagged');
  });
});
