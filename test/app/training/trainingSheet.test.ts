import { describe, expect, it } from 'vitest';
import { sheetSummary, trainingSet, trainingSheet } from '../../../src/app/training/trainingSheet.ts';
import type { RasterGrid } from '../../../src/core/geometry/rasterGrid.ts';
import type { MultiPolygonRings } from '../../../src/core/geometry/types.ts';
import { emptySiteState, type SiteState } from '../../../src/core/site/state.ts';
import type { Patch, Ruling, Tag } from '../../../src/core/site/types.ts';
import { groupScheme } from '../../../src/core/training/scheme.ts';

// The training sheet of a stored site: only settled single-species patches train, and
// the figures are the core's (pixels, balance, folds) on them; counts worked by hand.

const square = (x: number, y: number, s: number): MultiPolygonRings => [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]];
const grid: RasterGrid = { originX: 0, originY: 400, pixelWidth: 1, pixelHeight: 1, width: 400, height: 400 };
const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2025-07-24' } as unknown as Tag['display'];

function site(): SiteState {
  const state = emptySiteState();
  const patches = state.patches as Map<string, Patch>;
  const tags = state.tags as Map<string, Tag>;
  const rulings = state.rulings as Map<string, Ruling>;
  const add = (id: string, x: number, y: number, s: number, calls: string[]) => {
    patches.set(id, { id, geometry: square(x, y, s), source: { kind: 'drawn' }, createdAt: 't', createdBy: 'A' });
    calls.forEach((species, i) => tags.set(`${id}|p${i}`, { patchId: id, passId: `p${i}`, species, confidence: 'sure', note: '', interpreter: `I${i}`, time: 't', display }));
  };
  add('a', 10, 10, 4, ['ABFI']); // single call
  add('b', 110, 10, 4, ['ABFI', 'ABFI']); // agreed
  add('c', 210, 10, 4, ['SAIN', 'BEFA']); // open: calls differ
  add('d', 10, 210, 4, ['SAIN', 'BEFA']); // ruled SAIN
  rulings.set('r1', { id: 'r1', patchId: 'd', decision: { kind: 'species', species: 'SAIN' }, passIds: ['p0', 'p1'], by: 'A', time: 't', reason: '', reopened: null });
  add('e', 210, 210, 4, ['mixed']);
  add('f', 300, 300, 4, []);
  return state;
}

describe('training sheet', () => {
  it('trains on settled species only and says why the rest are out', () => {
    const set = trainingSet(site());
    expect(set.patches.map((p) => [p.id, p.species])).toEqual([['a', 'ABFI'], ['b', 'ABFI'], ['d', 'SAIN']]);
    expect(set.leftOut).toEqual({ 'calls not settled': ['c'], 'tagged mixed': ['e'], untagged: ['f'] });
    expect(set.patches[0].area).toBe(16);
  });

  it('counts, balances and folds them under a scheme', () => {
    const roster = [{ code: 'ABFI', group: 'conifer' }, { code: 'SAIN', group: 'broadleaf shrub' }, { code: 'BEFA', group: 'broadleaf shrub' }];
    const sheet = trainingSheet(trainingSet(site()), grid, {
      rule: { kind: 'inside', buffer: 0.5 },
      scheme: groupScheme(roster, 'conifer'),
      balance: { rareCount: 1 },
      folds: { k: 3, blockSize: 50, seed: 1 },
    });
    // A 4 m square on 1 m pixels shrunk by 0.5 m: 3 m across, the inner 2 x 2 whole pixels.
    expect(sheet.pixels.patches.map((p) => p.pure)).toEqual([4, 4, 4]);
    expect(sheet.balance.classes.map((c) => [c.name, c.pure])).toEqual([['ABFI', 8], ['other', 4]]);
    expect(sheet.balance.baselines.pixels.majorityAccuracy).toBeCloseTo(8 / 12, 12);
    // Three patches in three 50 m blocks: one block per fold, 100 m or more apart.
    expect(sheet.folds.folds.map((f) => f.patches).sort()).toEqual([1, 1, 1]);
    for (const f of sheet.folds.folds) expect(f.minTrainDistance).toBeGreaterThanOrEqual(96);
    expect(sheet.messages).toContain('class other lies in only 1 block(s) of 50 m, fewer than the 3 folds: some folds test none of it');
  });

  it('sums the sheet up for the page with the gap between folds applied', () => {
    // a (10,10) and b (110,10) are 96 m apart, d (10,210) 196 m from a: a gap of 100 m takes a and b.
    const summary = sheetSummary({
      set: trainingSet(site()), grid,
      options: { rule: { kind: 'centre' }, scheme: { name: 'all', classOf: { ABFI: 'ABFI', SAIN: 'SAIN' } }, folds: { k: 3, blockSize: 50, seed: 1 }, gap: { distance: 100, action: 'leave-out' } },
    });
    expect(summary.ruleText).toBe('pixel centre inside the patch');
    expect(summary.folds.gap).toEqual({ distance: 100, action: 'leave-out', within: 2 });
    expect(summary.folds.folds.reduce((n, f) => n + f.patches, 0)).toBe(1);
    expect(summary.messages).toContain('2 patch(es) lie within 100 m of a patch of another fold and are left out of every fold');
  });
});
