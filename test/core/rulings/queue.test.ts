import { describe, expect, it } from 'vitest';
import { disagreementQueue, filterQueue, queueProgress, speciesPairs } from '../../../src/core/rulings/index.ts';
import type { Finding } from '../../../src/core/checks/findings.ts';
import type { Patch } from '../../../src/core/site/index.ts';
import { ruledSite } from '../../app/rulings/ruledSite.ts';

// The disagreement queue on a small site built through the blind-pass use cases.
// The default order is a Borda count (J.-C. de Borda, 1781, "Mémoire sur les élections
// au scrutin": each candidate scores the sum of its ranks) over area, rarity and
// confidence; the expected order below is worked by hand in the comments.

describe('the disagreement queue', () => {
  it('lists species disagreements and calls naming no species, with every call revealed', async () => {
    const { site, blindPassId } = await ruledSite([
      { size: 4, first: 'PICE', second: { species: 'PICE' } },
      { size: 5, first: 'PICE', second: { species: 'ALVI', note: 'leafy' } },
      { size: 6, first: 'ALVI', second: { species: "can't tell" } },
      { size: 7, first: 'LADE' },
    ]);
    const queue = disagreementQueue({ state: site.state });
    expect(queue.map((i) => i.patchId).sort()).toEqual(['P2', 'P3']);
    const p2 = queue.find((i) => i.patchId === 'P2')!;
    expect(p2.kinds).toEqual(['species']);
    expect(p2.calls).toEqual([
      { passId: 'pass-ak', interpreter: 'ak', species: 'PICE', confidence: 'sure', note: 'ak on P2' },
      { passId: blindPassId, interpreter: 'bo', species: 'ALVI', confidence: 'sure', note: 'leafy' },
    ]);
    expect(p2.area).toBe(25);
    expect(queue.find((i) => i.patchId === 'P3')!.kinds).toEqual(['no-species']);
    expect(queueProgress(queue)).toEqual({ settled: 0, open: 2, total: 2 });
  });

  it('orders by the sum of area, rarity and confidence ranks', async () => {
    // P1: area 100, species PICE/ALVI, both sure (confidence 3)
    // P2: area 36,  species PICE/LADE, likely+sure (2.5)
    // P3: area 16,  species PICE/ALVI, unsure+unsure (1)
    // Species counts over patches: PICE 3, ALVI 2, LADE 1. Rarity: P1 2, P2 1, P3 2.
    // Ranks (0 best): area P1 0, P2 1, P3 2; rarity P2 0, P1 1, P3 1 (tie);
    // confidence P1 0, P2 1, P3 2. Sums: P1 1, P2 2, P3 5  ->  P1, P2, P3.
    const { site } = await ruledSite([
      { size: 10, first: 'PICE', second: { species: 'ALVI' } },
      { size: 6, first: 'PICE', firstConfidence: 'likely', second: { species: 'LADE' } },
      { size: 4, first: 'PICE', firstConfidence: 'unsure', second: { species: 'ALVI', confidence: 'unsure' } },
    ]);
    const queue = disagreementQueue({ state: site.state });
    expect(queue.map((i) => i.patchId)).toEqual(['P1', 'P2', 'P3']);
    expect(queue.map((i) => i.rarity)).toEqual([2, 1, 2]);
    expect(queue.map((i) => i.confidence)).toEqual([3, 2.5, 1]);
  });

  it('filters by species pair, interpreter, kind and status', async () => {
    const { site } = await ruledSite([
      { size: 10, first: 'PICE', second: { species: 'ALVI' } },
      { size: 6, first: 'PICE', second: { species: 'LADE' } },
      { size: 4, first: 'ALVI', second: { species: 'unknown' } },
    ]);
    const queue = disagreementQueue({ state: site.state });
    expect(filterQueue(queue, { pair: ['LADE', 'PICE'] }).map((i) => i.patchId)).toEqual(['P2']);
    expect(filterQueue(queue, { pair: ['ALVI', 'PICE'] }).map((i) => i.patchId)).toEqual(['P1']);
    expect(filterQueue(queue, { kind: 'no-species' }).map((i) => i.patchId)).toEqual(['P3']);
    expect(filterQueue(queue, { interpreter: 'bo' })).toHaveLength(3);
    expect(filterQueue(queue, { interpreter: 'cy' })).toHaveLength(0);
    expect(filterQueue(queue, { status: 'settled' })).toHaveLength(0);
    expect(speciesPairs(queue)).toEqual([['ALVI', 'PICE'], ['ALVI', 'unknown'], ['LADE', 'PICE']]);
  });

  it('takes in open mixed-species findings with their message', async () => {
    const { site } = await ruledSite([{ size: 10, first: 'PICE' }, { size: 6, first: 'ALVI' }]);
    const finding = { kind: 'mixed-tag', patches: ['P2'], severity: 'warning', message: 'P2 holds two species', area_m2: null, geometry: null, fix: { action: 'retag', target: 'P2', text: '' } } as Finding;
    const overlap = { ...finding, kind: 'overlap-same', patches: ['P1', 'P2'], message: 'same-species overlap' } as Finding;
    const queue = disagreementQueue({ state: site.state, findings: [finding, overlap] });
    expect(queue.map((i) => [i.patchId, i.kinds, i.notes])).toEqual([['P2', ['mixed'], ['P2 holds two species']]]);
  });

  it('lists outlines an independent delineation did not match, both ways', async () => {
    const { site } = await ruledSite([{ size: 10, first: 'PICE' }, { size: 10, first: 'ALVI' }]);
    // bo delineates: one outline matching P1 (x 0..10), one where ak drew nothing
    // (x 40..50), and the area spans P2 (x 20..30), which bo did not draw.
    const { startDelineation, endBlindPass } = await import('../../../src/app/blind/blindPasses.ts');
    const pass = await startDelineation(site, { interpreter: 'bo', time: '2026-07-02T08:00:00.000Z' });
    const drawn = (id: string, x: number): Patch => ({
      id, geometry: [[[[x, 0], [x + 10, 0], [x + 10, 10], [x, 10], [x, 0]]]], source: { kind: 'drawn' as const }, createdAt: '2026-07-02T08:10:00.000Z', createdBy: 'bo',
    });
    for (const [id, x] of [['D1', 0.5], ['D2', 40]] as const) {
      await site.commitWith(() => ({ kind: 'patch.added', actor: 'bo', time: '2026-07-02T08:10:00.000Z', payload: { patch: drawn(id, x), tags: [] } }));
    }
    const before = disagreementQueue({ state: site.state });
    expect(before.filter((i) => i.kinds.includes('unmatched'))).toHaveLength(0); // still open: nothing compared yet
    await endBlindPass(site, pass.id, { interpreter: 'bo', time: '2026-07-02T09:00:00.000Z' });
    const queue = disagreementQueue({ state: site.state });
    const unmatched = queue.filter((i) => i.kinds.includes('unmatched'));
    expect(unmatched.map((i) => i.patchId).sort()).toEqual(['D2', 'P2']);
    expect(unmatched.find((i) => i.patchId === 'D2')!.notes[0]).toMatch(/pass draw-bo-1 \(bo\) has no match in pass pass-ak/);
  });
});
