import InteriorPointArea from 'jsts/org/locationtech/jts/algorithm/InteriorPointArea.js';
import Polygonizer from 'jsts/org/locationtech/jts/operation/polygonize/Polygonizer.js';
import UnaryUnionOp from 'jsts/org/locationtech/jts/operation/union/UnaryUnionOp.js';
import { factory, fromJsts, jstsLines, type JstsGeometry } from './jstsBridge.ts';
import { multiPolygonArea, ringSignedArea } from './measure.ts';
import { splitIntoLoops } from './ringLoops.ts';
import { ringIsCollinear } from './segments.ts';
import { validityIssues } from './validity.ts';
import type { MultiPolygonRings, Position, Ring } from './types.ts';

// Make a broken outline valid, and say what changed: never silently.
// Clean-up first (drop bad numbers and repeated positions, close open rings, drop
// rings with no area), then rebuild the area from the noded edges: every face of the
// planar arrangement of the rings is kept when it lies inside its part by the even-odd
// rule. A bowtie thus becomes its two triangles, not one of them (buffer(0) would lose
// a lobe); a hole outside its shell becomes a part of its own, reported as such.

export interface RepairResult {
  /** The valid outline; empty when nothing with area is left. */
  rings: MultiPolygonRings;
  /** One plain sentence per change made. */
  changes: string[];
  /** |shoelace area| of the input rings as drawn (a bowtie's lobes cancel here). */
  areaBefore: number;
  areaAfter: number;
}

const samePoint = (a: Position, b: Position) => a[0] === b[0] && a[1] === b[1];

function cleanRing(ring: Ring, name: string, changes: string[]): Ring | null {
  let out = ring.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
  if (out.length < ring.length) changes.push(`dropped ${ring.length - out.length} position(s) of ${name} that were not numbers`);
  const before = out.length;
  out = out.filter((p, i) => i === 0 || !samePoint(p, out[i - 1]));
  if (out.length < before) changes.push(`removed ${before - out.length} repeated position(s) from ${name}`);
  if (out.length > 0 && !samePoint(out[0], out[out.length - 1])) {
    out = [...out, out[0]];
    changes.push(`closed ${name}`);
  }
  if (new Set(out.map(([x, y]) => `${x},${y}`)).size < 3 || ringIsCollinear(out)) {
    changes.push(`dropped ${name}: it encloses no area`);
    return null;
  }
  return out;
}

/** Even-odd inside test of a point against a set of rings. */
function insideEvenOdd(p: Position, rings: Ring[]): boolean {
  let inside = false;
  for (const ring of rings) {
    for (let i = 0, j = ring.length - 1; i < ring.length; j = i++) {
      const [xi, yi] = ring[i];
      const [xj, yj] = ring[j];
      if ((yi > p[1]) !== (yj > p[1]) && p[0] < ((xj - xi) * (p[1] - yi)) / (yj - yi) + xi) inside = !inside;
    }
  }
  return inside;
}

/** Whether two of the faces (of one noded arrangement) have an edge in common. */
function shareAnEdge(faces: JstsGeometry[]): boolean {
  // Faces of one arrangement share an edge exactly: the same two noded positions.
  const seen = new Set<string>();
  for (const face of faces) {
    const coordinates = face.getCoordinates() as { x: number; y: number }[];
    const own: string[] = [];
    for (let i = 1; i < coordinates.length; i++) {
      const p = coordinates[i - 1], q = coordinates[i];
      const first = p.x < q.x || (p.x === q.x && p.y < q.y);
      own.push(first ? `${p.x} ${p.y} ${q.x} ${q.y}` : `${q.x} ${q.y} ${p.x} ${p.y}`);
    }
    for (const key of own) if (seen.has(key)) return true;
    for (const key of own) seen.add(key);
  }
  return false;
}

/**
 * Repairs an outline. `brokenAsGiven` tells that the caller has already found the
 * outline's topology broken, which spares testing it again when the clean-up changed nothing.
 */
/**
 * Nodes all rings against each other and keeps the faces of the arrangement that lie
 * inside their part by the even-odd rule; also counts the edges that enclose nothing.
 */
function rebuildFaces(cleaned: MultiPolygonRings): { rings: MultiPolygonRings; dangles: number } {
  const noded: JstsGeometry = UnaryUnionOp.union(jstsLines(cleaned));
  const polygonizer = new Polygonizer();
  polygonizer.add(noded);
  const faces: JstsGeometry[] = polygonizer.getPolygons().toArray();
  const keep = faces.filter((face) => {
    const c = new InteriorPointArea(face).getInteriorPoint();
    return cleaned.some((rings) => insideEvenOdd([c.x, c.y], rings));
  });
  // Faces kept side by side along an edge must be merged; faces that meet at points at
  // most (a bowtie's two lobes) already form a valid MultiPolygon, and the union, the
  // costliest step, is skipped.
  const merged = keep.length === 0 ? null
    : keep.length === 1 || !shareAnEdge(keep) ? factory.createMultiPolygon(keep)
      : UnaryUnionOp.union(factory.createMultiPolygon(keep));
  const dangles = polygonizer.getDangles().size() + polygonizer.getCutEdges().size();
  return { rings: merged ? fromJsts(merged) : [], dangles };
}

export function repairOutline(parts: MultiPolygonRings, brokenAsGiven = false): RepairResult {
  const changes: string[] = [];
  const areaBefore = Math.abs(parts.reduce((sum, rings) => sum + rings.reduce((s, r) => {
    const finite = r.filter(([x, y]) => Number.isFinite(x) && Number.isFinite(y));
    return s + (finite.length > 2 ? ringSignedArea(finite) : 0);
  }, 0), 0));

  const cleaned: MultiPolygonRings = [];
  parts.forEach((rings, p) => {
    const kept: Ring[] = [];
    rings.forEach((ring, r) => {
      const name = `${r === 0 ? 'the outer ring' : `hole ${r}`}${parts.length > 1 ? ` of part ${p}` : ''}`;
      const out = cleanRing(ring, name, changes);
      if (out) kept.push(out);
      else if (r === 0 && rings.length > 1) changes.push(`holes of ${name} are kept as rings of their own`);
    });
    if (kept.length) cleaned.push(kept);
  });
  if (cleaned.length === 0) return { rings: [], changes, areaBefore, areaAfter: 0 };
  const cleanedNothing = changes.length === 0;

  const single = cleanedNothing && cleaned.length === 1 && cleaned[0].length === 1 ? splitIntoLoops(cleaned[0][0]) : null;
  const { rings, dangles } = single ? { rings: single, dangles: 0 } : rebuildFaces(cleaned);
  const areaAfter = multiPolygonArea(rings);

  if (dangles > 0) changes.push(`removed ${dangles} edge(s) that enclose nothing (spikes or cut lines)`);
  // After the clean-up, was the topology itself broken? Then the rebuild is a change.
  const stillBroken = brokenAsGiven && cleanedNothing ? true : validityIssues(cleaned).length > 0;
  if (rings.length !== cleaned.length) {
    changes.push(`rebuilt the outline from its crossing edges: ${cleaned.length} part(s) became ${rings.length}`);
  } else if (stillBroken) {
    changes.push('rebuilt the outline from its crossing or overlapping edges');
  }
  if (Math.abs(areaAfter - areaBefore) > 1e-9 * Math.max(1, areaBefore)) {
    changes.push(`area changed from ${areaBefore.toFixed(3)} to ${areaAfter.toFixed(3)} m²`);
  }
  return { rings, changes, areaBefore, areaAfter };
}
