import { Random } from '../random.ts';

// The order a blind pass walks its patches: shuffled, so neither the patch ids nor the
// first interpreter's order (often by species or by position) hint at a call.

/** A Fisher-Yates shuffle of the ids (sorted first, so the input order does not matter), fixed by the seed. */
export function shuffledOrder(patchIds: readonly string[], seed: number): string[] {
  const ids = [...new Set(patchIds)].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  return new Random(seed).fork('blind order').shuffle(ids);
}
