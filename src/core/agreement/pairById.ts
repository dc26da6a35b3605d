import type { PairedCall } from './pairedCall.ts';

/** One side's call on a patch, as read from a label file or a pass. */
export interface CallOnPatch {
  id: string | number;
  species: string;
  confidence?: string;
  group?: string;
}

export interface IdMismatch {
  /** Ids found only in the first list, and only in the second (in input order). */
  onlyFirst: string[];
  onlySecond: string[];
  shared: number;
}

export type PairingResult =
  | { ok: true; pairs: PairedCall[] }
  | { ok: false; mismatch: IdMismatch };

/**
 * Pairs two interpreters' calls by patch id. Every id must appear on both sides:
 * otherwise nothing is paired and the mismatch says how many ids are unmatched on
 * each side, so the caller can refuse with a clear message. Pairs come in the first
 * list's order; confidence and group come from the first side.
 */
export function pairById(first: readonly CallOnPatch[], second: readonly CallOnPatch[]): PairingResult {
  const secondById = new Map<string, CallOnPatch>();
  for (const call of second) secondById.set(String(call.id), call);
  const firstIds = new Set<string>();
  const pairs: PairedCall[] = [];
  const onlyFirst: string[] = [];
  for (const call of first) {
    const id = String(call.id);
    firstIds.add(id);
    const other = secondById.get(id);
    if (!other) {
      onlyFirst.push(id);
      continue;
    }
    const pair: PairedCall = { id, first: call.species, second: other.species };
    if (call.confidence !== undefined) pair.confidence = call.confidence;
    if (call.group !== undefined) pair.group = call.group;
    pairs.push(pair);
  }
  const onlySecond = second.map((c) => String(c.id)).filter((id) => !firstIds.has(id));
  if (onlyFirst.length || onlySecond.length || pairs.length === 0) {
    return { ok: false, mismatch: { onlyFirst, onlySecond, shared: pairs.length } };
  }
  return { ok: true, pairs };
}

/** Ids that appear twice once read as text (1 and "1"), which pairing could not tell apart. */
export function collidingIds(calls: readonly CallOnPatch[]): string[] {
  const seen = new Set<string>();
  const twice = new Set<string>();
  for (const c of calls) {
    const id = String(c.id);
    if (seen.has(id)) twice.add(id);
    seen.add(id);
  }
  return [...twice];
}

export interface AlignedCalls {
  /** Patch ids in the first list's order. */
  ids: string[];
  /** calls[i][r]: interpreter r's class for patch ids[i]. */
  calls: string[][];
}

export type AlignmentResult =
  | { ok: true; aligned: AlignedCalls }
  /** mismatches[r - 1] compares list r with the first list; empty lists are never ok. */
  | { ok: false; mismatches: IdMismatch[] };

/**
 * Lines up three or more interpreters' calls by patch id (for Fleiss' kappa): every
 * list must hold exactly the ids of the first one.
 */
export function alignById(lists: readonly (readonly CallOnPatch[])[]): AlignmentResult {
  if (lists.length < 2) throw new RangeError(`aligning calls needs at least two lists, got ${lists.length}`);
  const [first, ...others] = lists;
  const byId = others.map((list) => new Map(list.map((c) => [String(c.id), c.species] as const)));
  const mismatches = others.map((list) => {
    const result = pairById(first, list);
    return result.ok ? null : result.mismatch;
  });
  if (mismatches.some((m) => m !== null)) {
    return { ok: false, mismatches: mismatches.map((m) => m ?? { onlyFirst: [], onlySecond: [], shared: first.length }) };
  }
  const ids = first.map((c) => String(c.id));
  const calls = first.map((c) => [c.species, ...byId.map((m) => m.get(String(c.id))!)]);
  return { ok: true, aligned: { ids, calls } };
}
