import type { DisagreementKind, QueuePlace } from '../../core/rulings/index.ts';

// The place of the person ruling in the queue, kept for the open site while the Rulings
// page is closed: its filters, the patch in hand and that patch's position in the list.
// Going to the desk to split a patch, or to a sheet, and coming back finds it as it was.

export type StatusFilter = 'open' | 'settled' | 'all';

export class RulingsPlace implements QueuePlace {
  kind = $state<DisagreementKind | ''>('');
  who = $state('');
  /** 'A|B' species pair, or '' */
  pair = $state('');
  status = $state<StatusFilter>('open');
  patchId = $state<string | null>(null);
  position = $state(0);
}

const places = new WeakMap<object, RulingsPlace>();

/** The place kept for a site (by its store): the same object each time, until the site is let go. */
export function rulingsPlaceOf(site: object): RulingsPlace {
  let place = places.get(site);
  if (!place) places.set(site, (place = new RulingsPlace()));
  return place;
}
