import type { MultiPolygonRings, Position } from '../../core/geometry/types.ts';
import type { TrackedPatch } from './checkHost.ts';

// Patches packed for a worker: every position in one Float64Array and the ring
// structure in one Int32Array, both transferred, so a batch of thousands of outlines
// crosses to the worker without copying millions of small arrays on the UI thread.

export interface PatchBatch {
  ids: string[];
  species: string[];
  /** x, y of every position in order. */
  coordinates: Float64Array;
  /** Per patch: parts; per part: rings; per ring: positions. */
  structure: Int32Array;
}

export function packPatches(patches: TrackedPatch[]): PatchBatch {
  let positions = 0, counts = 0;
  for (const p of patches) {
    counts += 1 + p.geometry.length;
    for (const rings of p.geometry) {
      counts += rings.length;
      for (const ring of rings) positions += ring.length;
    }
  }
  const coordinates = new Float64Array(positions * 2);
  const structure = new Int32Array(counts);
  let c = 0, s = 0;
  for (const p of patches) {
    structure[s++] = p.geometry.length;
    for (const rings of p.geometry) {
      structure[s++] = rings.length;
      for (const ring of rings) {
        structure[s++] = ring.length;
        for (const [x, y] of ring) {
          coordinates[c++] = x;
          coordinates[c++] = y;
        }
      }
    }
  }
  return { ids: patches.map((p) => p.id), species: patches.map((p) => p.species), coordinates, structure };
}

export function unpackPatches(batch: PatchBatch): TrackedPatch[] {
  const { coordinates, structure } = batch;
  let c = 0, s = 0;
  return batch.ids.map((id, i) => {
    const geometry: MultiPolygonRings = [];
    for (let parts = structure[s++]; parts > 0; parts--) {
      const rings: Position[][] = [];
      for (let count = structure[s++]; count > 0; count--) {
        const ring: Position[] = [];
        for (let n = structure[s++]; n > 0; n--, c += 2) ring.push([coordinates[c], coordinates[c + 1]]);
        rings.push(ring);
      }
      geometry.push(rings);
    }
    return { id, species: batch.species[i], geometry };
  });
}
