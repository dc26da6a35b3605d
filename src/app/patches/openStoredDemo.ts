import { sha256Hex } from '../../core/ledger/sha256.ts';
import { buildImport, proposeMapping, readFieldFile } from '../../core/imports/index.ts';
import type { EventDraft, RosterEntry, SceneRef } from '../../core/site/index.ts';
import { withOwnIds } from './importFieldFile.ts';
import type { Platform } from '../../platform/types.ts';
import { SiteStore, type StoreOptions } from '../../store/SiteStore.ts';
import { StorageError } from '../../store/StorageError.ts';
import type { MappedSite, OpenSite } from '../site.ts';

// The demo as a stored site. On the first open it is created in IndexedDB from the demo
// files: its scenes (by name, size and SHA-256 from the manifest), its roster, and the
// field polygons imported as patches, each tagged with the crew's species in a "field"
// pass. Later opens read it back as it was left. A creation cut short (a crash between
// two events) is finished on the next open, step by step.

export const DEMO_SITE_ID = 'demo';
export const FIELD_PASS_ID = 'field';
export const FIELD_CREW = 'field crew';
const FIELD_FILE = 'field.geojson';

interface ManifestFiles {
  crs: { epsg: number };
  dates: { date: string }[];
  files: { name: string; role: string; date?: string; bytes: number; sha256: string }[];
}

export async function openStoredDemo(platform: Platform, imagery: MappedSite, options: StoreOptions = {}): Promise<SiteStore> {
  const store = await openOrCreate(imagery, options);
  try {
    await completeDemo(store, platform, imagery);
    return store;
  } catch (error) {
    store.close();
    throw error;
  }
}

async function openOrCreate(imagery: MappedSite, options: StoreOptions): Promise<SiteStore> {
  try {
    return await SiteStore.open(DEMO_SITE_ID, options);
  } catch (error) {
    // Only a site that is not there yet is created; an unreadable store is reported.
    if (!(error instanceof StorageError && error.kind === 'unavailable' && /^No site/.test(error.message))) throw error;
    const time = new Date().toISOString();
    return SiteStore.create({ id: DEMO_SITE_ID, name: imagery.name, epsg: imagery.epsg, createdAt: time }, FIELD_CREW, options);
  }
}

async function readDemoBytes(platform: Platform, name: string): Promise<Uint8Array> {
  const file = await platform.openDemoFile(name);
  return platform.readRange(file, 0, file.size);
}

/** Commits whichever of the demo's first events are not in the store yet. */
async function completeDemo(store: SiteStore, platform: Platform, imagery: MappedSite): Promise<void> {
  const time = () => new Date().toISOString();
  const commit = (draft: Omit<EventDraft, 'actor' | 'time'>) => store.commit({ ...draft, actor: FIELD_CREW, time: time() } as EventDraft);
  const state = () => store.state;
  if (state().scenes.size === 0) {
    const manifest = JSON.parse(new TextDecoder().decode(await readDemoBytes(platform, 'manifest.json'))) as ManifestFiles;
    for (const [i, { date }] of manifest.dates.entries()) {
      const files = manifest.files
        .filter((f) => f.date === date)
        .map((f) => ({ role: f.role.startsWith('panchromatic') ? 'pan' : 'ms', name: f.name, size: f.bytes, sha256: f.sha256 }));
      const scene: SceneRef = { id: `scene-${i + 1}`, date, epsg: manifest.crs.epsg, files };
      await commit({ kind: 'scene.added', payload: { scene } });
    }
  }
  if (state().roster.length === 0) {
    const entries: RosterEntry[] = imagery.roster.map((e) => ({ ...e }));
    await commit({ kind: 'roster.set', payload: { entries, previous: [] } });
  }
  if (!state().passes.has(FIELD_PASS_ID)) {
    const pass = { id: FIELD_PASS_ID, interpreter: FIELD_CREW, blind: false, startedAt: time(), endedAt: null, patchIds: null };
    await commit({ kind: 'pass.started', payload: { pass } });
  }
  if (![...state().imports.values()].some((r) => r.fileName === FIELD_FILE)) {
    const bytes = await readDemoBytes(platform, FIELD_FILE);
    const { file } = readFieldFile(FIELD_FILE, bytes, { siteEpsg: imagery.epsg });
    const mapping = proposeMapping(file.features, 'species', state().roster);
    const payload = buildImport(file, {
      importId: 'import-1',
      fileName: FIELD_FILE,
      sha256: await sha256Hex(bytes),
      sourceCrs: file.crs,
      mapping,
      leaveUnmappedUntagged: true,
      passId: FIELD_PASS_ID,
      interpreter: FIELD_CREW,
      time: time(),
      // Called on the ground, beside the plant.
      confidence: 'sure',
      display: { composite: 'none (called in the field)', stretch: 'none', date: 'the survey' },
    });
    await commit({ kind: 'import.added', payload: withOwnIds(payload, state()) });
  }
  if (state().passes.get(FIELD_PASS_ID)?.endedAt === null) {
    await commit({ kind: 'pass.ended', payload: { passId: FIELD_PASS_ID, time: time() } });
  }
}

/** The demo's imagery joined with its stored site: closing the site closes both. */
export async function withStoredDemo(platform: Platform, imagery: MappedSite, options: StoreOptions = {}): Promise<OpenSite> {
  let store: SiteStore;
  try {
    store = await openStoredDemo(platform, imagery, options);
  } catch (error) {
    imagery.dispose();
    throw error;
  }
  return {
    ...imagery,
    store,
    dispose: () => {
      store.close();
      imagery.dispose();
    },
  };
}
