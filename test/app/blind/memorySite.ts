import { sealEvent } from '../../../src/core/ledger/chain.ts';
import { applyEvent, emptySiteState, type EventDraft, type LedgerEvent, type SiteState } from '../../../src/core/site/index.ts';
import type { SiteWriter } from '../../../src/app/blind/siteWriter.ts';
import type { KeyValueStore } from '../../../src/app/blind/interpreterProfiles.ts';

// A site kept in memory with the store's own rules: each change is sealed into the hash
// chain and applied by the site reducer, in call order, from the state at its turn, and
// a change that throws leaves nothing behind. Only the IndexedDB write is left out
// (the store itself is tested in test/store on real IndexedDB).

export class MemorySite implements SiteWriter {
  state: SiteState;
  events: LedgerEvent[] = [];
  #queue: Promise<unknown> = Promise.resolve();

  constructor(state: SiteState = emptySiteState(), events: LedgerEvent[] = []) {
    this.state = state;
    this.events = [...events];
  }

  commitWith(make: (state: SiteState) => EventDraft | null | Promise<EventDraft | null>): Promise<LedgerEvent | null> {
    const run = this.#queue.then(async () => {
      const draft = await make(this.state);
      if (!draft) return null;
      const event = await sealEvent(draft, this.state.head);
      this.state = applyEvent(this.state, event);
      this.events.push(event);
      return event;
    });
    this.#queue = run.catch(() => undefined);
    return run;
  }
}

export class MemoryKeyValue implements KeyValueStore {
  readonly items = new Map<string, string>();
  getItem(key: string): string | null {
    return this.items.get(key) ?? null;
  }
  setItem(key: string, value: string): void {
    this.items.set(key, value);
  }
}
