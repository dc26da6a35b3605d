import type { SiteStore } from '../../store/SiteStore.ts';

/** What every site use case needs: the open store, who is working, and a clock. */
export interface SiteContext {
  store: SiteStore;
  interpreter: string;
  /** ISO 8601 UTC; passed in so tests and replays can fix it */
  now(): string;
}

export const systemClock = (): string => new Date().toISOString();

/** A new id for a patch, import or pass. */
export function newId(prefix: string): string {
  return `${prefix}-${crypto.randomUUID()}`;
}
