import type { SiteStore } from '../../store/SiteStore.ts';

/** What the blind-pass use cases need of a store: its state and its one way to change it. */
export type SiteWriter = Pick<SiteStore, 'state' | 'commitWith'>;
