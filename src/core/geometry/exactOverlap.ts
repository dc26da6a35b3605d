import OverlayOp from 'jsts/org/locationtech/jts/operation/overlay/OverlayOp.js';
import { fromJsts, type JstsGeometry } from './jstsBridge.ts';
import { multiPolygonArea } from './measure.ts';
import { intersect } from './overlay.ts';
import { ringOverlay } from './ringOverlay.ts';
import type { MultiPolygonRings, Ring } from './types.ts';

// The shared area of two valid outlines. Two one-ring outlines whose boundaries cross
// in general position (nearly every pair of crowns) take the direct ring traversal of
// ringOverlay.ts, some fifty times quicker than a general overlay. Touching vertices,
// edges along each other, holes and parts go to JSTS's overlay; when JSTS gives up on a
// robustness failure (TopologyException), the exact-arithmetic polyclip-ts overlay
// answers instead.

export interface Overlap {
  rings: MultiPolygonRings;
  area: number;
}

/** The only ring of a one-part outline without holes, else null. */
export function singleRing(parts: MultiPolygonRings): Ring | null {
  return parts.length === 1 && parts[0].length === 1 ? parts[0][0] : null;
}

/** The overlap of two valid outlines; JSTS geometries are asked for only when needed. */
export function exactOverlap(
  aRings: MultiPolygonRings,
  bRings: MultiPolygonRings,
  jstsA: () => JstsGeometry,
  jstsB: () => JstsGeometry,
): Overlap {
  const ringA = singleRing(aRings), ringB = singleRing(bRings);
  const direct = ringA && ringB ? ringOverlay(ringA, ringB, 'intersection') : null;
  if (direct) return { rings: direct, area: multiPolygonArea(direct) };
  let rings: MultiPolygonRings;
  try {
    rings = fromJsts(OverlayOp.intersection(jstsA(), jstsB()));
  } catch {
    rings = intersect(aRings, bRings);
  }
  return { rings, area: multiPolygonArea(rings) };
}
