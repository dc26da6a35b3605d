import { sealEvent } from '../../../src/core/ledger/chain.ts';
import type { MultiPolygonRings } from '../../../src/core/geometry/types.ts';
import {
  applyEvent, emptySiteState, type EventDraft, type LedgerEvent, type Patch, type Ruling, type SiteState, type Tag,
} from '../../../src/core/site/index.ts';
import type { OpenedSite } from '../../../src/core/export/siteFile.ts';

// A small real site for the export tests: every change goes through the ledger's own
// sealing and the site reducer, exactly as the store commits it.

export const EPSG = 32608;
const BASE = Date.parse('2025-07-24T08:00:00.000Z');

export class SiteBuilder {
  state: SiteState = emptySiteState();
  events: LedgerEvent[] = [];
  private tick = 0;

  time(): string {
    return new Date(BASE + 60_000 * this.tick++).toISOString();
  }

  async commit(draft: Omit<EventDraft, 'actor' | 'time'>, actor = 'ana'): Promise<LedgerEvent> {
    const event = await sealEvent({ ...draft, actor, time: this.time() } as EventDraft, this.state.head);
    this.state = applyEvent(this.state, event);
    this.events.push(event);
    return event;
  }

  get opened(): OpenedSite {
    return { state: this.state, events: [...this.events] };
  }

  async patch(id: string, geometry: MultiPolygonRings): Promise<void> {
    const patch: Patch = { id, geometry, source: { kind: 'drawn' }, createdAt: this.time(), createdBy: 'ana' };
    await this.commit({ kind: 'patch.added', payload: { patch, tags: [] } });
  }

  async tag(patchId: string, passId: string, species: string, interpreter: string, confidence: Tag['confidence'] = 'likely', note = ''): Promise<void> {
    const tag: Tag = {
      patchId, passId, species, confidence, note, interpreter, time: this.time(),
      display: { composite: 'nir-red-green', stretch: 'percentile 2-98', date: '2025-07-24' },
    };
    const previous = this.state.tags.get(`${patchId}|${passId}`) ?? null;
    await this.commit({ kind: 'tag.set', payload: { patchId, passId, tag, previous } }, interpreter);
  }

  async rule(id: string, patchId: string, decision: Ruling['decision'], reason = 'seen on both dates'): Promise<void> {
    const ruling: Ruling = { id, patchId, decision, passIds: ['a', 'b'], by: 'cleo', time: this.time(), reason, reopened: null };
    await this.commit({ kind: 'ruling.recorded', payload: { ruling } }, 'cleo');
  }

  async shift(patchId: string, dx: number, dy: number): Promise<void> {
    const previous = this.state.patches.get(patchId)!.geometry;
    const geometry = previous.map((rings) => rings.map((ring) => ring.map(([x, y]) => [x + dx, y + dy] as [number, number])));
    await this.commit({ kind: 'patch.geometry', payload: { patchId, geometry, previous } });
  }
}

/** A square ring, counterclockwise, closed, in metres. */
export function square(x: number, y: number, side: number): MultiPolygonRings {
  return [[[[x, y], [x + side, y], [x + side, y + side], [x, y + side], [x, y]]]];
}

/**
 * A site of `n` square patches in a row, tagged in two passes ("a" by ana, "b" by ben);
 * every fifth patch the passes disagree on, and rulings settle them.
 */
export async function twoPassSite(n = 12): Promise<SiteBuilder> {
  const b = new SiteBuilder();
  await b.commit({ kind: 'site.created', payload: { site: { id: 'test-site', name: 'Test basin', epsg: EPSG, createdAt: b.time() } } });
  await b.commit({
    kind: 'scene.added',
    payload: { scene: { id: 'scene-1', date: '2025-07-24', epsg: EPSG, files: [{ role: 'pan', name: 'pan.tif', size: 10, sha256: 'a'.repeat(64) }, { role: 'ms', name: 'ms.tif', size: 10, sha256: 'b'.repeat(64) }] } },
  });
  const roster = [
    { code: 'ABFI', scientificName: 'Abies fictiva', commonName: 'ridge fir', group: 'conifer', colour: '#009E73', key: '1' },
    { code: 'SAIN', scientificName: 'Salix inventa', commonName: 'brook willow', group: 'broadleaf shrub', colour: '#F0E442', key: '2' },
  ];
  await b.commit({ kind: 'roster.set', payload: { entries: roster, previous: [] } });
  for (const [id, who] of [['a', 'ana'], ['b', 'ben']]) {
    await b.commit({ kind: 'pass.started', payload: { pass: { id, interpreter: who, blind: id === 'b', startedAt: b.time(), endedAt: null, patchIds: null } } }, who);
  }
  for (let i = 1; i <= n; i++) {
    const id = `P${i}`;
    await b.patch(id, square(493000 + 20 * i, 4429000 + 3 * i, 6));
    const species = i % 2 ? 'ABFI' : 'SAIN';
    await b.tag(id, 'a', species, 'ana', 'sure');
    await b.tag(id, 'b', i % 5 === 0 ? (species === 'ABFI' ? 'SAIN' : 'ABFI') : species, 'ben');
    if (i % 5 === 0) await b.rule(`R${i}`, id, { kind: 'accept', passId: 'a' });
  }
  for (const passId of ['a', 'b']) await b.commit({ kind: 'pass.ended', payload: { passId, time: b.time() } });
  return b;
}
