import { sealEvent } from '../../../src/core/ledger/chain.ts';
import {
  applyEvent, emptySiteState, inverseOf, tagKey, type EventDraft, type LedgerEvent, type Patch, type SiteState, type Tag,
} from '../../../src/core/site/index.ts';

// A small in-memory ledger for tests: seals drafts, applies them, keeps the events.
export class MemoryLedger {
  state: SiteState = emptySiteState();
  events: LedgerEvent[] = [];
  private clock = Date.UTC(2026, 6, 1, 8);

  time(): string {
    this.clock += 1000;
    return new Date(this.clock).toISOString();
  }

  async add(draft: Omit<EventDraft, 'actor' | 'time'> & { actor?: string; time?: string }): Promise<LedgerEvent> {
    const event = await sealEvent({ actor: 'ak', time: this.time(), ...draft } as EventDraft, this.state.head);
    this.state = applyEvent(this.state, event);
    this.events.push(event);
    return event;
  }

  async undo(): Promise<LedgerEvent> {
    const target = this.state.history.undo.at(-1)!;
    return this.add({ ...inverseOf(this.events[target - 1]), undoes: target });
  }

  async redo(): Promise<LedgerEvent> {
    const target = this.state.history.redo.at(-1)!;
    return this.add({ ...inverseOf(this.events[target - 1]), redoes: target });
  }
}

export function square(x: number, y: number, size = 4): Patch['geometry'] {
  return [[[[x, y], [x + size, y], [x + size, y + size], [x, y + size], [x, y]]]];
}

export function patch(id: string, x = 0, y = 0): Patch {
  return { id, geometry: square(x, y), source: { kind: 'drawn' }, createdAt: '2026-07-01T08:00:00.000Z', createdBy: 'ak' };
}

export function tag(patchId: string, species: string, passId = 'pass-1'): Tag {
  return {
    patchId, passId, species, confidence: 'likely', note: '', interpreter: 'ak', time: '2026-07-01T09:00:00.000Z',
    display: { composite: 'natural', stretch: 'percentile 2-98', date: '2026-07-01' },
  };
}

/** A site with a roster, a pass and a few patches, some tagged, one edited, one deleted. */
export async function buildSite(): Promise<MemoryLedger> {
  const l = new MemoryLedger();
  await l.add({ kind: 'site.created', payload: { site: { id: 's1', name: 'Test basin', epsg: 32632, createdAt: l.time() } } });
  await l.add({
    kind: 'roster.set',
    payload: {
      entries: [
        { code: 'PICE', scientificName: 'Picea abies', commonName: 'Norway spruce', group: 'conifer', colour: '#009E73', key: '1' },
        { code: 'ALVI', scientificName: 'Alnus viridis', commonName: 'Green alder', group: 'broadleaf shrub', colour: '#E69F00', key: '2' },
      ],
      previous: [],
    },
  });
  await l.add({ kind: 'pass.started', payload: { pass: { id: 'pass-1', interpreter: 'ak', blind: false, startedAt: l.time(), endedAt: null, patchIds: null } } });
  for (let i = 0; i < 5; i++) await l.add({ kind: 'patch.added', payload: { patch: patch(`p${i}`, i * 10, 0), tags: [] } });
  await l.add({ kind: 'tag.set', payload: { patchId: 'p0', passId: 'pass-1', tag: tag('p0', 'PICE'), previous: null } });
  await l.add({ kind: 'tag.set', payload: { patchId: 'p1', passId: 'pass-1', tag: tag('p1', 'ALVI'), previous: null } });
  await l.add({ kind: 'tag.set', payload: { patchId: 'p1', passId: 'pass-1', tag: tag('p1', 'mixed'), previous: tag('p1', 'ALVI') } });
  await l.add({ kind: 'patch.geometry', payload: { patchId: 'p2', geometry: square(20, 0, 6), previous: square(20, 0) } });
  const p3 = l.state.patches.get('p3')!;
  await l.add({ kind: 'tag.set', payload: { patchId: 'p3', passId: 'pass-1', tag: tag('p3', 'PICE'), previous: null } });
  await l.add({ kind: 'patch.deleted', payload: { patch: p3, tags: [l.state.tags.get(tagKey('p3', 'pass-1'))!] } });
  return l;
}
