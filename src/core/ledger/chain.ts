import type { EventDraft, LedgerEvent } from '../site/events.ts';
import { GENESIS_HASH } from '../site/state.ts';
import { canonicalJson } from './canonicalJson.ts';
import { sha256Hex } from './sha256.ts';

// The hash chain: each event's hash is the SHA-256 of the canonical JSON (RFC 8785) of
// all its members but `hash`, and that includes `prev`, the hash of the event before.
// Changing any byte of any event therefore changes its hash and breaks the link after it.

/** The text that is hashed: the event without its own hash. */
export function hashedText(event: Omit<LedgerEvent, 'hash'> | LedgerEvent): string {
  const { hash: _hash, ...rest } = event as LedgerEvent;
  return canonicalJson(rest);
}

/** Numbers and chains a draft after the given head. */
export async function sealEvent(draft: EventDraft, head: { seq: number; hash: string }): Promise<LedgerEvent> {
  const unsealed = { ...draft, seq: head.seq + 1, prev: head.hash } as Omit<LedgerEvent, 'hash'>;
  return { ...unsealed, hash: await sha256Hex(hashedText(unsealed)) } as LedgerEvent;
}

export type ChainCheck =
  | { ok: true; length: number; head: string }
  | { ok: false; /** the first event that does not verify */ seq: number; index: number; problem: string };

/**
 * Verifies a whole ledger from its first event: numbering, links and every hash.
 * Reports the first place where the chain breaks.
 */
export async function verifyChain(events: readonly LedgerEvent[]): Promise<ChainCheck> {
  let prev = GENESIS_HASH;
  for (let i = 0; i < events.length; i++) {
    const event = events[i];
    const fail = (problem: string): ChainCheck => ({ ok: false, seq: typeof event?.seq === 'number' ? event.seq : i + 1, index: i, problem });
    if (!event || typeof event !== 'object') return fail(`entry ${i + 1} is not an event`);
    if (event.seq !== i + 1) return fail(`event at position ${i + 1} is numbered ${String(event.seq)}`);
    if (event.prev !== prev) return fail(`event ${event.seq} does not link to the event before it`);
    let hash: string;
    try {
      hash = await sha256Hex(hashedText(event));
    } catch (error) {
      return fail(`event ${event.seq} cannot be hashed: ${(error as Error).message}`);
    }
    if (hash !== event.hash) return fail(`event ${event.seq} was changed after it was recorded (its hash does not match)`);
    prev = hash;
  }
  return { ok: true, length: events.length, head: prev };
}
