import { describe, expect, it } from 'vitest';
import { demoRoster, speciesByCode } from '../../../src/core/demo/roster.ts';
import { speciesSpectra } from '../../../src/core/demo/spectra.ts';

// Okabe & Ito (2008), "Color Universal Design (CUD): how to make figures and
// presentations that are friendly to colorblind people": the eight colours' RGB values
// (recalled from memory): black 0,0,0; orange 230,159,0; sky blue 86,180,233; bluish
// green 0,158,115; yellow 240,228,66; blue 0,114,178; vermillion 213,94,0; reddish
// purple 204,121,167.
const okabeItoRgb = [
  [0, 0, 0], [230, 159, 0], [86, 180, 233], [0, 158, 115],
  [240, 228, 66], [0, 114, 178], [213, 94, 0], [204, 121, 167],
];

const rgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16));

describe('demo roster', () => {
  it('holds 6-8 species with unique codes, keys and colours', () => {
    expect(demoRoster.length).toBeGreaterThanOrEqual(6);
    expect(demoRoster.length).toBeLessThanOrEqual(8);
    for (const field of ['code', 'key', 'colour', 'scientificName', 'commonName'] as const) {
      expect(new Set(demoRoster.map((s) => s[field])).size, field).toBe(demoRoster.length);
    }
  });

  it('has conifers, two or three broadleaf shrubs and one other species', () => {
    const count = (group: string) => demoRoster.filter((s) => s.group === group).length;
    expect(count('conifer')).toBeGreaterThanOrEqual(2);
    expect(count('broadleaf shrub')).toBeGreaterThanOrEqual(2);
    expect(count('broadleaf shrub')).toBeLessThanOrEqual(3);
    expect(count('other')).toBe(1);
  });

  it('takes its default colours from the Okabe-Ito palette', () => {
    for (const s of demoRoster) {
      expect(okabeItoRgb, s.code).toContainEqual(rgb(s.colour));
    }
  });

  it('has a two-date spectrum for every species, and only for roster species', () => {
    expect(Object.keys(speciesSpectra).sort()).toEqual(demoRoster.map((s) => s.code).sort());
    expect(() => speciesByCode('NOPE')).toThrow(/unknown demo species code 'NOPE'/);
    expect(speciesByCode('RHPE').group).toBe('other');
  });
});
