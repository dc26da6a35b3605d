import { describe, expect, it } from 'vitest';
import { defaultSettings, estimateShift } from '../../../src/core/offset/estimateShift.ts';
import { fitPeak } from '../../../src/core/offset/peakFit.ts';
import { shiftPatches, shiftRecord } from '../../../src/core/offset/shiftPatches.ts';
import { circle, fieldPolygons, syntheticScene } from './synthetic.ts';

// The estimator on synthetic scenes whose shift we set: recovered within a quarter of
// a 0.3 m panchromatic pixel, an uncertainty that covers it, misplaced polygons
// flagged, and "no reliable shift" when the image carries nothing.

const PAN = 0.3;
const settings = (overrides = {}) => defaultSettings(PAN, 1.2, { replicates: 100, ...overrides });

describe('estimateShift', () => {
  for (const shift of [[1.3, -0.7], [0, 0], [-2.2, 1.6]] as [number, number][]) {
    it(`recovers a shift of (${shift.join(', ')}) m with an uncertainty that covers it`, () => {
      const scene = syntheticScene({ seed: 11 });
      const estimate = estimateShift(fieldPolygons(scene, shift, 5), scene.grid, settings());
      expect(estimate.reliable, estimate.reasons.join('; ')).toBe(true);
      const error = Math.hypot(estimate.dx! - shift[0], estimate.dy! - shift[1]);
      expect(error).toBeLessThan(PAN / 4);
      expect(error).toBeLessThanOrEqual(estimate.uncertainty!);
      expect(estimate.uncertainty!).toBeLessThan(0.2);
      expect(estimate.outliers).toEqual([]);
    });
  }

  it('flags misplaced polygons and keeps the estimate', () => {
    const scene = syntheticScene({ seed: 12 });
    const shift: [number, number] = [0.9, 1.1];
    const patches = fieldPolygons(scene, shift, 6);
    const misplaced = new Set<string>();
    patches.forEach((p, i) => {
      if (i % 6 !== 0) return;
      // Moved 4-5 m onto bare ground (crowns stand at least 4 m apart edge to edge).
      const angle = i;
      p.rings = shiftPatches([p.rings], { dx: 4.5 * Math.cos(angle), dy: 4.5 * Math.sin(angle) })[0];
      misplaced.add(String(p.id));
    });
    const estimate = estimateShift(patches, scene.grid, settings());
    expect(estimate.reliable, estimate.reasons.join('; ')).toBe(true);
    expect(Math.hypot(estimate.dx! - shift[0], estimate.dy! - shift[1])).toBeLessThan(PAN / 4);
    expect(new Set(estimate.outliers.map(String))).toEqual(misplaced);
  });

  it('says there is no reliable shift on a flat image, and on noise alone', () => {
    const flat = syntheticScene({ seed: 13, contrast: 0, noise: 0 });
    const patches = fieldPolygons(syntheticScene({ seed: 13 }), [0.5, 0.5], 7);
    const none = estimateShift(patches, flat.grid, settings());
    expect(none.reliable).toBe(false);
    expect(none.dx).toBeNull();
    expect(none.uncertainty).toBeNull();
    expect(none.reasons.join(' ')).toMatch(/flat/);
    expect(none.outliers).toEqual([]);

    const noisy = syntheticScene({ seed: 14, contrast: 0, noise: 0.05 });
    const noise = estimateShift(patches, noisy.grid, settings());
    expect(noise.reliable).toBe(false);
    expect(noise.dx).toBeNull();
  });

  it('says the shift is not reliable when the best fit is on the edge of the radius', () => {
    const scene = syntheticScene({ seed: 15 });
    const estimate = estimateShift(fieldPolygons(scene, [2.9, 1.5], 8), scene.grid, settings({ radius: 2.5 }));
    expect(estimate.reliable).toBe(false);
    expect(estimate.reasons.join(' ')).toMatch(/edge of the 2.5 m search radius/);
    expect(estimate.dx).toBeNull();
    expect(() => shiftRecord(estimate, [])).toThrow(/no reliable shift/);
  });

  it('needs two polygons at least', () => {
    const scene = syntheticScene({ seed: 16, crowns: 3 });
    expect(() => estimateShift(fieldPolygons(scene, [0, 0], 9).slice(0, 1), scene.grid, settings())).toThrow(/at least two polygons/);
  });

  it('gives the same answer for the same input (seeded bootstrap)', () => {
    const scene = syntheticScene({ seed: 17, crowns: 20 });
    const patches = fieldPolygons(scene, [0.4, -0.3], 10);
    const a = estimateShift(patches, scene.grid, settings());
    const b = estimateShift(patches, scene.grid, settings());
    expect(b).toEqual(a);
  });
});

describe('fitPeak', () => {
  it('finds the exact maximum of a quadratic surface off the node', () => {
    // f = 5 - (x - 0.3)^2 - 2 (y + 0.4)^2 + 0.5 (x - 0.3)(y + 0.4), sampled at integer nodes.
    const side = 5;
    const values = [];
    for (let row = 0; row < side; row++) {
      for (let col = 0; col < side; col++) {
        const x = col - 2 - 0.3;
        const y = row - 2 + 0.4;
        values.push(5 - x * x - 2 * y * y + 0.5 * x * y);
      }
    }
    const fit = fitPeak(values, side, 2, 2, 2);
    expect(fit.ok).toBe(true);
    expect(fit.x).toBeCloseTo(0.3, 10);
    expect(fit.y).toBeCloseTo(-0.4, 10);
  });

  it('refuses a saddle', () => {
    const values = [];
    for (let row = 0; row < 3; row++) for (let col = 0; col < 3; col++) values.push((col - 1) ** 2 - (row - 1) ** 2);
    expect(fitPeak(values, 3, 1, 1).ok).toBe(false);
  });
});

describe('shiftPatches and shiftRecord', () => {
  it('moves every vertex and leaves the input alone', () => {
    const original = circle(10, 20, 1, 4);
    const copy = JSON.parse(JSON.stringify(original));
    const [moved] = shiftPatches([original], { dx: 1.5, dy: -2 });
    expect(original).toEqual(copy);
    expect(moved[0][0][0]).toEqual([copy[0][0][0][0] + 1.5, copy[0][0][0][1] - 2]);
    expect(moved[0][0]).toHaveLength(copy[0][0].length);
  });

  it('records the shift, uncertainty, method and settings of a reliable estimate', () => {
    const scene = syntheticScene({ seed: 18, crowns: 25 });
    const estimate = estimateShift(fieldPolygons(scene, [1, 0], 11), scene.grid, settings());
    const record = shiftRecord(estimate, ['P1', 'P2']);
    expect(record.shift).toEqual({ dx: estimate.dx, dy: estimate.dy });
    expect(record.uncertaintyM).toBe(estimate.uncertainty);
    expect(record.settings.radius).toBe(3);
    expect(record.method).toMatch(/quadratic peak fit, bootstrap over polygons \(signal: ndvi\)/);
    expect(record.patchIds).toEqual(['P1', 'P2']);
  });
});
