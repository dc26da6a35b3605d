import { difference } from 'polyclip-ts';
import type { Finding } from '../../core/checks/findings.ts';
import { repairOutline } from '../../core/geometry/repair.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';

/** An ordinary edit that carries out a finding's suggested fix, or hands it to the user. */
export type FixPlan =
  | { kind: 'geometry'; id: string; geometry: MultiPolygonRings; says: string }
  | { kind: 'delete'; id: string; says: string }
  | { kind: 'merge'; id: string; other: string; says: string }
  /** Fixes that need the interpreter's eye (retag, redraw): take the patch in hand. */
  | { kind: 'hand'; id: string; says: string };

/** What the fix of a finding would do, given the patches' current outlines. */
export function fixPlan(finding: Finding, outlineOf: (id: string) => MultiPolygonRings | undefined): FixPlan {
  const target = String(finding.fix.target);
  const other = finding.patches.map(String).find((id) => id !== target);
  const outline = outlineOf(target);
  switch (finding.fix.action) {
    case 'repair': {
      if (!outline) break;
      const repaired = repairOutline(outline);
      if (repaired.rings.length === 0) return { kind: 'hand', id: target, says: `${target}: nothing with area is left after repair; redraw or delete it` };
      return { kind: 'geometry', id: target, geometry: repaired.rings, says: `${target}: ${repaired.changes.join('; ')}` };
    }
    case 'trim': {
      const cutter = other ? outlineOf(other) : undefined;
      if (!outline || !cutter) break;
      const trimmed = difference(outline as never, cutter as never) as unknown as MultiPolygonRings;
      if (trimmed.length === 0) return { kind: 'hand', id: target, says: `${target}: lies wholly inside ${other}; delete or redraw it` };
      return { kind: 'geometry', id: target, geometry: trimmed, says: `${target}: trimmed the part it shares with ${other}` };
    }
    case 'merge':
      if (other) return { kind: 'merge', id: target, other, says: `${target} and ${other}: joined into one patch` };
      break;
    case 'delete':
      return { kind: 'delete', id: target, says: `${target}: deleted as a duplicate` };
    default:
      break;
  }
  return { kind: 'hand', id: target, says: finding.fix.text };
}
