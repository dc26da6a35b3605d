import { afterEach, describe, expect, it } from 'vitest';
import { emptySiteState, replay, tagKey, type EventDraft } from '../../src/core/site/index.ts';
import { SiteStore } from '../../src/store/SiteStore.ts';
import { listSites } from '../../src/store/siteCatalogue.ts';
import { patch, tag } from '../core/site/scenario.ts';

// Real IndexedDB in Chromium (vitest browser mode): what is committed is what reopens.

const opened: SiteStore[] = [];
afterEach(async () => {
  for (const store of opened.splice(0)) {
    const id = store.state.site!.id;
    store.close();
    await SiteStore.remove(id);
  }
});

let counter = 0;
async function newSite(): Promise<SiteStore> {
  const id = `t${Date.now()}-${counter++}`;
  const store = await SiteStore.create({ id, name: `Test ${id}`, epsg: 32632, createdAt: '2026-07-01T08:00:00.000Z' }, 'ak');
  opened.push(store);
  await store.commit({ kind: 'pass.started', payload: { pass: { id: 'pass-1', interpreter: 'ak', blind: false, startedAt: 't', endedAt: null, patchIds: null } }, actor: 'ak', time: 't' });
  return store;
}

const at = (i: number) => new Date(Date.UTC(2026, 6, 1, 9, 0, i)).toISOString();
const add = (id: string, x = 0): EventDraft => ({ kind: 'patch.added', payload: { patch: patch(id, x), tags: [] }, actor: 'ak', time: at(0) });

describe('SiteStore', () => {
  it('reopens with the same state, the ledger verifies and replays to it', async () => {
    const store = await newSite();
    for (let i = 0; i < 20; i++) await store.commit(add(`p${i}`, i * 10));
    await store.commitWith((s) => ({ kind: 'tag.set', payload: { patchId: 'p3', passId: 'pass-1', tag: tag('p3', 'PICE'), previous: s.tags.get(tagKey('p3', 'pass-1')) ?? null }, actor: 'ak', time: at(1) }));
    const id = store.state.site!.id;
    const before = store.state;
    store.close();
    const again = await SiteStore.open(id);
    opened[opened.indexOf(store)] = again;
    expect(again.state).toEqual(before);
    expect(await again.verify()).toMatchObject({ ok: true, length: 23 });
    expect(replay(emptySiteState(), await again.ledger())).toEqual(again.state);
    expect((await listSites()).some((s) => s.id === id)).toBe(true);
  });

  it('keeps a one-step cut, its undo, the stored schemes and a held pass in the rows, across a reopen', async () => {
    const store = await newSite();
    await store.commit(add('p0'));
    await store.commitWith((s) => ({ kind: 'tag.set', payload: { patchId: 'p0', passId: 'pass-1', tag: tag('p0', 'PICE'), previous: s.tags.get(tagKey('p0', 'pass-1')) ?? null }, actor: 'ak', time: at(1) }));
    const original = store.state.patches.get('p0')!;
    const tags = [store.state.tags.get(tagKey('p0', 'pass-1'))!];
    const half = (x: number): typeof original.geometry => [[[[x, 0], [x + 2, 0], [x + 2, 4], [x, 4], [x, 0]]]];
    await store.commit({
      kind: 'patches.replaced',
      payload: { edit: 'cut', before: { patches: [original], tags }, after: { patches: [{ ...original, geometry: half(0) }, { ...patch('p1'), geometry: half(2) }], tags: [...tags, { ...tags[0], patchId: 'p1' }] } },
      actor: 'ak', time: at(2),
    });
    const scheme = { name: 'spruce against the rest', classOf: { PICE: 'PICE' } };
    await store.commit({ kind: 'schemes.set', payload: { schemes: [scheme], previous: [] }, actor: 'ak', time: at(3) });
    await store.commit({ kind: 'pass.started', payload: { pass: { id: 'blind-1', interpreter: 'bj', blind: true, startedAt: at(4), endedAt: null, patchIds: ['p0'] } }, actor: 'ak', time: at(4) });
    await store.commit({ kind: 'pass.paused', payload: { passId: 'blind-1', time: at(5) }, actor: 'bj', time: at(5) });
    const id = store.state.site!.id;
    const cut = store.state;
    store.close();
    let again = await SiteStore.open(id);
    opened[opened.indexOf(store)] = again;
    expect(again.state).toEqual(cut);
    expect(again.state.schemes).toEqual([scheme]);
    expect(again.state.passes.get('blind-1')!.pauses).toEqual([{ pausedAt: at(5), resumedAt: null }]);
    await again.undo('ak', at(6)); // the schemes
    await again.undo('ak', at(7)); // the whole cut in one step
    expect(again.state.patches.has('p1')).toBe(false);
    expect(again.state.tags.has(tagKey('p1', 'pass-1'))).toBe(false);
    expect(again.state.patches.get('p0')!.geometry).toEqual(original.geometry);
    const undone = again.state;
    again.close();
    const third = await SiteStore.open(id);
    opened[opened.indexOf(again)] = third;
    again = third;
    expect(again.state).toEqual(undone);
    expect(again.state.schemes).toEqual([]);
    expect(await again.verify()).toMatchObject({ ok: true });
    expect(replay(emptySiteState(), await again.ledger())).toEqual(again.state);
  });

  it('undoes and redoes many steps durably across a reopen', async () => {
    const store = await newSite();
    for (let i = 0; i < 30; i++) await store.commit(add(`p${i}`, i * 10));
    for (let i = 0; i < 25; i++) await store.undo('ak', at(i));
    expect(store.state.patches.size).toBe(5);
    const id = store.state.site!.id;
    store.close();
    const again = await SiteStore.open(id);
    opened[opened.indexOf(store)] = again;
    expect(again.state.patches.size).toBe(5);
    for (let i = 0; i < 10; i++) await again.redo('ak', at(i));
    expect([...again.state.patches.keys()].sort()).toEqual(Array.from({ length: 15 }, (_, i) => `p${i}`).sort());
    expect(await again.undo('ak', at(0))).not.toBeNull();
    expect(await again.verify()).toMatchObject({ ok: true });
  });

  it('refuses a change that does not fit, writing nothing', async () => {
    const store = await newSite();
    await store.commit(add('p1'));
    const head = store.state.head;
    await expect(store.commit(add('p1'))).rejects.toThrow(/already exists/);
    expect(store.state.head).toEqual(head);
    expect((await store.ledger()).length).toBe(head.seq);
    // the queue goes on after a refusal
    await store.commit(add('p2'));
    expect(store.state.head.seq).toBe(head.seq + 1);
  });

  it('writes changes in call order even when not awaited one by one', async () => {
    const store = await newSite();
    await Promise.all(Array.from({ length: 50 }, (_, i) => store.commit(add(`q${i}`, i))));
    const ledger = await store.ledger();
    expect(ledger.slice(2).map((e) => (e.kind === 'patch.added' ? e.payload.patch.id : ''))).toEqual(Array.from({ length: 50 }, (_, i) => `q${i}`));
  });

  it('refuses to write over changes another window made', async () => {
    const store = await newSite();
    const other = await SiteStore.open(store.state.site!.id);
    await other.commit(add('from-other'));
    other.close();
    await expect(store.commit(add('from-here'))).rejects.toMatchObject({ kind: 'stale' });
  });
});
