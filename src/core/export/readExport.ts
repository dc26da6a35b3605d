import type { SqlJsStatic } from 'sql.js';
import { sha256Hex } from '../ledger/sha256.ts';
import { ExportError } from './ExportError.ts';
import { exportSite, type ExportFormat } from './exportSite.ts';
import type { ExportOptions } from './options.ts';
import { provExportSha256, provLedgerHead } from './provDocument.ts';
import { readSiteFile, type OpenedSite } from './siteFile.ts';

// Importing an export into a new site, which is also how an export is verified: the
// history must verify as a chain, its head must be the head the PROV document states,
// the data file must be the one the PROV document names by hash, and it must be exactly
// what that history exports under the recorded options. A change to any of the three
// files is found and named.

export interface ExportFiles {
  data: { name: string; bytes: Uint8Array };
  history: { name: string; text: string };
  provenance: { name: string; text: string };
}

export interface ImportedExport extends OpenedSite {
  format: ExportFormat;
  options: ExportOptions;
}

function parseJson(text: string, name: string): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new ExportError(`is not a JSON document (${(error as Error).message})`, name);
  }
}

function sameBytes(a: Uint8Array, b: Uint8Array): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return i;
  return a.length === b.length ? -1 : n;
}

/** Which features of a GeoJSON export differ from the ones the history gives, by id. */
function changedFeatures(found: Uint8Array, expected: Uint8Array): string[] {
  const decode = (bytes: Uint8Array) => {
    try {
      const doc = JSON.parse(new TextDecoder().decode(bytes)) as { features?: { id?: unknown }[] };
      return new Map((doc.features ?? []).map((f) => [String(f.id), JSON.stringify(f)]));
    } catch {
      return null;
    }
  };
  const a = decode(found), b = decode(expected);
  if (!a || !b) return [];
  const ids = new Set([...a.keys(), ...b.keys()]);
  return [...ids].filter((id) => a.get(id) !== b.get(id));
}

/** Reads and verifies an export; returns the site its history gives. Throws ExportError naming what was changed. */
export async function importExport(files: ExportFiles, sql?: SqlJsStatic): Promise<ImportedExport> {
  const opened = await readSiteFile(files.history.text, files.history.name);
  const prov = parseJson(files.provenance.text, files.provenance.name) as { entity?: Record<string, Record<string, unknown>> };
  const head = provLedgerHead(prov);
  if (!head) throw new ExportError('states no ledger head (entity ff:history)', files.provenance.name);
  if (head.hash !== opened.state.head.hash || head.seq !== opened.state.head.seq) {
    throw new ExportError(`its ledger head (event ${head.seq}, ${head.hash.slice(0, 12)}…) is not the head of the history in ${files.history.name} (event ${opened.state.head.seq}, ${opened.state.head.hash.slice(0, 12)}…)`, files.provenance.name);
  }
  const exportEntity = prov.entity?.['ff:export'] ?? {};
  const format = exportEntity['ff:format'];
  if (format !== 'geojson' && format !== 'gpkg') throw new ExportError('names no export format', files.provenance.name);
  const run = prov.entity ? (prov as { activity?: Record<string, Record<string, unknown>> }).activity?.['ff:export-run'] : undefined;
  const options = parseJson(String(run?.['ff:options'] ?? 'null'), files.provenance.name) as ExportOptions | null;
  if (!options?.selection) throw new ExportError('records no export options', files.provenance.name);
  const stated = provExportSha256(prov);
  const actual = await sha256Hex(files.data.bytes);
  if (stated !== actual) throw new ExportError(`was changed after the export: its SHA-256 is not the one ${files.provenance.name} records`, files.data.name);

  const again = await exportSite(opened, options, { format, appVersion: '', time: '', sql });
  const expected = again.files.find((f) => f.role === 'data')!.bytes;
  const at = sameBytes(files.data.bytes, expected);
  if (at >= 0) {
    const changed = format === 'geojson' ? changedFeatures(files.data.bytes, expected) : [];
    const which = changed.length ? `patch(es) ${changed.slice(0, 5).join(', ')}${changed.length > 5 ? ', …' : ''} differ` : `the bytes differ from offset ${at}`;
    throw new ExportError(`is not what its history exports (${which}): the export was changed`, files.data.name);
  }
  return { ...opened, format, options };
}
