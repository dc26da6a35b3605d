import { describe, expect, it } from 'vitest';
import { zipSync } from 'fflate';
import {
  buildImport, ImportError, readFieldFile, readRosterCsv, readRosterJson, writeRosterCsv, writeRosterJson,
} from '../../../src/core/imports/index.ts';
import type { RosterEntry } from '../../../src/core/site/index.ts';

const site = { siteEpsg: 32632 };
const text = (s: string) => new TextEncoder().encode(s);
const polygon = (coordinates: unknown, properties: object = {}) => ({ type: 'Feature', properties, geometry: { type: 'Polygon', coordinates } });
const collection = (...features: unknown[]) => text(JSON.stringify({ type: 'FeatureCollection', features }));
const square = [[[10.8, 46.5], [10.801, 46.5], [10.801, 46.501], [10.8, 46.501], [10.8, 46.5]]];

function messageOf(run: () => unknown): string {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(ImportError);
    return (error as Error).message;
  }
  throw new Error('expected an ImportError');
}

describe('bad field files', () => {
  it('names out-of-range, NaN and unclosed rings by feature and ring', () => {
    const message = messageOf(() => readFieldFile('plots.geojson', collection(
      polygon([[[10.8, 46.5], [190, 46.5], [10.801, 46.501], [10.8, 46.5]]]),
      // NaN is not JSON: a writer that emits it is read as invalid JSON, so test null
      polygon([[[10.8, 46.5], [null, 46.5], [10.801, 46.501], [10.8, 46.5]]]),
      polygon([[[10.8, 46.5], [10.801, 46.5], [10.801, 46.501], [10.8, 46.501]]]),
      polygon([[[10.8, 46.5], [10.801, 46.5], [10.8, 46.5]]]),
    ), site));
    expect(message).toBe([
      'plots.geojson: 4 problems:',
      '- feature 1: ring 1: position [190, 46.5] is outside longitude -180..180 / latitude -90..90',
      '- feature 2: ring 1: position [null, 46.5] is not a pair of finite numbers',
      '- feature 3: ring 1 is not closed (it starts at [10.8, 46.5] and ends at [10.8, 46.501])',
      '- feature 4: ring 1 has 3 positions; a ring needs at least 4',
    ].join('\n'));
  });

  it('reads a literal NaN as what it is: not JSON', () => {
    expect(messageOf(() => readFieldFile('nan.geojson', text('{"type":"Point","coordinates":[NaN, 1]}'), site))).toMatch(/^nan\.geojson: not valid JSON/);
  });

  it('refuses a polygon of a million vertices', () => {
    const ring = Array.from({ length: 1_000_000 }, (_, i) => [10.8 + 0.001 * Math.cos(i / 1e5), 46.5 + 0.001 * Math.sin(i / 1e5)]);
    ring.push(ring[0]);
    expect(messageOf(() => readFieldFile('trace.geojson', collection(polygon([ring])), site))).toBe(
      'trace.geojson: feature 1: the polygon has 1,000,001 vertices; a patch may have at most 100,000 (simplify it first)',
    );
  });

  it('says when lon/lat was expected but metres came, and the CRS when it cannot be used', () => {
    expect(messageOf(() => readFieldFile('utm.geojson', collection(polygon([[[612000, 5150000], [612010, 5150000], [612010, 5150010], [612000, 5150000]]])), site)))
      .toMatch(/^utm\.geojson: feature 1: ring 1: position \[612000, 5150000\] is outside longitude/);
    const legacy = text(JSON.stringify({ type: 'FeatureCollection', crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::9999' } }, features: [polygon(square)] }));
    expect(messageOf(() => readFieldFile('odd.geojson', legacy, site))).toBe("odd.geojson: its CRS EPSG:9999 is not one we can reproject from; choose another or convert the file");
  });

  it('refuses files that are not field files', () => {
    expect(messageOf(() => readFieldFile('plots.csv', text('a,b'), site))).toMatch(/^plots\.csv: not a field file we read/);
    expect(messageOf(() => readFieldFile('plots.zip', text('not a zip'), site))).toMatch(/^plots\.zip: not a readable zip file/);
    expect(messageOf(() => readFieldFile('empty.zip', zipSync({ 'readme.txt': text('x') }), site))).toBe('empty.zip: the zip holds no .shp file');
    expect(messageOf(() => readFieldFile('bad.kml', text('<kml><Placemark>'), site))).toMatch(/^bad\.kml: not well-formed XML/);
    expect(messageOf(() => readFieldFile('none.geojson', collection(), site))).toBe('none.geojson: it holds no features with a geometry');
  });

  it('refuses unmapped species values unless the user leaves them untagged', () => {
    const { file, original } = readFieldFile('plots.geojson', collection(polygon(square, { sp: 'PICE' }), polygon(square, { sp: 'Zirbe' })), site);
    const options = {
      importId: 'i1', fileName: 'plots.geojson', sha256: 'ab', sourceCrs: original.crs, mapping: { attribute: 'sp', values: { PICE: 'PICE' } },
      leaveUnmappedUntagged: false, passId: 'pass-1', interpreter: 'ak', time: 't', confidence: 'sure' as const,
      display: { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' },
    };
    expect(() => buildImport(file, options)).toThrow('plots.geojson: 1 value(s) of "sp" match no roster entry: "Zirbe"; map them or choose to leave those patches untagged');
    const event = buildImport(file, { ...options, leaveUnmappedUntagged: true });
    expect(event.patches).toHaveLength(2);
    expect(event.tags.map((t) => [t.patchId, t.species])).toEqual([['i1-0', 'PICE']]);
    expect(event.patches[1].source).toEqual({ kind: 'import', importId: 'i1', featureIndex: 1, attributes: { sp: 'Zirbe' } });
    expect(event.record).toMatchObject({ sourceCrs: 'EPSG:4326', counts: { patches: 2, references: 0, skipped: 0 } });
  });
});

describe('roster files', () => {
  const roster: RosterEntry[] = [
    { code: 'PICE', scientificName: 'Picea abies', commonName: 'Norway spruce', group: 'conifer', colour: '#009E73', key: '1' },
    { code: 'ALVI', scientificName: 'Alnus viridis', commonName: 'Green alder, "dwarf"', group: 'broadleaf shrub', colour: '#E69F00', key: '2' },
  ];

  it('round-trips through CSV and JSON', () => {
    const csv = writeRosterCsv(roster);
    expect(csv.split('\r\n')[0]).toBe('code,scientific_name,common_name,group,colour,key');
    expect(csv).toContain('"Green alder, ""dwarf"""'); // RFC 4180 §2.7: quotes doubled inside quotes
    expect(readRosterCsv('roster.csv', csv)).toEqual(roster);
    expect(readRosterJson('roster.json', writeRosterJson(roster))).toEqual(roster);
  });

  it('names duplicate codes and keys by line', () => {
    const csv = 'code,scientific_name,key\nPICE,Picea abies,1\nLADE,Larix decidua,1\nPICE,Picea again,3\n';
    expect(messageOf(() => readRosterCsv('roster.csv', csv))).toBe(
      "roster.csv: 2 problems:\n- line 3: duplicate key '1' (also on row 1)\n- line 4: duplicate code 'PICE' (also on row 1)",
    );
    expect(messageOf(() => readRosterJson('roster.json', JSON.stringify([{ code: 'A', key: 'x' }, { code: 'A', key: 'y' }])))).toBe(
      "roster.json: entry 2: duplicate code 'A' (also on row 1)",
    );
  });

  it('says what columns it wanted', () => {
    expect(messageOf(() => readRosterCsv('roster.csv', 'name,colour\nx,#fff\n'))).toBe(
      'roster.csv: the header row has no "code" column (found: name, colour); expected code, scientific_name, common_name, group, colour, key',
    );
  });
});
