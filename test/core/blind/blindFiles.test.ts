import { describe, expect, it } from 'vitest';
import {
  buildBlindAnswers, buildBlindPackage, fitAnswers, readBlindAnswers, readBlindPackage, writeBlindAnswers, writeBlindPackage,
  type BlindAnswers, type BlindPackage,
} from '../../../src/core/blind/index.ts';
import { canonicalJson } from '../../../src/core/ledger/canonicalJson.ts';
import { sha256Hex } from '../../../src/core/ledger/sha256.ts';
import type { Tag } from '../../../src/core/site/index.ts';
import { blindSite, startPass } from './blindSite.ts';

// The blind package and answers files, and every way an answers file is refused.
// Hashes are SHA-256 (FIPS 180-4) of RFC 8785 canonical JSON; the expected digest of
// "abc" below is the FIPS 180-2 Appendix B.1 example value.

const made = { time: '2025-07-25T09:00:00.000Z', by: 'ana' };

async function withPass() {
  const b = await blindSite();
  await startPass(b, { id: 'blind-1', interpreter: 'ben', blind: true, patchIds: ['P6', 'P2', 'P9'] });
  const pkg = await buildBlindPackage(b.state, 'blind-1', made);
  return { b, pkg };
}

function answerTags(pkg: BlindPackage, calls: Record<string, string>): Tag[] {
  return Object.entries(calls).map(([patchId, species], i) => ({
    patchId, passId: pkg.pass.id, species, confidence: 'likely', note: i === 0 ? 'half in shadow' : '', interpreter: pkg.pass.interpreter,
    time: `2025-07-26T10:0${i}:00.000Z`, display: { composite: 'natural', stretch: 'percentile 2-98', date: '2025-07-24' },
  }));
}

async function resealed(doc: BlindAnswers | BlindPackage): Promise<string> {
  const { hash: _hash, ...rest } = doc;
  return JSON.stringify({ ...rest, hash: await sha256Hex(canonicalJson(rest)) });
}

