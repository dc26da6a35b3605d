// Reference checks of the CRS handling (src/core/crs.ts, proj4 2.22).
// Source: IOGP, EPSG Guidance Note 7-2 (Coordinate Conversions and Transformations
// including Formulas), the Transverse Mercator worked example for OSGB 1936 / British
// National Grid. Its values here are recalled from memory, not looked up: see SOURCES.md.
import proj4 from 'proj4';
import { describe, expect, it } from 'vitest';
import { crsName, ensureEpsg, isGeographicEpsg, transformer, utmEpsgForLonLat } from '../../src/core/crs.ts';

// The projection's defining parameters as the example gives them (Airy 1830 ellipsoid).
const bng = '+proj=tmerc +lat_0=49 +lon_0=-2 +k=0.9996012717 +x_0=400000 +y_0=-100000 +ellps=airy +units=m +no_defs';
const airyLonLat = '+proj=longlat +ellps=airy +no_defs';

// The worked example: lat 50°30'00"N, lon 00°30'00"E -> E 577274.99 m, N 69740.50 m
// (printed to the centimetre; from memory).
const example = { lon: 0.5, lat: 50.5, e: 577274.99, n: 69740.5 };
// Computed exactly the projection gives E 577274.984, N 69740.492: within a centimetre of the
// printed figures, which is the tolerance held here.
const tolerance = 0.01;

describe('EPSG Guidance Note 7-2, Transverse Mercator example (British National Grid)', () => {
  it('proj4 with the example\'s parameters reproduces the printed easting and northing', () => {
    const [e, n] = proj4(airyLonLat, bng).forward([example.lon, example.lat]);
    expect(Math.abs(e - example.e)).toBeLessThan(tolerance);
    expect(Math.abs(n - example.n)).toBeLessThan(tolerance);
  });

  it('maps the natural origin (49°N, 2°W) to the false easting and northing exactly', () => {
    const [e, n] = proj4(airyLonLat, bng).forward([-2, 49]);
    expect(e).toBeCloseTo(400000, 6);
    expect(n).toBeCloseTo(-100000, 6);
  });

  it('inverts the printed grid point to the example\'s latitude and longitude', () => {
    const [lon, lat] = proj4(airyLonLat, bng).inverse([example.e, example.n]);
    // 1 cm on the ground is about 1e-7 degrees.
    expect(lon).toBeCloseTo(example.lon, 6);
    expect(lat).toBeCloseTo(example.lat, 6);
  });

  it('crs.ts: EPSG:4277 (OSGB36) to EPSG:27700 gives the same point (same datum, no shift)', () => {
    const [e, n] = transformer(4277, 27700)([example.lon, example.lat]);
    expect(Math.abs(e - example.e)).toBeLessThan(tolerance);
    expect(Math.abs(n - example.n)).toBeLessThan(tolerance);
    expect(crsName(27700)).toBe('OSGB36 / British National Grid');
  });
});

describe('UTM through crs.ts', () => {
  it('puts a point on the central meridian at the false easting, and the equator at northing 0', () => {
    // Definition of UTM (common practice): k0 0.9996, FE 500000 m, FN 0 north of the equator.
    expect(transformer(4326, 32632)([9, 0])[0]).toBeCloseTo(500000, 6);
    expect(transformer(4326, 32632)([9, 0])[1]).toBeCloseTo(0, 6);
    // 45°N on the central meridian: 0.9996 x the WGS 84 meridian arc to 45° (4984944.378 m, from memory).
    expect(transformer(4326, 32632)([9, 45])[1]).toBeCloseTo(0.9996 * 4984944.378, 2);
  });

  it('round-trips points across a zone, north and south, to a millimetre', () => {
    for (const [lon, lat] of [[6.2, 46.5], [11.9, 47.1], [9, 60], [-70.3, -33.4], [147.1, -42.9]]) {
      const epsg = utmEpsgForLonLat(lon, lat);
      const forward = transformer(4326, epsg);
      const back = transformer(epsg, 4326);
      const [e, n] = forward([lon, lat]);
      const [lon2, lat2] = back([e, n]);
      expect(Math.abs(lon2 - lon)).toBeLessThan(1e-8);
      expect(Math.abs(lat2 - lat)).toBeLessThan(1e-8);
      const [e2, n2] = forward([lon2, lat2]);
      expect(Math.abs(e2 - e)).toBeLessThan(0.001);
      expect(Math.abs(n2 - n)).toBeLessThan(0.001);
    }
  });

  it('names and classifies the codes it knows', () => {
    expect(crsName(32633)).toBe('WGS 84 / UTM zone 33N');
    expect(crsName(32759)).toBe('WGS 84 / UTM zone 59S');
    expect(crsName(25832)).toBe('ETRS89 / UTM zone 32N');
    expect(crsName(2056)).toBeNull();
    expect(isGeographicEpsg(4326)).toBe(true);
    expect(isGeographicEpsg(4258)).toBe(true);
    expect(isGeographicEpsg(32633)).toBe(false);
    expect(isGeographicEpsg(3857)).toBe(false);
    expect(ensureEpsg(2056)).toBeNull();
    // ETRS89 and WGS 84 UTM coincide at this scale (the towgs84 of ETRS89 is zero).
    const a = transformer(4326, 25832)([9.5, 47.5]);
    const b = transformer(4326, 32632)([9.5, 47.5]);
    expect(Math.hypot(a[0] - b[0], a[1] - b[1])).toBeLessThan(0.001);
  });
});
