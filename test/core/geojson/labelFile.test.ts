import { describe, expect, it } from 'vitest';
import { LabelFileError, readLabelFile } from '../../../src/core/geojson/labelFile.ts';

const square = (x: number, y: number, s: number) => [[[x, y], [x + s, y], [x + s, y + s], [x, y + s], [x, y]]];
const collection = (features: unknown[], extra: Record<string, unknown> = {}) =>
  JSON.stringify({ type: 'FeatureCollection', ...extra, features });
const feature = (id: unknown, species: unknown, coordinates: unknown, properties: Record<string, unknown> = {}) => ({
  type: 'Feature', id, properties: { species, ...properties }, geometry: { type: 'Polygon', coordinates },
});

function problem(text: string, options = {}): string {
  try {
    readLabelFile(text, 'site.geojson', options);
  } catch (error) {
    expect(error).toBeInstanceOf(LabelFileError);
    return (error as Error).message;
  }
  throw new Error('expected the file to be refused');
}

describe('readLabelFile', () => {
  it('measures RFC 7946 lon/lat in the UTM zone of the centre', () => {
    const file = readLabelFile(collection([feature('a', 'pice', [[[10.5, 46.5], [10.5001, 46.5], [10.5001, 46.5001], [10.5, 46.5]]])]), 'x.geojson');
    expect(file.sourceEpsg).toBe(4326);
    expect(file.epsg).toBe(32632);
    // Reference: GDAL 3.6.2 gdaltransform -s_srs EPSG:4326 -t_srs EPSG:32632 of (10.5, 46.5)
    // gives 615097.162593407 5150696.34623148 (computed once on this machine).
    const [x, y] = file.patches[0].rings[0][0][0];
    expect(x).toBeCloseTo(615097.162593407, 3);
    expect(y).toBeCloseTo(5150696.34623148, 3);
  });

  it('uses the southern UTM zone south of the equator', () => {
    const file = readLabelFile(collection([feature(1, 'notho', [[[-70.25, -33.1], [-70.2499, -33.1], [-70.2499, -33.0999], [-70.25, -33.1]]])]), 'x.geojson');
    expect(file.epsg).toBe(32719);
    // Reference: GDAL 3.6.2 gdaltransform to EPSG:32719 of (-70.25, -33.1): 383358.34786972 6336932.05069384
    expect(file.patches[0].rings[0][0][0][0]).toBeCloseTo(383358.34786972, 3);
    expect(file.patches[0].rings[0][0][0][1]).toBeCloseTo(6336932.05069384, 3);
  });

  it('keeps a projected CRS named by a legacy crs member', () => {
    const file = readLabelFile(collection([feature('p', 'pinu', square(600000, 5100000, 4))], {
      crs: { type: 'name', properties: { name: 'urn:ogc:def:crs:EPSG::32632' } },
    }), 'x.geojson');
    expect(file.epsg).toBe(32632);
    expect(file.patches[0].rings[0][0][1]).toEqual([600004, 5100000]);
  });

  it('reprojects lon/lat into a given target CRS', () => {
    const file = readLabelFile(collection([feature('a', 'pice', [[[10.5, 46.5], [10.6, 46.5], [10.6, 46.6], [10.5, 46.5]]])]), 'x.geojson', { targetEpsg: 32632 });
    expect(file.epsg).toBe(32632);
  });

  it('reads tags as codes or objects, MultiPolygons and properties.id', () => {
    const text = collection([
      { type: 'Feature', properties: { id: 7, species: 'betu', tags: ['betu', { species: 'alnu', interpreter: 'B', confidence: 'unsure' }] },
        geometry: { type: 'MultiPolygon', coordinates: [square(0, 0, 1), square(5, 5, 1)] } },
    ], { crs: { type: 'name', properties: { name: 'EPSG:32632' } } });
    const [patch] = readLabelFile(text, 'x.geojson').patches;
    expect(patch.id).toBe(7);
    expect(patch.rings).toHaveLength(2);
    expect(patch.tags).toEqual([{ species: 'betu' }, { species: 'alnu', interpreter: 'B', confidence: 'unsure' }]);
  });

  it('keeps broken geometry for the checks: null positions become NaN, open rings stay open', () => {
    const text = collection([feature('b', 'pice', [[[0, 0], [1, 0], [null, 1]]])], { crs: { type: 'name', properties: { name: 'EPSG:32632' } } });
    const ring = readLabelFile(text, 'x.geojson').patches[0].rings[0][0];
    expect(ring).toHaveLength(3);
    expect(Number.isNaN(ring[2][0])).toBe(true);
  });

  it('names the file and the feature in every refusal', () => {
    expect(problem('{oops')).toMatch(/^site\.geojson: not valid JSON/);
    expect(problem('[]')).toBe('site.geojson: expected a GeoJSON FeatureCollection, found an array');
    expect(problem(JSON.stringify({ type: 'FeatureCollection' }))).toMatch(/no "features" array/);
    expect(problem(collection([feature(undefined, 'pice', square(0, 0, 1))]))).toMatch(/feature 0: has no "id"/);
    expect(problem(collection([feature('a', '', square(0, 0, 1))]))).toMatch(/feature 0 \(id "a"\): has no "species"/);
    expect(problem(collection([feature('a', 'x', square(0, 0, 1)), feature('a', 'y', square(0, 0, 1))])))
      .toMatch(/feature 1 \(id "a"\): repeats the id of feature 0/);
    expect(problem(collection([{ type: 'Feature', id: 'l', properties: { species: 'x' }, geometry: { type: 'LineString', coordinates: [] } }])))
      .toMatch(/geometry is a LineString, expected Polygon or MultiPolygon/);
    expect(problem(collection([feature('a', 'x', [[[0, 0], 5]])]))).toMatch(/coordinates\[0\]\[1\] is not a position/);
    expect(problem(collection([feature('a', 'x', square(600000, 5100000, 1))]))).toMatch(/is not lon\/lat/);
    expect(problem(collection([feature('a', 'x', square(0, 0, 1), { tags: 'pice' })]))).toMatch(/"tags" must be an array/);
    expect(problem(collection([], { crs: { type: 'name', properties: { name: 'local grid' } } }))).toMatch(/unsupported "crs" name/);
    expect(problem(collection([feature('a', 'x', square(0, 0, 1))], { crs: { type: 'name', properties: { name: 'EPSG:99999' } } }), { targetEpsg: 32632 }))
      .toMatch(/unsupported CRS EPSG:99999/);
  });

  it('accepts an assumed EPSG for projected coordinates without a crs member', () => {
    const file = readLabelFile(collection([feature('a', 'x', square(600000, 5100000, 2))]), 'x.geojson', { assumeEpsg: 32632 });
    expect(file.epsg).toBe(32632);
    expect(file.patches[0].rings[0][0][0]).toEqual([600000, 5100000]);
  });
});
