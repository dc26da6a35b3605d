import { describe, expect, it } from 'vitest';
import { overridesEveryone, reasonProblem } from '../../../src/core/rulings/index.ts';
import type { RulingDecision, Tag } from '../../../src/core/site/types.ts';

// "Overriding both interpreters requires a reason" (issue 7): which decisions agree with
// somebody and which go against every call. Cases worked by hand from that rule.

const tag = (passId: string, species: string): Tag => ({
  patchId: 'P1', passId, species, confidence: 'sure', note: '', interpreter: passId, time: '2026-07-01T10:00:00Z',
  display: { composite: 'natural', stretch: 'minmax', date: '2026-07-01' },
});
const calls = [tag('a', 'PICE'), tag('b', 'ALVI')];

const table: { decision: RulingDecision; tags: Tag[]; overrides: boolean }[] = [
  { decision: { kind: 'accept', passId: 'a' }, tags: calls, overrides: false },
  { decision: { kind: 'species', species: 'PICE' }, tags: calls, overrides: false },
  { decision: { kind: 'species', species: 'LADE' }, tags: calls, overrides: true },
  { decision: { kind: 'mixed' }, tags: calls, overrides: true },
  { decision: { kind: 'mixed' }, tags: [tag('a', 'PICE'), tag('b', 'mixed')], overrides: false },
  { decision: { kind: 'exclude' }, tags: calls, overrides: true },
  { decision: { kind: 'species', species: 'unknown' }, tags: [tag('a', 'unknown')], overrides: true },
  { decision: { kind: 'exclude' }, tags: [], overrides: false },
];

describe('overriding every interpreter needs a reason', () => {
  it.each(table)('$decision.kind $decision over the calls', ({ decision, tags, overrides }) => {
    expect(overridesEveryone(decision, tags)).toBe(overrides);
    expect(reasonProblem(decision, tags, '') !== null).toBe(overrides);
    expect(reasonProblem(decision, tags, 'crown shape and the late-season date')).toBeNull();
  });

  it('does not take blank space as a reason', () => {
    expect(reasonProblem({ kind: 'exclude' }, calls, '   ')).toMatch(/add a reason/);
  });
});
