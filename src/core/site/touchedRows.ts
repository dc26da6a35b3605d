import type { LedgerEvent } from './events.ts';
import { tagKey } from './types.ts';

/** The keys of the current-state rows an event changes, so storage rewrites only those. */
export interface TouchedRows {
  site: boolean;
  roster: boolean;
  schemes: boolean;
  scenes: string[];
  patches: string[];
  tags: string[];
  passes: string[];
  rulings: string[];
  references: string[];
  imports: string[];
}

export function touchedRows(event: LedgerEvent): TouchedRows {
  const rows: TouchedRows = {
    site: false, roster: false, schemes: false, scenes: [], patches: [], tags: [], passes: [], rulings: [], references: [], imports: [],
  };
  switch (event.kind) {
    case 'site.created':
    case 'site.renamed':
      rows.site = true;
      break;
    case 'scene.added':
      rows.scenes.push(event.payload.scene.id);
      break;
    case 'roster.set':
      rows.roster = true;
      break;
    case 'patch.added':
    case 'patch.deleted':
      rows.patches.push(event.payload.patch.id);
      rows.tags.push(...event.payload.tags.map((t) => tagKey(t.patchId, t.passId)));
      break;
    case 'patch.geometry':
      rows.patches.push(event.payload.patchId);
      break;
    case 'patches.shifted':
      rows.patches.push(...event.payload.outlines.map((o) => o.patchId));
      break;
    case 'patches.replaced':
      // A cut keeps the patch's id on one piece: each row is listed once.
      rows.patches.push(...new Set([event.payload.before, event.payload.after].flatMap((side) => side.patches.map((p) => p.id))));
      rows.tags.push(...new Set([event.payload.before, event.payload.after].flatMap((side) => side.tags.map((t) => tagKey(t.patchId, t.passId)))));
      break;
    case 'schemes.set':
      rows.schemes = true;
      break;
    case 'tag.set':
      rows.tags.push(tagKey(event.payload.patchId, event.payload.passId));
      break;
    case 'import.added':
    case 'import.removed':
      rows.imports.push(event.payload.record.id);
      rows.patches.push(...event.payload.patches.map((p) => p.id));
      rows.tags.push(...event.payload.tags.map((t) => tagKey(t.patchId, t.passId)));
      rows.references.push(...event.payload.references.map((r) => r.id));
      break;
    case 'pass.started':
      rows.passes.push(event.payload.pass.id);
      break;
    case 'pass.ended':
    case 'pass.paused':
    case 'pass.resumed':
      rows.passes.push(event.payload.passId);
      break;
    case 'ruling.recorded':
      rows.rulings.push(event.payload.ruling.id);
      break;
    case 'ruling.reopened':
      rows.rulings.push(event.payload.rulingId);
      break;
  }
  return rows;
}
