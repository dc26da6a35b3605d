import { beforeAll, describe, expect, it } from 'vitest';
import Coordinate from 'jsts/org/locationtech/jts/geom/Coordinate.js';
import GeometryFactory from 'jsts/org/locationtech/jts/geom/GeometryFactory.js';
import 'jsts/org/locationtech/jts/monkey.js'; // adds contains() and intersects() to geometries
import { panWeights } from '../../../src/core/demo/bands.ts';
import { speciesSpectra } from '../../../src/core/demo/spectra.ts';
import { speciesByCode } from '../../../src/core/demo/roster.ts';
import type { Truth, TruthCrown } from '../../../src/core/demo/truth.ts';
import { sceneUnderTest, type ReadBack, type SceneUnderTest } from './sceneUnderTest.ts';

// The pixels of the written demo files against the truth file. Pure pixels are found
// here independently of the generator, with JSTS (2.12.1, npm) polygon predicates on the
// truth outlines: a multispectral pixel whose square lies wholly inside one crown's
// outline and meets no other crown's outline.

// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Geometry = any;
const factory = new GeometryFactory();
const polygon = (ring: number[][]): Geometry => factory.createPolygon(factory.createLinearRing(ring.map(([x, y]) => new Coordinate(x, y))), []);

/** NDVI, (NIR - red) / (NIR + red): Rouse et al. (1974), "Monitoring vegetation systems in the Great Plains with ERTS". */
const ndvi = (red: number, nir: number) => (nir - red) / (nir + red);
const RED = 4;
const NIR1 = 6;

interface PurePixel {
  crown: TruthCrown;
  index: number;
}

let under: SceneUnderTest;
let truth: Truth;
let early: ReadBack;
let late: ReadBack;
let pure: PurePixel[];

function findPurePixels(t: Truth): PurePixel[] {
  const { msSize, origin, msPixel } = t.grid;
  const shapes = t.crowns.map((c) => polygon(c.outline));
  const found: PurePixel[] = [];
  t.crowns.forEach((crown, k) => {
    const shape = shapes[k];
    const env = shape.getEnvelopeInternal();
    const neighbours = t.crowns
      .map((_, j) => j)
      .filter((j) => j !== k && shapes[j].getEnvelopeInternal().intersects(env));
    const col0 = Math.floor((env.getMinX() - origin[0]) / msPixel);
    const col1 = Math.floor((env.getMaxX() - origin[0]) / msPixel);
    const row0 = Math.floor((origin[1] - env.getMaxY()) / msPixel);
    const row1 = Math.floor((origin[1] - env.getMinY()) / msPixel);
    for (let row = Math.max(0, row0); row <= Math.min(msSize - 1, row1); row++) {
      for (let col = Math.max(0, col0); col <= Math.min(msSize - 1, col1); col++) {
        const x0 = origin[0] + col * msPixel;
        const y1 = origin[1] - row * msPixel;
        const square = polygon([[x0, y1 - msPixel], [x0 + msPixel, y1 - msPixel], [x0 + msPixel, y1], [x0, y1], [x0, y1 - msPixel]]);
        if (!shape.contains(square)) continue;
        if (neighbours.some((j) => shapes[j].intersects(square))) continue;
        found.push({ crown, index: row * msSize + col });
      }
    }
  });
  return found;
}

/** Whether one factor F in [lo, hi] brings every band within `tolerance` of F * spectrum. */
function sharedFactorFits(values: number[], spectrum: number[], lo: number, hi: number, tolerance: number): boolean {
  let min = lo;
  let max = hi;
  values.forEach((v, b) => {
    min = Math.max(min, (v - tolerance) / spectrum[b]);
    max = Math.min(max, (v + tolerance) / spectrum[b]);
  });
  return min <= max;
}

const bandValues = (image: ReadBack, index: number) => image.bands.map((band) => band[index]);

beforeAll(async () => {
  under = await sceneUnderTest(5, 1024);
  truth = under.json<Truth>('truth.json');
  early = await under.read('ms.tif');
  late = await under.read('ms-late.tif');
  pure = findPurePixels(truth);
}, 120_000);

