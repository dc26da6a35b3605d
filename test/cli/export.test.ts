import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import * as fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeDemoSite } from '../../src/cli/demo-data.ts';
import { main } from '../../src/cli/main.ts';
import { writeExportFiles, type WriteCalls } from '../../src/cli/verbs/export.ts';
import { siteFileText } from '../../src/core/export/siteFile.ts';
import { twoPassSite } from '../core/export/siteBuilder.ts';

// `fellfield export` as a user runs it, on the demo written by demo:data and on small
// sites: files renamed into place, one clear line and exit code 2 on bad input.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-export-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
let demoSite: string;

beforeAll(async () => {
  const { files } = await writeDemoSite({ out: join(dir, 'demo'), seed: 2, size: 256, parallel: false });
  const name = files.find((f) => f.includes('site'));
  expect(name).toBeDefined();
  demoSite = join(dir, 'demo', name!);
}, 60_000);

async function run(...args: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await main(['export', ...args], { stdout: (t) => { stdout += t; }, stderr: (t) => { stderr += t; } });
  return { code, stdout, stderr };
}

const noPartials = (folder: string) => readdirSync(folder).filter((n) => n.includes('partial'));

describe('fellfield export', () => {
  it('exports the demo site file as GeoJSON with its history and PROV document', async () => {
    const out = join(dir, 'out-geojson');
    const r = await run(demoSite, '--format', 'geojson', '--out', out);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/patch\(es\) exported as geojson/);
    expect(r.stdout).toMatch(/verify in the field/);
    expect(readdirSync(out).sort()).toEqual(['labels.geojson', 'labels.prov.json', 'labels.site.json']);
    const data = JSON.parse(readFileSync(join(out, 'labels.geojson'), 'utf8'));
    const field = JSON.parse(readFileSync(join(dir, 'demo', 'field.geojson'), 'utf8'));
    expect(data.features.map((f: { id: string }) => f.id).sort()).toEqual(field.features.map((f: { properties: { id: string } }) => f.properties.id).sort());
    expect(readFileSync(join(out, 'labels.site.json'), 'utf8')).toBe(readFileSync(demoSite, 'utf8'));
  });

  it('finds a scheme stored with the site by its name', async () => {
    // The demo's history with one more event: a scheme stored on the Training sheet.
    const { readSiteFile } = await import('../../src/core/export/siteFile.ts');
    const { sealEvent } = await import('../../src/core/ledger/chain.ts');
    const opened = await readSiteFile(readFileSync(demoSite, 'utf8'), demoSite);
    const classOf = Object.fromEntries(opened.state.roster.map((e) => [e.code, e.group === 'conifer' ? 'tree' : 'shrub']));
    const stored = await sealEvent({ kind: 'schemes.set', payload: { schemes: [{ name: 'Trees and shrubs', classOf }], previous: [] }, actor: 'ak', time: '2025-08-01T10:00:00.000Z' }, opened.state.head);
    const withScheme = join(dir, 'with-scheme.site.json');
    writeFileSync(withScheme, siteFileText([...opened.events, stored]));
    const out = join(dir, 'out-stored-scheme');
    const r = await run(withScheme, '--format', 'geojson', '--out', out, '--scheme', 'Trees and shrubs', '--open', 'leave-out');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const classes = new Set(JSON.parse(readFileSync(join(out, 'labels.geojson'), 'utf8')).features.map((f: { properties: { class: string } }) => f.properties.class));
    expect([...classes].sort()).toEqual(['shrub', 'tree']);
    expect((await run(withScheme, '--format', 'geojson', '--out', out, '--scheme', 'Trees')).stderr).toMatch(/--scheme: unknown scheme 'Trees' \(Trees and shrubs, species, groups/);
  });

  it('exports a GeoPackage with --json, a scheme, folds and pure pixels on the demo grid', async () => {
    const out = join(dir, 'out-gpkg');
    const r = await run(demoSite, '--format', 'gpkg', '--out', out, '--scheme', 'groups', '--folds', '2', '--ms', join(dir, 'demo', 'ms.tif'), '--pixel-rule', 'centre', '--json', '--name', 'demo-labels');
    expect(r.stderr).toBe('');
    const summary = JSON.parse(r.stdout);
    expect(summary.format).toBe('gpkg');
    expect(summary.files.map((f: { name: string }) => f.name)).toEqual(['demo-labels.gpkg', 'demo-labels.site.json', 'demo-labels.prov.json']);
    expect(readFileSync(join(out, 'demo-labels.gpkg')).subarray(0, 16).toString('latin1')).toBe('SQLite format 3\0');
    expect(noPartials(out)).toEqual([]);
  });

  it('two runs give the same data file bytes', async () => {
    const [a, b] = [join(dir, 'same-a'), join(dir, 'same-b')];
    for (const out of [a, b]) expect((await run(demoSite, '--format', 'gpkg', '--out', out)).code).toBe(0);
    expect(readFileSync(join(a, 'labels.gpkg')).equals(readFileSync(join(b, 'labels.gpkg')))).toBe(true);
  });

  it('refuses a site with open disagreements, naming them, and writes nothing', async () => {
    const b = await twoPassSite(4);
    await b.tag('P3', 'b', 'SAIN', 'ben');
    const site = join(dir, 'open.site.json');
    writeFileSync(site, siteFileText(b.events));
    const out = join(dir, 'out-open');
    const r = await run(site, '--format', 'geojson', '--out', out);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('fellfield export: 1 patch(es) have an open disagreement (P3): settle them with rulings first, or choose to leave them out or include them without a species\n'.trimEnd());
    expect(existsSync(out)).toBe(false);
    expect((await run(site, '--format', 'geojson', '--out', out, '--open', 'leave-out')).code).toBe(0);
  });

  it('one-pass exports feed fellfield agree: the disagreements the site holds are the ones it counts', async () => {
    const b = await twoPassSite(20);
    const site = join(dir, 'two.site.json');
    writeFileSync(site, siteFileText(b.events));
    const out = join(dir, 'passes');
    for (const pass of ['a', 'b']) expect((await run(site, '--format', 'geojson', '--pass', pass, '--name', `pass-${pass}`, '--out', out)).code).toBe(0);
    let stdout = '';
    expect(await main(['agree', join(out, 'pass-a.geojson'), join(out, 'pass-b.geojson'), '--json'], { stdout: (t) => { stdout += t; }, stderr: () => {} })).toBe(0);
    const sheet = JSON.parse(stdout);
    // Every fifth patch of twoPassSite is called differently in pass b: 4 of 20.
    expect(sheet.n).toBe(20);
    expect(sheet.observed).toBeCloseTo(16 / 20, 12);
  });

  it('a folder that cannot be written: one line naming it, exit 2', async () => {
    const blocker = join(dir, 'a-file');
    writeFileSync(blocker, 'x');
    const r = await run(demoSite, '--format', 'geojson', '--out', join(blocker, 'sub'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^fellfield export: cannot use the output folder .*a-file\/sub: a part of the path is not a folder \(ENOTDIR\)$/);
  });

  it('bad input: a missing site file, a tampered one, a wrong format, no --out', async () => {
    expect((await run(join(dir, 'nope.json'), '--format', 'geojson', '--out', dir)).stderr).toMatch(/nope\.json: cannot read the site file \(no such file or folder \(ENOENT\)\)$/);
    const tampered = join(dir, 'tampered.site.json');
    writeFileSync(tampered, readFileSync(demoSite, 'utf8').replace('"confidence":"sure"', '"confidence":"unsure"'));
    const t = await run(tampered, '--format', 'geojson', '--out', join(dir, 'tampered-out'));
    expect(t.code).toBe(2);
    expect(t.stderr).toMatch(/tampered\.site\.json: the history does not verify: event \d+ was changed after it was recorded/);
    expect((await run(demoSite, '--format', 'shp', '--out', dir)).stderr).toMatch(/--format must be geojson or gpkg, got 'shp'/);
    expect((await run(demoSite, '--format', 'gpkg')).stderr).toMatch(/--out DIR is required/);
    expect((await run(demoSite, '--format', 'gpkg', '--out', dir, '--scheme', 'nonsense')).stderr).toMatch(/--scheme: unknown scheme 'nonsense'/);
    for (const line of [t.stderr]) expect(line.split('\n').filter(Boolean)).toHaveLength(1);
  });
});

describe('writing the files of an export', () => {
  const files = [
    { name: 'labels.geojson', bytes: new Uint8Array(5000).fill(65), role: 'data' as const },
    { name: 'labels.site.json', bytes: new Uint8Array(9000).fill(66), role: 'history' as const },
    { name: 'labels.prov.json', bytes: new Uint8Array(100).fill(67), role: 'provenance' as const },
  ];

  // A disk that fills mid-export, simulated: the second file gets half its bytes on disk,
  // then the write fails with ENOSPC as the kernel reports it.
  function fillingDisk(): WriteCalls {
    let writes = 0;
    return {
      writeFileSync: (path, bytes) => {
        writes += 1;
        if (writes === 2) {
          fs.writeFileSync(path, bytes.subarray(0, bytes.length / 2));
          throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' });
        }
        fs.writeFileSync(path, bytes);
      },
      renameSync: fs.renameSync,
      rmSync: fs.rmSync,
      mkdirSync: fs.mkdirSync,
    };
  }

  it('a disk that fills mid-export: a clear message, and no file, whole or half, under a final name', () => {
    const out = join(dir, 'full-disk');
    expect(() => writeExportFiles(out, files, fillingDisk())).toThrow(/^cannot write the export into .*full-disk: the disk is full \(ENOSPC\); nothing was written$/);
    expect(readdirSync(out)).toEqual([]);
  });

  it('an earlier export under the same names is kept whole when the next one fails', () => {
    const out = join(dir, 'kept');
    writeExportFiles(out, files);
    const before = readFileSync(join(out, 'labels.site.json'));
    expect(() => writeExportFiles(out, files.map((f) => ({ ...f, bytes: new Uint8Array(f.bytes.length).fill(90) })), fillingDisk())).toThrow(/disk is full/);
    expect(readFileSync(join(out, 'labels.site.json')).equals(before)).toBe(true);
    expect(noPartials(out)).toEqual([]);
  });

  it('writes every file whole and leaves no temporary names', () => {
    const out = join(dir, 'whole');
    writeExportFiles(out, files);
    expect(readdirSync(out).sort()).toEqual(['labels.geojson', 'labels.prov.json', 'labels.site.json']);
    expect(readFileSync(join(out, 'labels.site.json')).length).toBe(9000);
  });
});
