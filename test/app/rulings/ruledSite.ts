import { startBlindPass, tagInBlindPass, endBlindPass } from '../../../src/app/blind/blindPasses.ts';
import type { Confidence, Patch, Tag } from '../../../src/core/site/index.ts';
import { MemorySite } from '../blind/memorySite.ts';

// A small site with a first pass by "ak" and an ended blind second look by "bo", made
// through the site reducer and the blind-pass use cases: the starting point of the
// rulings tests.

export const display = { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' };
let clock = Date.UTC(2026, 6, 1, 8);
export const at = (): string => new Date((clock += 1000)).toISOString();

export function squarePatch(id: string, x: number, size: number, createdBy = 'ak', createdAt = '2026-07-01T07:00:00.000Z'): Patch {
  return { id, geometry: [[[[x, 0], [x + size, 0], [x + size, size], [x, size], [x, 0]]]], source: { kind: 'drawn' }, createdAt, createdBy };
}

export function firstTag(patchId: string, species: string, confidence: Confidence = 'sure'): Tag {
  return { patchId, passId: 'pass-ak', species, confidence, note: `ak on ${patchId}`, interpreter: 'ak', time: '2026-07-01T07:30:00.000Z', display };
}

export interface SecondCall { species: string; confidence?: Confidence; note?: string }

/** Patches P1.. of the given sizes, ak's calls, then bo's blind calls where given. */
export async function ruledSite(patches: { size: number; first: string; firstConfidence?: Confidence; second?: SecondCall }[]): Promise<{ site: MemorySite; blindPassId: string }> {
  const site = new MemorySite();
  const commit = (draft: Parameters<MemorySite['commitWith']>[0]) => site.commitWith(draft);
  await commit(() => ({ kind: 'site.created', payload: { site: { id: 's-rule', name: 'Rulings basin', epsg: 32632, createdAt: at() } }, actor: 'ak', time: at() }));
  await commit((s) => ({
    kind: 'roster.set', actor: 'ak', time: at(),
    payload: {
      previous: s.roster as never,
      entries: [
        { code: 'PICE', scientificName: 'Picea abies', commonName: 'Norway spruce', group: 'conifer', colour: '#009E73', key: '1' },
        { code: 'ALVI', scientificName: 'Alnus viridis', commonName: 'Green alder', group: 'broadleaf shrub', colour: '#E69F00', key: '2' },
        { code: 'LADE', scientificName: 'Larix decidua', commonName: 'European larch', group: 'conifer', colour: '#56B4E9', key: '3' },
      ],
    },
  }));
  await commit(() => ({ kind: 'pass.started', actor: 'ak', time: at(), payload: { pass: { id: 'pass-ak', interpreter: 'ak', blind: false, startedAt: '2026-07-01T07:00:00.000Z', endedAt: null, patchIds: null } } }));
  let x = 0;
  for (const [i, p] of patches.entries()) {
    const patch = squarePatch(`P${i + 1}`, x, p.size);
    x += p.size + 10;
    await commit(() => ({ kind: 'patch.added', actor: 'ak', time: at(), payload: { patch, tags: [firstTag(patch.id, p.first, p.firstConfidence)] } }));
  }
  const picked = patches.map((p, i) => (p.second ? `P${i + 1}` : null)).filter((id): id is string => id !== null);
  if (picked.length === 0) return { site, blindPassId: '' };
  const { pass } = await startBlindPass(site, { kind: 'picked', patchIds: picked }, { interpreter: 'bo', time: at() });
  for (const [i, p] of patches.entries()) {
    if (!p.second) continue;
    await tagInBlindPass(site, pass.id, `P${i + 1}`, { species: p.second.species, confidence: p.second.confidence ?? 'sure', note: p.second.note ?? `bo on P${i + 1}` }, { interpreter: 'bo', time: at(), display });
  }
  await endBlindPass(site, pass.id, { interpreter: 'bo', time: at() });
  return { site, blindPassId: pass.id };
}
