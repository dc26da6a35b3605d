import Dexie, { type Table } from 'dexie';
import { extentOfRings, multiPolygonArea } from '../core/geometry/measure.ts';
import type { Extent } from '../core/geometry/types.ts';
import type {
  ImportRecord, LedgerEvent, Pass, Patch, ReferenceFeature, Ruling, SceneRef, Tag,
} from '../core/site/index.ts';

// One IndexedDB database per site. Dexie versions, newest last; each older version stays
// declared so an old database upgrades step by step. A fixture of each older version is
// in test/store/fixtures/, and test/store/migrations.browser.test.ts upgrades it.
//
// Version 1: the ledger, a key-value meta table, and one table per kind of row.
// Version 2: patch rows also carry their extent and area (m²), indexed, so lists and
//            viewport queries need not load every outline; version 1 rows are filled in.

export const SCHEMA_VERSION = 2;

export interface PatchRow extends Patch {
  extent: Extent;
  area: number;
}

export interface TagRow extends Tag {
  /** tagKey(patchId, passId) */
  key: string;
}

/** meta rows: 'head' {seq, hash}, 'history' {undo, redo}, 'site' {site}, 'roster' {entries}, 'schemes' (absent before the first) */
export interface MetaRow {
  key: string;
  value: unknown;
}

export class SiteDatabase extends Dexie {
  ledger!: Table<LedgerEvent, number>;
  meta!: Table<MetaRow, string>;
  scenes!: Table<SceneRef, string>;
  patches!: Table<PatchRow, string>;
  tags!: Table<TagRow, string>;
  passes!: Table<Pass, string>;
  rulings!: Table<Ruling, string>;
  references!: Table<ReferenceFeature, string>;
  imports!: Table<ImportRecord, string>;

  constructor(name: string, options: { indexedDB?: IDBFactory; IDBKeyRange?: typeof IDBKeyRange } = {}) {
    // Chromium commits with relaxed durability unless asked; a saved edit must survive a
    // power cut, so every transaction of this database is strict.
    super(name, { chromeTransactionDurability: 'strict', ...options });
    this.version(1).stores(SCHEMA_V1);
    this.version(2).stores(SCHEMA_V2).upgrade(async (tx) => {
      await tx.table('patches').toCollection().modify((row: PatchRow) => {
        Object.assign(row, patchMeasures(row.geometry));
      });
    });
  }
}

export const SCHEMA_V1 = {
  ledger: '&seq',
  meta: '&key',
  scenes: '&id',
  patches: '&id',
  tags: '&key, patchId, passId',
  passes: '&id',
  rulings: '&id, patchId',
  references: '&id, importId',
  imports: '&id',
};

export const SCHEMA_V2 = { ...SCHEMA_V1, patches: '&id, area' };

export function patchMeasures(geometry: Patch['geometry']): { extent: Extent; area: number } {
  return { extent: extentOfRings(geometry), area: multiPolygonArea(geometry) };
}

export function siteDatabaseName(siteId: string): string {
  return `fellfield-site-${siteId}`;
}
