import { spawnSync } from 'node:child_process';
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import { lonLatParts } from '../../src/core/export/geojsonWriter.ts';
import { GEOJSON_DECIMALS } from '../../src/core/export/options.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';

// Reprojection of exported outlines to WGS 84 longitude/latitude.
// Source: Snyder, J. P. (1987) Map Projections: A Working Manual, USGS Professional
// Paper 1395, the numerical example of the ellipsoidal Transverse Mercator (Clarke 1866,
// k0 0.9996, central meridian 75°W): lat 40°30'N, lon 73°30'W -> x 127,106.5 m,
// y 4,484,124.4 m. The figures are recalled from memory, not looked up (see SOURCES.md).
// Then the writer itself, on WGS 84 / UTM zone 18N (EPSG:32618), against proj4 2.22 and
// GDAL 3.6.2's gdaltransform (PROJ) where installed.

const snyder = { lat: 40.5, lon: -73.5, x: 127106.5, y: 4484124.4 };
const clarkeTm = '+proj=tmerc +lat_0=0 +lon_0=-75 +k=0.9996 +x_0=0 +y_0=0 +ellps=clrk66 +units=m +no_defs';
const clarkeLonLat = '+proj=longlat +ellps=clrk66 +no_defs';
const utm18 = '+proj=utm +zone=18 +datum=WGS84 +units=m +no_defs';

const round = (v: number) => Math.round(v * 10 ** GEOJSON_DECIMALS) / 10 ** GEOJSON_DECIMALS;

describe('Snyder (1987), Transverse Mercator on the Clarke 1866 ellipsoid', () => {
  it('proj4 gives the printed x and y to the printed decimetre', () => {
    const [x, y] = proj4(clarkeLonLat, clarkeTm).forward([snyder.lon, snyder.lat]);
    expect(Math.abs(x - snyder.x)).toBeLessThan(0.05);
    expect(Math.abs(y - snyder.y)).toBeLessThan(0.05);
  });

  it('and back: the printed x and y give the example\'s latitude and longitude', () => {
    const [lon, lat] = proj4(clarkeLonLat, clarkeTm).inverse([snyder.x, snyder.y]);
    // 0.05 m is under 1e-6 degree.
    expect(lon).toBeCloseTo(snyder.lon, 6);
    expect(lat).toBeCloseTo(snyder.lat, 6);
  });
});

describe('the GeoJSON writer\'s reprojection (EPSG:32618 to EPSG:4326)', () => {
  // The example's geographic point, and a small ring around it, placed on WGS 84 / UTM 18N.
  const [e, n] = proj4('EPSG:4326', utm18).forward([snyder.lon, snyder.lat]);
  const ring: [number, number][] = [[e, n], [e + 10, n], [e + 10, n + 10], [e, n + 10], [e, n]];
  const parts: MultiPolygonRings = [[ring]];
  const [out] = lonLatParts(parts, 32618)[0];

  it('returns the example\'s point to the stated decimals', () => {
    expect(out[0]).toEqual([round(snyder.lon), round(snyder.lat)]);
  });

  it('matches proj4\'s own inverse, rounded to the stated decimals, at every vertex', () => {
    out.forEach((p, i) => {
      const [lon, lat] = proj4(utm18, 'EPSG:4326').forward(ring[i]);
      expect(p).toEqual([round(lon), round(lat)]);
    });
  });

  it.skipIf(spawnSync('gdaltransform', ['--version']).status !== 0)('matches GDAL\'s gdaltransform (PROJ) within the rounding', () => {
    const input = ring.map(([x, y]) => `${x} ${y}`).join('\n');
    const r = spawnSync('gdaltransform', ['-s_srs', 'EPSG:32618', '-t_srs', 'OGC:CRS84', '-output_xy'], { input, encoding: 'utf8' });
    expect(r.status).toBe(0);
    const gdal = r.stdout.trim().split('\n').map((line) => line.trim().split(/\s+/).map(Number));
    expect(gdal).toHaveLength(5);
    gdal.forEach(([lon, lat], i) => {
      expect(Math.abs(lon - out[i][0])).toBeLessThanOrEqual(0.5e-8 + 1e-10);
      expect(Math.abs(lat - out[i][1])).toBeLessThanOrEqual(0.5e-8 + 1e-10);
    });
  });

  it('a vertex 1 mm away moves the written position: the precision holds a millimetre', () => {
    const [moved] = lonLatParts([[ring.map(([x, y]) => [x + 0.001, y] as [number, number])]], 32618)[0];
    expect(moved[0][0]).not.toBe(out[0][0]);
  });
});
