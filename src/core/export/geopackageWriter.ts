import type { SqlJsStatic } from 'sql.js';
import { geopackageGeometry } from './geopackageBinary.ts';
import type { ExportedPatch } from './patchRecords.ts';
import { SCALAR_COLUMNS, scalarValues, STRUCTURED_COLUMNS, structuredValues } from './properties.ts';
import { srsRow } from './srsDefinition.ts';

// A GeoPackage (OGC GeoPackage Encoding Standard 12-128r18, version 1.3) of the exported
// patches in the site's own CRS: the required gpkg_spatial_ref_sys (§1.1.2),
// gpkg_contents (§1.1.3) and gpkg_geometry_columns (§2.1.5) tables, a feature table with
// GeoPackage binary geometry, and an attributes table with what the export was made
// from. SQLite runs in sql.js (wasm), which the caller hands in, so this module stays
// free of how the engine is loaded. The same inserts in the same order give the same
// pages, and no clock is read: last_change is the time of the ledger's head event.

/** "GPKG" as a 32-bit big-endian integer, the SQLite application_id of a GeoPackage (§1.1.1.1.1). */
export const GPKG_APPLICATION_ID = 0x47504b47;
/** user_version of GeoPackage 1.3 (§1.1.1.1.1): major, minor and patch as MMmmpp. */
export const GPKG_USER_VERSION = 10300;
export const FEATURE_TABLE = 'patches';
export const INFO_TABLE = 'export_provenance';

export interface GeopackageHeader {
  site: { id: string; name: string; epsg: number };
  ledgerHead: { seq: number; hash: string };
  /** ISO 8601 UTC of the ledger's head event */
  lastChange: string;
  options: Record<string, unknown>;
}

const SCHEMA = `
CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER NOT NULL PRIMARY KEY, organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT);
CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE,
  description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id));
CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name), CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id));
`;

const COLUMN_TYPES: Record<string, string> = {
  patch_id: 'TEXT NOT NULL UNIQUE', species: 'TEXT', class: 'TEXT', consensus: 'TEXT NOT NULL', consensus_species: 'TEXT',
  ruling: 'TEXT', fold: 'INTEGER', pure_pixels: 'INTEGER', pixel_rule: 'TEXT',
};

/** GeoPackage's form of a time: YYYY-MM-DDTHH:MM:SS.SSSZ (§1.1.3.1.1). */
export function gpkgTime(iso: string): string {
  const t = new Date(iso);
  return Number.isNaN(t.getTime()) ? '1970-01-01T00:00:00.000Z' : t.toISOString();
}

function extentOf(patches: readonly ExportedPatch[]): [number, number, number, number] | null {
  let minX = Infinity, minY = Infinity, maxX = -Infinity, maxY = -Infinity;
  for (const p of patches) for (const rings of p.geometry) for (const ring of rings) for (const [x, y] of ring) {
    if (x < minX) minX = x;
    if (x > maxX) maxX = x;
    if (y < minY) minY = y;
    if (y > maxY) maxY = y;
  }
  return minX <= maxX ? [minX, minY, maxX, maxY] : null;
}

/** The GeoPackage file's bytes. */
export function geopackageBytes(SQL: SqlJsStatic, patches: readonly ExportedPatch[], header: GeopackageHeader): Uint8Array {
  const epsg = header.site.epsg;
  const srs = srsRow(epsg);
  const db = new SQL.Database();
  try {
    // No rollback journal: a failed export is thrown away whole, and the journal's page
    // copies would cost more than the table itself.
    db.run(`PRAGMA journal_mode = OFF; PRAGMA application_id = ${GPKG_APPLICATION_ID}; PRAGMA user_version = ${GPKG_USER_VERSION};`);
    db.run('BEGIN');
    db.run(SCHEMA);
    const srsInsert = 'INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, ?)';
    db.run(srsInsert, ['Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system']);
    db.run(srsInsert, ['Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system']);
    const wgs84 = srsRow(4326);
    db.run(srsInsert, [wgs84.srs_name, 4326, 'EPSG', 4326, wgs84.definition, 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid']);
    if (epsg !== 4326) db.run(srsInsert, [srs.srs_name, srs.srs_id, srs.organization, srs.organization_coordsys_id, srs.definition, null]);

    const extent = extentOf(patches);
    const lastChange = gpkgTime(header.lastChange);
    db.run('INSERT INTO gpkg_contents VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)', [
      FEATURE_TABLE, 'features', FEATURE_TABLE, `labelled patches of site ${header.site.name}`, lastChange,
      extent?.[0] ?? null, extent?.[1] ?? null, extent?.[2] ?? null, extent?.[3] ?? null, epsg,
    ]);
    db.run('INSERT INTO gpkg_contents (table_name, data_type, identifier, description, last_change) VALUES (?, ?, ?, ?, ?)', [
      INFO_TABLE, 'attributes', INFO_TABLE, 'what the export was made from: site, ledger head, options', lastChange,
    ]);
    db.run('INSERT INTO gpkg_geometry_columns VALUES (?, ?, ?, ?, 0, 0)', [FEATURE_TABLE, 'geom', 'MULTIPOLYGON', epsg]);

    const columns = [...SCALAR_COLUMNS.map((c) => `"${c}" ${COLUMN_TYPES[c]}`), ...STRUCTURED_COLUMNS.map((c) => `"${c}" TEXT NOT NULL`)];
    db.run(`CREATE TABLE "${FEATURE_TABLE}" (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, geom MULTIPOLYGON, ${columns.join(', ')})`);
    const names = ['geom', ...SCALAR_COLUMNS, ...STRUCTURED_COLUMNS];
    const insert = db.prepare(`INSERT INTO "${FEATURE_TABLE}" (${names.map((n) => `"${n}"`).join(', ')}) VALUES (${names.map(() => '?').join(', ')})`);
    for (const p of patches) {
      const scalars = scalarValues(p);
      const structured = structuredValues(p);
      insert.run([
        geopackageGeometry(p.geometry, epsg),
        ...SCALAR_COLUMNS.map((c) => scalars[c]),
        ...STRUCTURED_COLUMNS.map((c) => JSON.stringify(structured[c])),
      ]);
    }
    insert.free();

    db.run(`CREATE TABLE "${INFO_TABLE}" (id INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, key TEXT NOT NULL UNIQUE, value TEXT NOT NULL)`);
    const info = db.prepare(`INSERT INTO "${INFO_TABLE}" (key, value) VALUES (?, ?)`);
    info.run(['site', JSON.stringify(header.site)]);
    info.run(['ledger_head', JSON.stringify(header.ledgerHead)]);
    info.run(['options', JSON.stringify(header.options)]);
    info.free();
    db.run('COMMIT');
    return db.export();
  } finally {
    db.close();
  }
}
