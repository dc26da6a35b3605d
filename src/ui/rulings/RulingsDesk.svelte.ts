import { recordRuling, describeDecision } from '../../app/rulings/recordRuling.ts';
import { reopenRuling } from '../../app/rulings/reopenRuling.ts';
import { rulingsQueue, type RulingsQueue } from '../../app/rulings/rulingsQueue.ts';
import { sendToThirdReader } from '../../app/rulings/sendToThirdReader.ts';
import { openBlindPassOf } from '../../core/blind/index.ts';
import type { Finding } from '../../core/checks/findings.ts';
import { filterQueue, itemAtPlace, overridesEveryone, queueProgress, speciesPairs, type DisagreementKind, type QueueItem } from '../../core/rulings/index.ts';
import { settledPatchesBySpecies } from '../../core/rulings/speciesSpectrum.ts';
import { namesNoSpecies } from '../../core/blind/answers.ts';
import type { MultiPolygonRings } from '../../core/geometry/types.ts';
import { tagsOfPatch, type Ruling, type RulingDecision, type SiteState } from '../../core/site/index.ts';
import type { SiteStore } from '../../store/SiteStore.ts';
import { systemClock } from '../../app/site/context.ts';
import { tellFailure } from '../state/tellFailure.ts';
import { rulingsPlaceOf, type RulingsPlace, type StatusFilter } from './RulingsPlace.svelte.ts';

// The state of the Rulings page: the queue of the stored site, its filters, the patch
// in hand, the reason being written and what the last action did. Every decision goes
// through the ruling use cases; the page only presents and forwards keys and clicks.
// The filters and the patch in hand live in the site's RulingsPlace, so they outlast the page.

export type { StatusFilter };

export class RulingsDesk {
  #raw = $state.raw<SiteState>(null as unknown as SiteState);
  #queue = $derived.by<RulingsQueue>(() => rulingsQueue(this.#raw, this.interpreter));
  #settled = $derived.by(() => settledPatchesBySpecies(this.#queue.view));
  reason = $state('');
  /** a decision waiting for its reason (it overrides every call) */
  pending = $state.raw<RulingDecision | null>(null);
  message = $state<{ text: string; problem: boolean } | null>(null);
  busy = $state(false);

  readonly #store: SiteStore;
  readonly #now: () => string;
  readonly #unsubscribe: () => void;
  readonly #place: RulingsPlace;

  constructor(store: SiteStore, readonly interpreter: string, now: () => string = systemClock, place: RulingsPlace = rulingsPlaceOf(store)) {
    this.#store = store;
    this.#now = now;
    this.#place = place;
    this.#raw = store.state;
    this.#unsubscribe = store.subscribe((s) => (this.#raw = s));
  }

  dispose(): void {
    this.#unsubscribe();
  }