describe('the blind package', () => {
  it('uses the standard SHA-256', async () => {
    expect(await sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('holds outlines, scenes with hashes, the roster and the pass, and no call', async () => {
    const { b, pkg } = await withPass();
    expect(pkg.patches.map((p) => p.id)).toEqual(['P6', 'P2', 'P9']);
    expect(pkg.patches[0].geometry).toEqual(b.state.patches.get('P6')!.geometry);
    expect(pkg.scenes[0].files[0].sha256).toBe('a'.repeat(64));
    expect(pkg.roster.map((e) => e.code)).toEqual(['ABFI', 'PIEX', 'SAIN', 'JUNO']);
    expect(pkg.answers).toEqual(['mixed', 'unknown', "can't tell"]);
    expect(pkg.packageId).toBe(`pkg-${pkg.contentHash.slice(0, 16)}`);
    const text = writeBlindPackage(pkg);
    for (const leak of ['unsure', 'note on', 'field call', '"species"', 'crew_note']) expect(text).not.toContain(leak);
    expect(await readBlindPackage('p.json', text)).toEqual(pkg);
  });

  it('has the same identity whenever it is made from the same pass', async () => {
    const { b, pkg } = await withPass();
    const again = await buildBlindPackage(b.state, 'blind-1', { time: '2026-01-01T00:00:00.000Z', by: 'cleo' });
    expect(again.contentHash).toBe(pkg.contentHash);
    expect(again.hash).not.toBe(pkg.hash);
  });

  it('refuses bad package files, naming the file and the problem', async () => {
    const { pkg } = await withPass();
    const text = writeBlindPackage(pkg);
    const cases: [string, string | RegExp][] = [
      ['{"format":', /^p\.json: not valid JSON/],
      ['{"format":"something else"}', 'p.json: not a Fellfield blind package'],
      [JSON.stringify({ ...pkg, version: 9 }), /newer Fellfield \(package version 9/],
      [text.replace('"P9"', '"P2"'), /patch P2 is listed twice/],
      [JSON.stringify({ ...pkg, patches: [{ ...pkg.patches[0], species: 'ABFI' }] }), /carries species: a blind package holds outlines only/],
      [JSON.stringify({ ...pkg, patches: [{ id: 'P6', geometry: [[[[0, 0], [1, 0], [0, 0]]]] }] }), /ring 1, has fewer than 4 positions/],
      [JSON.stringify({ ...pkg, patches: [] }), /holds no patches/],
      [text.replace('"ben"', '"eve"'), /hash does not match its content/],
    ];
    for (const [input, message] of cases) await expect(readBlindPackage('p.json', input)).rejects.toThrow(message);
    // Re-sealed after a change, the outer hash fits but the identity does not.
    await expect(readBlindPackage('p.json', await resealed({ ...pkg, pass: { ...pkg.pass, interpreter: 'eve' } }))).rejects.toThrow(/package id does not match its content/);
  });

  it('is not made for a pass that is not blind, missing, or a delineation', async () => {
    const { b } = await withPass();
    await expect(buildBlindPackage(b.state, 'a', made)).rejects.toThrow(/not blind/);
    await expect(buildBlindPackage(b.state, 'nope', made)).rejects.toThrow(/no pass nope/);
    await startPass(b, { id: 'draw-1', interpreter: 'cleo', blind: true, patchIds: [] });
    await expect(buildBlindPackage(b.state, 'draw-1', made)).rejects.toThrow(/independent delineation/);
  });
});

describe('the answers file', () => {
  it('round-trips and fits its package: tags in package order', async () => {
    const { b, pkg } = await withPass();
    const answers = await buildBlindAnswers(pkg, answerTags(pkg, { P9: "can't tell", P6: 'SAIN' }), '2025-07-26T11:00:00.000Z');
    const read = await readBlindAnswers('a.json', writeBlindAnswers(answers));
    expect(read).toEqual(answers);
    const fit = await fitAnswers(b.state, read, 'a.json');
    expect(fit.tags.map((t) => [t.patchId, t.species, t.passId, t.interpreter])).toEqual([['P6', 'SAIN', 'blind-1', 'ben'], ['P9', "can't tell", 'blind-1', 'ben']]);
    expect(fit.unanswered).toEqual(['P2']);
  });

  it('refuses answers that do not belong, and merges nothing', async () => {
    const { b, pkg } = await withPass();
    const good = await buildBlindAnswers(pkg, answerTags(pkg, { P6: 'SAIN', P2: 'ABFI' }), '2025-07-26T11:00:00.000Z');
    const fit = async (doc: BlindAnswers, state = b.state) => fitAnswers(state, await readBlindAnswers('a.json', await resealed(doc)), 'a.json');

    await expect(fit({ ...good, passId: 'blind-9' })).rejects.toThrow(/^a\.json: the answers are for pass blind-9, which this site does not hold/);
    await expect(fit({ ...good, interpreter: 'eve' })).rejects.toThrow(/signed by eve, but pass blind-1 was given to ben/);
    await expect(fit({ ...good, packageId: 'pkg-0000000000000000' })).rejects.toThrow(/package id does not match the hash it names/);
    const other = '1'.repeat(64);
    await expect(fit({ ...good, packageId: `pkg-${other.slice(0, 16)}`, contentHash: other })).rejects.toThrow(/belong to another package, or its patches, scenes or roster changed/);
    await expect(fit({ ...good, answers: [...good.answers, { ...good.answers[0], patchId: 'P30' }] })).rejects.toThrow(/answers patch P30, which the package does not hold/);
    await expect(fit({ ...good, answers: [...good.answers, good.answers[0]] })).rejects.toThrow(/answers patch P6 more than once/);
    await expect(fit({ ...good, answers: [{ ...good.answers[0], species: 'OAKX' }] })).rejects.toThrow(/"OAKX", which is neither a roster code nor one of mixed, unknown, can't tell/);

    // Tampered without re-sealing: the hash tells.
    await expect(readBlindAnswers('a.json', writeBlindAnswers(good).replace('"SAIN"', '"ABFI"'))).rejects.toThrow(/hash does not match/);
    await expect(readBlindAnswers('a.json', writeBlindPackage(pkg))).rejects.toThrow(/the blind package itself, not the answers/);
    await expect(readBlindAnswers('a.json', JSON.stringify({ ...good, answers: [{ ...good.answers[0], confidence: 'certain' }] }))).rejects.toThrow(/confidence "certain", not one of sure, likely, unsure/);

    // A patch edited since the package went out: the answers no longer fit.
    await b.shift('P2', 0.5, 0);
    await expect(fit(good)).rejects.toThrow(/changed since it was sent/);
  });

  it('refuses a package answered twice', async () => {
    const { b, pkg } = await withPass();
    const answers = await buildBlindAnswers(pkg, answerTags(pkg, { P6: 'SAIN' }), '2025-07-26T11:00:00.000Z');
    const { tags } = await fitAnswers(b.state, answers, 'a.json');
    await b.tag(tags[0].patchId, tags[0].passId, tags[0].species, 'ben');
    await expect(fitAnswers(b.state, answers, 'a.json')).rejects.toThrow(/pass blind-1 already holds 1 answer: a package is answered once/);
  });

  it('refuses answers to a pass that was ended', async () => {
    const { b, pkg } = await withPass();
    await b.commit({ kind: 'pass.ended', payload: { passId: 'blind-1', time: '2025-07-27T00:00:00.000Z' } }, 'ben');
    const answers = await buildBlindAnswers(pkg, answerTags(pkg, { P6: 'SAIN' }), '2025-07-26T11:00:00.000Z');
    await expect(fitAnswers(b.state, answers, 'a.json')).rejects.toThrow(/was ended on 2025-07-27/);
  });
});
