import { describe, expect, it } from 'vitest';
import { selectPatches } from '../../../src/core/blind/selection.ts';
import { blindSite, speciesOf, startPass } from './blindSite.ts';

describe('selectPatches', () => {
  it('chooses every patch last called unsure (every third of the 30)', async () => {
    const b = await blindSite();
    const s = selectPatches(b.state, { kind: 'unsure' });
    expect(s.patchIds).toEqual(['P12', 'P15', 'P18', 'P21', 'P24', 'P27', 'P3', 'P30', 'P6', 'P9']);
    expect(s.summary).toMatch(/^10 patches: every patch last tagged unsure/);
  });

  it('chooses every patch of the given species', async () => {
    const b = await blindSite();
    const s = selectPatches(b.state, { kind: 'species', species: ['PIEX', 'JUNO'] });
    expect(s.patchIds).toEqual(['P25', 'P26', 'P27', 'P28', 'P29', 'P30']);
  });

  it('ignores blind calls when choosing: only the newest desk call counts', async () => {
    const b = await blindSite();
    await startPass(b, { id: 'blind-1', interpreter: 'ben', blind: true, patchIds: ['P1'] });
    await b.tag('P1', 'blind-1', 'JUNO', 'ben', 'unsure');
    expect(selectPatches(b.state, { kind: 'species', species: ['JUNO'] }).patchIds).toEqual(['P30']);
    // A later desk call replaces the earlier one.
    await startPass(b, { id: 'c', interpreter: 'cleo', blind: false, patchIds: null });
    await b.tag('P1', 'c', 'JUNO', 'cleo', 'sure');
    expect(selectPatches(b.state, { kind: 'species', species: ['JUNO'] }).patchIds).toEqual(['P1', 'P30']);
  });

  it('draws a stratified sample reproducibly by seed, with every species in it', async () => {
    const b = await blindSite();
    const s = selectPatches(b.state, { kind: 'sample', size: 10, seed: 42 });
    expect(s.patchIds).toHaveLength(10);
    expect(s.strata).toEqual([
      { key: 'ABFI', size: 15, drawn: 5 }, { key: 'JUNO', size: 1, drawn: 1 }, { key: 'PIEX', size: 5, drawn: 1 }, { key: 'SAIN', size: 9, drawn: 3 },
    ]);
    const drawnSpecies = s.patchIds.map((id) => speciesOf(Number(id.slice(1))));
    expect(drawnSpecies.filter((x) => x === 'SAIN')).toHaveLength(3);
    expect(selectPatches(b.state, { kind: 'sample', size: 10, seed: 42 }).patchIds).toEqual(s.patchIds);
    expect(selectPatches(b.state, { kind: 'sample', size: 10, seed: 43 }).patchIds).not.toEqual(s.patchIds);
  });

  it('takes every tagged patch when the sample asks for more, and says so', async () => {
    const b = await blindSite();
    const s = selectPatches(b.state, { kind: 'sample', size: 99, seed: 1 });
    expect(s.patchIds).toHaveLength(30);
    expect(s.summary).toContain('fewer than the 99 asked for');
  });

  it('keeps a hand-picked set, once each', async () => {
    const b = await blindSite();
    expect(selectPatches(b.state, { kind: 'picked', patchIds: ['P7', 'P2', 'P7'] }).patchIds).toEqual(['P2', 'P7']);
  });

  it('refuses with a plain message: unknown ids, nothing fitting, bad sizes and seeds', async () => {
    const b = await blindSite();
    expect(() => selectPatches(b.state, { kind: 'picked', patchIds: ['P2', 'Q9'] })).toThrow('No patch Q9 in this site.');
    expect(() => selectPatches(b.state, { kind: 'species', species: ['SAIN-X'] })).toThrow(/No patch fits: every patch last tagged SAIN-X/);
    expect(() => selectPatches(b.state, { kind: 'species', species: [] })).toThrow(/at least one species/);
    expect(() => selectPatches(b.state, { kind: 'sample', size: 0, seed: 1 })).toThrow(/at least 1, not 0/);
    expect(() => selectPatches(b.state, { kind: 'sample', size: 3, seed: -2 })).toThrow(/seed must be a whole number/);
    expect(() => selectPatches(b.state, { kind: 'picked', patchIds: [] })).toThrow(/No patch fits/);
  });
});
