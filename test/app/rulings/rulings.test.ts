import { describe, expect, it } from 'vitest';
import { recordRuling } from '../../../src/app/rulings/recordRuling.ts';
import { reopenRuling } from '../../../src/app/rulings/reopenRuling.ts';
import { sendToThirdReader } from '../../../src/app/rulings/sendToThirdReader.ts';
import { rulingsQueue } from '../../../src/app/rulings/rulingsQueue.ts';
import { verifyChain } from '../../../src/core/ledger/chain.ts';
import { disagreementQueue, queueProgress, RulingError, siteConsensus } from '../../../src/core/rulings/index.ts';
import { emptySiteState, replay, tagsOfPatch, type SiteState } from '../../../src/core/site/index.ts';
import { at, display, ruledSite } from './ruledSite.ts';

// Rulings as ledger events: recorded with who, when, what, why and which passes;
// reopened keeping the history; refused with a clear message (and nothing written) when
// the patch changed under the screen, was deleted, or the decision overrides everyone
// without a reason. Replaying the ledger from empty gives the same consensus: the
// replay uses the site's own reducer (applyEvent) and the chain check of
// src/core/ledger, whose SHA-256 is checked against FIPS 180-4 in test/core/ledger.

const ruler = (): { interpreter: string; time: string } => ({ interpreter: 'cy', time: at() });

function consensusOf(state: SiteState) {
  return siteConsensus(state.patches.keys(), state.tags.values(), state.rulings.values());
}

async function threeDisagreements() {
  return ruledSite([
    { size: 10, first: 'PICE', second: { species: 'ALVI' } },
    { size: 8, first: 'PICE', second: { species: 'LADE' } },
    { size: 6, first: 'ALVI', second: { species: "can't tell" } },
  ]);
}

