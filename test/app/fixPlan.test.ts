import { describe, expect, it } from 'vitest';
import { fixPlan } from '../../src/app/findings/fixPlan.ts';
import { runChecks } from '../../src/core/checks/runChecks.ts';
import { multiPolygonArea } from '../../src/core/geometry/measure.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';

// Each fix, carried out, must make its finding go away on a fresh full check.

const square = (x: number, y: number, s: number): MultiPolygonRings => [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]];

function check(outlines: Record<string, MultiPolygonRings>, species: Record<string, string>) {
  return runChecks(Object.entries(outlines).map(([id, rings]) => ({ id, species: species[id], rings }))).findings;
}

describe('fixPlan', () => {
  it('trims a mixed-species overlap out of one patch, leaving no overlap', () => {
    const outlines = { a: square(0, 0, 4), b: square(3, 0, 4) };
    const species = { a: 'ABFI', b: 'SAIN' };
    const finding = check(outlines, species).find((f) => f.kind === 'overlap-mixed')!;
    expect(finding).toBeDefined();
    const plan = fixPlan(finding, (id) => outlines[id as 'a' | 'b']);
    expect(plan.kind).toBe('geometry');
    if (plan.kind !== 'geometry') return;
    const after = { ...outlines, [plan.id]: plan.geometry };
    expect(check(after, species).filter((f) => f.kind.startsWith('overlap'))).toHaveLength(0);
    // 4 x 4 less the 1 x 4 strip shared (exact by hand).
    expect(multiPolygonArea(plan.geometry)).toBeCloseTo(12, 9);
  });

  it('repairs a bowtie into its two triangles and says what changed', () => {
    const bowtie: MultiPolygonRings = [[[[0, 0], [4, 4], [4, 0], [0, 4], [0, 0]]]];
    const finding = check({ x: bowtie }, { x: 'ABFI' }).find((f) => f.kind === 'invalid')!;
    const plan = fixPlan(finding, () => bowtie);
    expect(plan.kind).toBe('geometry');
    if (plan.kind !== 'geometry') return;
    expect(plan.says).toMatch(/^x: /);
    expect(check({ x: plan.geometry }, { x: 'ABFI' }).filter((f) => f.kind === 'invalid')).toHaveLength(0);
    expect(multiPolygonArea(plan.geometry)).toBeCloseTo(8, 9); // two triangles of 4 m² each
  });

  it('hands fixes that need an interpreter to the user', () => {
    const finding = check({ m: square(0, 0, 4) }, { m: 'mixed' }).find((f) => f.kind === 'mixed-tag')!;
    expect(fixPlan(finding, () => square(0, 0, 4)).kind).toBe('hand');
  });
});
