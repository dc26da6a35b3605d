// Export benchmark (DESIGN.md contract): a site of crown-sized patches with full
// provenance (two passes, rulings on the disagreements, shifted outlines) exported to
// GeoJSON and to a GeoPackage, each beside the floor of a plain JSON.stringify of the
// same features (ratio below 1: how close the export comes to just writing the data).
import initSqlJs from 'sql.js';
import { exportSite, type ExportFormat } from '../src/core/export/exportSite.ts';
import type { OpenedSite } from '../src/core/export/siteFile.ts';
import { patchRecords } from '../src/core/export/patchRecords.ts';
import { sealEvent } from '../src/core/ledger/chain.ts';
import type { Position } from '../src/core/geometry/types.ts';
import {
  applyEvent, emptySiteState, type EventDraft, type ImportRecord, type LedgerEvent, type Patch, type SiteState, type Tag,
} from '../src/core/site/index.ts';
import { result, seeded, time, type Benchmark } from './harness.ts';

const EPSG = 32608;
const SPECIES = ['ABFI', 'PIEX', 'PISI', 'SAIN', 'BEFA', 'VAFI'];
const display = { composite: 'nir-red-green', stretch: 'percentile 2-98', date: '2025-07-24' };

/** A site of n crowns on a jittered 8 m grid, tagged in two passes, 10 % disagreeing and ruled. */
async function benchSite(n: number): Promise<OpenedSite> {
  const random = seeded(17);
  let state: SiteState = emptySiteState();
  const events: LedgerEvent[] = [];
  let tick = 0;
  const time = () => new Date(Date.UTC(2025, 6, 24, 8) + 1000 * tick++).toISOString();
  const commit = async (draft: Omit<EventDraft, 'actor' | 'time'>, actor = 'ana') => {
    const event = await sealEvent({ ...draft, actor, time: time() } as EventDraft, state.head);
    state = applyEvent(state, event);
    events.push(event);
  };
  await commit({ kind: 'site.created', payload: { site: { id: 'bench', name: 'Bench basin', epsg: EPSG, createdAt: time() } } });
  await commit({ kind: 'scene.added', payload: { scene: { id: 'scene-1', date: '2025-07-24', epsg: EPSG, files: [{ role: 'pan', name: 'pan.tif', size: 1, sha256: 'a'.repeat(64) }, { role: 'ms', name: 'ms.tif', size: 1, sha256: 'b'.repeat(64) }] } } });
  for (const [id, who] of [['a', 'ana'], ['b', 'ben']]) {
    await commit({ kind: 'pass.started', payload: { pass: { id, interpreter: who, blind: id === 'b', startedAt: time(), endedAt: null, patchIds: null } } }, who);
  }
  const side = Math.ceil(Math.sqrt(n));
  const record: ImportRecord = {
    id: 'import-1', fileName: 'field.geojson', sha256: 'c'.repeat(64), format: 'geojson', sourceCrs: 'EPSG:4326',
    counts: { patches: n, references: 0, skipped: 0 }, mapping: null, time: time(), by: 'ana',
  };
  const patches: Patch[] = [];
  const tagsA: Tag[] = [];
  for (let i = 0; i < n; i++) {
    const cx = 493000 + (i % side) * 8 + random() * 2, cy = 4429000 + Math.floor(i / side) * 8 + random() * 2;
    const r = 1.5 + random() * 1.5;
    const ring: Position[] = [];
    for (let k = 0; k < 24; k++) {
      const a = (2 * Math.PI * k) / 24;
      ring.push([cx + r * (0.85 + 0.3 * random()) * Math.cos(a), cy + r * (0.85 + 0.3 * random()) * Math.sin(a)]);
    }
    ring.push([ring[0][0], ring[0][1]]);
    const id = `F${i + 1}`;
    patches.push({ id, geometry: [[ring]], source: { kind: 'import', importId: record.id, featureIndex: i, attributes: { id, species: SPECIES[i % 6] } }, createdAt: record.time, createdBy: 'ana' });
    tagsA.push({ patchId: id, passId: 'a', species: SPECIES[i % 6], confidence: 'sure', note: '', interpreter: 'ana', time: record.time, display });
  }
  await commit({ kind: 'import.added', payload: { record, patches, tags: tagsA, references: [] } });
  // Pass b looks again at a fifth of the patches; half of those it calls differently.
  for (let i = 0; i < n; i += 5) {
    const id = `F${i + 1}`;
    const species = i % 10 === 0 ? SPECIES[(i + 1) % 6] : SPECIES[i % 6];
    const tag: Tag = { patchId: id, passId: 'b', species, confidence: 'likely', note: 'late date', interpreter: 'ben', time: time(), display };
    await commit({ kind: 'tag.set', payload: { patchId: id, passId: 'b', tag, previous: null } }, 'ben');
    if (i % 10 === 0) {
      await commit({ kind: 'ruling.recorded', payload: { ruling: { id: `R${i}`, patchId: id, decision: { kind: 'accept', passId: 'a' }, passIds: ['a', 'b'], by: 'cleo', time: time(), reason: 'crown shape', reopened: null } } }, 'cleo');
    }
  }
  for (const passId of ['a', 'b']) await commit({ kind: 'pass.ended', payload: { passId, time: time() } });
  // A systematic shift applied to every twentieth outline.
  for (let i = 0; i < n; i += 20) {
    const patch = state.patches.get(`F${i + 1}`)!;
    const geometry = patch.geometry.map((rings) => rings.map((ring) => ring.map(([x, y]) => [x + 0.8, y - 0.4] as Position)));
    await commit({ kind: 'patch.geometry', payload: { patchId: patch.id, geometry, previous: patch.geometry } });
  }
  return { state, events };
}

const SIZES = { small: 1000, large: 10000 } as const;

export const benchmarks: Benchmark[] = [{
  name: 'export.site',
  async run(size) {
    const n = SIZES[size] ?? SIZES.large;
    const site = await benchSite(n);
    const sql = await initSqlJs();
    const options = { selection: { kind: 'consensus' as const } };
    // The floor: the same features, provenance included, as one JSON.stringify.
    const records = patchRecords(site.state, site.events, options).patches;
    const plain = () => JSON.stringify({ type: 'FeatureCollection', features: records.map(({ geometry, ...properties }) => ({ type: 'Feature', id: properties.id, geometry: { type: 'MultiPolygon', coordinates: geometry }, properties })) });
    const base = await time(plain, { runs: 5 });
    const lines = [];
    for (const format of ['geojson', 'gpkg'] as ExportFormat[]) {
      let bytes = 0;
      let cpu = 0;
      const ours = await time(async () => {
        // CPU time beside the wall clock: on a shared, busy machine it says more of the work itself.
        const before = process.cpuUsage();
        const { files } = await exportSite(site, options, { format, appVersion: 'bench', time: '2031-01-01T00:00:00.000Z', sql });
        const used = process.cpuUsage(before);
        cpu = Math.min(cpu || Infinity, (used.user + used.system) / 1000);
        bytes = files[0].bytes.length;
      }, { runs: 5 });
      lines.push(result('export.site', n, ours, 'JSON.stringify of the same features', base, { format, bytes, events: site.events.length, min_cpu_ms: Math.round(cpu) }));
    }
    return lines;
  },
}];
