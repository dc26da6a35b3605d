import type { MultiPolygonRings } from '../geometry/types.ts';

// Small checks for reading blind files: each returns a problem in words, or null.

export const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

export function textProblem(v: unknown, what: string): string | null {
  return typeof v === 'string' && v.length > 0 ? null : `${what} is missing or not text`;
}

/** Parts, each an outer ring then holes, each ring at least 4 finite positions. */
export function geometryProblem(v: unknown, what: string): string | null {
  if (!Array.isArray(v) || v.length === 0) return `${what} has no polygon`;
  for (const [p, part] of v.entries()) {
    if (!Array.isArray(part) || part.length === 0) return `${what}, part ${p + 1}, has no ring`;
    for (const [r, ring] of part.entries()) {
      if (!Array.isArray(ring) || ring.length < 4) return `${what}, part ${p + 1}, ring ${r + 1}, has fewer than 4 positions`;
      for (const pos of ring) {
        if (!Array.isArray(pos) || pos.length < 2 || !Number.isFinite(pos[0]) || !Number.isFinite(pos[1])) {
          return `${what}, part ${p + 1}, ring ${r + 1}, holds a position that is not two numbers`;
        }
      }
    }
  }
  return null;
}

export type Geometry = MultiPolygonRings;
