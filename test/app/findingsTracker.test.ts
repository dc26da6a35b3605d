import { describe, expect, it } from 'vitest';
import { FindingsTracker, type TrackedPatch } from '../../src/app/findings/FindingsTracker.ts';
import { InlineCheckRunner } from '../../src/app/findings/inlineCheckRunner.ts';
import { runChecks } from '../../src/core/checks/runChecks.ts';
import { seeded } from '../../bench/harness.ts';

// The tracker must always agree with a full check of the same patches (the core's
// runChecks), in the same order, however the patches were edited in between.

const newTracker = () => new FindingsTracker(new InlineCheckRunner(() => Promise.reject(new Error('no rasters here'))));

function square(x: number, y: number, size: number): TrackedPatch['geometry'] {
  return [[[[x, y], [x + size, y], [x + size, y + size], [x, y + size], [x, y]]]];
}

function site(count: number, random: () => number): TrackedPatch[] {
  return Array.from({ length: count }, (_, i) => ({
    id: `p${i}`,
    geometry: square(Math.floor(random() * 60), Math.floor(random() * 60), 2 + random() * 4),
    species: ['ABFI', 'PIEX', 'SAIN'][Math.floor(random() * 3)],
  }));
}

const key = (f: { kind: string; patches: unknown[] }) => `${f.kind}:${f.patches.join('+')}`;
const fullCheck = (patches: TrackedPatch[]) =>
  runChecks(patches.map((p) => ({ id: p.id, species: p.species, rings: p.geometry }))).findings.map(key);

describe('FindingsTracker', () => {
  it('matches a full check after random edits, deletions and retags', async () => {
    const random = seeded(7);
    let patches = site(120, random);
    const tracker = newTracker();
    await tracker.load(patches);
    expect(tracker.findings().map(key)).toEqual(fullCheck(patches));
    for (let step = 0; step < 60; step++) {
      const i = Math.floor(random() * patches.length);
      const roll = random();
      if (roll < 0.4) patches[i] = { ...patches[i], geometry: square(random() * 60, random() * 60, 2 + random() * 4) };
      else if (roll < 0.7) patches[i] = { ...patches[i], species: patches[i].species === 'ABFI' ? 'PIEX' : 'ABFI' };
      else if (roll < 0.85) patches = patches.filter((_, j) => j !== i);
      else patches = [...patches, { id: `n${step}`, geometry: square(random() * 60, random() * 60, 3), species: 'SAIN' }];
      await tracker.sync(patches);
    }
    expect(tracker.findings().map(key)).toEqual(fullCheck(patches));
  });

  it('reports what an edit added and removed', async () => {
    const tracker = newTracker();
    const a = { id: 'a', geometry: square(0, 0, 4), species: 'ABFI' };
    const b = { id: 'b', geometry: square(10, 0, 4), species: 'PIEX' };
    await tracker.load([a, b]);
    expect(tracker.findings().filter((f) => f.kind.startsWith('overlap'))).toHaveLength(0);
    const moved = { ...b, geometry: square(2, 0, 4) };
    const delta = await tracker.sync([a, moved]);
    expect(delta.added.map((f) => f.kind)).toContain('overlap-mixed');
    const back = await tracker.sync([a, b]);
    expect(back.removed.map((f) => f.kind)).toContain('overlap-mixed');
  });

  it('takes in a site larger than one slice, and still sees a deletion and an edit', { timeout: 60_000 }, async () => {
    const random = seeded(3);
    const patches = Array.from({ length: 25_000 }, (_, i) => ({
      id: `q${i}`,
      geometry: square((i % 200) * 5 + random(), Math.floor(i / 200) * 5 + random(), 2 + random() * 3),
      species: ['ABFI', 'PIEX'][i % 2],
    }));
    const tracker = newTracker();
    await tracker.load(patches);
    expect(tracker.findings().map(key)).toEqual(fullCheck(patches));
    const edited = patches.filter((_, i) => i !== 12_345).map((p, i) => (i === 20_000 ? { ...p, geometry: square(0, 0, 4) } : p));
    await tracker.sync(edited);
    expect(tracker.findings().map(key)).toEqual(fullCheck(edited));
  });
});