describe('recording and reopening rulings', () => {
  it('records each ruling as a chained event and settles the queue; replay gives the same consensus', async () => {
    const { site, blindPassId } = await threeDisagreements();
    const r1 = await recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: blindPassId }, seen: null }, ruler());
    expect(r1).toMatchObject({ patchId: 'P1', by: 'cy', passIds: [blindPassId, 'pass-ak'].sort(), reason: '', reopened: null });
    const r2 = await recordRuling(site, { patchId: 'P2', decision: { kind: 'species', species: 'PICE' }, seen: null }, ruler());
    await recordRuling(site, { patchId: 'P3', decision: { kind: 'exclude' }, reason: 'shadowed by the ridge', seen: null }, ruler());
    const last = site.events.at(-1)!;
    expect(last.kind).toBe('ruling.recorded');
    expect(last.actor).toBe('cy');
    expect(queueProgress(disagreementQueue({ state: site.state }))).toEqual({ settled: 3, open: 0, total: 3 });

    await reopenRuling(site, r2.id, 'the larch turns in autumn: look at the second date', ruler());
    await recordRuling(site, { patchId: 'P2', decision: { kind: 'accept', passId: blindPassId }, seen: null }, ruler());
    const c = consensusOf(site.state);
    expect([...c].map(([id, v]) => [id, v.status, v.species])).toEqual([['P1', 'ruled', 'ALVI'], ['P2', 'ruled', 'LADE'], ['P3', 'excluded', null]]);
    // the reopened ruling stays, marked
    expect(site.state.rulings.get(r2.id)?.reopened?.reason).toMatch(/second date/);
    expect([...site.state.rulings.values()].filter((r) => r.patchId === 'P2')).toHaveLength(2);

    expect((await verifyChain(site.events)).ok).toBe(true);
    const replayed = replay(emptySiteState(), site.events);
    expect(consensusOf(replayed)).toEqual(c);
    expect(replayed.rulings).toEqual(site.state.rulings);
    expect(site.events.filter((e) => e.kind === 'ruling.recorded')).toHaveLength(4);
    expect(site.events.filter((e) => e.kind === 'ruling.reopened')).toHaveLength(1);
  });

  it('refuses to override every call without a reason, recording nothing', async () => {
    const { site } = await threeDisagreements();
    const before = site.events.length;
    await expect(recordRuling(site, { patchId: 'P1', decision: { kind: 'species', species: 'LADE' }, seen: null }, ruler())).rejects.toThrow(/overrides every interpreter's call: add a reason/);
    await expect(recordRuling(site, { patchId: 'P1', decision: { kind: 'mixed' }, reason: ' ', seen: null }, ruler())).rejects.toThrow(RulingError);
    expect(site.events.length).toBe(before);
    await recordRuling(site, { patchId: 'P1', decision: { kind: 'species', species: 'LADE' }, reason: 'needles in tufts on the pan band', seen: null }, ruler());
    expect(site.events.length).toBe(before + 1);
  });

  it('refuses decisions that cannot stand', async () => {
    const { site, blindPassId } = await threeDisagreements();
    await expect(recordRuling(site, { patchId: 'P3', decision: { kind: 'accept', passId: blindPassId }, seen: null }, ruler())).rejects.toThrow(/names no species/);
    await expect(recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: 'pass-zz' }, seen: null }, ruler())).rejects.toThrow(/no pass pass-zz/);
    await expect(recordRuling(site, { patchId: 'P1', decision: { kind: 'species', species: 'QUUX' }, reason: 'x', seen: null }, ruler())).rejects.toThrow(/not a species of the roster/);
    await expect(recordRuling(site, { patchId: 'P1', decision: { kind: 'mixed' }, reason: 'x', seen: null }, { interpreter: ' ', time: at() })).rejects.toThrow(/who is ruling/);
  });

  it('two windows ruling on one patch: the second sees the first and is refused, nothing lost', async () => {
    const { site, blindPassId } = await threeDisagreements();
    // Both screens showed P1 with no ruling in force.
    const first = recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: 'pass-ak' }, seen: null }, ruler());
    const second = recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: blindPassId }, seen: null }, { interpreter: 'dee', time: at() });
    const r1 = await first;
    await expect(second).rejects.toThrow(/changed since you looked: cy ruled it at .* \(accept the call of pass pass-ak\); reopen that ruling to change it/);
    expect([...site.state.rulings.values()]).toEqual([r1]);
    // Having seen it, the second may reopen and rule again; both stay in the history.
    await reopenRuling(site, r1.id, 'the alder leaves show on the late date', { interpreter: 'dee', time: at() });
    await recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: blindPassId }, seen: null }, { interpreter: 'dee', time: at() });
    expect(consensusOf(site.state).get('P1')?.species).toBe('ALVI');
    expect(site.state.rulings.size).toBe(2);
  });

  it('a ruling on a deleted patch is refused; a ruling on a patch deleted later survives its undo', async () => {
    const { site } = await threeDisagreements();
    const r = await recordRuling(site, { patchId: 'P2', decision: { kind: 'accept', passId: 'pass-ak' }, seen: null }, ruler());
    const patch = site.state.patches.get('P2')!;
    const tags = tagsOfPatch(site.state, 'P2');
    await site.commitWith(() => ({ kind: 'patch.deleted', payload: { patch, tags }, actor: 'ak', time: at() }));
    await expect(recordRuling(site, { patchId: 'P2', decision: { kind: 'mixed' }, reason: 'x', seen: r.id }, ruler())).rejects.toThrow(/Patch P2 is no longer in the site .*nothing was recorded/);
    expect(disagreementQueue({ state: site.state }).some((i) => i.patchId === 'P2')).toBe(false);
    // the ruling is kept in the history and applies again once the deletion is undone
    expect(site.state.rulings.get(r.id)).toEqual(r);
    await site.commitWith(() => ({ kind: 'patch.added', payload: { patch, tags }, actor: 'ak', time: at() }));
    expect(consensusOf(site.state).get('P2')).toMatchObject({ status: 'ruled', species: 'PICE', rulingId: r.id });
  });

  it('reopens a ruling whose accepted call was removed, saying so, and keeps it in the history', async () => {
    const { site, blindPassId } = await threeDisagreements();
    const r = await recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: blindPassId }, seen: null }, ruler());
    const previous = site.state.tags.get(`P1|${blindPassId}`)!;
    await site.commitWith(() => ({ kind: 'tag.set', payload: { patchId: 'P1', passId: blindPassId, tag: null, previous }, actor: 'bo', time: at() }));
    // the accepted call is gone: the patch is open again, with its ruling still named
    expect(consensusOf(site.state).get('P1')).toMatchObject({ status: 'open', rulingId: r.id });
    const outcome = await reopenRuling(site, r.id, 'the accepted call was withdrawn', ruler());
    expect(outcome.passesGone).toEqual([blindPassId]);
    await expect(reopenRuling(site, r.id, 'again', ruler())).rejects.toThrow(/already reopened by cy/);
    await expect(reopenRuling(site, 'ruling-99', 'why', ruler())).rejects.toThrow(/no ruling ruling-99/);
    expect(site.state.rulings.get(r.id)?.reopened?.reason).toBe('the accepted call was withdrawn');
  });

  it('asks for a reason to reopen', async () => {
    const { site } = await threeDisagreements();
    const r = await recordRuling(site, { patchId: 'P1', decision: { kind: 'accept', passId: 'pass-ak' }, seen: null }, ruler());
    await expect(reopenRuling(site, r.id, '  ', ruler())).rejects.toThrow(/Say why ruling/);
  });

  it('sends a patch to a third reader as a blind pass of that one patch', async () => {
    const { site } = await threeDisagreements();
    await expect(sendToThirdReader(site, 'P1', 'bo', ruler())).rejects.toThrow(/bo has already called patch P1/);
    const pass = await sendToThirdReader(site, 'P1', 'eve', ruler());
    expect(pass).toMatchObject({ interpreter: 'eve', blind: true, patchIds: ['P1'], endedAt: null });
    await expect(sendToThirdReader(site, 'P2', 'eve', ruler())).rejects.toThrow(/eve is already in blind pass/);
    const { tagInBlindPass, endBlindPass } = await import('../../../src/app/blind/blindPasses.ts');
    await tagInBlindPass(site, pass.id, 'P1', { species: 'ALVI', confidence: 'sure' }, { interpreter: 'eve', time: at(), display });
    await endBlindPass(site, pass.id, { interpreter: 'eve', time: at() });
    const item = disagreementQueue({ state: site.state }).find((i) => i.patchId === 'P1')!;
    expect(item.calls.map((c) => [c.interpreter, c.species])).toEqual([['ak', 'PICE'], ['bo', 'ALVI'], ['eve', 'ALVI']]);
  });

  it('builds the page queue through the checks: a patch called mixed is a finding, differing calls are not twice', async () => {
    const { site } = await ruledSite([
      { size: 10, first: 'PICE', second: { species: 'ALVI' } },
      { size: 8, first: 'mixed' },
      { size: 6, first: 'ALVI' },
    ]);
    const { items, findings } = rulingsQueue(site.state, 'cy');
    expect(items.map((i) => [i.patchId, i.kinds])).toEqual([['P1', ['species']], ['P2', ['mixed']]]);
    expect(items[1].notes[0]).toMatch(/patch P2 is tagged as mixed/);
    expect(findings.some((f) => f.kind === 'mixed-tag' && f.patches.includes('P2'))).toBe(true);
    // A ruling settles the mixed one like any other.
    await recordRuling(site, { patchId: 'P2', decision: { kind: 'mixed' }, seen: null }, ruler());
    expect(queueProgress(rulingsQueue(site.state, 'cy').items)).toEqual({ settled: 1, open: 1, total: 2 });
  });

  it('refuses a ruling from someone in an open blind pass', async () => {
    const { site } = await threeDisagreements();
    const pass = await sendToThirdReader(site, 'P1', 'eve', ruler());
    await expect(recordRuling(site, { patchId: 'P2', decision: { kind: 'accept', passId: 'pass-ak' }, seen: null }, { interpreter: 'eve', time: at() }))
      .rejects.toThrow(`eve is in blind pass ${pass.id}: rulings reveal every call`);
    expect(site.state.rulings.size).toBe(0);
  });
});
