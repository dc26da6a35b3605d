import { describe, expect, it } from 'vitest';
import type { Finding } from '../../../src/core/checks/findings.ts';
import type { PatchInput } from '../../../src/core/checks/preparedPatch.ts';
import { runChecks } from '../../../src/core/checks/runChecks.ts';
import type { SceneGrids } from '../../../src/core/checks/settings.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';

// One small scene per kind of finding, with sizes worked out by hand (squares and
// triangles), plus the degenerate and oversized input that must not crash or hang.

const square = (x: number, y: number, s: number): Ring => [[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]];
const patch = (id: string | number, species: string, ring: Ring, extra: Partial<PatchInput> = {}): PatchInput =>
  ({ id, species, rings: [[ring]], ...extra });
const kinds = (findings: Finding[]) => findings.map((f) => `${f.kind} ${f.patches.join(',')}`);
// With no scene, the nominal 1.2 m multispectral pixel makes anything under 2.88 m² undersized.
const noSize = { settings: { minAreaInMsPixels: 0 } };

describe('overlaps', () => {
  it('same species: double counting, with area, shares, polygon and a merge', () => {
    const { findings } = runChecks([patch('a', 'pice', square(0, 0, 4)), patch('b', 'pice', square(3, 0, 4))], noSize);
    expect(kinds(findings)).toEqual(['overlap-same a,b']);
    const [f] = findings;
    expect(f.severity).toBe('warning');
    expect(f.area_m2).toBe(4);
    expect(f.shares).toEqual([0.25, 0.25]);
    expect(f.fix.action).toBe('merge');
    expect(f.geometry?.type).toBe('MultiPolygon');
  });

  it('different species: a mixed conflict, trimmed from the side that loses least', () => {
    const { findings } = runChecks([patch('big', 'pice', square(0, 0, 10)), patch('small', 'alnu', square(8, 8, 4))], noSize);
    expect(kinds(findings)).toEqual(['overlap-mixed big,small']);
    const [f] = findings;
    expect(f.severity).toBe('error');
    expect(f.area_m2).toBe(4);
    expect(f.shares).toEqual([0.04, 0.25]);
    expect(f.fix).toMatchObject({ action: 'trim', target: 'big' });
    expect(f.details?.species).toEqual(['pice', 'alnu']);
  });

  it('touching patches and slivers at or under the tolerance are not findings', () => {
    const touching = runChecks([patch(1, 'pice', square(0, 0, 4)), patch(2, 'alnu', square(4, 0, 4)), patch(3, 'alnu', square(4, 4, 2))], noSize);
    expect(touching.findings).toEqual([]);
    // 0.002 m wide x 4 m = 0.008 m², under the default 0.009 m² (0.1 of a 0.3 m pixel).
    const sliver = runChecks([patch(1, 'pice', square(0, 0, 4)), patch(2, 'alnu', square(3.998, 0, 4))], noSize);
    expect(sliver.findings).toEqual([]);
    const wider = runChecks([patch(1, 'pice', square(0, 0, 4)), patch(2, 'alnu', square(3.99, 0, 4))], noSize);
    expect(kinds(wider.findings)).toEqual(['overlap-mixed 1,2']);
  });

  it('a patch inside another overlaps by all of itself', () => {
    const { findings } = runChecks([patch('out', 'pice', square(0, 0, 10)), patch('in', 'pice', square(2, 2, 2))], noSize);
    expect(findings[0].patches).toEqual(['in', 'out']);
    expect(findings[0].shares).toEqual([1, 0.04]);
  });

  it('an overlap with a hole counts only the area outside the hole', () => {
    const ring = patch('ring', 'pice', square(0, 0, 10), { rings: [[square(0, 0, 10), square(3, 3, 4).reverse()]] });
    const { findings } = runChecks([ring, patch('plug', 'alnu', square(2, 2, 6))], noSize);
    expect(findings[0].area_m2).toBe(36 - 16);
  });
});

