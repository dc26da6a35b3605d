import type { SqlJsStatic } from 'sql.js';
import { sha256Hex } from '../ledger/sha256.ts';
import { ExportError } from './ExportError.ts';
import { geojsonText } from './geojsonWriter.ts';
import { geopackageBytes } from './geopackageWriter.ts';
import { recordedOptions, type ExportOptions } from './options.ts';
import { patchRecords } from './patchRecords.ts';
import { provDocument } from './provDocument.ts';
import { siteFileText, type OpenedSite } from './siteFile.ts';

// One export of a site: the data file (GeoJSON or GeoPackage), the site's history as a
// site file, and the PROV document that ties them together. Everything but the PROV
// document depends on the site state and the options alone, so the same site gives the
// same bytes; the caller writes the files (temporary name, then rename).

export type ExportFormat = 'geojson' | 'gpkg';
export const EXPORT_FORMATS: readonly ExportFormat[] = ['geojson', 'gpkg'];

export interface ExportRun {
  format: ExportFormat;
  /** file names start with this; default: "labels" */
  baseName?: string;
  appVersion: string;
  /** ISO 8601 UTC of the export, written only into the PROV document */
  time: string;
  /** the SQLite engine, needed for GeoPackage */
  sql?: SqlJsStatic;
  onProgress?: (stage: string, done: number, total: number) => void;
  signal?: AbortSignal;
}

export interface ExportFile {
  name: string;
  bytes: Uint8Array;
  role: 'data' | 'history' | 'provenance';
}

export interface ExportSummary {
  site: string;
  format: ExportFormat;
  patches: number;
  leftOut: { reason: string; count: number; ids: string[] }[];
  ledgerHead: { seq: number; hash: string };
  messages: string[];
  files: { name: string; role: string; bytes: number; sha256: string }[];
}

/** The history file, data file and provenance file of an export, with a summary. */
export async function exportSite(opened: OpenedSite, options: ExportOptions, run: ExportRun): Promise<{ files: ExportFile[]; summary: ExportSummary }> {
  const { state, events } = opened;
  if (!state.site) throw new ExportError('the site has no site record (an empty ledger)');
  const site = state.site;
  const base = run.baseName ?? 'labels';
  if (!/^[\w.-]+$/.test(base)) throw new ExportError(`the export name "${base}" may hold only letters, digits, '.', '-' and '_'`);
  const progress = run.onProgress ?? (() => {});
  const stop = () => { if (run.signal?.aborted) throw new ExportError('the export was cancelled'); };
  const encoder = new TextEncoder();

  progress('provenance of each patch', 0, 3);
  const records = patchRecords(state, events, options);
  stop();
  const recorded = recordedOptions(options);
  const header = { site: { id: site.id, name: site.name, epsg: site.epsg }, ledgerHead: { ...state.head }, options: recorded };

  progress(run.format === 'gpkg' ? 'GeoPackage' : 'GeoJSON', 1, 3);
  let data: Uint8Array;
  if (run.format === 'geojson') {
    data = encoder.encode(geojsonText(records.patches, header));
  } else {
    if (!run.sql) throw new ExportError('a GeoPackage export needs the SQLite engine, which did not load');
    const lastChange = events.find((e) => e.seq === state.head.seq)?.time ?? site.createdAt;
    data = geopackageBytes(run.sql, records.patches, { ...header, lastChange });
  }
  stop();

  progress('provenance document', 2, 3);
  const history = encoder.encode(siteFileText(events));
  const dataName = `${base}.${run.format}`;
  const historyName = `${base}.site.json`;
  const leftOut = records.leftOut.map((l) => ({ reason: l.reason, count: l.ids.length }));
  const dataSha = await sha256Hex(data);
  const historySha = await sha256Hex(history);
  const prov = provDocument(state, events, records.patches, {
    file: dataName, format: run.format, sha256: dataSha, historyFile: historyName, historySha256: historySha,
    time: run.time, appVersion: run.appVersion, options: recorded, leftOut,
  });
  const provBytes = encoder.encode(`${JSON.stringify(prov, null, 1)}\n`);
  const files: ExportFile[] = [
    { name: dataName, bytes: data, role: 'data' },
    { name: historyName, bytes: history, role: 'history' },
    { name: `${base}.prov.json`, bytes: provBytes, role: 'provenance' },
  ];
  progress('done', 3, 3);
  const hashes = [dataSha, historySha, await sha256Hex(provBytes)];
  const listed = files.map((f, i) => ({ name: f.name, role: f.role, bytes: f.bytes.length, sha256: hashes[i] }));
  return {
    files,
    summary: {
      site: site.name, format: run.format, patches: records.patches.length,
      leftOut: records.leftOut.map((l) => ({ reason: l.reason, count: l.ids.length, ids: l.ids })),
      ledgerHead: { ...state.head }, messages: records.messages, files: listed,
    },
  };
}
