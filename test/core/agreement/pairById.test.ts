import { describe, expect, it } from 'vitest';
import { alignById, collidingIds, pairById } from '../../../src/core/agreement/pairById.ts';

describe('pairById', () => {
  it('pairs calls on the same patch whatever the order, keeping the first side’s order', () => {
    const result = pairById(
      [{ id: 'p1', species: 'larix', confidence: 'sure' }, { id: 2, species: 'pinus' }],
      [{ id: '2', species: 'salix' }, { id: 'p1', species: 'larix' }],
    );
    expect(result).toEqual({
      ok: true,
      pairs: [
        { id: 'p1', first: 'larix', second: 'larix', confidence: 'sure' },
        { id: '2', first: 'pinus', second: 'salix' },
      ],
    });
  });

  it('refuses mismatched ids and says how many are unmatched on each side', () => {
    const result = pairById(
      [{ id: 'a', species: 'x' }, { id: 'b', species: 'x' }, { id: 'c', species: 'x' }],
      [{ id: 'a', species: 'x' }, { id: 'd', species: 'x' }],
    );
    expect(result).toEqual({ ok: false, mismatch: { onlyFirst: ['b', 'c'], onlySecond: ['d'], shared: 1 } });
  });

  it('refuses two lists with no id in common', () => {
    const result = pairById([{ id: 'a', species: 'x' }], [{ id: 'b', species: 'x' }]);
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.mismatch.shared).toBe(0);
  });

  it('finds ids that only differ as number and text', () => {
    expect(collidingIds([{ id: 1, species: 'x' }, { id: '1', species: 'x' }, { id: 2, species: 'x' }])).toEqual(['1']);
  });
});

describe('alignById', () => {
  it('lines up three interpreters by id', () => {
    const result = alignById([
      [{ id: 'a', species: 'x' }, { id: 'b', species: 'y' }],
      [{ id: 'b', species: 'y' }, { id: 'a', species: 'z' }],
      [{ id: 'a', species: 'x' }, { id: 'b', species: 'x' }],
    ]);
    expect(result).toEqual({ ok: true, aligned: { ids: ['a', 'b'], calls: [['x', 'z', 'x'], ['y', 'y', 'x']] } });
  });

  it('reports the mismatch of each list against the first', () => {
    const result = alignById([
      [{ id: 'a', species: 'x' }, { id: 'b', species: 'y' }],
      [{ id: 'a', species: 'y' }, { id: 'b', species: 'y' }],
      [{ id: 'a', species: 'x' }],
    ]);
    expect(result.ok).toBe(false);
    if (!result.ok) {
      expect(result.mismatches[0]).toEqual({ onlyFirst: [], onlySecond: [], shared: 2 });
      expect(result.mismatches[1]).toEqual({ onlyFirst: ['b'], onlySecond: [], shared: 1 });
    }
  });
});
