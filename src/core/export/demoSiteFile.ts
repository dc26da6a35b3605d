import { transformer } from '../crs.ts';
import type { DemoFile } from '../demo/files.ts';
import type { MultiPolygonRings, Position } from '../geometry/types.ts';
import { sealEvent } from '../ledger/chain.ts';
import { sha256Hex } from '../ledger/sha256.ts';
import {
  emptySiteState, applyEvent, type EventDraft, type ImportRecord, type LedgerEvent, type Patch, type RosterEntry,
  type SceneRef, type SiteState, type Tag,
} from '../site/index.ts';
import { siteFileText } from './siteFile.ts';

// The demo as a site file, so it can be exported from the command line: the scenes (by
// name, size and SHA-256 from the demo's manifest), the roster, and the field polygons
// imported as patches in the scene CRS, each tagged in a "field" pass with the crew's
// species. Times are fixed from the scene date, so the same demo gives the same file.

export const DEMO_SITE_FILE = 'demo.site.json';
export const DEMO_SITE_ID = 'demo';
export const DEMO_FIELD_PASS = 'field';
export const DEMO_FIELD_CREW = 'field crew';

interface Manifest {
  basin: string;
  crs: { epsg: number };
  dates: { date: string }[];
  files: { name: string; role: string; date?: string; bytes: number; sha256: string }[];
}

interface FieldFeature {
  geometry: { type: string; coordinates: unknown } | null;
  properties: Record<string, unknown> | null;
}

function demoJson<T>(files: readonly DemoFile[], name: string): T {
  const file = files.find((f) => f.name === name);
  if (!file) throw new Error(`the demo has no ${name}`);
  return JSON.parse(new TextDecoder().decode(file.bytes)) as T;
}

/** The field polygons as patches (scene CRS) with the crew's species as tags of the field pass. */
function fieldPatches(features: FieldFeature[], epsg: number, record: ImportRecord, roster: readonly RosterEntry[]) {
  const project = transformer(4326, epsg);
  const codes = new Set(roster.map((e) => e.code));
  const patches: Patch[] = [];
  const tags: Tag[] = [];
  const values: Record<string, string> = {};
  features.forEach((feature, featureIndex) => {
    const g = feature.geometry;
    if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) throw new Error(`${record.fileName}: feature ${featureIndex + 1} is not a polygon`);
    const lonLat = (g.type === 'Polygon' ? [g.coordinates] : g.coordinates) as Position[][][];
    const geometry: MultiPolygonRings = lonLat.map((rings) => rings.map((ring) => ring.map((p) => project([p[0], p[1]]))));
    const attributes = { ...(feature.properties ?? {}) };
    const id = String(attributes.id ?? `F${featureIndex + 1}`);
    patches.push({ id, geometry, source: { kind: 'import', importId: record.id, featureIndex, attributes }, createdAt: record.time, createdBy: DEMO_FIELD_CREW });
    const species = String(attributes.species ?? '');
    if (!codes.has(species)) return;
    values[species] = species;
    tags.push({
      patchId: id, passId: DEMO_FIELD_PASS, species, confidence: 'sure', note: '', interpreter: DEMO_FIELD_CREW, time: record.time,
      display: { composite: 'none (called in the field)', stretch: 'none', date: String(attributes.recorded ?? '') },
    });
  });
  return { patches, tags, values };
}

/** The demo site's ledger, built from the demo's files. */
export async function demoSiteEvents(files: readonly DemoFile[]): Promise<LedgerEvent[]> {
  const manifest = demoJson<Manifest>(files, 'manifest.json');
  const roster = demoJson<{ species: RosterEntry[] }>(files, 'roster.json').species.map((e) => ({ ...e }));
  const fieldFile = files.find((f) => f.name === 'field.geojson');
  if (!fieldFile) throw new Error('the demo has no field.geojson');
  const epsg = manifest.crs.epsg;
  const day = manifest.dates[0]?.date ?? '2000-01-01';
  let tick = 0;
  // One second apart from noon UTC of the first scene date: fixed, ordered, plausible.
  const time = () => new Date(Date.parse(`${day}T12:00:00.000Z`) + 1000 * tick++).toISOString();

  let state: SiteState = emptySiteState();
  const events: LedgerEvent[] = [];
  const commit = async (draft: Omit<EventDraft, 'actor' | 'time'>, at = time()) => {
    const event = await sealEvent({ ...draft, actor: DEMO_FIELD_CREW, time: at } as EventDraft, state.head);
    state = applyEvent(state, event);
    events.push(event);
  };
  await commit({ kind: 'site.created', payload: { site: { id: DEMO_SITE_ID, name: manifest.basin, epsg, createdAt: time() } } });
  for (const [i, { date }] of manifest.dates.entries()) {
    const sceneFiles = manifest.files.filter((f) => f.date === date)
      .map((f) => ({ role: f.role.startsWith('panchromatic') ? 'pan' : 'ms', name: f.name, size: f.bytes, sha256: f.sha256 }));
    const scene: SceneRef = { id: `scene-${i + 1}`, date, epsg, files: sceneFiles };
    await commit({ kind: 'scene.added', payload: { scene } });
  }
  await commit({ kind: 'roster.set', payload: { entries: roster, previous: [] } });
  await commit({ kind: 'pass.started', payload: { pass: { id: DEMO_FIELD_PASS, interpreter: DEMO_FIELD_CREW, blind: false, startedAt: time(), endedAt: null, patchIds: null } } });
  const features = (JSON.parse(new TextDecoder().decode(fieldFile.bytes)) as { features: FieldFeature[] }).features;
  const record: ImportRecord = {
    id: 'import-1', fileName: 'field.geojson', sha256: await sha256Hex(fieldFile.bytes), format: 'geojson',
    sourceCrs: 'EPSG:4326', counts: { patches: features.length, references: 0, skipped: 0 }, mapping: null, time: time(), by: DEMO_FIELD_CREW,
  };
  const { patches, tags, values } = fieldPatches(features, epsg, record, roster);
  record.mapping = { attribute: 'species', values };
  await commit({ kind: 'import.added', payload: { record, patches, tags, references: [] } }, record.time);
  const ended = time();
  await commit({ kind: 'pass.ended', payload: { passId: DEMO_FIELD_PASS, time: ended } }, ended);
  return events;
}

/** The demo site file, ready to be written beside the other demo files. */
export async function demoSiteFile(files: readonly DemoFile[]): Promise<DemoFile> {
  const events = await demoSiteEvents(files);
  return { name: DEMO_SITE_FILE, role: 'the demo site: ledger of scenes, roster and field polygons', bytes: new TextEncoder().encode(siteFileText(events)), epsg: null };
}
