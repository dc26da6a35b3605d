import { describe, expect, it } from 'vitest';
import { sealEvent } from '../../../src/core/ledger/chain.ts';
import {
  applyEvent, emptySiteState, isPaused, readSiteFile, replay, siteFileOf, tagKey, touchedRows, writeSiteFile,
  type Pass, type Patch,
} from '../../../src/core/site/index.ts';
import { patchHistory } from '../../../src/core/export/patchHistory.ts';
import { buildSite, patch, square, type MemoryLedger } from './scenario.ts';

// The event kinds of one-step cuts and joins, blind-pass pauses, interpreter switches and
// stored schemes: each applies, undoes where it can, replays from empty to the same state,
// and is refused when it does not fit.

const half = (x: number, y: number, w: number, h: number): Patch['geometry'] => [[[[x, y], [x + w, y], [x + w, y + h], [x, y + h], [x, y]]]];

async function refused(l: MemoryLedger, draft: Parameters<MemoryLedger['add']>[0]): Promise<() => unknown> {
  const event = await sealEvent({ actor: 'ak', time: l.time(), ...draft } as never, l.state.head);
  return () => applyEvent(l.state, event);
}

describe('patches.replaced', () => {
  it('cuts a patch into pieces that keep its tags, and one undo puts it back whole', async () => {
    const l = await buildSite();
    const original = l.state.patches.get('p0')!;
    const tags = [...l.state.tags.values()].filter((t) => t.patchId === 'p0');
    expect(tags.length).toBe(1);
    const kept = { ...original, geometry: half(0, 0, 2, 4) };
    const piece: Patch = { ...patch('p9'), geometry: half(2, 0, 2, 4) };
    await l.add({
      kind: 'patches.replaced',
      payload: { edit: 'cut', before: { patches: [original], tags }, after: { patches: [kept, piece], tags: [...tags, ...tags.map((t) => ({ ...t, patchId: 'p9' }))] } },
    });
    expect(l.state.patches.get('p0')!.geometry).toEqual(half(0, 0, 2, 4));
    expect(l.state.tags.get(tagKey('p9', 'pass-1'))?.species).toBe(tags[0].species);
    const steps = l.state.history.undo.length;
    await l.undo();
    expect(l.state.history.undo.length).toBe(steps - 1);
    expect(l.state.patches.get('p0')!.geometry).toEqual(square(0, 0));
    expect(l.state.patches.has('p9')).toBe(false);
    expect(l.state.tags.has(tagKey('p9', 'pass-1'))).toBe(false);
    await l.redo();
    expect(l.state.patches.has('p9')).toBe(true);
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('joins two patches in one step; the one that goes takes its tags along and gets them back on undo', async () => {
    const l = await buildSite();
    const a = l.state.patches.get('p0')!;
    const b = l.state.patches.get('p1')!;
    const tagsA = [...l.state.tags.values()].filter((t) => t.patchId === 'p0');
    const tagsB = [...l.state.tags.values()].filter((t) => t.patchId === 'p1');
    expect(tagsB.length).toBeGreaterThan(0);
    await l.add({
      kind: 'patches.replaced',
      payload: { edit: 'join', before: { patches: [a, b], tags: [...tagsA, ...tagsB] }, after: { patches: [{ ...a, geometry: half(0, 0, 14, 4) }], tags: tagsA } },
    });
    expect(l.state.patches.has('p1')).toBe(false);
    expect([...l.state.tags.values()].some((t) => t.patchId === 'p1')).toBe(false);
    await l.undo();
    expect(l.state.patches.get('p1')).toEqual(b);
    expect(l.state.tags.get(tagKey('p1', 'pass-1'))).toEqual(tagsB[0]);
    expect(l.state.patches.get('p0')).toEqual(a);
  });

  it('is refused whole when a patch it removes carries a tag it does not list, or a piece already exists', async () => {
    const l = await buildSite();
    const a = l.state.patches.get('p0')!;
    expect(await refused(l, { kind: 'patches.replaced', payload: { edit: 'cut', before: { patches: [a], tags: [] }, after: { patches: [a], tags: [] } } }))
      .toThrow(/tag the event does not carry/);
    const tags = [...l.state.tags.values()].filter((t) => t.patchId === 'p0');
    expect(await refused(l, { kind: 'patches.replaced', payload: { edit: 'cut', before: { patches: [a], tags }, after: { patches: [a, patch('p2')], tags } } }))
      .toThrow(/p2 already exists/);
  });

  it('touches each row once, and the export history tells the cut and keeps the earlier changes of the piece', async () => {
    const l = await buildSite();
    const original = l.state.patches.get('p2')!; // reshaped once in the scenario
    const tags = [...l.state.tags.values()].filter((t) => t.patchId === 'p2');
    const event = await l.add({
      kind: 'patches.replaced',
      payload: { edit: 'cut', before: { patches: [original], tags }, after: { patches: [{ ...original, geometry: half(20, 0, 3, 6) }, { ...patch('p9'), geometry: half(23, 0, 3, 6) }], tags } },
    });
    expect(touchedRows(event).patches).toEqual(['p2', 'p9']);
    const history = patchHistory(l.events);
    const p2 = history.changes.get('p2')!;
    const p9 = history.changes.get('p9')!;
    expect(p2.at(-1)).toMatchObject({ kind: 'edit', how: 'cut', seq: event.seq });
    expect(p9.map((c) => c.seq)).toEqual(p2.map((c) => c.seq));
    expect(history.origin.get('p9')?.seq).toBe(event.seq);
  });
});

describe('pass.paused and pass.resumed', () => {
  async function withBlindPass(): Promise<MemoryLedger> {
    const l = await buildSite();
    const pass: Pass = { id: 'blind-1', interpreter: 'bj', blind: true, startedAt: l.time(), endedAt: null, patchIds: ['p0', 'p1'] };
    await l.add({ kind: 'pass.started', payload: { pass } });
    return l;
  }

  it('hold a blind pass and take it up again, keeping every period; ending a held pass closes its pause', async () => {
    const l = await withBlindPass();
    const t1 = l.time();
    await l.add({ kind: 'pass.paused', payload: { passId: 'blind-1', time: t1 } });
    expect(isPaused(l.state.passes.get('blind-1')!)).toBe(true);
    const t2 = l.time();
    await l.add({ kind: 'pass.resumed', payload: { passId: 'blind-1', time: t2 } });
    expect(isPaused(l.state.passes.get('blind-1')!)).toBe(false);
    const t3 = l.time();
    await l.add({ kind: 'pass.paused', payload: { passId: 'blind-1', time: t3 } });
    const t4 = l.time();
    await l.add({ kind: 'pass.ended', payload: { passId: 'blind-1', time: t4 } });
    expect(l.state.passes.get('blind-1')!.pauses).toEqual([{ pausedAt: t1, resumedAt: t2 }, { pausedAt: t3, resumedAt: t4 }]);
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('are not undo steps, and are refused on a pass that is not an open blind one or already in that state', async () => {
    const l = await withBlindPass();
    const steps = l.state.history.undo.length;
    await l.add({ kind: 'pass.paused', payload: { passId: 'blind-1', time: l.time() } });
    expect(l.state.history.undo.length).toBe(steps);
    expect(await refused(l, { kind: 'pass.paused', payload: { passId: 'blind-1', time: l.time() } })).toThrow(/already paused/);
    await l.add({ kind: 'pass.resumed', payload: { passId: 'blind-1', time: l.time() } });
    expect(await refused(l, { kind: 'pass.resumed', payload: { passId: 'blind-1', time: l.time() } })).toThrow(/not paused/);
    expect(await refused(l, { kind: 'pass.paused', payload: { passId: 'pass-1', time: l.time() } })).toThrow(/not an open blind pass/);
    expect(await refused(l, { kind: 'pass.paused', payload: { passId: 'nope', time: l.time() } })).toThrow(/no pass nope/);
  });
});

describe('schemes.set and interpreter.switched', () => {
  const conifers = { name: 'conifers and the rest', classOf: { PICE: 'PICE', ALVI: 'other' } };
  const target = { name: 'alder against the rest', classOf: { PICE: 'not ALVI', ALVI: 'ALVI' } };

  it('stores the named schemes, undoes to the list before, and refuses two schemes of one name', async () => {
    const l = await buildSite();
    await l.add({ kind: 'schemes.set', payload: { schemes: [conifers], previous: [] } });
    await l.add({ kind: 'schemes.set', payload: { schemes: [conifers, target], previous: [conifers] } });
    expect(l.state.schemes).toEqual([conifers, target]);
    await l.undo();
    expect(l.state.schemes).toEqual([conifers]);
    expect(await refused(l, { kind: 'schemes.set', payload: { schemes: [conifers, conifers], previous: [conifers] } })).toThrow(/two schemes are called/);
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('records a switch of interpreter in the ledger without changing the site or the undo stack', async () => {
    const l = await buildSite();
    const before = l.state;
    await l.add({ kind: 'interpreter.switched', payload: { from: 'ak', to: 'bj', initials: 'BJ' } });
    expect({ ...l.state, head: before.head }).toEqual(before);
    expect(l.events.at(-1)?.kind).toBe('interpreter.switched');
  });

  it('travel in the site file and read back; a version 1 file without schemes still restores', async () => {
    const l = await buildSite();
    await l.add({ kind: 'schemes.set', payload: { schemes: [target], previous: [] } });
    const text = writeSiteFile(siteFileOf(l.state, l.events));
    const back = await readSiteFile('site.json', text);
    expect(back.state.schemes).toEqual([target]);

    const old = await buildSite();
    const file = siteFileOf(old.state, old.events) as unknown as Record<string, unknown>;
    delete file.schemes;
    file.version = 1;
    const restored = await readSiteFile('old.site.json', JSON.stringify(file));
    expect(restored.state.schemes).toEqual([]);
    expect(restored.state.patches.size).toBe(old.state.patches.size);
  });
});
