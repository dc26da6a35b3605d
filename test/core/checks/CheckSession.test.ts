import { describe, expect, it } from 'vitest';
import { CheckSession } from '../../../src/core/checks/CheckSession.ts';
import { compareFindings, type Finding } from '../../../src/core/checks/findings.ts';
import { pairFindings } from '../../../src/core/checks/pairFindings.ts';
import { patchFindings } from '../../../src/core/checks/patchFindings.ts';
import { preparePatch, type PatchInput } from '../../../src/core/checks/preparedPatch.ts';
import { resolveSettings } from '../../../src/core/checks/settings.ts';
import { runChecks } from '../../../src/core/checks/runChecks.ts';
import type { Ring } from '../../../src/core/geometry/types.ts';
import { Random } from '../../../src/core/random.ts';
import { crownRing, SPECIES, testSite } from './testSite.ts';

// The engine's promises: an edit re-checks only what it touches yet ends where a full
// check would, and findings do not depend on where rings start, their winding, or the
// order of the patches.

// The multispectral grid covers most of the site; the top and right rows of crowns cross its edges.
const scene = { ms: { originX: 599990, originY: 5100150, pixelWidth: 1.2, pixelHeight: 1.2, width: 150, height: 140 } };

/** A finding without the parts that legitimately depend on vertex order (geometry, wording). */
function summary(f: Finding) {
  return { kind: f.kind, patches: f.patches, severity: f.severity, area: f.area_m2, shares: f.shares, reasons: f.reasons };
}

function expectSameFindings(actual: Finding[], expected: Finding[]) {
  expect(actual.map((f) => `${f.kind} ${f.patches.join(',')} ${f.severity}`))
    .toEqual(expected.map((f) => `${f.kind} ${f.patches.join(',')} ${f.severity}`));
  actual.forEach((f, i) => {
    const e = summary(expected[i]);
    const a = summary(f);
    expect(a.reasons).toEqual(e.reasons);
    // Areas are rounded to 0.001 m²; overlays of re-ordered rings may differ in the last bit.
    if (e.area === null) expect(a.area).toBeNull();
    else expect(Math.abs(a.area! - e.area)).toBeLessThanOrEqual(0.0011);
    (e.shares ?? []).forEach((s, k) => expect(Math.abs(a.shares![k] - s)).toBeLessThanOrEqual(1e-3));
  });
}

const rotate = (ring: Ring, by: number): Ring => {
  const open = ring.slice(0, -1);
  const k = by % open.length;
  const turned = [...open.slice(k), ...open.slice(0, k)];
  return [...turned, turned[0]];
};

function randomEdit(random: Random, patch: PatchInput): PatchInput {
  const roll = random.next();
  if (roll < 0.4) {
    const dx = random.uniform(-4, 4), dy = random.uniform(-4, 4);
    return { ...patch, rings: patch.rings.map((part) => part.map((ring) => ring.map(([x, y]) => [x + dx, y + dy] as [number, number]))) };
  }
  if (roll < 0.6) return { ...patch, species: SPECIES[Math.floor(random.next() * SPECIES.length)] };
  if (roll < 0.8) {
    const [cx, cy] = patch.rings[0][0][0];
    return { ...patch, rings: [[crownRing(random, cx, cy, random.uniform(0.3, 5), 8)]] };
  }
  // Break it: swap two vertices, which often makes the ring cross itself.
  const ring = [...patch.rings[0][0]];
  if (ring.length > 4) [ring[1], ring[2]] = [ring[2], ring[1]];
  return { ...patch, rings: [[ring]] };
}

