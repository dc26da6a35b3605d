import type { SiteStore } from '../../store/SiteStore.ts';
import type { Platform } from '../../platform/types.ts';
import { sha256Hex } from '../../core/ledger/sha256.ts';
import {
  buildImport, readFieldFile, summariseAttributes, type AttributeSummary, type FieldFile,
} from '../../core/imports/index.ts';
import type { Confidence, EventPayloads, SiteState } from '../../core/site/index.ts';

// Field polygons into a stored site, in three steps the import panel walks through:
// pick and read the file (checked and reprojected, nothing stored), choose the attribute
// and map its values onto the roster (unknown values listed), then commit it as one
// import event with the calls in a pass of their own. A failed step changes nothing.

export interface PickedFieldFile {
  name: string;
  bytes: Uint8Array;
  sha256: string;
}

export interface ReadFieldFile {
  picked: PickedFieldFile;
  file: FieldFile;
  attributes: AttributeSummary[];
  /** the attribute that most likely holds the species, or null */
  likelyAttribute: string | null;
}

export const FIELD_EXTENSIONS = ['geojson', 'json', 'zip', 'kml', 'kmz', 'gpx'];

export async function pickFieldFile(platform: Platform): Promise<PickedFieldFile | null> {
  const [ref] = await platform.pickFiles({ title: 'Import field polygons (GeoJSON, zipped shapefile, KML, KMZ or GPX)', extensions: FIELD_EXTENSIONS });
  if (!ref) return null;
  const bytes = await platform.readRange(ref, 0, ref.size);
  return { name: ref.name, bytes, sha256: await sha256Hex(bytes) };
}

/** Reads a picked file into the site's CRS; `assumeEpsg` for a file that does not say its CRS. */
export function readPickedFieldFile(picked: PickedFieldFile, siteEpsg: number, assumeEpsg?: number): ReadFieldFile {
  const { file } = readFieldFile(picked.name, picked.bytes, { siteEpsg, assumeEpsg });
  const attributes = summariseAttributes(file.features);
  const likely = attributes.find((a) => /species|code|taxon|spp/i.test(a.name)) ?? null;
  return { picked, file, attributes, likelyAttribute: likely?.name ?? null };
}

export interface ImportChoices {
  /** null: import the outlines untagged */
  mapping: { attribute: string; values: Record<string, string> } | null;
  leaveUnmappedUntagged: boolean;
  /** who made the calls in the file, e.g. 'field crew' */
  caller: string;
  confidence: Confidence;
  /** who imports */
  interpreter: string;
  time: string;
}

function freeId(taken: (id: string) => boolean, stem: string): string {
  let n = 1;
  while (taken(`${stem}-${n}`)) n++;
  return `${stem}-${n}`;
}

/** The file's own polygon ids as patch ids when each is present, unique and free in the site. */
export function withOwnIds(payload: EventPayloads['import.added'], state: SiteState): EventPayloads['import.added'] {
  const ids = payload.patches.map((p) => (p.source.kind === 'import' ? String(p.source.attributes.id ?? '').trim() : ''));
  if (ids.some((id) => id === '' || state.patches.has(id)) || new Set(ids).size !== ids.length) return payload;
  const rename = new Map(payload.patches.map((p, i) => [p.id, ids[i]]));
  return {
    ...payload,
    patches: payload.patches.map((p) => ({ ...p, id: rename.get(p.id)! })),
    tags: payload.tags.map((t) => ({ ...t, patchId: rename.get(t.patchId) ?? t.patchId })),
  };
}

/** Commits the import; resolves to how many patches, tags and reference features it added. */
export async function commitFieldImport(store: SiteStore, read: ReadFieldFile, choices: ImportChoices) {
  const state = store.state;
  const importId = freeId((id) => state.imports.has(id), 'import');
  const passId = freeId((id) => state.passes.has(id), 'field');
  // Built first, so a refused mapping stores nothing at all.
  const payload = withOwnIds(buildImport(read.file, {
    importId,
    fileName: read.picked.name,
    sha256: read.picked.sha256,
    sourceCrs: read.file.crs,
    mapping: choices.mapping,
    leaveUnmappedUntagged: choices.leaveUnmappedUntagged,
    passId,
    interpreter: choices.caller,
    time: choices.time,
    confidence: choices.confidence,
    display: { composite: 'none (called in the field)', stretch: 'none', date: 'the survey' },
  }), state);
  const actor = choices.interpreter;
  if (payload.tags.length) {
    const pass = { id: passId, interpreter: choices.caller, blind: false, startedAt: choices.time, endedAt: null, patchIds: null };
    await store.commit({ kind: 'pass.started', payload: { pass }, actor, time: choices.time });
  }
  await store.commit({ kind: 'import.added', payload, actor, time: choices.time });
  if (payload.tags.length) await store.commit({ kind: 'pass.ended', payload: { passId, time: choices.time }, actor, time: choices.time });
  return { patches: payload.patches.length, tags: payload.tags.length, references: payload.references.length };
}
