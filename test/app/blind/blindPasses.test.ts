import { describe, expect, it } from 'vitest';
import { endBlindPass, passProgress, pauseBlindPass, startBlindPass, startDelineation, tagInBlindPass } from '../../../src/app/blind/blindPasses.ts';
import { recordInterpreterSwitch } from '../../../src/app/blind/interpreterSwitch.ts';
import { exportBlindAnswers, exportBlindPackage, importBlindAnswers, receiveBlindPackage } from '../../../src/app/blind/blindFiles.ts';
import { InterpreterProfiles } from '../../../src/app/blind/interpreterProfiles.ts';
import { blindView, readBlindPackage } from '../../../src/core/blind/index.ts';
import { emptySiteState, isPaused, replay } from '../../../src/core/site/index.ts';
import { verifyChain } from '../../../src/core/ledger/chain.ts';
import { blindSite } from '../../core/blind/blindSite.ts';
import { MemoryKeyValue, MemorySite } from './memorySite.ts';

const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2025-07-24' };
let clock = 0;
const at = (interpreter: string) => ({ interpreter, time: new Date(Date.UTC(2025, 7, 1) + 1000 * clock++).toISOString() });

async function site() {
  const b = await blindSite();
  return new MemorySite(b.state, b.events);
}

describe('a blind pass on one machine', () => {
  it('starts over the chosen patches in shuffled order, tags with blind answers, shows progress and ends', async () => {
    const store = await site();
    const { pass, selected } = await startBlindPass(store, { kind: 'unsure' }, { ...at('ben'), by: 'ana' });
    expect(pass.blind).toBe(true);
    expect(store.events.at(-1)!.actor).toBe('ana'); // who started it, for ben
    expect([...pass.patchIds!].sort()).toEqual(selected.patchIds);
    expect(pass.patchIds).not.toEqual(selected.patchIds); // shuffled (10 ids: a 1 in 3.6 million chance to come out sorted)
    expect(passProgress(store.state, pass)).toEqual({ total: 10, called: 0, next: pass.patchIds![0] });

    await tagInBlindPass(store, pass.id, pass.patchIds![0], { species: "can't tell" }, { ...at('ben'), display });
    await tagInBlindPass(store, pass.id, pass.patchIds![1], { species: 'mixed' }, { ...at('ben'), display });
    await tagInBlindPass(store, pass.id, pass.patchIds![1], { confidence: 'unsure', note: 'two crowns?' }, { ...at('ben'), display });
    const tag = store.state.tags.get(`${pass.patchIds![1]}|${pass.id}`)!;
    expect([tag.species, tag.confidence, tag.note, tag.interpreter]).toEqual(['mixed', 'unsure', 'two crowns?', 'ben']);
    expect(passProgress(store.state, pass)).toEqual({ total: 10, called: 2, next: pass.patchIds![2] });

    await endBlindPass(store, pass.id, at('ben'));
    expect(store.state.passes.get(pass.id)!.endedAt).not.toBeNull();
    expect((await verifyChain(store.events)).ok).toBe(true);
  });

  it('refuses what does not fit, naming the problem', async () => {
    const store = await site();
    await expect(startBlindPass(store, { kind: 'unsure' }, at('ana'))).rejects.toThrow('10 of the 10 chosen patches were last called by ana: a second look must come from another interpreter.');
    const { pass } = await startBlindPass(store, { kind: 'picked', patchIds: ['P1', 'P2'] }, at('ben'));
    await expect(startBlindPass(store, { kind: 'unsure' }, at('ben'))).rejects.toThrow(`ben is already in blind pass ${pass.id}: end it before starting another.`);
    const t = (patchId: string, call: object, who = 'ben') => tagInBlindPass(store, pass.id, patchId, call, { ...at(who), display });
    await expect(t('P3', { species: 'ABFI' })).rejects.toThrow(`Patch P3 is not part of blind pass ${pass.id}.`);
    await expect(t('P1', { species: 'ABFI' }, 'cleo')).rejects.toThrow(`belongs to ben, not cleo`);
    await expect(t('P1', { species: 'OAKX' })).rejects.toThrow('"OAKX" is neither a roster code nor one of mixed, unknown, can\'t tell.');
    await expect(t('P1', { confidence: 'sure' })).rejects.toThrow(/no call in this pass yet/);
    await endBlindPass(store, pass.id, at('ben'));
    await expect(t('P1', { species: 'ABFI' })).rejects.toThrow(/has ended/);
    expect([...store.state.tags.values()].filter((x) => x.passId === pass.id)).toHaveLength(0);
  });

  it('keeps a delineation apart: patches drawn in it are its own', async () => {
    const store = await site();
    const pass = await startDelineation(store, at('ben'));
    expect(pass.patchIds).toEqual([]);
    await expect(startDelineation(store, at('ben'))).rejects.toThrow(/already in blind pass/);
  });
});