describe('CheckSession: incremental re-check', () => {
  for (const seed of [1, 2, 3]) {
    it(`ends where a full re-check ends after 300 random edits (seed ${seed})`, { timeout: 60_000 }, () => {
      const random = new Random(100 + seed);
      const patches = new Map(testSite(400, seed).map((p) => [p.id, p]));
      const session = new CheckSession({ scene });
      session.load(patches.values());
      let nextId = 10000;
      for (let step = 0; step < 300; step++) {
        // Midway, fold the loose patches back into the index, as an idle moment would.
        if (step === 150) session.compact();
        const ids = [...patches.keys()];
        const roll = random.next();
        if (roll < 0.1) {
          const id = ids[Math.floor(random.next() * ids.length)];
          patches.delete(id);
          session.remove(id);
        } else if (roll < 0.2) {
          // A new patch drawn over an existing one.
          const base = patches.get(ids[Math.floor(random.next() * ids.length)])!;
          const [cx, cy] = base.rings[0][0][0];
          const added = { id: nextId++, species: SPECIES[0], rings: [[crownRing(random, cx, cy, 2, 9)]] };
          patches.set(added.id, added);
          session.upsert(added);
        } else {
          const id = ids[Math.floor(random.next() * ids.length)];
          const edited = randomEdit(random, patches.get(id)!);
          patches.set(id, edited);
          session.upsert(edited);
        }
      }
      const full = runChecks(patches.values(), { scene });
      expectSameFindings(session.findings(), full.findings);
      expect(session.counts()).toEqual(full.counts);
      expect(full.findings.length).toBeGreaterThan(20);
      expect(new Set(full.findings.map((f) => f.kind)).size).toBeGreaterThanOrEqual(5);
    });
  }

  it('reports what one edit removed and added', () => {
    const a: PatchInput = { id: 'a', species: 'pice', rings: [[[[0, 0], [4, 0], [4, 4], [0, 4], [0, 0]]]] };
    const b: PatchInput = { id: 'b', species: 'lari', rings: [[[[10, 0], [14, 0], [14, 4], [10, 4], [10, 0]]]] };
    const session = new CheckSession();
    session.load([a, b]);
    expect(session.findings()).toEqual([]);
    const moved = { ...b, rings: [[[[3, 0], [7, 0], [7, 4], [3, 4], [3, 0]]]] as Ring[][] };
    const delta = session.upsert(moved);
    expect(delta.removed).toEqual([]);
    expect(delta.added.map((f) => f.kind)).toEqual(['overlap-mixed']);
    expect(session.findingsOf('a').map((f) => f.kind)).toEqual(['overlap-mixed']);
    const back = session.upsert(b);
    expect(back.removed.map((f) => f.kind)).toEqual(['overlap-mixed']);
    expect(session.findings()).toEqual([]);
    expect(session.remove('zzz')).toEqual({ removed: [], added: [] });
  });

  it('loads in chunks with progress, ending where a plain load ends', async () => {
    const site = testSite(500, 4);
    const seen: number[] = [];
    const chunked = new CheckSession({ scene });
    await chunked.loadInChunks(site, { chunk: 100, onProgress: (done, total) => { seen.push(done); expect(total).toBe(1000); } });
    expect(seen.length).toBeGreaterThanOrEqual(6);
    expect(seen[seen.length - 1]).toBe(1000);
    expectSameFindings(chunked.findings(), runChecks(site, { scene }).findings);
  });

  it('stops a chunked load when cancelled and is left empty', async () => {
    const controller = new AbortController();
    const session = new CheckSession();
    const loading = session.loadInChunks(testSite(500, 4), { chunk: 50, onProgress: (done) => { if (done >= 100) controller.abort(new Error('stop')); }, signal: controller.signal });
    await expect(loading).rejects.toThrow('stop');
    expect(session.size).toBe(0);
    expect(session.findings()).toEqual([]);
  });

  it('gives a patch its area and pure pixels', () => {
    const session = new CheckSession({ scene: { ms: { originX: 0, originY: 10, pixelWidth: 1, pixelHeight: 1, width: 10, height: 10 } } });
    session.load([{ id: 'a', species: 'pice', rings: [[[[0.5, 0.5], [3.5, 0.5], [3.5, 3.5], [0.5, 3.5], [0.5, 0.5]]]] }]);
    expect(session.figures('a')).toEqual({ areaM2: 9, purePixels: 4, valid: true });
    expect(session.figures('b')).toBeNull();
  });

  it('refuses duplicate ids on a full load', () => {
    const p: PatchInput = { id: 1, species: 'x', rings: [[[[0, 0], [1, 0], [1, 1], [0, 0]]]] };
    expect(() => new CheckSession().load([p, p])).toThrow(/patch id 1 appears twice/);
  });
});

describe('findings do not depend on vertex start, winding or patch order', () => {
  const site = testSite(300, 9);
  const reference = runChecks(site, { scene }).findings;

  it('the site has findings of most kinds to compare', () => {
    expect(new Set(reference.map((f) => f.kind)).size).toBe(7);
  });

  it('rotated rings', () => {
    const random = new Random(5);
    const turned = site.map((p) => ({ ...p, rings: p.rings.map((part) => part.map((ring) => rotate(ring, 1 + Math.floor(random.next() * 5)))) }));
    expectSameFindings(runChecks(turned, { scene }).findings, reference);
  });

  it('reversed rings', () => {
    const reversed = site.map((p) => ({ ...p, rings: p.rings.map((part) => part.map((ring) => [...ring].reverse())) }));
    expectSameFindings(runChecks(reversed, { scene }).findings, reference);
  });

  it('shuffled patch order', () => {
    const random = new Random(6);
    const shuffled = [...site];
    for (let i = shuffled.length - 1; i > 0; i--) {
      const j = Math.floor(random.next() * (i + 1));
      [shuffled[i], shuffled[j]] = [shuffled[j], shuffled[i]];
    }
    expectSameFindings(runChecks(shuffled, { scene }).findings, reference);
  });
});

describe('a full load finds exactly what trying every pair finds', () => {
  /** The checks with every pair of patches tried and no index: the plain definition. */
  function everyPair(patches: PatchInput[]): Finding[] {
    const settings = resolveSettings({}, scene);
    const prepared = patches.map((p) => preparePatch(p, settings));
    const all = prepared.flatMap((p) => patchFindings(p, settings, scene));
    for (let i = 0; i < prepared.length; i++) {
      for (let j = i + 1; j < prepared.length; j++) all.push(...pairFindings(prepared[i], prepared[j], settings));
    }
    return all.sort(compareFindings);
  }

  for (const seed of [11, 12, 13]) {
    it(`on a seeded site of 1,000 patches (seed ${seed})`, () => {
      const site = testSite(1000, seed);
      expect(runChecks(site, { scene }).findings).toEqual(everyPair(site));
    });
  }

  it('when a few huge patches make the boxes too uneven for the grid', () => {
    const site = testSite(600, 14);
    for (let i = 0; i < 30; i++) {
      const x = 600000 + i * 3, y = 5100000 + i * 2, s = 200 - i * 4;
      site.push({ id: `big${i}`, species: SPECIES[i % SPECIES.length], rings: [[[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]]] });
    }
    expect(runChecks(site, { scene }).findings).toEqual(everyPair(site));
  });
});
