import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import { ensureEpsg } from '../../src/core/crs.ts';
import { ImportError, proposeMapping, readFieldFile, type FieldFile } from '../../src/core/imports/index.ts';
import type { Position } from '../../src/core/geometry/types.ts';

// Field files read, reprojected into a site in EPSG:32632 (WGS 84 / UTM zone 32N), and
// compared with what GDAL's ogr2ogr (Debian gdal-bin 3.6.2, PROJ 9.1) wrote or read for
// the same data: fixtures/imports/, made by make-fixtures.sh.

const dir = join(import.meta.dirname, 'fixtures', 'imports');
const bytes = (name: string) => new Uint8Array(readFileSync(join(dir, name)));
const expected = JSON.parse(readFileSync(join(dir, 'field-32632.expected.json'), 'utf8'));
const site = { siteEpsg: 32632 };

type Json = { geometry: { type: string; coordinates: unknown }; properties: Record<string, unknown> };

/** Polygon parts of an ogr2ogr feature as rings of positions. */
function partsOf(feature: Json): Position[][][] {
  return feature.geometry.type === 'Polygon' ? [feature.geometry.coordinates as Position[][]] : (feature.geometry.coordinates as Position[][][]);
}

/** Rings compared as point sets in order up to start and direction (shapefiles store outer rings clockwise). */
function normalRing(ring: Position[]): Position[] {
  const open = ring.slice(0, -1);
  const area = open.reduce((s, p, i) => s + p[0] * open[(i + 1) % open.length][1] - open[(i + 1) % open.length][0] * p[1], 0);
  const ccw = area > 0 ? open : [...open].reverse();
  let start = 0;
  ccw.forEach((p, i) => {
    if (p[0] < ccw[start][0] || (p[0] === ccw[start][0] && p[1] < ccw[start][1])) start = i;
  });
  return [...ccw.slice(start), ...ccw.slice(0, start)];
}

function expectSameParts(actual: Position[][][], wanted: Position[][][], tolerance: number) {
  expect(actual.length).toBe(wanted.length);
  actual.forEach((rings, i) => {
    expect(rings.length).toBe(wanted[i].length);
    rings.forEach((ring, j) => {
      const a = normalRing(ring);
      const w = normalRing(wanted[i][j]);
      expect(a.length).toBe(w.length);
      a.forEach((p, k) => {
        expect(Math.abs(p[0] - w[k][0])).toBeLessThan(tolerance);
        expect(Math.abs(p[1] - w[k][1])).toBeLessThan(tolerance);
      });
    });
  });
}

const polygons = (file: FieldFile) => file.features.filter((f) => f.geometries[0].kind === 'polygon');

