import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { MAX_VERTICES_PER_POLYGON } from '../../core/imports/index.ts';

/** A patch outline as the store accepts it: parts of closed rings of finite positions. */
export class GeometryError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'GeometryError';
  }
}

export function checkPatchGeometry(geometry: MultiPolygonRings): void {
  if (!Array.isArray(geometry) || geometry.length === 0) throw new GeometryError('a patch needs at least one polygon');
  let vertices = 0;
  geometry.forEach((rings, part) => {
    if (!Array.isArray(rings) || rings.length === 0) throw new GeometryError(`part ${part + 1} has no outer ring`);
    rings.forEach((ring, r) => {
      if (!Array.isArray(ring) || ring.length < 4) throw new GeometryError(`ring ${r + 1} of part ${part + 1} has fewer than 4 positions`);
      vertices += ring.length;
      for (const p of ring) {
        if (!Array.isArray(p) || !Number.isFinite(p[0]) || !Number.isFinite(p[1])) throw new GeometryError(`ring ${r + 1} of part ${part + 1} has a position that is not two finite numbers`);
      }
      const [a, b] = [ring[0], ring[ring.length - 1]];
      if (a[0] !== b[0] || a[1] !== b[1]) throw new GeometryError(`ring ${r + 1} of part ${part + 1} is not closed`);
    });
  });
  if (vertices > MAX_VERTICES_PER_POLYGON) throw new GeometryError(`the patch has ${vertices} vertices; at most ${MAX_VERTICES_PER_POLYGON} are allowed`);
}
