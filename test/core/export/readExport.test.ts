import initSqlJs from 'sql.js';
import { describe, expect, it } from 'vitest';
import { consensus } from '../../../src/core/export/consensus.ts';
import { exportSite, type ExportFile, type ExportFormat } from '../../../src/core/export/exportSite.ts';
import type { ExportOptions } from '../../../src/core/export/options.ts';
import { provLedgerHead } from '../../../src/core/export/provDocument.ts';
import { importExport, type ExportFiles } from '../../../src/core/export/readExport.ts';
import { verifyChain } from '../../../src/core/ledger/chain.ts';
import { sha256Hex } from '../../../src/core/ledger/sha256.ts';
import { tagsOfPatch } from '../../../src/core/site/state.ts';
import { twoPassSite } from './siteBuilder.ts';

const SQL = await initSqlJs();
const decode = (bytes: Uint8Array) => new TextDecoder().decode(bytes);
const encode = (text: string) => new TextEncoder().encode(text);

async function exportOf(format: ExportFormat, options: ExportOptions = { selection: { kind: 'consensus' }, folds: { k: 2 } }) {
  const b = await twoPassSite(10);
  await b.shift('P4', 0.5, 0.5);
  const { files } = await exportSite(b.opened, options, { format, appVersion: '0.1.0', time: '2031-02-03T04:05:06.000Z', sql: SQL });
  const by = (role: ExportFile['role']) => files.find((f) => f.role === role)!;
  const set: ExportFiles = {
    data: { name: by('data').name, bytes: by('data').bytes },
    history: { name: by('history').name, text: decode(by('history').bytes) },
    provenance: { name: by('provenance').name, text: decode(by('provenance').bytes) },
  };
  return { b, set };
}

/** Replaces the PROV document's data hash, as a careful forger would. */
async function withMatchingHash(set: ExportFiles, data: Uint8Array): Promise<ExportFiles> {
  const prov = JSON.parse(set.provenance.text);
  prov.entity['ff:export']['ff:sha256'] = await sha256Hex(data);
  return { ...set, data: { ...set.data, bytes: data }, provenance: { ...set.provenance, text: JSON.stringify(prov) } };
}

describe('importing an export into a new site', () => {
  for (const format of ['geojson', 'gpkg'] as const) {
    it(`${format}: gives the same patches, tags, rulings and consensus`, async () => {
      const { b, set } = await exportOf(format);
      const site = await importExport(set, SQL);
      expect(site.format).toBe(format);
      expect([...site.state.patches.entries()]).toEqual([...b.state.patches.entries()]);
      expect([...site.state.tags.entries()]).toEqual([...b.state.tags.entries()]);
      expect([...site.state.rulings.entries()]).toEqual([...b.state.rulings.entries()]);
      for (const id of b.state.patches.keys()) {
        const rulings = (s: typeof b.state) => [...s.rulings.values()].filter((r) => r.patchId === id);
        expect(consensus(tagsOfPatch(site.state, id), rulings(site.state))).toEqual(consensus(tagsOfPatch(b.state, id), rulings(b.state)));
      }
    });
  }

  it('the PROV document\'s ledger head verifies against the exported history', async () => {
    const { b, set } = await exportOf('geojson');
    const check = await verifyChain(b.events);
    expect(check.ok).toBe(true);
    expect(provLedgerHead(JSON.parse(set.provenance.text))).toEqual({ seq: b.events.length, hash: check.ok ? check.head : '' });
  });
});

describe('a tampered export is found on import', () => {
  it('a feature changed and its hash fixed in the PROV document: names the patch', async () => {
    const { set } = await exportOf('geojson');
    const forged = decode(set.data.bytes).replace(/("id":"P3".*?"species":)"ABFI"/, '$1"SAIN"');
    expect(forged).not.toBe(decode(set.data.bytes));
    await expect(importExport(await withMatchingHash(set, encode(forged)), SQL)).rejects.toThrow(/labels\.geojson: is not what its history exports \(patch\(es\) P3 differ\)/);
  });

  it('a data file changed without touching the PROV document: the hash says so', async () => {
    const { set } = await exportOf('geojson');
    const forged = encode(decode(set.data.bytes).replace('"sure"', '"unsure"'));
    await expect(importExport({ ...set, data: { ...set.data, bytes: forged } }, SQL)).rejects.toThrow(/labels\.geojson: was changed after the export/);
  });

  it('a GeoPackage with one changed byte in a species value', async () => {
    const { set } = await exportOf('gpkg');
    const bytes = new Uint8Array(set.data.bytes);
    const at = Buffer.from(bytes).indexOf('SAIN');
    bytes[at] = 'X'.charCodeAt(0);
    await expect(importExport(await withMatchingHash(set, bytes), SQL)).rejects.toThrow(/labels\.gpkg: is not what its history exports \(the bytes differ from offset \d+\)/);
  });

  it('an event of the history changed: the chain breaks at that event', async () => {
    const { set } = await exportOf('geojson');
    const history = set.history.text.replace('"note":"","interpreter":"ben"', '"note":"changed","interpreter":"ben"');
    expect(history).not.toBe(set.history.text);
    await expect(importExport({ ...set, history: { ...set.history, text: history } }, SQL)).rejects.toThrow(/labels\.site\.json: the history does not verify: event \d+ was changed after it was recorded/);
  });

  it('the history cut short: its head is no longer the one the PROV document states', async () => {
    const { set } = await exportOf('geojson');
    const doc = JSON.parse(set.history.text);
    doc.ledger = doc.ledger.slice(0, -2);
    doc.head = { seq: doc.ledger.length, hash: doc.ledger[doc.ledger.length - 1].hash };
    await expect(importExport({ ...set, history: { ...set.history, text: JSON.stringify(doc) } }, SQL)).rejects.toThrow(/labels\.prov\.json: its ledger head \(event \d+, [0-9a-f]{12}…\) is not the head of the history/);
  });

  it('a PROV document without a head, or not JSON', async () => {
    const { set } = await exportOf('geojson');
    await expect(importExport({ ...set, provenance: { ...set.provenance, text: '{"entity":{}}' } }, SQL)).rejects.toThrow(/labels\.prov\.json: states no ledger head/);
    await expect(importExport({ ...set, provenance: { ...set.provenance, text: '{' } }, SQL)).rejects.toThrow(/labels\.prov\.json: is not a JSON document/);
  });
});
