import initSqlJs from 'sql.js';
import { beforeAll, describe, expect, it } from 'vitest';
import { exportSite } from '../../../src/core/export/exportSite.ts';
import { geopackageGeometry, readGeopackageGeometry } from '../../../src/core/export/geopackageBinary.ts';
import { GPKG_APPLICATION_ID, GPKG_USER_VERSION } from '../../../src/core/export/geopackageWriter.ts';
import { srsRow } from '../../../src/core/export/srsDefinition.ts';
import { EPSG, twoPassSite } from './siteBuilder.ts';

// The GeoPackage writer read back through SQLite itself (sql.js), and its binary
// geometry decoded again; the layout rules are those of OGC 12-128r18 (cited beside
// the writer). GDAL's own reading is in test/reference/export-gdal.test.ts.

let SQL: Awaited<ReturnType<typeof initSqlJs>>;
beforeAll(async () => {
  SQL = await initSqlJs();
});

async function gpkg(b: Awaited<ReturnType<typeof twoPassSite>>) {
  const { files } = await exportSite(b.opened, { selection: { kind: 'consensus' } }, { format: 'gpkg', appVersion: '0.1.0', time: '2031-02-03T04:05:06.000Z', sql: SQL });
  return files.find((f) => f.role === 'data')!.bytes;
}

describe('GeoPackage binary geometry', () => {
  it('writes the GP header (magic, version 0, little-endian with an xy envelope, srs_id) and reads back bit for bit', () => {
    const parts = [[[[493000.123456789, 4429000.987654321], [493010.5, 4429000.25], [493005.1, 4429010.75], [493000.123456789, 4429000.987654321]]]] as [number, number][][][];
    const bytes = geopackageGeometry(parts, EPSG);
    expect([...bytes.subarray(0, 4)]).toEqual([0x47, 0x50, 0, 0b11]);
    const view = new DataView(bytes.buffer);
    expect(view.getInt32(4, true)).toBe(EPSG);
    expect([view.getFloat64(8, true), view.getFloat64(16, true), view.getFloat64(24, true), view.getFloat64(32, true)])
      .toEqual([493000.123456789, 493010.5, 4429000.25, 4429010.75]);
    // WKB after the 40-byte header: little-endian flag, type 6 (MultiPolygon).
    expect(bytes[40]).toBe(1);
    expect(view.getUint32(41, true)).toBe(6);
    expect(readGeopackageGeometry(bytes)).toEqual({ srsId: EPSG, parts });
  });

  it('marks an empty geometry with the empty flag and no envelope', () => {
    const bytes = geopackageGeometry([], EPSG);
    expect(bytes[3] & 0b1_0000).toBe(0b1_0000);
    expect((bytes[3] >> 1) & 0b111).toBe(0);
  });
});

describe('GeoPackage file', () => {
  it('is a GeoPackage 1.3 database with the required tables, the site CRS and a last_change from the ledger', async () => {
    const b = await twoPassSite(4);
    const db = new SQL.Database(await gpkg(b));
    const one = (sql: string) => db.exec(sql)[0].values;
    expect(one('PRAGMA application_id')[0][0]).toBe(GPKG_APPLICATION_ID);
    expect(one('PRAGMA user_version')[0][0]).toBe(GPKG_USER_VERSION);
    expect(one('SELECT srs_id FROM gpkg_spatial_ref_sys ORDER BY srs_id').map((r) => r[0])).toEqual([-1, 0, 4326, EPSG]);
    expect(one(`SELECT definition FROM gpkg_spatial_ref_sys WHERE srs_id = ${EPSG}`)[0][0]).toBe(srsRow(EPSG).definition);
    const headTime = b.events[b.events.length - 1].time;
    expect(one("SELECT data_type, last_change, srs_id FROM gpkg_contents WHERE table_name = 'patches'")[0]).toEqual(['features', headTime, EPSG]);
    expect(one('SELECT table_name, column_name, geometry_type_name, srs_id, z, m FROM gpkg_geometry_columns')[0]).toEqual(['patches', 'geom', 'MULTIPOLYGON', EPSG, 0, 0]);
    expect(one('SELECT patch_id, species, consensus FROM patches ORDER BY fid')).toEqual([['P1', 'ABFI', 'agreed'], ['P2', 'SAIN', 'agreed'], ['P3', 'ABFI', 'agreed'], ['P4', 'SAIN', 'agreed']]);
    expect(JSON.parse(String(one("SELECT value FROM export_provenance WHERE key = 'ledger_head'")[0][0]))).toEqual(b.state.head);
    expect(one('PRAGMA integrity_check')[0][0]).toBe('ok');
    db.close();
  });

  it('stores the outlines losslessly in the site CRS', async () => {
    const b = await twoPassSite(3);
    const db = new SQL.Database(await gpkg(b));
    const rows = db.exec('SELECT patch_id, geom FROM patches ORDER BY fid')[0].values;
    for (const [id, geom] of rows) {
      expect(readGeopackageGeometry(geom as Uint8Array)).toEqual({ srsId: EPSG, parts: b.state.patches.get(String(id))!.geometry });
    }
    db.close();
  });

  it('gives the same bytes for the same state, whatever the export time', async () => {
    const b = await twoPassSite(6);
    const first = await gpkg(b);
    const { files } = await exportSite(b.opened, { selection: { kind: 'consensus' } }, { format: 'gpkg', appVersion: '9', time: '2040-01-01T00:00:00.000Z', sql: SQL });
    expect(Buffer.from(files[0].bytes).equals(Buffer.from(first))).toBe(true);
  });

  it('the asm.js build of sql.js (the app\'s, under its script policy) writes the same bytes as the wasm build', async () => {
    const b = await twoPassSite(5);
    const asm = (await import('sql.js/dist/sql-asm.js')).default;
    const { files } = await exportSite(b.opened, { selection: { kind: 'consensus' } }, { format: 'gpkg', appVersion: '0.1.0', time: '', sql: await asm() });
    expect(Buffer.from(files[0].bytes).equals(Buffer.from(await gpkg(b)))).toBe(true);
  });

  it('refuses a CRS it cannot define, naming it', () => {
    expect(() => srsRow(3857)).toThrow(/cannot yet define the site's CRS EPSG:3857/);
  });

  it('asks for the SQLite engine rather than failing inside', async () => {
    const b = await twoPassSite(1);
    await expect(exportSite(b.opened, { selection: { kind: 'consensus' } }, { format: 'gpkg', appVersion: '0', time: '' })).rejects.toThrow(/needs the SQLite engine/);
  });
});