  get kind(): DisagreementKind | '' { return this.#place.kind; }
  set kind(value: DisagreementKind | '') { this.#place.kind = value; }
  get who(): string { return this.#place.who; }
  set who(value: string) { this.#place.who = value; }
  /** 'A|B' species pair, or '' */
  get pair(): string { return this.#place.pair; }
  set pair(value: string) { this.#place.pair = value; }
  get status(): StatusFilter { return this.#place.status; }
  set status(value: StatusFilter) { this.#place.status = value; }
  /** the patch in hand; kept by id so a new ruling does not lose the place */
  get patchId(): string | null { return this.#place.patchId; }

  get all(): QueueItem[] {
    return this.#queue.items;
  }

  get progress() {
    return queueProgress(this.#queue.items);
  }

  get pairs(): [string, string][] {
    return speciesPairs(this.#queue.items);
  }

  get interpreters(): string[] {
    const names = this.#queue.items.flatMap((i) => i.calls.map((c) => c.interpreter));
    return names.filter((n, i) => names.indexOf(n) === i).sort();
  }

  get items(): QueueItem[] {
    const pair = this.pair ? (this.pair.split('|') as [string, string]) : undefined;
    return filterQueue(this.#queue.items, { kind: this.kind || undefined, interpreter: this.who || undefined, pair, status: this.status });
  }

  /** The ruler's own open blind pass, while there is one: the page stays shut. */
  get blindPass(): string | null {
    return openBlindPassOf(this.#raw, this.interpreter)?.id ?? null;
  }

  get roster() {
    return this.#raw.roster;
  }

  /** The patch in hand: the chosen one while the queue holds it, else the one now at its place (core/rulings/place.ts). */
  get current(): QueueItem | null {
    return itemAtPlace(this.items, this.#queue.items, this.#place);
  }

  get position(): number {
    const cur = this.current;
    return cur ? this.items.findIndex((i) => i.patchId === cur.patchId) : -1;
  }

  get patch() {
    const cur = this.current;
    return cur ? this.#queue.view.patches.get(cur.patchId) ?? null : null;
  }

  /** Every ruling ever made on the patch in hand, newest first (reopened ones included). */
  get history(): Ruling[] {
    const cur = this.current;
    if (!cur) return [];
    return [...this.#raw.rulings.values()].filter((r) => r.patchId === cur.patchId).sort((a, b) => b.time.localeCompare(a.time) || b.id.localeCompare(a.id));
  }

  /** The species the patch in hand is called or ruled, in call order, for its spectrum's company. */
  get speciesInvolved(): string[] {
    const cur = this.current;
    if (!cur) return [];
    const named = [...cur.calls.map((c) => c.species), cur.consensus.species ?? ''];
    const roster = this.#raw.roster.map((e) => e.code);
    return named.filter((s, i) => named.indexOf(s) === i && !namesNoSpecies(s) && roster.includes(s));
  }

  /** The outlines of the patches settled as a species. */
  settledOutlines(species: string): MultiPolygonRings[] {
    const patches = this.#queue.view.patches;
    return (this.#settled.get(species) ?? []).map((id) => patches.get(id)!.geometry);
  }

  get findings(): Finding[] {
    const cur = this.current;
    return cur ? this.#queue.findings.filter((f) => f.patches.map(String).includes(cur.patchId)) : [];
  }

  describe(decision: RulingDecision): string {
    return describeDecision(decision);
  }

  /** Steps through the listed items; wraps at the ends. */
  step(by: 1 | -1): void {
    const items = this.items;
    if (!items.length) return;
    const at = this.position;
    const next = at < 0 ? 0 : (at + by + items.length) % items.length;
    this.choose(items[next].patchId);
  }

  choose(patchId: string): void {
    this.#hold(patchId);
    this.reason = '';
    this.pending = null;
  }

  /** Notes the patch in hand as the place to come back to (before leaving for the desk). */
  keepPlace(): void {
    const cur = this.current;
    if (cur) this.#hold(cur.patchId);
  }

  /** Accepts the call of the n-th pass on the patch (0: A, 1: B, ...). */
  acceptCall(n: number): Promise<boolean> {
    const call = this.current?.calls[n];
    if (!call) {
      this.message = { text: `This patch has no call ${String.fromCharCode(65 + n)}.`, problem: true };
      return Promise.resolve(false);
    }
    return this.decide({ kind: 'accept', passId: call.passId });
  }

  speciesByKey(key: string): Promise<boolean> | null {
    const entry = this.#raw.roster.find((e) => e.key && e.key.toLowerCase() === key.toLowerCase());
    return entry ? this.decide({ kind: 'species', species: entry.code }) : null;
  }

  /**
   * Records a decision on the patch in hand. One that overrides every call waits for a
   * reason: the page then asks for it and `confirm` records it.
   */
  async decide(decision: RulingDecision): Promise<boolean> {
    const cur = this.current;
    if (!cur || this.busy) return false;
    if (cur.ruling) {
      this.message = { text: `Patch ${cur.patchId} is settled by ${cur.ruling.id}: reopen it (Shift+R) to rule again.`, problem: true };
      return false;
    }
    const tags = tagsOfPatch(this.#raw, cur.patchId);
    if (overridesEveryone(decision, tags) && !this.reason.trim()) {
      this.pending = decision;
      this.message = { text: `“${describeDecision(decision)}” overrides every call: write the reason and press Enter.`, problem: false };
      return false;
    }
    return this.#run(async () => {
      const ruling = await recordRuling(this.#store, { patchId: cur.patchId, decision, reason: this.reason, seen: null }, { interpreter: this.interpreter, time: this.#now() });
      this.message = { text: `Patch ${cur.patchId}: ${describeDecision(decision)} (${ruling.id}).`, problem: false };
      this.reason = '';
      this.pending = null;
      this.#advanceFrom(cur.patchId);
    });
  }

  /** Records the decision that waited for its reason. */
  confirm(): Promise<boolean> {
    return this.pending ? this.decide(this.pending) : Promise.resolve(false);
  }

  reopen(): Promise<boolean> {
    const cur = this.current;
    if (!cur?.ruling) {
      this.message = { text: 'There is no ruling in force on this patch to reopen.', problem: true };
      return Promise.resolve(false);
    }
    if (!this.reason.trim()) {
      this.message = { text: 'Write why the ruling is reopened (R), then press Shift+R again.', problem: true };
      return Promise.resolve(false);
    }
    const ruling = cur.ruling;
    return this.#run(async () => {
      const outcome = await reopenRuling(this.#store, ruling.id, this.reason, { interpreter: this.interpreter, time: this.#now() });
      const gone = outcome.passesGone.length ? ` Passes without their call here now: ${outcome.passesGone.join(', ')}.` : '';
      this.message = { text: `Ruling ${ruling.id} reopened; it stays in the history.${gone}`, problem: false };
      this.reason = '';
    });
  }

  sendToThird(reader: string): Promise<boolean> {
    const cur = this.current;
    if (!cur) return Promise.resolve(false);
    return this.#run(async () => {
      const pass = await sendToThirdReader(this.#store, cur.patchId, reader, { interpreter: this.interpreter, time: this.#now() });
      this.message = { text: `Patch ${cur.patchId} sent to ${pass.interpreter} in blind pass ${pass.id}.`, problem: false };
    });
  }

  #advanceFrom(patchId: string): void {
    const items = this.items;
    const open = items.find((i) => i.patchId !== patchId && !i.settled);
    this.#hold(open?.patchId ?? patchId);
  }

  #hold(patchId: string): void {
    this.#place.patchId = patchId;
    const at = this.items.findIndex((i) => i.patchId === patchId);
    if (at >= 0) this.#place.position = at;
  }

  async #run(work: () => Promise<void>): Promise<boolean> {
    this.busy = true;
    try {
      return await tellFailure(work, (text) => (this.message = { text, problem: true }));
    } finally {
      this.busy = false;
    }
  }
}
