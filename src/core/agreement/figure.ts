/**
 * A figure that may be undefined for the data at hand (one class only, no pairs):
 * then `value` is null and `reason` says why, so nothing downstream ever sees NaN.
 */
export type Figure<T = number> =
  | { value: T; reason: null }
  | { value: null; reason: string };

export function defined<T>(value: T): Figure<T> {
  return { value, reason: null };
}

export function undefinedBecause<T = number>(reason: string): Figure<T> {
  return { value: null, reason };
}
