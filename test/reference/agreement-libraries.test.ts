import { describe, expect, it } from 'vitest';
import { cohenKappa } from '../../src/core/agreement/cohenKappa.ts';
import { confusionMatrix } from '../../src/core/agreement/confusionMatrix.ts';
import { fleissKappa, ratingTable } from '../../src/core/agreement/fleissKappa.ts';
import { maxWeightMatching } from '../../src/core/agreement/hungarian.ts';
import { candidatePairs, matchByIou } from '../../src/core/agreement/iouMatch.ts';
import { sharedArea } from '../../src/core/agreement/sharedArea.ts';
import { multiPolygonArea } from '../../src/core/geometry/measure.ts';
import { intersectionArea } from '../../src/core/geometry/overlay.ts';
import type { MultiPolygonRings } from '../../src/core/geometry/types.ts';
import inputs from './fixtures/agreement/inputs.json' with { type: 'json' };
import library from './fixtures/agreement/library-values.json' with { type: 'json' };

// Values computed once by reference libraries from Debian's packages and committed as
// fixtures by fixtures/agreement/make_fixtures.py; versions are in library-values.json
// (scikit-learn 1.2.1, statsmodels 0.13.5, SciPy 1.10.1, Shapely 1.8.5, NumPy 1.24.2).

describe('Cohen kappa against scikit-learn and statsmodels', () => {
  it.each(inputs.kappa.map((c, i) => ({ ...c, expected: library.kappa[i] })))('$name', ({ first, second, expected }) => {
    const m = confusionMatrix(first, second);
    // sklearn.metrics.confusion_matrix with labels sorted: same order, same counts.
    expect(m.classes).toEqual(expected.classes);
    expect(m.counts).toEqual(expected.sklearn_confusion_matrix);
    const k = cohenKappa(m);
    // sklearn.metrics.cohen_kappa_score
    expect(k.kappa.value).toBeCloseTo(expected.sklearn_cohen_kappa_score, 12);
    // statsmodels.stats.inter_rater.cohens_kappa: std_kappa (Fleiss, Cohen & Everitt 1969),
    // std_kappa0 (under H0) and the 95 % limits kappa ± 1.96·std_kappa.
    expect(k.kappa.value).toBeCloseTo(expected.statsmodels_kappa, 12);
    expect(k.standardError.value).toBeCloseTo(expected.statsmodels_std_kappa, 12);
    expect(k.standardErrorNull.value).toBeCloseTo(expected.statsmodels_std_kappa0, 12);
    expect(k.ci95.value![0]).toBeCloseTo(Math.max(-1, expected.statsmodels_kappa_low), 9);
    expect(k.ci95.value![1]).toBeCloseTo(Math.min(1, expected.statsmodels_kappa_upp), 9);
  });
});

describe("Fleiss' kappa against statsmodels", () => {
  it.each(inputs.fleiss.map((c, i) => ({ ...c, expected: library.fleiss[i] })))('$name', ({ calls, expected }) => {
    // statsmodels.stats.inter_rater.aggregate_raters, then fleiss_kappa(method='fleiss').
    const { categories, table } = ratingTable(calls);
    expect(categories).toEqual(expected.categories);
    expect(table).toEqual(expected.table);
    expect(fleissKappa(categories, table).kappa.value).toBeCloseTo(expected.statsmodels_fleiss_kappa, 12);
  });
});

describe('optimal assignment against SciPy', () => {
  it.each(inputs.assignment.map((c, i) => ({ ...c, expected: library.assignment[i], shape: `${c.weights.length}×${c.weights[0].length}` })))(
    'reaches the total of scipy.optimize.linear_sum_assignment on $shape',
    ({ weights, expected }) => {
      // Zero cells are "no edge"; SciPy sees them as pairs worth nothing, the same total.
      const edges = weights.flatMap((row, r) => row.flatMap((weight, column) => (weight > 0 ? [{ row: r, column, weight }] : [])));
      const pairs = maxWeightMatching(weights.length, weights[0].length, edges);
      expect(new Set(pairs.map((e) => e.row)).size).toBe(pairs.length);
      expect(new Set(pairs.map((e) => e.column)).size).toBe(pairs.length);
      expect(pairs.reduce((s, e) => s + e.weight, 0)).toBeCloseTo(expected.scipy_max_total, 10);
    },
  );
});

describe('areas and overlaps against Shapely', () => {
  type GeoJsonShape = { type: string; coordinates: unknown };
  const rings = (g: GeoJsonShape): MultiPolygonRings =>
    (g.type === 'Polygon' ? [g.coordinates] : g.coordinates) as MultiPolygonRings;

  it.each(inputs.shapes.map((c, i) => ({ ...c, expected: library.shapes[i] })))('$name', ({ a, b, expected }) => {
    const ra = rings(a);
    const rb = rings(b);
    const areaA = multiPolygonArea(ra);
    const areaB = multiPolygonArea(rb);
    const shared = intersectionArea(ra, rb);
    // shapely .area, .intersection(...).area, and IoU from .union(...).area
    expect(areaA).toBeCloseTo(expected.area_a, 6);
    expect(areaB).toBeCloseTo(expected.area_b, 6);
    expect(shared).toBeCloseTo(expected.intersection, 6);
    expect(shared / (areaA + areaB - shared)).toBeCloseTo(expected.iou, 9);
    // The matcher's own shared-area routine, both ways round.
    expect(sharedArea(ra, rb)).toBeCloseTo(expected.intersection, 6);
    expect(sharedArea(rb, ra)).toBeCloseTo(expected.intersection, 6);
  });
});

describe('IoU matching against Shapely and SciPy', () => {
  // Two delineations of crowded crowns: Shapely computes every IoU, SciPy's
  // linear_sum_assignment picks the pairs of largest total IoU among those ≥ 0.3.
  const { min_iou: minIou, first, second } = inputs.delineation;
  const expected = library.delineation;
  const outlines = (shapes: { coordinates: unknown }[], prefix: string) =>
    shapes.map((g, i) => ({ id: `${prefix}${i}`, rings: [g.coordinates] as MultiPolygonRings }));
  const a = outlines(first, 'a');
  const b = outlines(second, 'b');

  it('finds the same candidate pairs', () => {
    expect(candidatePairs(a, b, { minIou }).edges).toHaveLength(expected.candidates);
  });

  it('reaches the same number of matches and the same total IoU', () => {
    const m = matchByIou(a, b, { minIou });
    expect(m.pairs).toHaveLength(expected.matched);
    // GEOS works on the raw UTM coordinates, we near the origin: they differ by ~1e-10.
    expect(m.pairs.reduce((s, p) => s + p.iou, 0)).toBeCloseTo(expected.total_iou, 8);
    expect(m.pairs.map((p) => [p.first, p.second])).toEqual(expected.pairs);
  });
});