describe('demo pixels against the truth', () => {
  it('finds enough pure pixels to check, and no more than the truth counts', () => {
    expect(pure.length).toBeGreaterThan(200);
    expect(pure.length).toBeLessThanOrEqual(truth.purity.purePixels);
    const byCrown = new Map<string, number>();
    for (const p of pure) byCrown.set(p.crown.id, (byCrown.get(p.crown.id) ?? 0) + 1);
    for (const [id, count] of byCrown) {
      expect(count).toBeLessThanOrEqual(truth.crowns.find((c) => c.id === id)!.purePixels);
    }
  });

  it('gives every pure pixel its crown\'s spectrum under one illumination factor, on both dates', () => {
    // The stated guarantee: |DN_b - F * spectrum_b| <= noise + 0.5, one F for all bands.
    // The truth rounds spectra to 0.01 DN, worth at most 0.0125 DN more after scaling.
    const tolerance = truth.variation.msNoiseDn + 0.5 + 0.0125;
    const [lo, hi] = truth.variation.illumination;
    const misfits = pure.filter(({ crown, index }) =>
      !sharedFactorFits(bandValues(early, index), crown.spectrum.early, lo, hi, tolerance)
      || !sharedFactorFits(bandValues(late, index), crown.spectrum.late, lo, hi, tolerance));
    expect(misfits.map((p) => `${p.crown.id}@${p.index}`)).toEqual([]);
  });

  it('gives healthy crowns\' pure pixels their species\' spectrum within the stated variation', () => {
    // From the species spectrum alone: DN_b = G * gain * species_b * (1 + j_b) + noise, with
    // G = illumination x crown brightness and |j_b| <= the band jitter, so one G must
    // fit every band. Conifers and shrubs are told apart; conifers among themselves not.
    const v = truth.variation;
    const gMin = v.illumination[0] * v.crownBrightness[0];
    const gMax = v.illumination[1] * v.crownBrightness[1];
    const noise = v.msNoiseDn + 0.5;
    const gain = under.json<{ radiometry: { dn_per_reflectance: number } }>('manifest.json').radiometry.dn_per_reflectance;
    const fits = (values: number[], code: string) => {
      const s = speciesSpectra[code].early.map((r) => gain * r);
      let lo = gMin;
      let hi = gMax;
      values.forEach((dn, b) => {
        lo = Math.max(lo, (dn - noise) / ((1 + v.bandJitter) * s[b]));
        hi = Math.min(hi, (dn + noise) / ((1 - v.bandJitter) * s[b]));
      });
      return lo <= hi;
    };
    const healthy = pure.filter((p) => p.crown.condition === 'healthy');
    const own = healthy.filter(({ crown, index }) => !fits(bandValues(early, index), crown.species));
    expect(own.map((p) => p.crown.id)).toEqual([]);
    const shrubCodes = Object.keys(speciesSpectra).filter((c) => speciesByCode(c).group === 'broadleaf shrub');
    const coniferPixels = healthy.filter((p) => speciesByCode(p.crown.species).group === 'conifer');
    const passAsShrub = coniferPixels.filter(({ index }) => shrubCodes.some((c) => fits(bandValues(early, index), c)));
    expect(coniferPixels.length).toBeGreaterThan(50);
    expect(passAsShrub.length / coniferPixels.length).toBeLessThan(0.02);
  });

  it('does not fit a pure pixel to a crown of another group', () => {
    // The check above must be able to fail: a conifer's pixel against a broadleaf shrub's
    // spectrum, or the reverse, fails the same test in nearly every case.
    const tolerance = truth.variation.msNoiseDn + 0.5;
    const [lo, hi] = truth.variation.illumination;
    const conifer = truth.crowns.find((c) => speciesByCode(c.species).group === 'conifer' && c.condition === 'healthy')!;
    const shrub = truth.crowns.find((c) => speciesByCode(c.species).group === 'broadleaf shrub' && c.condition === 'healthy')!;
    const healthy = pure.filter((p) => p.crown.condition === 'healthy');
    let wrongFits = 0;
    for (const { crown, index } of healthy) {
      const other = speciesByCode(crown.species).group === 'conifer' ? shrub : conifer;
      if (sharedFactorFits(bandValues(early, index), other.spectrum.early, lo, hi, tolerance)) wrongFits++;
    }
    expect(wrongFits / healthy.length).toBeLessThan(0.02);
  });

  it('matches healthy pure pixels to their species group by spectral angle to the species spectra', () => {
    const angle = (a: number[], b: readonly number[]) => {
      let dot = 0, na = 0, nb = 0;
      a.forEach((v, i) => { dot += v * b[i]; na += v * v; nb += b[i] * b[i]; });
      return Math.acos(Math.min(1, dot / Math.sqrt(na * nb)));
    };
    const healthy = pure.filter((p) => p.crown.condition === 'healthy');
    let right = 0;
    for (const { crown, index } of healthy) {
      const values = bandValues(early, index);
      const codes = Object.keys(speciesSpectra);
      const nearest = codes.reduce((best, code) => (angle(values, speciesSpectra[code].early) < angle(values, speciesSpectra[best].early) ? code : best));
      if (speciesByCode(nearest).group === speciesByCode(crown.species).group) right++;
    }
    expect(healthy.length).toBeGreaterThan(100);
    // Conifers and shrubs share the foliage curve shape, so angle alone errs now and then;
    // the exact fit test above is the strict one.
    expect(right / healthy.length).toBeGreaterThan(0.85);
  });

  it('turns the broadleaf shrubs by the late date and leaves the conifers nearly unchanged (NDVI)', () => {
    const change = (group: string) => {
      const drops = pure
        .filter((p) => speciesByCode(p.crown.species).group === group && p.crown.condition === 'healthy')
        .map(({ index }) => ndvi(early.bands[RED][index], early.bands[NIR1][index]) - ndvi(late.bands[RED][index], late.bands[NIR1][index]));
      expect(drops.length).toBeGreaterThan(20);
      return drops.reduce((s, d) => s + d, 0) / drops.length;
    };
    expect(change('broadleaf shrub')).toBeGreaterThan(0.25);
    expect(Math.abs(change('conifer'))).toBeLessThan(0.03);
  });

  it('keeps the panchromatic image consistent with the weighted multispectral bands', async () => {
    // Each multispectral pixel is the mean of its 4 x 4 sub-pixels and pan is the weighted
    // band sum per sub-pixel, so mean(pan) - sum(w_b * ms_b) is noise and rounding only:
    // pan noise < 8, weighted MS noise < 6 (weights sum to 1), rounding <= 1.
    const pan = await under.read('pan.tif');
    const n = pan.width;
    const m = early.width;
    const bound = truth.variation.panNoiseDn + truth.variation.msNoiseDn + 1;
    let worst = 0;
    let checked = 0;
    for (let my = 0; my < m; my++) {
      for (let mx = 0; mx < m; mx++) {
        let sum = 0;
        let saturated = false;
        for (let sy = 0; sy < 4; sy++) {
          for (let sx = 0; sx < 4; sx++) {
            const v = pan.bands[0][(my * 4 + sy) * n + mx * 4 + sx];
            if (v >= 2047) saturated = true;
            sum += v;
          }
        }
        const ms = bandValues(early, my * m + mx);
        if (saturated || ms.some((v) => v >= 2047)) continue;
        const weighted = ms.reduce((s, v, b) => s + panWeights[b] * v, 0);
        worst = Math.max(worst, Math.abs(sum / 16 - weighted));
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(m * m * 0.8);
    expect(worst).toBeLessThanOrEqual(bound);
  });

  it('keeps every value within 11 bits', async () => {
    for (const name of ['pan.tif', 'ms.tif', 'pan-late.tif', 'ms-late.tif']) {
      const image = await under.read(name);
      for (const band of image.bands) {
        let max = 0;
        for (const v of band) if (v > max) max = v;
        expect(max, name).toBeLessThanOrEqual(2047);
        expect(max, name).toBeGreaterThan(500);
      }
    }
  });

  it('casts crown shadows on the side away from the sun', async () => {
    const pan = await under.read('pan.tif');
    const { origin, panPixel, panSize } = truth.grid;
    const azimuth = (148 * Math.PI) / 180; // the early date's sun, from manifest.json
    const sun = [Math.sin(azimuth), Math.cos(azimuth)];
    const at = (x: number, y: number) => {
      const px = Math.floor((x - origin[0]) / panPixel);
      const py = Math.floor((origin[1] - y) / panPixel);
      return px >= 0 && py >= 0 && px < panSize && py < panSize ? pan.bands[0][py * panSize + px] : NaN;
    };
    let darker = 0;
    let compared = 0;
    for (const crown of truth.crowns) {
      if (speciesByCode(crown.species).group !== 'conifer' || crown.height < 4) continue;
      const reach = Math.max(...crown.outline.map(([x, y]) => Math.hypot(x - crown.centre[0], y - crown.centre[1]))) + 0.4;
      const isolated = truth.crowns.every((o) => o === crown || Math.hypot(o.centre[0] - crown.centre[0], o.centre[1] - crown.centre[1]) > reach + o.radius * 1.2 + crown.height);
      if (!isolated) continue;
      const away = at(crown.centre[0] - sun[0] * reach, crown.centre[1] - sun[1] * reach);
      const toward = at(crown.centre[0] + sun[0] * reach, crown.centre[1] + sun[1] * reach);
      if (Number.isNaN(away) || Number.isNaN(toward)) continue;
      compared++;
      if (away < toward * 0.7) darker++;
    }
    expect(compared).toBeGreaterThan(10);
    expect(darker / compared).toBeGreaterThan(0.9);
  });
});
