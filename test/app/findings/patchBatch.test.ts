import { describe, expect, it } from 'vitest';
import { packPatches, unpackPatches } from '../../../src/app/findings/patchBatch.ts';
import type { TrackedPatch } from '../../../src/app/findings/checkHost.ts';

// Packing for the checks worker must give back exactly the patches it was given.

describe('packPatches', () => {
  it('round-trips parts, holes, odd rings and NaN positions', () => {
    const patches: TrackedPatch[] = [
      { id: 'a', species: 'pice', geometry: [[[[0, 0], [4, 0], [4, 4], [0, 0]], [[1, 1], [2, 1], [2, 2], [1, 1]]], [[[10, 10], [11, 10], [11, 11], [10, 10]]]] },
      { id: 'b', species: '', geometry: [[[[600000.123456789, 5100000.987654321], [Number.NaN, 1], [3, 3]]]] },
      { id: 'c', species: 'lari', geometry: [] },
    ];
    const batch = packPatches(patches);
    expect(batch.coordinates).toBeInstanceOf(Float64Array);
    expect(unpackPatches(structuredClone(batch))).toEqual(patches);
  });
});
