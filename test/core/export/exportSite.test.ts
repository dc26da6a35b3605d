import { describe, expect, it } from 'vitest';
import { ExportError } from '../../../src/core/export/ExportError.ts';
import { exportSite, type ExportFile } from '../../../src/core/export/exportSite.ts';
import type { ExportOptions } from '../../../src/core/export/options.ts';
import type { OpenedSite } from '../../../src/core/export/siteFile.ts';
import { twoPassSite } from './siteBuilder.ts';

const run = { format: 'geojson' as const, appVersion: '0.1.0', time: '2031-02-03T04:05:06.000Z' };
const consensusOnly: ExportOptions = { selection: { kind: 'consensus' } };
const text = (files: ExportFile[], role: ExportFile['role']) => new TextDecoder().decode(files.find((f) => f.role === role)!.bytes);
const features = (files: ExportFile[]) => (JSON.parse(text(files, 'data')) as { features: { id: string; properties: Record<string, unknown> }[] }).features;

async function exported(opened: OpenedSite, options: ExportOptions = consensusOnly, time = run.time) {
  return exportSite(opened, options, { ...run, time });
}

describe('exportSite', () => {
  it('gives byte-identical data and history files for the same state; only the PROV document holds the export time', async () => {
    const b = await twoPassSite();
    const first = await exported(b.opened);
    const second = await exported(b.opened, consensusOnly, '2032-12-31T23:59:59.000Z');
    expect(first.files.map((f) => f.name)).toEqual(['labels.geojson', 'labels.site.json', 'labels.prov.json']);
    for (const role of ['data', 'history'] as const) expect(text(second.files, role)).toBe(text(first.files, role));
    expect(text(first.files, 'data')).not.toContain('2031-02-03');
    expect(text(first.files, 'history')).not.toContain('2031-02-03');
    expect(text(first.files, 'provenance')).toContain('2031-02-03T04:05:06.000Z');
    expect(text(second.files, 'provenance')).not.toBe(text(first.files, 'provenance'));
  });

  it('a changed tag changes exactly that patch\'s feature, line for line', async () => {
    const b = await twoPassSite();
    const before = await exported(b.opened);
    await b.tag('P3', 'a', 'ABFI', 'ana', 'sure', 'needle tufts seen on the late date');
    const after = await exported(b.opened);
    const linesBefore = text(before.files, 'data').split('\n');
    const linesAfter = text(after.files, 'data').split('\n');
    expect(linesAfter.length).toBe(linesBefore.length);
    const changed = linesAfter.map((line, i) => (line === linesBefore[i] ? null : i)).filter((i) => i !== null);
    // The header line carries the ledger head, which moves with every change; beyond it, one feature.
    expect(changed).toEqual([0, 3]);
    expect(JSON.parse(linesAfter[3].replace(/,$/, '')).id).toBe('P3');
    const a = features(before.files), c = features(after.files);
    expect(c.filter((f, i) => JSON.stringify(f) !== JSON.stringify(a[i])).map((f) => f.id)).toEqual(['P3']);
  });

  it('carries every tag with interpreter, pass, time, confidence, note and display settings, and the rulings', async () => {
    const b = await twoPassSite();
    const p5 = features((await exported(b.opened)).files).find((f) => f.id === 'P5')!;
    expect(p5.properties.species).toBe('ABFI');
    expect(p5.properties.consensus).toBe('ruled');
    expect(p5.properties.ruling).toBe('R5');
    expect(p5.properties.tags).toEqual([
      expect.objectContaining({ pass: 'a', interpreter: 'ana', species: 'ABFI', confidence: 'sure', note: '', display: { composite: 'nir-red-green', stretch: 'percentile 2-98', date: '2025-07-24' } }),
      expect.objectContaining({ pass: 'b', interpreter: 'ben', species: 'SAIN', confidence: 'likely' }),
    ]);
    expect(p5.properties.rulings).toEqual([expect.objectContaining({ id: 'R5', decision: 'accept pass a', by: 'cleo', reason: 'seen on both dates', reopened: null })]);
    expect(p5.properties.source).toEqual(expect.objectContaining({ kind: 'drawn', by: 'ana' }));
    expect(p5.properties.scenes).toEqual([{ id: 'scene-1', date: '2025-07-24', files: [{ role: 'pan', name: 'pan.tif', sha256: 'a'.repeat(64) }, { role: 'ms', name: 'ms.tif', sha256: 'b'.repeat(64) }] }]);
  });

  it('records a shift with its offset, who and the ledger event', async () => {
    const b = await twoPassSite(3);
    await b.shift('P2', 1.2, -0.4);
    const p2 = features((await exported(b.opened)).files).find((f) => f.id === 'P2')!;
    const [shift] = p2.properties.transformations as { kind: string; dx: number; dy: number; ledger_seq: number }[];
    expect(shift.kind).toBe('shift');
    expect(shift.dx).toBeCloseTo(1.2, 9);
    expect(shift.dy).toBeCloseTo(-0.4, 9);
    expect(shift.ledger_seq).toBe(b.state.head.seq);
  });

  it('refuses a site with open disagreements by default, naming them; leaves them out or includes them when asked', async () => {
    const b = await twoPassSite(6);
    await b.tag('P2', 'b', 'ABFI', 'ben');
    const refused = exported(b.opened).catch((e: unknown) => e);
    await expect(refused).resolves.toBeInstanceOf(ExportError);
    expect(((await refused) as Error).message).toMatch(/^1 patch\(es\) have an open disagreement \(P2\): settle them with rulings first/);
    const left = await exported(b.opened, { ...consensusOnly, open: 'leave-out' });
    expect(features(left.files).map((f) => f.id)).not.toContain('P2');
    expect(left.summary.leftOut).toEqual([{ reason: 'open disagreement', count: 1, ids: ['P2'] }]);
    const included = features((await exported(b.opened, { ...consensusOnly, open: 'include' })).files).find((f) => f.id === 'P2')!;
    expect(included.properties).toMatchObject({ species: null, class: null, consensus: 'open' });
  });

  it('exports one pass with only its own tags, and all passes with every tag', async () => {
    const b = await twoPassSite(5);
    const pass = features((await exported(b.opened, { selection: { kind: 'pass', passId: 'b' } })).files);
    expect(pass.find((f) => f.id === 'P5')!.properties.species).toBe('SAIN');
    expect(pass.every((f) => (f.properties.tags as { pass: string }[]).every((t) => t.pass === 'b'))).toBe(true);
    expect(pass.every((f) => (f.properties.rulings as unknown[]).length === 0)).toBe(true);
    const all = features((await exported(b.opened, { selection: { kind: 'all-passes' } })).files);
    expect(all.map((f) => (f.properties.tags as unknown[]).length)).toEqual([2, 2, 2, 2, 2]);
    await expect(exported(b.opened, { selection: { kind: 'pass', passId: 'zz' } })).rejects.toThrow(/the site has no pass "zz" \(passes: a, b\)/);
  });

  it('gives classes under a scheme and spatial folds, in natural id order', async () => {
    const b = await twoPassSite(12);
    const scheme = { name: 'conifer or not', classOf: { ABFI: 'conifer', SAIN: 'shrub' } };
    const f = features((await exported(b.opened, { selection: { kind: 'consensus' }, scheme, folds: { k: 3, blockSize: 40, seed: 2 } })).files);
    expect(f.map((x) => x.id)).toEqual(['P1', 'P2', 'P3', 'P4', 'P5', 'P6', 'P7', 'P8', 'P9', 'P10', 'P11', 'P12']);
    expect(f.map((x) => x.properties.class)).toEqual(f.map((x) => (x.properties.species === 'ABFI' ? 'conifer' : 'shrub')));
    const folds = f.map((x) => x.properties.fold as number);
    expect(new Set(folds)).toEqual(new Set([0, 1, 2]));
  });

  it('refuses to export while a blind pass runs, naming it', async () => {
    const b = await twoPassSite(2);
    await b.commit({ kind: 'pass.started', payload: { pass: { id: 'c', interpreter: 'dev', blind: true, startedAt: b.time(), endedAt: null, patchIds: ['P1'] } } }, 'dev');
    await expect(exported(b.opened)).rejects.toThrow(/^blind pass c is still running: end it before exporting/);
    await b.commit({ kind: 'pass.ended', payload: { passId: 'c', time: b.time() } }, 'dev');
    await expect(exported(b.opened)).resolves.toBeDefined();
  });

  it('refuses an export name that could leave the folder', async () => {
    const b = await twoPassSite(2);
    await expect(exportSite(b.opened, consensusOnly, { ...run, baseName: '../x' })).rejects.toThrow(/may hold only letters/);
  });
});
