import { describe, expect, it } from 'vitest';
import { sealEvent } from '../../../src/core/ledger/chain.ts';
import { applyEvent, emptySiteState, replay, SiteRuleError, tagKey } from '../../../src/core/site/index.ts';
import { buildSite, patch, square, tag } from './scenario.ts';

describe('applyEvent', () => {
  it('gives the current state when the ledger is replayed from empty', async () => {
    const l = await buildSite();
    const replayed = replay(emptySiteState(), l.events);
    expect(replayed).toEqual(l.state);
    expect([...replayed.patches.keys()]).toEqual(['p0', 'p1', 'p2', 'p4']);
    expect(replayed.tags.get(tagKey('p1', 'pass-1'))?.species).toBe('mixed');
    expect(replayed.tags.has(tagKey('p3', 'pass-1'))).toBe(false);
    expect(replayed.patches.get('p2')?.geometry).toEqual(square(20, 0, 6));
  });

  it('never changes the state it is given', async () => {
    const l = await buildSite();
    const before = l.state;
    const snapshot = structuredClone({ patches: [...before.patches], tags: [...before.tags], history: before.history });
    await l.add({ kind: 'patch.added', payload: { patch: patch('p9'), tags: [] } });
    expect({ patches: [...before.patches], tags: [...before.tags], history: before.history }).toEqual(snapshot);
  });

  it('undoes many steps and redoes them, as new events, back to the same state', async () => {
    const l = await buildSite();
    const states = [l.state];
    const steps = l.state.history.undo.length;
    expect(steps).toBe(12); // roster, five patches, four tags, a reshape, a deletion; not the pass
    for (let i = 0; i < steps; i++) {
      await l.undo();
      states.push(l.state);
    }
    expect(l.state.patches.size).toBe(0);
    expect(l.state.tags.size).toBe(0);
    expect(l.state.roster).toEqual([]);
    for (let i = steps - 1; i >= 0; i--) {
      await l.redo();
      expect({ p: l.state.patches, t: l.state.tags, r: l.state.roster }).toEqual({ p: states[i].patches, t: states[i].tags, r: states[i].roster });
    }
    expect(replay(emptySiteState(), l.events)).toEqual(l.state);
  });

  it('drops the redo stack on a new change', async () => {
    const l = await buildSite();
    await l.undo();
    expect(l.state.history.redo.length).toBe(1);
    await l.add({ kind: 'patch.added', payload: { patch: patch('p8'), tags: [] } });
    expect(l.state.history.redo).toEqual([]);
  });

  it('refuses events that do not fit the state, leaving nothing half-applied', async () => {
    const l = await buildSite();
    const bad = async (draft: Parameters<typeof l.add>[0]) => {
      const event = await sealEvent({ actor: 'ak', time: l.time(), ...draft } as never, l.state.head);
      return () => applyEvent(l.state, event);
    };
    expect(await bad({ kind: 'patch.added', payload: { patch: patch('p0'), tags: [] } })).toThrow(/already exists/);
    expect(await bad({ kind: 'tag.set', payload: { patchId: 'nope', passId: 'pass-1', tag: tag('nope', 'PICE'), previous: null } })).toThrow(SiteRuleError);
    expect(await bad({ kind: 'tag.set', payload: { patchId: 'p0', passId: 'pass-9', tag: tag('p0', 'PICE', 'pass-9'), previous: null } })).toThrow(/no pass/);
    // deleting a patch without carrying its tags would lose them on undo
    expect(await bad({ kind: 'patch.deleted', payload: { patch: l.state.patches.get('p0')!, tags: [] } })).toThrow(/tag the event does not carry/);
    expect(await bad({ kind: 'patch.geometry', payload: { patchId: 'p0', geometry: square(0, 0), previous: square(0, 0) }, undoes: 3 })).toThrow(/not the next to undo/);
  });

  it('refuses an event out of sequence or from another chain', async () => {
    const l = await buildSite();
    const event = await sealEvent({ kind: 'patch.added', payload: { patch: patch('p7'), tags: [] }, actor: 'ak', time: l.time() }, l.state.head);
    expect(() => applyEvent(l.state, { ...event, seq: event.seq + 1 })).toThrow(/does not follow/);
    expect(() => applyEvent(l.state, { ...event, prev: 'f'.repeat(64) })).toThrow(/another ledger/);
    expect(() => applyEvent(emptySiteState(), { ...event, seq: 1, prev: '0'.repeat(64) })).toThrow(/begin with site.created/);
  });
});
