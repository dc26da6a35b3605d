import { spawnSync } from 'node:child_process';
import { copyFileSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { provLedgerHead } from '../../src/core/export/provDocument.ts';
import { verifyChain } from '../../src/core/ledger/chain.ts';
import type { SiteBuilder } from '../core/export/siteBuilder.ts';
import { geometrySite, writtenExport } from './exportSites.ts';

// Both export formats read by outside readers:
// - GDAL 3.6.2 (Debian gdal-bin): ogrinfo reports feature count, geometry type and CRS;
//   ogr2ogr reprojects the GeoPackage to WGS 84 with PROJ, to compare with our GeoJSON.
// - GDAL's GeoPackage validator, validate_gpkg.py (Debian python3-gdal 3.6.2,
//   osgeo_utils/samples), which checks a file against the OGC GeoPackage requirements.
// - The PROV document by the Python "prov" library 2.0.0 (Debian python3-prov), which
//   reads PROV-JSON after the W3C Member Submission and writes it out as PROV-N.

const run = (cmd: string, args: string[]) => spawnSync(cmd, args, { encoding: 'utf8' });
const hasGdal = run('ogrinfo', ['--version']).status === 0;
const validator = '/usr/lib/python3/dist-packages/osgeo_utils/samples/validate_gpkg.py';
const hasProv = run('/usr/bin/python3', ['-c', 'import prov']).status === 0;

let site: SiteBuilder;
let gpkg: Awaited<ReturnType<typeof writtenExport>>;
let geojson: Awaited<ReturnType<typeof writtenExport>>;

beforeAll(async () => {
  site = await geometrySite();
  gpkg = await writtenExport(site, 'gpkg');
  geojson = await writtenExport(site, 'geojson');
});
afterAll(() => {
  for (const o of [gpkg, geojson]) rmSync(o.dir, { recursive: true, force: true });
});

describe.skipIf(!hasGdal)('GDAL reads the exports', () => {
  it('ogrinfo: the GeoPackage holds 8 MultiPolygons in EPSG:32608, without a warning', () => {
    const r = run('ogrinfo', ['-so', gpkg.data, 'patches']);
    expect(r.status).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/Geometry: Multi Polygon/);
    expect(r.stdout).toMatch(/Feature Count: 8\n/);
    expect(r.stdout).toMatch(/PROJCRS\["WGS 84 \/ UTM zone 8N"/);
    expect(r.stdout).toMatch(/ID\["EPSG",32608\]\]\s*Data axis/);
    expect(r.stdout).toMatch(/^patch_id: String/m);
    expect(r.stdout).toMatch(/^fold: Integer64/m);
  });

  it('ogrinfo: the GeoJSON holds 8 MultiPolygons in EPSG:4326', () => {
    const r = run('ogrinfo', ['-so', '-al', geojson.data]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/Geometry: Multi Polygon/);
    expect(r.stdout).toMatch(/Feature Count: 8\n/);
    expect(r.stdout).toMatch(/ID\["EPSG",4326\]\]\s*Data axis/);
  });

  it('ogrinfo: the GeoPackage\'s patch ids and species are the ones exported, in order', () => {
    const r = run('ogrinfo', ['-q', '-geom=NO', gpkg.data, 'patches']);
    const ids = [...r.stdout.matchAll(/patch_id \(String\) = (\S+)/g)].map((m) => m[1]);
    const species = [...r.stdout.matchAll(/ {2}species \(String\) = (\S+)/g)].map((m) => m[1]);
    // Natural id order: H1, M1, then P1 to P6.
    expect(ids).toEqual(['H1', 'M1', 'P1', 'P2', 'P3', 'P4', 'P5', 'P6']);
    expect(species).toEqual(['ABFI', 'ABFI', 'ABFI', 'SAIN', 'ABFI', 'SAIN', 'ABFI', 'SAIN']);
  });

  it('validate_gpkg.py finds nothing wrong, yet does find a broken copy', () => {
    const ok = run('/usr/bin/python3', [validator, gpkg.data]);
    expect(ok.stdout + ok.stderr).toBe('');
    expect(ok.status).toBe(0);
    // The validator can fail: a copy whose application_id (header bytes 68-71) is wrong.
    const broken = join(gpkg.dir, 'broken.gpkg');
    copyFileSync(gpkg.data, broken);
    const bytes = readFileSync(broken);
    bytes.writeUInt32BE(0x12345678, 68);
    writeFileSync(broken, bytes);
    const bad = run('/usr/bin/python3', [validator, broken]);
    expect(bad.status).not.toBe(0);
    expect(bad.stdout + bad.stderr).toMatch(/application_id/i);
  });

  it('ogr2ogr reprojects the GeoPackage to WGS 84 (PROJ) onto our GeoJSON, within its rounding', () => {
    const target = join(gpkg.dir, 'gdal-4326.geojson');
    const r = run('ogr2ogr', ['-f', 'GeoJSON', '-t_srs', 'EPSG:4326', '-lco', 'COORDINATE_PRECISION=12', target, gpkg.data, 'patches']);
    expect(r.status).toBe(0);
    type Doc = { features: { id?: string; properties: { patch_id?: string }; geometry: { coordinates: number[][][][] } }[] };
    const gdal = JSON.parse(readFileSync(target, 'utf8')) as Doc;
    const ours = JSON.parse(readFileSync(geojson.data, 'utf8')) as Doc;
    expect(gdal.features.map((f) => f.properties.patch_id)).toEqual(ours.features.map((f) => f.id));
    let compared = 0;
    gdal.features.forEach((f, i) => f.geometry.coordinates.forEach((rings, p) => rings.forEach((ring, r) => {
      let mine = ours.features[i].geometry.coordinates[p][r];
      // Our writer may have reversed a ring to obey the winding rule; GDAL keeps the stored order.
      if (Math.abs(mine[1][0] - ring[1][0]) > 1e-7 || Math.abs(mine[1][1] - ring[1][1]) > 1e-7) mine = [...mine].reverse();
      ring.forEach((q, k) => {
        // Half a unit of the 8th decimal from rounding, plus a hair for the two libraries.
        expect(Math.abs(q[0] - mine[k][0])).toBeLessThanOrEqual(0.5e-8 + 1e-10);
        expect(Math.abs(q[1] - mine[k][1])).toBeLessThanOrEqual(0.5e-8 + 1e-10);
        compared++;
      });
    })));
    expect(compared).toBe(50);
  });
});

