import type { LedgerEvent } from '../site/events.ts';
import type { SiteState } from '../site/state.ts';
import { EXPORT_CAUTIONS } from './cautions.ts';
import { patchHistory } from './patchHistory.ts';
import type { ExportedPatch } from './patchRecords.ts';

// The provenance document beside each export, in PROV-JSON (W3C Member Submission
// "PROV-JSON", 2013) over the PROV data model (W3C PROV-DM, 2013): entities (scenes and
// their image files, imported files, patches, the history, the export), activities
// (imports, passes, rulings, shifts and edits, the export), agents (interpreters, the
// app) and the relations between them. The export's own time is here and only here.

export const FF = 'ff';
export const FF_NAMESPACE = 'urn:fellfield:';

export interface ExportDescriptor {
  /** the exported data file, e.g. labels.geojson */
  file: string;
  format: 'geojson' | 'gpkg';
  /** SHA-256 of the data file */
  sha256: string;
  /** the history (site file) written beside it */
  historyFile: string;
  historySha256: string;
  /** ISO 8601 UTC: when the export ran (the only clock in an export) */
  time: string;
  appVersion: string;
  options: Record<string, unknown>;
  /** patches left out, by reason */
  leftOut: { reason: string; count: number }[];
}

type Record_ = Record<string, unknown>;

const dateTime = (value: string) => ({ $: value, type: 'xsd:dateTime' });
const safe = (s: string) => encodeURIComponent(s);

class ProvBuilder {
  readonly doc: Record<string, Record<string, Record_>> = {
    entity: {}, activity: {}, agent: {}, wasGeneratedBy: {}, used: {}, wasAssociatedWith: {},
    wasAttributedTo: {}, wasDerivedFrom: {}, wasInformedBy: {},
  };
  private counts = new Map<string, number>();

  add(kind: 'entity' | 'activity' | 'agent', id: string, attributes: Record_): void {
    this.doc[kind][id] = { ...(this.doc[kind][id] ?? {}), ...attributes };
  }

  relate(kind: string, attributes: Record_): void {
    const n = (this.counts.get(kind) ?? 0) + 1;
    this.counts.set(kind, n);
    this.doc[kind][`_:${kind}${n}`] = attributes;
  }

  agent(name: string): string {
    const id = `${FF}:agent/${safe(name)}`;
    if (!this.doc.agent[id]) this.add('agent', id, { 'prov:type': 'prov:Person', 'prov:label': name });
    return id;
  }
}