describe('near-duplicates', () => {
  it('two copies a little apart: IoU over 0.9, and the overlap is still reported', () => {
    // 4 x 4 squares offset by 0.1 m: overlap 3.9 x 4 = 15.6, union 16.4, IoU 0.95122.
    const { findings } = runChecks([patch('a', 'pice', square(0, 0, 4)), patch('b', 'pice', square(0.1, 0, 4))], noSize);
    expect(kinds(findings)).toEqual(['overlap-same a,b', 'near-duplicate a,b']);
    const dup = findings[1];
    expect(dup.details?.iou).toBeCloseTo(15.6 / 16.4, 4);
    expect(dup.fix.action).toBe('delete');
    expect(dup.severity).toBe('warning');
  });

  it('copies with two species are an error to settle', () => {
    const { findings } = runChecks([patch('a', 'pice', square(0, 0, 4)), patch('b', 'lari', square(0, 0, 4))], noSize);
    const dup = findings.find((f) => f.kind === 'near-duplicate')!;
    expect(dup.severity).toBe('error');
    expect(dup.fix.action).toBe('retag');
    expect(dup.details?.iou).toBe(1);
  });

  it('IoU at 0.8 is not a near-duplicate by default, but is under a lower setting', () => {
    // Offset 4/9 m: overlap 4 x (4 - 4/9), union 4 x (4 + 4/9): IoU = 0.8.
    const pair = [patch('a', 'pice', square(0, 0, 4)), patch('b', 'pice', square(4 / 9, 0, 4))];
    expect(kinds(runChecks(pair, noSize).findings)).toEqual(['overlap-same a,b']);
    expect(kinds(runChecks(pair, { settings: { minAreaInMsPixels: 0, nearDuplicateIoU: 0.75 } }).findings)).toContain('near-duplicate a,b');
  });
});

describe('mixed tags', () => {
  it('a patch tagged mixed, and one whose interpreters disagree', () => {
    const { findings } = runChecks([
      patch('m', 'Mixed', square(0, 0, 4)),
      patch('q', 'pice', square(10, 0, 4), { tags: [{ species: 'pice' }, { species: 'lari' }] }),
      patch('ok', 'pice', square(20, 0, 4), { tags: [{ species: 'pice' }] }),
    ], noSize);
    expect(kinds(findings)).toEqual(['mixed-tag m', 'mixed-tag q']);
    expect(findings[1].details?.species).toEqual(['lari', 'pice']);
    expect(findings[1].fix.action).toBe('retag');
  });
});

describe('undersized', () => {
  const ms = { originX: 0, originY: 20, pixelWidth: 2, pixelHeight: 2, width: 10, height: 10 };

  it('area under two multispectral pixels, with or without a scene', () => {
    // 1.5 x 1.5 = 2.25 m², under 2 x 1.2² = 2.88 m².
    expect(kinds(runChecks([patch(1, 'pice', square(0, 0, 1.5))]).findings)).toEqual(['undersized 1']);
    expect(kinds(runChecks([patch(1, 'pice', square(0, 0, 1.7))]).findings)).toEqual([]);
  });

  it('no pure multispectral pixel on the scene grid', () => {
    const scene: SceneGrids = { ms };
    // 2.9 x 2.9 m = 8.41 m² (over 8 m²) but placed across pixel corners: no whole 2 m pixel.
    const off = runChecks([patch('x', 'pice', square(1, 1, 2.9))], { scene });
    expect(kinds(off.findings)).toEqual(['undersized x']);
    expect(off.findings[0].details).toMatchObject({ purePixels: 0, minPurePixels: 1 });
    // The same square on the grid holds one pure pixel.
    expect(runChecks([patch('x', 'pice', square(0, 0, 3.4))], { scene }).findings).toEqual([]);
    // Asking for four pure pixels makes that one too few.
    expect(kinds(runChecks([patch('x', 'pice', square(0, 0, 3.4))], { scene, settings: { minPurePixels: 4 } }).findings)).toEqual(['undersized x']);
  });
});