describe.skipIf(!hasProv)('the PROV document read by the Python prov library', () => {
  it('parses as PROV-JSON with one entity per patch and the ledger head of the history', async () => {
    const script = `
import json, sys
import prov.model as pm
doc = pm.ProvDocument.deserialize(sys.argv[1], format='json')
patches = [e for e in doc.get_records(pm.ProvEntity) if str(e.get_attribute('prov:type') and list(e.get_attribute('prov:type'))[0]) == 'ff:Patch']
history = [e for e in doc.get_records(pm.ProvEntity) if str(e.identifier) == 'ff:history'][0]
agents = sorted(str(a.identifier) for a in doc.get_records(pm.ProvAgent))
provn = doc.get_provn()
print(json.dumps({"patches": len(patches), "head": list(history.get_attribute('ff:headHash'))[0], "seq": list(history.get_attribute('ff:headSeq'))[0], "agents": agents, "provn": provn.startswith('document')}))
`;
    const r = run('/usr/bin/python3', ['-c', script, gpkg.prov]);
    expect(r.stderr).toBe('');
    const got = JSON.parse(r.stdout);
    const chain = await verifyChain(site.events);
    expect(chain.ok).toBe(true);
    expect(got).toEqual({ patches: 8, head: chain.ok ? chain.head : '', seq: site.events.length, agents: ['ff:agent/ana', 'ff:agent/ben', 'ff:agent/cleo', 'ff:agent/fellfield'], provn: true });
    expect(provLedgerHead(JSON.parse(readFileSync(gpkg.prov, 'utf8')))).toEqual({ seq: site.events.length, hash: got.head });
  });

  it('carries the cautions and the export time, which appear nowhere else', () => {
    const prov = readFileSync(geojson.prov, 'utf8');
    expect(prov).toMatch(/Labels are interpretations/);
    expect(prov).toMatch(/Verify in the field before any management decision/);
    expect(prov).toMatch(/Follow local regulations/);
    expect(prov).toMatch(/afternoon storms/);
    expect(prov).toContain('2031-02-03T04:05:06.000Z');
    expect(readFileSync(geojson.data, 'utf8')).not.toContain('2031-02-03');
  });
});
