import { describe, expect, it } from 'vitest';
import proj4 from 'proj4';
import { ensureEpsg } from '../../src/core/crs.ts';
import { crsName, crsUnits, isGeographicEpsg } from '../../src/core/crsNames.ts';

// The proj4-free answers the TIFF inspector uses agree with proj4's own definitions
// (the reference library the map projects with) for every code Fellfield can place.
const placeable = [
  4326, 4258, 4269, 4277, 3857, 27700,
  ...Array.from({ length: 60 }, (_, i) => 32601 + i),
  ...Array.from({ length: 60 }, (_, i) => 32701 + i),
  ...Array.from({ length: 11 }, (_, i) => 25828 + i),
];

describe('CRS kinds without proj4', () => {
  it.each(placeable)('EPSG:%i is geographic exactly when proj4 defines it as longlat', (epsg) => {
    const name = ensureEpsg(epsg);
    expect(name).not.toBeNull();
    const def = proj4.defs(name!) as { projName?: string };
    expect(isGeographicEpsg(epsg)).toBe(def.projName === 'longlat');
    expect(crsUnits(epsg)).toBe(def.projName === 'longlat' ? 'degree' : 'metre');
    expect(crsName(epsg)).not.toBeNull();
  });

  it('falls back on the EPSG numbering for codes it cannot place (common practice)', () => {
    expect(isGeographicEpsg(4230)).toBe(true); // ED50, geographic 2D
    expect(isGeographicEpsg(2056)).toBe(false); // a projected code
    expect(crsName(2056)).toBeNull();
    expect(crsUnits(null)).toBe('pixel');
  });
});