describe('off the image', () => {
  const ms = { originX: 0, originY: 20, pixelWidth: 2, pixelHeight: 2, width: 10, height: 10 };
  const pan = { originX: 0, originY: 20, pixelWidth: 0.5, pixelHeight: 0.5, width: 40, height: 40 };

  it('outside the scene, across its edge, or inside', () => {
    const { findings } = runChecks([
      patch('out', 'pice', square(30, 30, 4)),
      patch('edge', 'pice', square(18, 10, 4)),
      patch('in', 'pice', square(10, 10, 4)),
    ], { scene: { ms, pan } });
    expect(kinds(findings)).toEqual(['off-image edge', 'off-image out']);
    const [edge, out] = findings;
    expect(edge).toMatchObject({ severity: 'warning', area_m2: 8, shares: [0.5] });
    expect(out).toMatchObject({ severity: 'error', area_m2: 16, shares: [1] });
    expect(edge.geometry?.type).toBe('MultiPolygon');
  });

  it('the sliver tolerance follows the panchromatic pixel of the scene', () => {
    // 0.5 m pan pixel: tolerance 0.025 m²; 0.005 x 4 m = 0.02 m² off the edge is noise.
    const { findings } = runChecks([patch('e', 'pice', square(16.005, 10, 4))], { scene: { ms, pan } });
    expect(findings).toEqual([]);
  });
});

describe('invalid and degenerate outlines never crash', () => {
  it('a bowtie is invalid at its crossing, repaired into two triangles, and still checked for overlap', () => {
    const bowtie: Ring = [[0, 0], [4, 4], [4, 0], [0, 4], [0, 0]];
    const { findings } = runChecks([patch('bow', 'pice', bowtie), patch('sq', 'alnu', square(3, 1, 3))], noSize);
    expect(kinds(findings)).toEqual(['invalid bow', 'overlap-mixed bow,sq']);
    const [invalid, overlap] = findings;
    expect(invalid.reasons).toEqual(['self-intersection']);
    expect(invalid.geometry).toEqual({ type: 'Point', coordinates: [2, 2] });
    expect(invalid.fix.action).toBe('repair');
    expect(invalid.fix.text).toMatch(/1 part\(s\) became 2/);
    expect(invalid.details?.repairedAreaM2).toBe(8);
    // The right triangle (2,2)-(4,4)-(4,0) meets the square [3,6]x[1,4] where 3 <= x <= 4
    // and 1 <= y <= x: the integral of (x - 1) from 3 to 4 is 2.5 m² (worked by hand).
    expect(overlap.area_m2).toBe(2.5);
  });

  it('collinear points, two-point rings, NaN positions and empty outlines become findings', () => {
    const { findings } = runChecks([
      patch('line', 'pice', [[0, 0], [1, 1], [2, 2], [0, 0]]),
      patch('two', 'pice', [[5, 5], [6, 6]]),
      patch('nan', 'pice', [[10, 10], [NaN, 10], [11, 11], [10, 10]]),
      { id: 'empty', species: 'pice', rings: [] },
      { id: 'hollow', species: 'pice', rings: [[]] },
      patch('open', 'pice', [[20, 20], [24, 20], [24, 24], [20, 24]]),
    ], noSize);
    const reasons = Object.fromEntries(findings.filter((f) => f.kind === 'invalid').map((f) => [f.patches[0], f.reasons]));
    expect(reasons).toEqual({
      line: ['zero-area'], two: ['too-few-points'], nan: ['invalid-coordinate'],
      empty: ['too-few-points'], hollow: ['too-few-points'], open: ['ring-not-closed'],
    });
    expect(JSON.parse(JSON.stringify(findings))).toHaveLength(findings.length);
    // Nothing is left of a collinear outline: the fix is to delete or redraw it.
    expect(findings.find((f) => f.patches[0] === 'line')!.fix.action).toBe('delete');
    expect(findings.find((f) => f.patches[0] === 'open')!.fix.action).toBe('repair');
  });

  it('an outline of a million vertices is reported and not taken apart', () => {
    const n = 1_000_000;
    const ring: Ring = [];
    for (let i = 0; i < n; i++) ring.push([50 + 5 * Math.cos((2 * Math.PI * i) / n), 50 + 5 * Math.sin((2 * Math.PI * i) / n)]);
    ring.push(ring[0]);
    const { findings } = runChecks([patch('huge', 'pice', ring), patch('near', 'pice', square(50, 50, 2))], noSize);
    expect(kinds(findings)).toEqual(['invalid huge']);
    expect(findings[0].reasons).toEqual(['vertex-limit']);
    expect(findings[0].fix.action).toBe('simplify');
  });
});
