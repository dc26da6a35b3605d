import { SiteBuilder, EPSG, square } from '../export/siteBuilder.ts';
import type { Pass, Patch } from '../../../src/core/site/index.ts';

// A small real site for the blind-pass tests, built through the ledger's sealing and the
// site reducer: 30 patches called by ana in a desk pass ("a"), with species in the
// shares 15 ABFI, 9 SAIN, 5 PIEX, 1 JUNO; every third patch unsure; notes on some; the
// first five imported from a field file whose attributes carry the species.

export { square };

export const ROSTER = [
  { code: 'ABFI', scientificName: 'Abies fictiva', commonName: 'ridge fir', group: 'conifer', colour: '#009E73', key: '1' },
  { code: 'PIEX', scientificName: 'Picea exempla', commonName: 'slope spruce', group: 'conifer', colour: '#0072B2', key: '2' },
  { code: 'SAIN', scientificName: 'Salix inventa', commonName: 'brook willow', group: 'broadleaf shrub', colour: '#F0E442', key: '3' },
  { code: 'JUNO', scientificName: 'Juniperus nota', commonName: 'mat juniper', group: 'conifer', colour: '#CC79A7', key: '4' },
];

export function speciesOf(i: number): string {
  if (i <= 15) return 'ABFI';
  if (i <= 24) return 'SAIN';
  if (i <= 29) return 'PIEX';
  return 'JUNO';
}

export async function blindSite(): Promise<SiteBuilder> {
  const b = new SiteBuilder();
  await b.commit({ kind: 'site.created', payload: { site: { id: 'blind-site', name: 'Test basin', epsg: EPSG, createdAt: b.time() } } });
  await b.commit({
    kind: 'scene.added',
    payload: { scene: { id: 'scene-1', date: '2025-07-24', epsg: EPSG, files: [{ role: 'pan', name: 'pan.tif', size: 10, sha256: 'a'.repeat(64) }] } },
  });
  await b.commit({ kind: 'roster.set', payload: { entries: ROSTER, previous: [] } });
  await startPass(b, { id: 'a', interpreter: 'ana', blind: false, patchIds: null });
  const imported: Patch[] = [];
  for (let i = 1; i <= 5; i++) {
    imported.push({
      id: `P${i}`, geometry: square(493000 + 20 * i, 4429000, 6), createdAt: b.time(), createdBy: 'ana',
      source: { kind: 'import', importId: 'imp-1', featureIndex: i - 1, attributes: { species: speciesOf(i), crew_note: 'field call' } },
    });
  }
  await b.commit({
    kind: 'import.added',
    payload: {
      record: {
        id: 'imp-1', fileName: 'field.geojson', sha256: 'c'.repeat(64), format: 'geojson', sourceCrs: 'EPSG:4326',
        counts: { patches: 5, references: 0, skipped: 0 }, mapping: { attribute: 'species', values: { ABFI: 'ABFI' } }, time: b.time(), by: 'ana',
      },
      patches: imported, tags: [], references: [],
    },
  });
  for (let i = 6; i <= 30; i++) await b.patch(`P${i}`, square(493000 + 20 * i, 4429000, 6));
  for (let i = 1; i <= 30; i++) await b.tag(`P${i}`, 'a', speciesOf(i), 'ana', i % 3 === 0 ? 'unsure' : 'sure', i % 4 === 0 ? `note on P${i}` : '');
  return b;
}

export async function startPass(b: SiteBuilder, pass: Omit<Pass, 'startedAt' | 'endedAt'>): Promise<Pass> {
  const full: Pass = { ...pass, startedAt: b.time(), endedAt: null };
  await b.commit({ kind: 'pass.started', payload: { pass: full } }, pass.interpreter);
  return full;
}