describe('a blind pass across two machines', () => {
  it('goes out as a package, is answered elsewhere and comes back once', async () => {
    const home = await site();
    const { pass } = await startBlindPass(home, { kind: 'sample', size: 6, seed: 5 }, at('ben'));
    let sent = '';
    const pkg = await exportBlindPackage(home.state, pass.id, async (name, data) => {
      expect(name).toBe(`${pass.id}.blind-package.json`);
      sent = data;
      return true;
    }, at('ana'));
    expect(pkg).not.toBeNull();

    // The other machine: a new site made from the package alone.
    const away = new MemorySite(emptySiteState());
    const received = await readBlindPackage('from-ana.json', sent);
    const made = at('ben').time;
    await away.commitWith(() => ({ kind: 'site.created', payload: { site: { id: 'away', name: 'away', epsg: received.epsg, createdAt: made } }, actor: 'ben', time: made }));
    await receiveBlindPackage(away, received, at('ben'));
    const awayView = blindView(away.state, 'ben');
    expect([...awayView.patches.keys()]).toEqual(pass.patchIds);
    expect(away.state.tags.size).toBe(0);
    for (const [i, id] of pass.patchIds!.entries()) {
      await tagInBlindPass(away, pass.id, id, { species: i === 0 ? 'unknown' : 'SAIN', confidence: 'likely' }, { ...at('ben'), display });
    }
    let answers = '';
    await exportBlindAnswers(away.state, pass.id, async (_name, data) => ((answers = data), true), at('ben'));

    // Home again: answers for another package are refused, these are taken once.
    const imported = await importBlindAnswers(home, 'ben-answers.json', answers, at('ana'));
    expect(imported).toEqual({ passId: pass.id, recorded: 6, unanswered: [] });
    expect([...home.state.tags.values()].filter((t) => t.passId === pass.id).map((t) => t.species).sort()).toEqual(['SAIN', 'SAIN', 'SAIN', 'SAIN', 'SAIN', 'unknown']);
    const before = home.events.length;
    await expect(importBlindAnswers(home, 'ben-answers.json', answers, at('ana'))).rejects.toThrow(/^ben-answers\.json: pass blind-ben-1 already holds 6 answers/);
    expect(home.events.length).toBe(before);
  });
});

describe('interpreter profiles and pauses', () => {
  it('records every switch, refuses clashes, and survives a reload', () => {
    const kv = new MemoryKeyValue();
    let t = 0;
    const now = () => `2025-08-01T00:00:0${t++}.000Z`;
    const book = new InterpreterProfiles(kv, now);
    book.add('Ana Example', 'ae');
    expect(book.current?.initials).toBe('AE');
    book.add('Ben Sample', 'BS');
    expect(book.current?.name).toBe('Ana Example'); // adding does not switch
    book.switchTo('Ben Sample');
    expect(() => book.add('ana example', 'XX')).toThrow('There is already an interpreter called Ana Example.');
    expect(() => book.add('Cleo', 'BS')).toThrow('Ben Sample already uses the initials BS.');
    expect(() => book.add('Cleo', 'C3')).toThrow(/one to four letters/);
    expect(() => book.switchTo('Nobody')).toThrow(/no interpreter called Nobody/);
    const again = new InterpreterProfiles(kv, now);
    expect(again.current?.name).toBe('Ben Sample');
    expect(again.switches.map((s) => [s.from, s.to])).toEqual([[null, 'Ana Example'], ['Ana Example', 'Ben Sample']]);
  });

  it('pauses and resumes a pass in the ledger: no call while held, every period kept, and the same after a replay', async () => {
    const store = await site();
    const { pass } = await startBlindPass(store, { kind: 'picked', patchIds: ['P1', 'P2'] }, at('ben'));
    const paused = at('ben');
    await pauseBlindPass(store, pass.id, true, paused);
    await pauseBlindPass(store, pass.id, true, at('ben')); // already held: nothing written
    expect(store.events.filter((e) => e.kind === 'pass.paused').length).toBe(1);
    await expect(tagInBlindPass(store, pass.id, 'P1', { species: 'mixed' }, { ...at('ben'), display })).rejects.toThrow(/is paused/);
    const resumed = at('ben');
    await pauseBlindPass(store, pass.id, false, resumed);
    expect(isPaused(store.state.passes.get(pass.id)!)).toBe(false);
    expect(await tagInBlindPass(store, pass.id, 'P1', { species: 'mixed' }, { ...at('ben'), display })).not.toBeNull();
    expect(store.state.passes.get(pass.id)!.pauses).toEqual([{ pausedAt: paused.time, resumedAt: resumed.time }]);
    expect(replay(emptySiteState(), store.events)).toEqual(store.state);
    await endBlindPass(store, pass.id, at('ana'));
    await expect(pauseBlindPass(store, pass.id, true, at('ben'))).rejects.toThrow(/has ended/);
  });

  it('records a switch of interpreter in the site, not a second time for the same person', async () => {
    const store = await site();
    const before = store.events.length;
    await recordInterpreterSwitch(store, 'ana', { name: 'ben', initials: 'B' }, at('ben').time);
    await recordInterpreterSwitch(store, 'ben', { name: 'ben', initials: 'B' }, at('ben').time);
    expect(store.events.length).toBe(before + 1);
    expect(store.events.at(-1)).toMatchObject({ kind: 'interpreter.switched', actor: 'ben', payload: { from: 'ana', to: 'ben', initials: 'B' } });
    expect((await verifyChain(store.events)).ok).toBe(true);
  });
});

describe('the blind pass at the desk, for the pages beside it', () => {
  it('follows the profile at the desk', async () => {
    const { blindPassAtDesk, interpreterAtDesk } = await import('../../../src/app/blind/blindAtDesk.ts');
    const store = await site();
    const kv = new MemoryKeyValue();
    expect(interpreterAtDesk(kv)).toBe('Interpreter A');
    const { pass } = await startBlindPass(store, { kind: 'picked', patchIds: ['P1'] }, at('ben'));
    expect(blindPassAtDesk(store.state, kv)).toBeNull();
    const book = new InterpreterProfiles(kv, () => '2025-08-01T00:00:00.000Z');
    book.add('ben', 'B');
    expect(blindPassAtDesk(store.state, kv)?.id).toBe(pass.id);
  });
});
