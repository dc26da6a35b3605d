import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { Random } from '../../src/core/random.ts';
import { writeGeoTiff } from '../../src/core/tiff/writeGeoTiff.ts';

// fellfield folds end to end on a seeded field of square patches written here.

const dir = mkdtempSync(join(tmpdir(), 'fellfield-folds-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const square = (x: number, y: number, s: number) => [[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]];
const utm = { crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32632' } } };

function write(name: string, content: string | Uint8Array): string {
  const path = join(dir, name);
  writeFileSync(path, content);
  return path;
}

// 400 patches of 2-5 m over 400 x 400 m from 600000 E, 5100000 N; three species.
const random = new Random(12);
const features = Array.from({ length: 400 }, (_, i) => ({
  type: 'Feature', id: `p${i}`,
  properties: { species: ['pice', 'lari', 'salx'][random.weighted([0.5, 0.3, 0.2])] },
  geometry: { type: 'Polygon', coordinates: square(600000 + random.uniform(0, 395), 5100000 + random.uniform(0, 395), random.uniform(2, 5)) },
}));
const patches = write('patches.geojson', JSON.stringify({ type: 'FeatureCollection', ...utm, features }));

async function run(...args: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await main(['folds', ...args], { stdout: (t) => { stdout += `${t}\n`; }, stderr: (t) => { stderr += `${t}\n`; } });
  return { code, stdout, stderr };
}

type Row = { id: string; species: string; class: string | null; fold: number | 'held-out' | null; block: [number, number] | null };

describe('fellfield folds', () => {
  it('deals every patch into one of k folds by 50 m blocks, seeded', async () => {
    const { code, stdout } = await run(patches, '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc).toMatchObject({ k: 5, blockSize: 50, seed: 1, weight: 'patches', crs: 'EPSG:32632' });
    const rows = doc.patches as Row[];
    expect(rows).toHaveLength(400);
    const foldOfBlock = new Map<string, number>();
    for (const row of rows) {
      expect([1, 2, 3, 4, 5]).toContain(row.fold);
      const key = row.block!.join(',');
      expect(foldOfBlock.get(key) ?? row.fold).toBe(row.fold);
      foldOfBlock.set(key, row.fold as number);
    }
    expect(doc.folds.map((f: { fold: number }) => f.fold)).toEqual([1, 2, 3, 4, 5]);
    expect(doc.folds.reduce((n: number, f: { patches: number }) => n + f.patches, 0)).toBe(400);
    expect(doc.maxShareDeviation).toBeLessThan(0.1);
    for (const f of doc.folds) expect(f.minTrainDistance).toBeGreaterThanOrEqual(0);
    const again = JSON.parse((await run(patches, '--json')).stdout);
    expect(again.patches).toEqual(rows);
    const other = JSON.parse((await run(patches, '--json', '--seed', '7')).stdout);
    expect(other.patches).not.toEqual(rows);
  });

  it('holds out a region, lumps by a scheme and names the species it leaves unmapped', async () => {
    const region = write('region.geojson', JSON.stringify({ type: 'Feature', ...utm, properties: {}, geometry: { type: 'Polygon', coordinates: square(600000, 5100000, 100) } }));
    const scheme = write('scheme.json', JSON.stringify({ name: 'conifers', classOf: { pice: 'conifer', lari: 'conifer' } }));
    const { code, stdout } = await run(patches, '--json', '--held-out', region, '--scheme', scheme, '--k', '3', '--block', '80');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    const rows = doc.patches as Row[];
    expect(doc.messages[0]).toMatch(/^scheme "conifers" leaves species salx unmapped: its \d+ patch\(es\) are left out/);
    for (const row of rows) {
      if (row.species === 'salx') expect(row).toMatchObject({ class: null, fold: null });
      else expect(row.class).toBe('conifer');
    }
    const held = rows.filter((r) => r.fold === 'held-out');
    expect(held.length).toBeGreaterThan(5);
    expect(doc.heldOut.patches).toBe(held.length);
    expect(doc.heldOut.minTrainDistance).toBeGreaterThanOrEqual(0);
    expect(doc.folds).toHaveLength(3);
  });

  it('says when the held-out region holds no patch and folds the rest', async () => {
    const far = write('far.geojson', JSON.stringify({ type: 'FeatureCollection', ...utm, features: [{ type: 'Feature', properties: {}, geometry: { type: 'Polygon', coordinates: square(700000, 5200000, 10) } }] }));
    const { code, stdout } = await run(patches, '--held-out', far);
    expect(code).toBe(0);
    expect(stdout).toMatch(/notes\n {2}the held-out region holds no patch centre: there is no independent test set/);
    expect(stdout).toMatch(/fold 5 +\d+ patch\(es\)/);
  });

  it('weights by pure pixels with a scene', async () => {
    const ms = write('ms.tif', writeGeoTiff({ width: 200, height: 200, sampleType: 'uint8', bands: [new Uint8Array(40000).fill(9)], epsg: 32632, origin: [600000, 5100400], pixelSize: [2, 2], overviewFactors: [] }));
    const doc = JSON.parse((await run(patches, '--json', '--scene', ms, '--buffer', '0')).stdout);
    expect(doc.weight).toBe('pure pixels');
    const weights = doc.folds.reduce((n: number, f: { classWeights: Record<string, number> }) => n + Object.values(f.classWeights).reduce((a, b) => a + b, 0), 0);
    expect(weights).toBeGreaterThan(100);
    expect(weights).toBeLessThan(400 * 4);
  });

  it('leaves out, or only counts, the patches within --gap of another fold', async () => {
    const plain = JSON.parse((await run(patches, '--json')).stdout);
    const doc = JSON.parse((await run(patches, '--json', '--gap', '3')).stdout);
    const left = (doc.patches as Row[]).filter((r) => (r.fold as unknown) === 'gap');
    expect(left.length).toBeGreaterThan(0);
    expect(doc.gap).toEqual({ distance: 3, action: 'leave-out', within: left.length });
    const perFold = doc.folds.map((f: { withinGap: number }) => f.withinGap);
    expect(perFold.reduce((a: number, b: number) => a + b, 0)).toBe(left.length);
    // What is left keeps the gap: the nearest training patch of each fold is 3 m away or more.
    for (const f of doc.folds) if (f.minTrainDistance !== null) expect(f.minTrainDistance).toBeGreaterThanOrEqual(3);
    expect(Math.min(...plain.folds.map((f: { minTrainDistance: number }) => f.minTrainDistance))).toBeLessThan(3);
    const reported = JSON.parse((await run(patches, '--json', '--gap', '3', '--gap-report')).stdout);
    expect((reported.patches as Row[]).map((r) => r.fold)).toEqual((plain.patches as Row[]).map((r) => r.fold));
    expect(reported.gap).toEqual({ distance: 3, action: 'report', within: left.length });
    const text = (await run(patches, '--gap', '3')).stdout;
    expect(text).toMatch(/fold 1 .*; \d+ within the gap \(left out, 3 m\);/);
  });

  it('names the file and the problem on bad input, exit 2', async () => {
    const cases: [string[], RegExp][] = [
      [[patches, '--k', '1'], /--k: expected a whole number of 2 or more, got '1'/],
      [[patches, '--block', '0'], /--block: expected a block side in metres/],
      [[patches, '--seed', 'x'], /--seed: expected a whole number/],
      [[patches, '--buffer', '1'], /need --scene/],
      [[patches, '--gap=-1'], /--gap: expected a distance in metres \(0 or more\), got '-1'/],
      [[patches, '--gap-report'], /--gap-report needs --gap M/],
      [[patches, '--scheme', write('s.json', '{"name": "x"}')], /s.json: expected \{"name"/],
      [[patches, '--scheme', write('t.json', '{"name": "x", "classOf": {}}')], /t.json: scheme "x" maps no species/],
      [[patches, '--held-out', write('r.geojson', '{"type": "Point", "coordinates": [0, 0]}')], /r.geojson: polygon 0: geometry is a Point, expected Polygon or MultiPolygon/],
      [[patches, '--held-out', join(dir, 'nope.geojson')], /nope.geojson: cannot read the file \(no such file\)/],
    ];
    for (const [args, message] of cases) {
      const { code, stderr } = await run(...args);
      expect(code, args.join(' ')).toBe(2);
      expect(stderr).toMatch(message);
      expect(stderr.trim().split('\n')).toHaveLength(1);
    }
  });
});
