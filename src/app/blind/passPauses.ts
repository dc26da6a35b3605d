import type { KeyValueStore } from './interpreterProfiles.ts';

// Pausing a blind pass: the pass stays open (and everyone else's calls stay hidden from
// its interpreter), but its keys stop tagging until it is resumed, so a break or a
// hand-over to another interpreter cannot add a call by accident. Pauses are kept per
// machine with their times; the calls themselves carry their own times in the ledger.

export interface PausePeriod {
  pausedAt: string;
  resumedAt: string | null;
}

const key = (siteId: string) => `fellfield.blind-pauses.${siteId}`;

export class PassPauses {
  #periods: Record<string, PausePeriod[]>;

  constructor(private readonly storage: KeyValueStore, private readonly siteId: string, private readonly now: () => string) {
    try {
      const doc = JSON.parse(storage.getItem(key(siteId)) ?? '{}') as Record<string, PausePeriod[]>;
      this.#periods = doc && typeof doc === 'object' ? doc : {};
    } catch {
      this.#periods = {};
    }
  }

  isPaused(passId: string): boolean {
    const last = this.#periods[passId]?.at(-1);
    return last !== undefined && last.resumedAt === null;
  }

  periods(passId: string): readonly PausePeriod[] {
    return this.#periods[passId] ?? [];
  }

  pause(passId: string): void {
    if (this.isPaused(passId)) return;
    this.#periods = { ...this.#periods, [passId]: [...this.periods(passId), { pausedAt: this.now(), resumedAt: null }] };
    this.#save();
  }

  resume(passId: string): void {
    if (!this.isPaused(passId)) return;
    const list = [...this.periods(passId)];
    list[list.length - 1] = { ...list[list.length - 1], resumedAt: this.now() };
    this.#periods = { ...this.#periods, [passId]: list };
    this.#save();
  }

  #save(): void {
    this.storage.setItem(key(this.siteId), JSON.stringify(this.#periods));
  }
}
