import { describe, expect, it } from 'vitest';
import { isTaggable, rosterProblems, type RosterEntry } from '../../../src/core/site/index.ts';

const entry = (code: string, key: string): RosterEntry => ({ code, key, scientificName: '', commonName: '', group: 'conifer', colour: '#000000' });

describe('rosterProblems', () => {
  it('accepts a clean roster', () => {
    expect(rosterProblems([entry('PICE', '1'), entry('LADE', '2'), entry('ALVI', '')])).toEqual([]);
  });
  it('names duplicate codes and keys with both rows', () => {
    expect(rosterProblems([entry('PICE', '1'), entry('PICE', '2'), entry('LADE', 'P'), entry('PIMU', 'p')])).toEqual([
      { row: 2, problem: "duplicate code 'PICE' (also on row 1)" },
      { row: 4, problem: "duplicate key 'p' (also on row 3)" },
    ]);
  });
  it('refuses reserved classes, empty codes and long keys', () => {
    expect(rosterProblems([entry('Mixed', '1'), entry(' ', '2'), entry('PICE', 'ab')]).map((p) => p.problem)).toEqual([
      "code 'Mixed' is a reserved class", 'the code is empty', "key 'ab' is not a single character",
    ]);
  });
  it('lets tags name roster codes and reserved classes only', () => {
    const roster = [entry('PICE', '1')];
    expect(isTaggable(roster, 'PICE')).toBe(true);
    expect(isTaggable(roster, 'not vegetation')).toBe(true);
    expect(isTaggable(roster, 'LADE')).toBe(false);
  });
});
