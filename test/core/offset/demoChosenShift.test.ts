import { describe, expect, it } from 'vitest';
import { synthesizeDemo } from '../../../src/core/demo/synthesize.ts';

// The demo's chosen field shift (DemoOptions.fieldShift), which the offset checks use
// for zero and near-radius shifts: only the shift changes, nothing else of the scene.

describe('demo fieldShift', () => {
  it('moves every field vertex by the difference of shifts and leaves the rest as drawn', () => {
    const drawn = synthesizeDemo({ seed: 3, size: 512, dates: [] });
    const chosen = synthesizeDemo({ seed: 3, size: 512, dates: [], fieldShift: [0.5, -2] });
    expect(chosen.survey.shift).toEqual([0.5, -2]);
    expect(chosen.truth.offset).toEqual({ dx: -0.5, dy: 2, units: 'm' });
    expect(chosen.crowns).toEqual(drawn.crowns);
    expect(chosen.survey.polygons.map((p) => p.crownId)).toEqual(drawn.survey.polygons.map((p) => p.crownId));
    const [ddx, ddy] = [0.5 - drawn.survey.shift[0], -2 - drawn.survey.shift[1]];
    chosen.survey.polygons.forEach((p, i) => {
      p.ring.forEach(([x, y], k) => {
        expect(x - drawn.survey.polygons[i].ring[k][0]).toBeCloseTo(ddx, 9);
        expect(y - drawn.survey.polygons[i].ring[k][1]).toBeCloseTo(ddy, 9);
      });
    });
  });

  it('changes nothing when not given', () => {
    const a = synthesizeDemo({ seed: 4, size: 256, dates: [] });
    const b = synthesizeDemo({ seed: 4, size: 256, dates: [], fieldShift: undefined });
    expect(b.truth).toEqual(a.truth);
  });
});
