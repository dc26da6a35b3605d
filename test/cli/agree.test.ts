import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import inputs from '../reference/fixtures/agreement/inputs.json' with { type: 'json' };

const dir = mkdtempSync(join(tmpdir(), 'fellfield-agree-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

interface Patch {
  id?: string | number;
  species?: string;
  confidence?: string;
  /** Lower-left corner and size of a square outline, in metres of UTM zone 32N. */
  at?: [number, number, number];
}

function write(name: string, patches: Patch[] | string): string {
  const path = join(dir, name);
  if (typeof patches === 'string') {
    writeFileSync(path, patches);
    return path;
  }
  const features = patches.map((p, i) => {
    const [x, y, s] = p.at ?? [500000 + i * 20, 5100000, 10];
    return {
      type: 'Feature',
      ...(p.id === undefined ? {} : { id: p.id }),
      properties: { ...(p.species ? { species: p.species } : {}), ...(p.confidence ? { confidence: p.confidence } : {}) },
      geometry: { type: 'Polygon', coordinates: [[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]] },
    };
  });
  const crs = { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32632' } };
  writeFileSync(path, JSON.stringify({ type: 'FeatureCollection', crs, features }));
  return path;
}

async function run(...args: string[]) {
  const stdout: string[] = [];
  const stderr: string[] = [];
  const code = await main(['agree', ...args], { stdout: (t) => stdout.push(t), stderr: (t) => stderr.push(t) });
  return { code, stdout: stdout.join('\n'), stderr: stderr.join('\n') };
}

/** Two files whose paired calls reproduce a given confusion matrix (rows: first file). */
function filesFor(name: string, classes: string[], matrix: number[][]): [string, string] {
  const first: Patch[] = [];
  const second: Patch[] = [];
  let id = 0;
  matrix.forEach((row, i) => row.forEach((count, j) => {
    for (let c = 0; c < count; c++) {
      first.push({ id: `p${id}`, species: classes[i] });
      second.push({ id: `p${id}`, species: classes[j] });
      id++;
    }
  }));
  return [write(`${name}-a.geojson`, first), write(`${name}-b.geojson`, second.reverse())];
}

describe('fellfield agree --by id', () => {
  // The SAS PROC FREQ kappa example quoted in statsmodels' tests (see SOURCES.md):
  // kappa 0.4842, ASE 0.1380, 95 % limits 0.2137 and 0.7547.
  const [a, b] = filesFor('sas', ['abies', 'larix', 'pinus'], [[0, 4, 1], [0, 8, 0], [0, 1, 5]]);

  it('prints the figures of the published example as JSON', async () => {
    const { code, stdout, stderr } = await run(a, b, '--json');
    expect(stderr).toBe('');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.n).toBe(19);
    expect(doc.classes).toEqual(['abies', 'larix', 'pinus']);
    expect(doc.matrix).toEqual([[0, 4, 1], [0, 8, 0], [0, 1, 5]]);
    expect(doc.observed).toBeCloseTo(13 / 19, 12);
    expect(doc.kappa).toBeCloseTo(0.4842, 4);
    expect(doc.kappa_se).toBeCloseTo(0.138, 4);
    expect(doc.kappa_ci95[0]).toBeCloseTo(0.2137, 4);
    expect(doc.kappa_ci95[1]).toBeCloseTo(0.7547, 4);
    expect(doc.pabak).toBeCloseTo((3 * 13 / 19 - 1) / 2, 12);
    expect(doc.expected).toBeCloseTo((5 * 0 + 8 * 13 + 6 * 6) / 361, 12);
    expect(doc.per_class.map((c: { class: string }) => c.class)).toEqual(doc.classes);
    expect(doc.explanations.kappa).toMatch(/0.484/);
    expect(doc.reason).toBeUndefined();
    // The six off-diagonal pairs, for reconciliation.
    expect(doc.disagreements).toHaveLength(6);
    expect(doc.disagreements.every((d: { first: string; second: string }) => d.first !== d.second)).toBe(true);
  });

  it('gives the same kappa and the transposed matrix when the files are swapped', async () => {
    const ab = JSON.parse((await run(a, b, '--json')).stdout);
    const ba = JSON.parse((await run(b, a, '--by', 'id', '--json')).stdout);
    expect(ba.kappa).toBeCloseTo(ab.kappa, 14);
    expect(ba.kappa_se).toBeCloseTo(ab.kappa_se, 14);
    expect(ba.matrix).toEqual(ab.matrix[0].map((_: number, j: number) => ab.matrix.map((row: number[]) => row[j])));
  });

  it('shows the matrix and each figure with its explanation as text', async () => {
    const { code, stdout } = await run(a, b);
    expect(code).toBe(0);
    expect(stdout).toMatch(/paired by id: 19 patches/);
    expect(stdout).toMatch(/^larix\s+0\s+8\s+0 \|\s+8$/m);
    expect(stdout).toMatch(/^total\s+0\s+13\s+6 \|\s+19$/m);
    expect(stdout).toMatch(/Cohen's kappa\s+0.484\s+Agreement beyond chance/);
    expect(stdout).toMatch(/95 % interval\s+\[0.214, 0.755\]/);
    expect(stdout).toMatch(/PABAK/);
    expect(stdout).toMatch(/Disagreements \(6\), first file \/ second file\n {2}p\d+: abies \/ larix/);
  });

  it('reports kappa as null with a reason when both used one class only', async () => {
    const one = write('one-a.geojson', [{ id: 1, species: 'larix' }, { id: 2, species: 'larix' }]);
    const two = write('one-b.geojson', [{ id: 2, species: 'larix' }, { id: 1, species: 'larix' }]);
    const { code, stdout } = await run(one, two, '--json');
    expect(code).toBe(0);
    expect(stdout).not.toMatch(/NaN/);
    const doc = JSON.parse(stdout);
    expect(doc.observed).toBe(1);
    expect(doc.kappa).toBeNull();
    expect(doc.kappa_se).toBeNull();
    expect(doc.kappa_ci95).toBeNull();
    expect(doc.pabak).toBeNull();
    expect(doc.reason).toMatch(/one class only \(larix\)/);
    expect(doc.reasons.pabak).toMatch(/only one class/);
    expect((await run(one, two)).stdout).toMatch(/Cohen's kappa\s+undefined\s+Not defined: both interpreters used one class only/);
  });

  it('breaks agreement down by the first file’s confidence', async () => {
    const x = write('conf-a.geojson', [
      { id: 1, species: 'larix', confidence: 'sure' }, { id: 2, species: 'pinus', confidence: 'sure' },
      { id: 3, species: 'larix', confidence: 'unsure' }, { id: 4, species: 'pinus', confidence: 'unsure' },
    ]);
    const y = write('conf-b.geojson', [
      { id: 1, species: 'larix' }, { id: 2, species: 'pinus' }, { id: 3, species: 'pinus' }, { id: 4, species: 'pinus' },
    ]);
    const doc = JSON.parse((await run(x, y, '--json')).stdout);
    expect(doc.by_confidence.map((g: { key: string; n: number; observed: number }) => [g.key, g.n, g.observed])).toEqual([
      ['sure', 2, 1],
      ['unsure', 2, 0.5],
    ]);
  });
});

describe('fellfield agree --match iou', () => {
  // Two delineations: one identical square, one shifted by 1 m (IoU 0.6), one each unmatched.
  const a = write('iou-a.geojson', [
    { id: 'a1', species: 'larix', at: [500000, 5100000, 10] },
    { id: 'a2', species: 'pinus', at: [500020, 5100000, 4] },
    { id: 'a3', species: 'salix', at: [500040, 5100000, 5] },
  ]);
  const b = write('iou-b.geojson', [
    { id: 'b1', species: 'larix', at: [500000, 5100000, 10] },
    { id: 'b2', species: 'larix', at: [500021, 5100000, 4] },
    { id: 'b3', species: 'salix', at: [500060, 5100000, 5] },
  ]);

  it('matches outlines by IoU and reports the delineation figures', async () => {
    const { code, stdout, stderr } = await run(a, b, '--match', 'iou', '--json');
    expect(stderr).toBe('');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.paired_by).toBe('iou');
    expect(doc.n).toBe(2);
    expect(doc.delineation.matched).toBe(2);
    expect(doc.delineation.unmatched_first).toBe(1);
    expect(doc.delineation.unmatched_second).toBe(1);
    expect(doc.delineation.mean_iou).toBeCloseTo(0.8, 9);
    expect(doc.delineation.area_weighted_agreement).toBeCloseTo(100 / 112, 9);
    expect(doc.delineation.pairs.map((p: { a: string; b: string }) => [p.a, p.b])).toEqual([['a1', 'b1'], ['a2', 'b2']]);
    expect(doc.matrix).toEqual([[1, 0], [1, 0]]);
  });

  it('honours --min-iou', async () => {
    const doc = JSON.parse((await run(a, b, '--match', 'iou', '--min-iou', '0.7', '--json')).stdout);
    expect(doc.delineation.matched).toBe(1);
    expect(doc.delineation.min_iou).toBe(0.7);
  });

  it('measures lon/lat files in metres of one UTM zone before matching', async () => {
    // RFC 7946 lon/lat squares, the second shifted east by a fifth of its width: over
    // 10 m the projection is affine to well below 1e-3, so IoU is 0.8 / 1.2.
    const lonLat = (name: string, shift: number) => {
      const d = 0.0001;
      const x = 10 + shift * d;
      const feature = {
        type: 'Feature', id: 'q1', properties: { species: 'larix' },
        geometry: { type: 'Polygon', coordinates: [[[x, 46], [x + d, 46], [x + d, 46 + d], [x, 46 + d], [x, 46]]] },
      };
      return write(name, JSON.stringify({ type: 'FeatureCollection', features: [feature] }));
    };
    const doc = JSON.parse((await run(lonLat('ll-a.geojson', 0), lonLat('ll-b.geojson', 0.2), '--match', 'iou', '--json')).stdout);
    expect(doc.delineation.matched).toBe(1);
    expect(doc.delineation.mean_iou).toBeCloseTo(0.8 / 1.2, 3);
  });

  it('reports figures as undefined, not an error, when no outline finds a partner', async () => {
    const far = write('iou-far.geojson', [{ id: 'f1', species: 'larix', at: [500500, 5100500, 10] }]);
    const { code, stdout } = await run(a, far, '--match', 'iou', '--json');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.n).toBe(0);
    expect(doc.kappa).toBeNull();
    expect(doc.reason).toMatch(/no paired calls/);
    expect(doc.delineation.matched).toBe(0);
    expect(doc.delineation.mean_iou).toBeNull();
    expect(doc.delineation.reasons.mean_iou).toMatch(/no pair of outlines reached IoU 0.5/);
  });

  it('prints the delineation block as text', async () => {
    const { stdout } = await run(a, b, '--match', 'iou');
    expect(stdout).toMatch(/Delineation \(IoU at least 0.5\)/);
    expect(stdout).toMatch(/mean IoU\s+0.800/);
  });
});

describe('fellfield agree on bad input', () => {
  const good = write('good.geojson', [{ id: 'a', species: 'larix' }, { id: 'b', species: 'pinus' }]);

  const cases: [string, () => string[], RegExp][] = [
    ['a file that is not JSON', () => [write('bad.geojson', '{"type": Feature'), good], /bad\.geojson: not valid JSON/],
    ['JSON that is not GeoJSON', () => [good, write('list.geojson', '[1, 2]')], /list\.geojson: expected a GeoJSON FeatureCollection, found an array/],
    ['a feature without id', () => [write('noid.geojson', [{ id: 'a', species: 'larix' }, { species: 'pinus' }]), good], /noid\.geojson: feature 1: has no "id"/],
    ['a feature without species', () => [good, write('nospecies.geojson', [{ id: 'a' }, { id: 'b', species: 'x' }])], /nospecies\.geojson: feature 0 \(id "a"\): has no "species"/],
    ['duplicate ids', () => [write('dup.geojson', [{ id: 'a', species: 'larix' }, { id: 'a', species: 'pinus' }]), good], /dup\.geojson: feature 1 \(id "a"\): repeats the id of feature 0/],
    ['no shared id', () => [good, write('other.geojson', [{ id: 'x', species: 'larix' }, { id: 'y', species: 'larix' }, { id: 'z', species: 'larix' }])], /share no feature id: nothing to compare \(2 ids in .*good\.geojson, 3 in .*other\.geojson\)/],
    ['mismatched ids', () => [good, write('partial.geojson', [{ id: 'a', species: 'larix' }, { id: 'c', species: 'larix' }, { id: 'd', species: 'larix' }])], /mismatched ids: 1 only in .*good\.geojson \(e\.g\. "b"\), 2 only in .*partial\.geojson \(e\.g\. "c", "d"\); 1 shared/],
    ['a missing file', () => [good, join(dir, 'absent.geojson')], /absent\.geojson: cannot read the file \(no such file\)/],
    ['one file only', () => [good], /expected two label files/],
    ['a bad --min-iou', () => [good, good, '--match', 'iou', '--min-iou', '1.5'], /--min-iou takes a number in \(0, 1\], got '1.5'/],
    ['--min-iou without --match', () => [good, good, '--min-iou', '0.5'], /--min-iou needs --match iou/],
    ['an unknown --by', () => [good, good, '--by', 'name'], /--by takes 'id'/],
  ];

  it.each(cases)('refuses %s with exit 2 and one clear line', async (_name, args, message) => {
    const { code, stdout, stderr } = await run(...args());
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toMatch(message);
    expect(stderr.trim().split('\n')).toHaveLength(1);
    expect(stderr).not.toMatch(/\n\s+at /);
  });
});

describe('fellfield agree with three or more files', () => {
  // Fleiss (1971): 30 patients, 6 psychiatrists each, kappa .430; raw calls as in
  // statsmodels' tests, R irr's kappam.fleiss gives 0.4302445 (see SOURCES.md).
  const diagnoses = inputs.fleiss.find((c) => c.name === 'Fleiss (1971) diagnoses')!.calls;
  const paths = [0, 1, 2, 3, 4, 5].map((r) =>
    write(`rater${r}.geojson`, diagnoses.map((row, i) => ({ id: `patient-${i + 1}`, species: `class-${row[r]}` }))));

  it("reports Fleiss' kappa of the published example and Cohen's kappa per pair", async () => {
    const { code, stdout, stderr } = await run(...paths, '--json');
    expect(stderr).toBe('');
    expect(code).toBe(0);
    const doc = JSON.parse(stdout);
    expect(doc.n).toBe(30);
    expect(doc.raters).toBe(6);
    expect(doc.fleiss_kappa).toBeCloseTo(0.4302445, 7);
    expect(doc.pairwise).toHaveLength(15);
    const pair = JSON.parse((await run(paths[0], paths[1], '--json')).stdout);
    expect(doc.pairwise[0].kappa).toBeCloseTo(pair.kappa, 12);
  });

  it('prints them as text', async () => {
    const { stdout } = await run(...paths.slice(0, 3));
    expect(stdout).toMatch(/Agreement of 3 label files, paired by id: 30 patches/);
    expect(stdout).toMatch(/Fleiss' kappa\s+-?\d\.\d{3}/);
    expect(stdout).toMatch(/rater0\.geojson × rater2\.geojson\s+kappa/);
  });

  it('refuses mismatched ids in any file, naming it', async () => {
    const short = write('short.geojson', diagnoses.slice(1).map((row, i) => ({ id: `patient-${i + 2}`, species: `class-${row[0]}` })));
    const { code, stderr } = await run(paths[0], paths[1], short);
    expect(code).toBe(2);
    expect(stderr).toMatch(/rater0\.geojson and .*short\.geojson have mismatched ids: 1 only in .*rater0\.geojson \(e\.g\. "patient-1"\), 0 only/);
  });

  it('refuses IoU matching of more than two files', async () => {
    const { code, stderr } = await run(...paths.slice(0, 3), '--match', 'iou');
    expect(code).toBe(2);
    expect(stderr).toMatch(/compares two delineations, got 3 files/);
  });
});

describe('the installed command', () => {
  it('runs through bin/fellfield.mjs', () => {
    const [a, b] = filesFor('bin', ['larix', 'pinus'], [[3, 1], [0, 4]]);
    const out = execFileSync(process.execPath, ['bin/fellfield.mjs', 'agree', a, b, '--json'], { encoding: 'utf8' });
    const doc = JSON.parse(out);
    // po = 7/8, pe = (4·3 + 4·5)/64 = 0.5, kappa = 0.75.
    expect(doc.kappa).toBeCloseTo(0.75, 12);
  });
});
