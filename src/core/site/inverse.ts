import { SiteRuleError } from './SiteRuleError.ts';
import type { EventDraft, LedgerEvent } from './events.ts';

type Change = Pick<EventDraft, 'kind' | 'payload'>;

/** The change that reverses an undoable event, built from its payload alone. */
export function inverseOf(event: LedgerEvent): Change {
  switch (event.kind) {
    case 'site.renamed':
      return { kind: 'site.renamed', payload: { name: event.payload.previous, previous: event.payload.name } };
    case 'roster.set':
      return { kind: 'roster.set', payload: { entries: event.payload.previous, previous: event.payload.entries } };
    case 'patch.added':
      return { kind: 'patch.deleted', payload: event.payload };
    case 'patch.deleted':
      return { kind: 'patch.added', payload: event.payload };
    case 'patch.geometry':
      return {
        kind: 'patch.geometry',
        payload: { patchId: event.payload.patchId, geometry: event.payload.previous, previous: event.payload.geometry },
      };
    case 'patches.shifted': {
      const { shiftId, direction, record, outlines } = event.payload;
      return {
        kind: 'patches.shifted',
        payload: {
          shiftId, record, direction: direction === 'apply' ? 'restore' : 'apply',
          outlines: outlines.map((o) => ({ patchId: o.patchId, geometry: o.previous, previous: o.geometry })),
        },
      };
    }
    case 'patches.replaced':
      return { kind: 'patches.replaced', payload: { edit: event.payload.edit, before: event.payload.after, after: event.payload.before } };
    case 'schemes.set':
      return { kind: 'schemes.set', payload: { schemes: event.payload.previous, previous: event.payload.schemes } };
    case 'tag.set':
      return {
        kind: 'tag.set',
        payload: { ...event.payload, tag: event.payload.previous, previous: event.payload.tag },
      };
    case 'import.added':
      return { kind: 'import.removed', payload: event.payload };
    case 'import.removed':
      return { kind: 'import.added', payload: event.payload };
    default:
      throw new SiteRuleError(`a ${event.kind} event cannot be undone`);
  }
}