/** The PROV-JSON document of one export. */
export function provDocument(state: SiteState, events: readonly LedgerEvent[], patches: readonly ExportedPatch[], d: ExportDescriptor): Record<string, unknown> {
  const b = new ProvBuilder();
  const app = `${FF}:agent/fellfield`;
  b.add('agent', app, { 'prov:type': 'prov:SoftwareAgent', 'prov:label': 'Fellfield', [`${FF}:version`]: d.appVersion });

  const history = `${FF}:history`;
  const head = state.head;
  b.add('entity', history, {
    'prov:type': `${FF}:Ledger`, 'prov:label': 'the hash-chained history of the site',
    [`${FF}:file`]: d.historyFile, [`${FF}:sha256`]: d.historySha256,
    [`${FF}:headSeq`]: head.seq, [`${FF}:headHash`]: head.hash,
  });

  for (const scene of state.scenes.values()) {
    const sceneId = `${FF}:scene/${safe(scene.id)}`;
    b.add('entity', sceneId, { 'prov:type': `${FF}:Scene`, 'prov:label': scene.id, [`${FF}:date`]: scene.date, [`${FF}:epsg`]: scene.epsg });
    for (const f of scene.files) {
      const fileId = `${FF}:file/${f.sha256}`;
      b.add('entity', fileId, { 'prov:type': `${FF}:ImageFile`, 'prov:label': f.name, [`${FF}:role`]: f.role, [`${FF}:bytes`]: f.size, [`${FF}:sha256`]: f.sha256 });
      b.relate('wasDerivedFrom', { 'prov:generatedEntity': sceneId, 'prov:usedEntity': fileId });
    }
  }

  for (const record of state.imports.values()) {
    const fileId = `${FF}:file/${record.sha256}`;
    const importId = `${FF}:import/${safe(record.id)}`;
    b.add('entity', fileId, { 'prov:type': `${FF}:FieldFile`, 'prov:label': record.fileName, [`${FF}:format`]: record.format, [`${FF}:sha256`]: record.sha256 });
    b.add('activity', importId, { 'prov:type': `${FF}:Import`, 'prov:startTime': record.time, 'prov:endTime': record.time });
    b.relate('used', { 'prov:activity': importId, 'prov:entity': fileId });
    b.relate('wasAssociatedWith', { 'prov:activity': importId, 'prov:agent': b.agent(record.by) });
  }

  for (const pass of state.passes.values()) {
    const passId = `${FF}:pass/${safe(pass.id)}`;
    b.add('activity', passId, {
      'prov:type': `${FF}:Pass`, 'prov:startTime': pass.startedAt, ...(pass.endedAt ? { 'prov:endTime': pass.endedAt } : {}),
      [`${FF}:blind`]: pass.blind,
    });
    b.relate('wasAssociatedWith', { 'prov:activity': passId, 'prov:agent': b.agent(pass.interpreter) });
  }

  for (const ruling of state.rulings.values()) {
    const rulingId = `${FF}:ruling/${safe(ruling.id)}`;
    b.add('activity', rulingId, {
      'prov:type': `${FF}:Ruling`, 'prov:startTime': ruling.time, 'prov:endTime': ruling.time,
      [`${FF}:decision`]: ruling.decision.kind, [`${FF}:reason`]: ruling.reason, [`${FF}:reopened`]: ruling.reopened !== null,
    });
    b.relate('wasAssociatedWith', { 'prov:activity': rulingId, 'prov:agent': b.agent(ruling.by) });
    for (const p of ruling.passIds) b.relate('wasInformedBy', { 'prov:informed': rulingId, 'prov:informant': `${FF}:pass/${safe(p)}` });
  }

  const changes = patchHistory(events).changes;
  const importBySource = new Map([...state.imports.values()].map((r) => [`${r.sha256}|${r.fileName}`, r.id]));
  const exported = `${FF}:export`;
  const run = `${FF}:export-run`;
  for (const p of patches) {
    const patchId = `${FF}:patch/${safe(p.id)}`;
    b.add('entity', patchId, {
      'prov:type': `${FF}:Patch`, 'prov:label': p.id, [`${FF}:species`]: p.species ?? '', [`${FF}:consensus`]: p.consensus.status,
    });
    const source = p.source;
    if (source.kind === 'import') {
      const importId = importBySource.get(`${source.sha256}|${source.file}`);
      if (importId) b.relate('wasGeneratedBy', { 'prov:entity': patchId, 'prov:activity': `${FF}:import/${safe(importId)}` });
      b.relate('wasDerivedFrom', { 'prov:generatedEntity': patchId, 'prov:usedEntity': `${FF}:file/${source.sha256}` });
    } else {
      b.relate('wasAttributedTo', { 'prov:entity': patchId, 'prov:agent': b.agent(source.by) });
    }
    for (const t of p.tags) b.relate('used', { 'prov:activity': `${FF}:pass/${safe(t.pass)}`, 'prov:entity': patchId, 'prov:time': t.time });
    for (const r of p.rulings) b.relate('used', { 'prov:activity': `${FF}:ruling/${safe(r.id)}`, 'prov:entity': patchId, 'prov:time': r.time });
    for (const c of changes.get(p.id) ?? []) {
      const changeId = `${FF}:${c.kind}/${c.seq}`;
      b.add('activity', changeId, {
        'prov:type': c.kind === 'shift' ? `${FF}:Shift` : `${FF}:Edit`, 'prov:startTime': c.time, 'prov:endTime': c.time,
        [`${FF}:ledgerSeq`]: c.seq, ...(c.kind === 'shift' ? { [`${FF}:dx`]: c.dx, [`${FF}:dy`]: c.dy } : {}),
      });
      b.relate('wasAssociatedWith', { 'prov:activity': changeId, 'prov:agent': b.agent(c.by) });
      b.relate('used', { 'prov:activity': changeId, 'prov:entity': patchId });
    }
    b.relate('used', { 'prov:activity': run, 'prov:entity': patchId });
  }

  b.add('activity', run, { 'prov:type': `${FF}:Export`, 'prov:startTime': d.time, 'prov:endTime': d.time, [`${FF}:options`]: JSON.stringify(d.options) });
  b.add('entity', exported, {
    'prov:type': `${FF}:Export`, 'prov:label': d.file, [`${FF}:format`]: d.format, [`${FF}:sha256`]: d.sha256,
    [`${FF}:patches`]: patches.length, [`${FF}:leftOut`]: JSON.stringify(d.leftOut),
    'prov:generatedAtTime': dateTime(d.time),
    [`${FF}:cautions`]: EXPORT_CAUTIONS.join(' '),
  });
  b.relate('used', { 'prov:activity': run, 'prov:entity': history });
  for (const scene of state.scenes.values()) b.relate('used', { 'prov:activity': run, 'prov:entity': `${FF}:scene/${safe(scene.id)}` });
  b.relate('wasGeneratedBy', { 'prov:entity': exported, 'prov:activity': run, 'prov:time': d.time });
  b.relate('wasAssociatedWith', { 'prov:activity': run, 'prov:agent': app });
  b.relate('wasDerivedFrom', { 'prov:generatedEntity': exported, 'prov:usedEntity': history });

  const doc: Record<string, unknown> = {
    prefix: { [FF]: FF_NAMESPACE, xsd: 'http://www.w3.org/2001/XMLSchema#', prov: 'http://www.w3.org/ns/prov#' },
  };
  for (const [kind, items] of Object.entries(b.doc)) if (Object.keys(items).length) doc[kind] = items;
  return doc;
}

/** The ledger head a PROV document states, or null when it states none. */
export function provLedgerHead(doc: unknown): { seq: number; hash: string } | null {
  const entity = (doc as { entity?: Record<string, Record_> })?.entity?.[`${FF}:history`];
  const hash = entity?.[`${FF}:headHash`], seq = entity?.[`${FF}:headSeq`];
  return typeof hash === 'string' && typeof seq === 'number' ? { seq, hash } : null;
}

/** The data file's SHA-256 a PROV document states, or null. */
export function provExportSha256(doc: unknown): string | null {
  const value = (doc as { entity?: Record<string, Record_> })?.entity?.[`${FF}:export`]?.[`${FF}:sha256`];
  return typeof value === 'string' ? value : null;
}