describe('field polygons against GDAL ogr2ogr', () => {
  it('reprojects RFC 7946 lon/lat GeoJSON to UTM 32N within a millimetre of ogr2ogr', () => {
    const { file } = readFieldFile('field-lonlat.geojson', bytes('field-lonlat.geojson'), site);
    expect(file.crs).toEqual({ kind: 'epsg', epsg: 32632 });
    const ours = polygons(file);
    expect(ours).toHaveLength(4);
    ours.forEach((f, i) => {
      const g = f.geometries[0];
      expect(g.kind).toBe('polygon');
      if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(expected.polygons[i]), 1e-3);
      expect(f.attributes).toEqual(expected.polygons[i].properties);
    });
  });

  it('takes the CRS from the legacy crs member ogr2ogr writes, leaving coordinates as written', () => {
    const { file, original } = readFieldFile('field-32632-crs.geojson', bytes('field-32632-crs.geojson'), site);
    expect(original.crs).toEqual({ kind: 'epsg', epsg: 32632 });
    polygons(file).forEach((f, i) => {
      const g = f.geometries[0];
      if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(expected.polygons[i]), 1e-9);
    });
  });

  it('reads a zipped shapefile in UTM 33N with a CP1252 .dbf as GDAL reads it, and reprojects it to 32N', () => {
    const ogrRead = JSON.parse(readFileSync(join(dir, 'field-32633.ogr.geojson'), 'utf8'));
    // in its own CRS: the stored coordinates and the attributes decoded by the .cpg
    const own = readFieldFile('field-32633.zip', bytes('field-32633.zip'), { siteEpsg: 32633 }).file;
    expect(own.format).toBe('shapefile');
    expect(own.features).toHaveLength(4);
    own.features.forEach((f, i) => {
      // GDAL reads a blank .dbf text field as null; shpjs as ''
      const gdal = Object.fromEntries(Object.entries(ogrRead.features[i].properties).map(([k, v]) => [k, v ?? '']));
      expect(f.attributes).toEqual(gdal);
      const g = f.geometries[0];
      if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(ogrRead.features[i]), 1e-6);
    });
    expect(own.features[1].attributes.note).toBe('Grünerle – dicht'); // ü and an en dash, both CP1252
    // into the site's zone: the same as ogr2ogr's direct lon/lat → 32N within a millimetre
    const { file, original } = readFieldFile('field-32633.zip', bytes('field-32633.zip'), site);
    expect(original.crs).toMatchObject({ kind: 'definition', name: 'WGS_1984_UTM_Zone_33N' });
    file.features.forEach((f, i) => {
      const g = f.geometries[0];
      if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(expected.polygons[i]), 1e-3);
    });
  });

  it('refuses a shapefile without .prj, naming the file, unless the user chooses its CRS', () => {
    expect(() => readFieldFile('field-noprj.zip', bytes('field-noprj.zip'), site)).toThrow(ImportError);
    expect(() => readFieldFile('field-noprj.zip', bytes('field-noprj.zip'), site)).toThrow(
      'field-noprj.zip: field.shp has no .prj beside it, so its coordinate system is unknown; add the .prj to the zip or choose the CRS',
    );
    const { file } = readFieldFile('field-noprj.zip', bytes('field-noprj.zip'), { ...site, assumeEpsg: 32633 });
    const g = file.features[0].geometries[0];
    if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(expected.polygons[0]), 1e-3);
  });

  it('reads the KML ogr2ogr wrote: the same polygons and attributes', () => {
    const { file } = readFieldFile('field.kml', bytes('field.kml'), site);
    expect(file.format).toBe('kml');
    const ours = polygons(file);
    expect(ours).toHaveLength(4);
    ours.forEach((f, i) => {
      expect(f.attributes.plot).toBe(expected.polygons[i].properties.plot);
      const g = f.geometries[0];
      if (g.kind === 'polygon') expectSameParts(g.parts, partsOf(expected.polygons[i]), 1e-3);
    });
  });

  it('reads GPX waypoints and a track from ogr2ogr as reference points and a line', () => {
    const { file } = readFieldFile('field.gpx', bytes('field.gpx'), site);
    const all = file.features.flatMap((f) => f.geometries);
    expect(all.map((g) => g.kind).sort()).toEqual(['line', 'point', 'point']);
    const [p1, p2] = all.filter((g) => g.kind === 'point');
    const walk = all.find((g) => g.kind === 'line')!;
    const ref = expected.references as Json[];
    for (const [ours, theirs] of [[p1, ref[0]], [p2, ref[1]]] as const) {
      if (ours.kind !== 'point') throw new Error('expected a point');
      const [x, y] = theirs.geometry.coordinates as Position;
      expect(Math.hypot(ours.position[0] - x, ours.position[1] - y)).toBeLessThan(1e-3);
    }
    if (walk.kind !== 'line') throw new Error('expected a line');
    (ref[2].geometry.coordinates as Position[]).forEach(([x, y], i) => {
      expect(Math.hypot(walk.path[i][0] - x, walk.path[i][1] - y)).toBeLessThan(1e-3);
    });
  });

  it('agrees with proj4 (npm, 2.22.0) called directly with the UTM 32N definition', () => {
    const { file, original } = readFieldFile('field-lonlat.geojson', bytes('field-lonlat.geojson'), site);
    const utm32 = proj4('+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs');
    expect(ensureEpsg(32632)).toBe('EPSG:32632');
    const g0 = original.features[0].geometries[0];
    const g1 = file.features[0].geometries[0];
    if (g0.kind !== 'polygon' || g1.kind !== 'polygon') throw new Error('expected polygons');
    g0.parts[0][0].forEach((p, i) => expect(g1.parts[0][0][i]).toEqual(utm32.forward(p)));
  });
});

describe('species mapping of the field file', () => {
  it('maps codes and common names, and lists the value no roster entry matches', () => {
    const { file } = readFieldFile('field-lonlat.geojson', bytes('field-lonlat.geojson'), site);
    const roster = [
      { code: 'PICE', scientificName: 'Picea abies', commonName: 'Norway spruce', group: 'conifer', colour: '#009E73', key: '1' },
      { code: 'ALVI', scientificName: 'Alnus viridis', commonName: 'Green alder', group: 'broadleaf shrub', colour: '#E69F00', key: '2' },
    ];
    expect(proposeMapping(file.features, 'species', roster)).toEqual({
      attribute: 'species',
      values: { PICE: 'PICE', 'Green alder': 'ALVI' },
      unknown: [{ value: 'Zwergwacholder', count: 1 }],
      empty: 1,
    });
  });
});
