import { describe, expect, it } from 'vitest';
import { deleteScheme, saveScheme, SchemeRefused } from '../../../src/app/training/schemeEdits.ts';
import { sealEvent } from '../../../src/core/ledger/chain.ts';
import { applyEvent, emptySiteState, inverseOf, replay, type EventDraft } from '../../../src/core/site/index.ts';
import { groupScheme, oneAgainstRestScheme } from '../../../src/core/training/scheme.ts';
import { MemorySite } from '../blind/memorySite.ts';

// Storing the site's named schemes: one 'schemes.set' event per change, carrying the
// whole list and the one it replaces, so its inverse restores the list; refusals write
// nothing. The rules are the project's own (issue 8), worked by hand.

const who = { interpreter: 'ak', time: '2026-07-01T08:00:00.000Z' };
const roster = [{ code: 'PICE', group: 'conifer' }, { code: 'LADE', group: 'conifer' }, { code: 'ALVI', group: 'broadleaf shrub' }];

async function site() {
  const s = new MemorySite();
  await s.commitWith(() => ({ kind: 'site.created', payload: { site: { id: 's', name: 'Scheme basin', epsg: 32632, createdAt: who.time } }, actor: 'ak', time: who.time }));
  return s;
}

describe('scheme edits', () => {
  it('stores new schemes last, edits one in its place, and deletes one, each an event with the list it replaced', async () => {
    const s = await site();
    await saveScheme(s, { ...groupScheme(roster, 'conifer'), name: ' Conifers apart ' }, null, who);
    await saveScheme(s, oneAgainstRestScheme(['PICE', 'LADE', 'ALVI'], 'ALVI'), null, who);
    expect(s.state.schemes.map((x) => x.name)).toEqual(['Conifers apart', 'ALVI against the rest']);
    expect(s.state.schemes[0].classOf).toEqual({ PICE: 'PICE', LADE: 'LADE', ALVI: 'other' });
    // Renamed and a class cleared: it keeps its place; the blank class leaves ALVI unmapped.
    await saveScheme(s, { name: 'Conifers only', classOf: { PICE: 'PICE', LADE: ' LADE ', ALVI: '  ' } }, 'Conifers apart', who);
    expect(s.state.schemes.map((x) => x.name)).toEqual(['Conifers only', 'ALVI against the rest']);
    expect(s.state.schemes[0].classOf).toEqual({ PICE: 'PICE', LADE: 'LADE' });
    expect(await saveScheme(s, { name: 'Conifers only', classOf: { PICE: 'PICE', LADE: 'LADE' } }, 'Conifers only', who)).toBeNull();
    await deleteScheme(s, 'ALVI against the rest', who);
    expect(s.state.schemes.map((x) => x.name)).toEqual(['Conifers only']);
    const last = s.events.at(-1)!;
    expect(last.kind).toBe('schemes.set');
    expect(last.payload).toMatchObject({ schemes: [{ name: 'Conifers only' }], previous: [{ name: 'Conifers only' }, { name: 'ALVI against the rest' }] });
    // Its inverse (what undo commits) brings the deleted scheme back; replay gives the same list.
    const undone = applyEvent(s.state, await sealEvent({ ...inverseOf(last), actor: 'ak', time: who.time, undoes: last.seq } as EventDraft, s.state.head));
    expect(undone.schemes.map((x) => x.name)).toEqual(['Conifers only', 'ALVI against the rest']);
    expect(replay(emptySiteState(), s.events).schemes).toEqual(s.state.schemes);
  });

  it('refuses an empty scheme, a taken name and a scheme gone from the site, writing nothing', async () => {
    const s = await site();
    await saveScheme(s, { name: 'Lumped', classOf: { PICE: 'tree' } }, null, who);
    const count = s.events.length;
    const refusals: [Promise<unknown>, RegExp][] = [
      [saveScheme(s, { name: '  ', classOf: { PICE: 'tree' } }, null, who), /not saved: a scheme needs a name/],
      [saveScheme(s, { name: 'Empty', classOf: { PICE: ' ' } }, null, who), /not saved: scheme "Empty" maps no species/],
      [saveScheme(s, { name: 'lumped', classOf: { LADE: 'tree' } }, null, who), /another scheme is already called "lumped"/],
      [saveScheme(s, { name: 'Other', classOf: { LADE: 'tree' } }, 'Vanished', who), /"Vanished" is no longer stored/],
      [deleteScheme(s, 'Vanished', who), /no stored scheme called "Vanished"/],
    ];
    for (const [attempt, message] of refusals) {
      await expect(attempt).rejects.toBeInstanceOf(SchemeRefused);
      await expect(attempt).rejects.toThrow(message);
    }
    expect(s.events).toHaveLength(count);
  });
});
