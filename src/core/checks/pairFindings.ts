import { exactOverlap } from '../geometry/exactOverlap.ts';
import { hullsApart } from '../geometry/hull.ts';
import { compareIds, type Finding } from './findings.ts';
import { hullOf, jstsOf, type PreparedPatch } from './preparedPatch.ts';
import type { CheckSettings } from './settings.ts';

// The checks on two neighbouring patches: overlap (same or different species) and
// near-duplicates. Cheap tests first, so most neighbours never reach the overlay:
// boxes that share less than the sliver area, then hulls that do not overlap.

const round = (value: number, digits = 3) => Math.round(value * 10 ** digits) / 10 ** digits;
const percent = (share: number) => `${Math.round(share * 1000) / 10} %`;

/** Hull gaps up to this (m) count as touching: rounding of UTM metres, far below any sliver. */
const TOUCH_TOLERANCE = 1e-7;

/** The answer for most pairs, shared (never changed by callers). */
const NONE: Finding[] = Object.freeze([]) as unknown as Finding[];

export function pairFindings(first: PreparedPatch, second: PreparedPatch, settings: CheckSettings): Finding[] {
  const ea = first.extent, eb = second.extent;
  if (!ea || !eb || !first.shape || !second.shape) return NONE;
  const w = Math.min(ea[2], eb[2]) - Math.max(ea[0], eb[0]);
  const h = Math.min(ea[3], eb[3]) - Math.max(ea[1], eb[1]);
  if (w <= 0 || h <= 0 || w * h <= settings.sliverAreaM2) return NONE;
  const inOrder = compareIds(first.input.id, second.input.id) <= 0;
  const a = inOrder ? first : second, b = inOrder ? second : first;
  if (hullsApart(hullOf(a), hullOf(b), TOUCH_TOLERANCE)) return NONE;

  const overlap = exactOverlap(a.shape!, b.shape!, () => jstsOf(a), () => jstsOf(b));
  if (overlap.area <= settings.sliverAreaM2) return NONE;

  const ids = [a.input.id, b.input.id];
  const shares = [overlap.area / a.area, overlap.area / b.area];
  const iou = overlap.area / (a.area + b.area - overlap.area);
  const same = a.input.species.trim() === b.input.species.trim();
  const species = [a.input.species, b.input.species];
  const area = round(overlap.area);
  // Trim the side that loses the smaller share of itself.
  const trimTarget = shares[0] <= shares[1] ? a : b;
  const out: Finding[] = [{
    kind: same ? 'overlap-same' : 'overlap-mixed',
    patches: ids,
    severity: same ? 'warning' : 'error',
    message: same
      ? `patches ${ids[0]} and ${ids[1]} (both ${species[0]}) overlap by ${round(overlap.area, 2)} m²: those pixels count twice`
      : `patches ${ids[0]} (${species[0]}) and ${ids[1]} (${species[1]}) overlap by ${round(overlap.area, 2)} m²: those pixels carry two species`,
    area_m2: area,
    shares: shares.map((s) => round(s, 4)),
    geometry: { type: 'MultiPolygon', coordinates: overlap.rings },
    fix: same
      ? { action: 'merge', target: ids[1], text: `merge patch ${ids[1]} into patch ${ids[0]}` }
      : {
        action: 'trim',
        target: trimTarget.input.id,
        text: `cut the overlap out of patch ${trimTarget.input.id} (${percent(Math.min(...shares))} of it), after checking which species is there`,
      },
    details: { species: same ? [species[0]] : species, iou: round(iou, 4) },
  }];
  if (iou > settings.nearDuplicateIoU) {
    // Keep the larger of the two; on a tie, the first in id order.
    const drop = b.area <= a.area ? b : a;
    out.push({
      kind: 'near-duplicate',
      patches: ids,
      severity: same ? 'warning' : 'error',
      message: `patches ${ids[0]} and ${ids[1]} are near-duplicates (IoU ${round(iou, 3)})${same ? '' : `, tagged ${species[0]} and ${species[1]}`}`,
      area_m2: area,
      shares: shares.map((s) => round(s, 4)),
      geometry: { type: 'MultiPolygon', coordinates: overlap.rings },
      fix: same
        ? { action: 'delete', target: drop.input.id, text: `delete patch ${drop.input.id}, a copy of the other` }
        : { action: 'retag', target: drop.input.id, text: `one outline with two species: settle the species and delete patch ${drop.input.id}` },
      details: { iou: round(iou, 4), species: same ? [species[0]] : species },
    });
  }
  return out;
}
