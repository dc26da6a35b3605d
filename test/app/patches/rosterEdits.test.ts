import { describe, expect, it } from 'vitest';
import { emptySiteState, type RosterEntry, type SiteState, type Tag } from '../../../src/core/site/index.ts';
import { rosterRefusals } from '../../../src/app/patches/rosterEdits.ts';
import { withOwnIds } from '../../../src/app/patches/importFieldFile.ts';
import { DESK_KEYS } from '../../../src/ui/state/patchKeys.ts';
import type { EventPayloads } from '../../../src/core/site/index.ts';

// The desk's own roster rules beside the site model's (rules of our own: a roster key
// may not shadow a desk key, a code in use may not be dropped), and the field file's ids
// kept as patch ids only when that is safe.

const entry = (code: string, key: string, colour = '#009E73'): RosterEntry => ({ code, scientificName: '', commonName: '', group: 'conifer', colour, key });
const tag = (patchId: string, species: string): Tag => ({
  patchId, passId: 'p1', species, confidence: 'sure', note: '', interpreter: 'ak', time: 't', display: { composite: '', stretch: '', date: '' },
});
const state = (roster: RosterEntry[], tags: Tag[] = []): SiteState => ({
  ...emptySiteState(), roster, tags: new Map(tags.map((t) => [`${t.patchId}|${t.passId}`, t])),
});

describe('rosterRefusals', () => {
  it('accepts a sound roster', () => {
    expect(rosterRefusals(state([]), [entry('ABFI', '1'), entry('PIEX', '2')], DESK_KEYS)).toEqual([]);
  });

  it('names every row with a problem: duplicates, desk keys, bad colours', () => {
    const problems = rosterRefusals(state([]), [entry('ABFI', '1'), entry('ABFI', 'p'), entry('SAIN', 'u', 'green')], DESK_KEYS);
    expect(problems).toContain("row 2: duplicate code 'ABFI' (also on row 1)");
    expect(problems).toContain("row 2: key 'p' already does something else on the desk (see the keys page)");
    expect(problems).toContain("row 3: key 'u' already does something else on the desk (see the keys page)");
    expect(problems).toContain("row 3: colour 'green' is not of the form #RRGGBB");
  });

  it('refuses to drop a code that tags still use', () => {
    const before = state([entry('ABFI', '1'), entry('PIEX', '2')], [tag('a', 'PIEX'), tag('b', 'PIEX')]);
    expect(rosterRefusals(before, [entry('ABFI', '1')], DESK_KEYS)).toEqual([
      "code 'PIEX' is dropped but 2 tag(s) still use it; retag those patches first",
    ]);
  });
});

describe('withOwnIds', () => {
  const payload = (ids: unknown[]): EventPayloads['import.added'] => ({
    record: {} as never,
    patches: ids.map((id, i) => ({
      id: `import-1-${i}`, geometry: [], createdAt: 't', createdBy: 'crew',
      source: { kind: 'import', importId: 'import-1', featureIndex: i, attributes: id === undefined ? {} : { id } },
    })),
    tags: [tag('import-1-1', 'PIEX')],
    references: [],
  });

  it('takes the file ids, and moves the tags with them', () => {
    const out = withOwnIds(payload(['F001', 'F002']), state([]));
    expect(out.patches.map((p) => p.id)).toEqual(['F001', 'F002']);
    expect(out.tags[0].patchId).toBe('F002');
  });

  it('keeps the import ids when a file id is missing, repeated or already taken', () => {
    expect(withOwnIds(payload(['F001', undefined]), state([])).patches[0].id).toBe('import-1-0');
    expect(withOwnIds(payload(['F001', 'F001']), state([])).patches[0].id).toBe('import-1-0');
    const taken = { ...state([]), patches: new Map([['F001', {} as never]]) };
    expect(withOwnIds(payload(['F001', 'F002']), taken).patches[0].id).toBe('import-1-0');
  });
});
