import type { InterpreterProfile } from './interpreterProfiles.ts';
import type { SiteWriter } from './siteWriter.ts';

// A switch of interpreter at the desk of an open site goes into that site's ledger as
// well as the machine's book of profiles, so the site's own history says who worked
// when, whichever machine it later travels to.

/** Records that `to` took the site's desk from `from`; nothing when it is the same person. */
export async function recordInterpreterSwitch(store: SiteWriter, from: string | null, to: InterpreterProfile, time: string): Promise<void> {
  if (from === to.name) return;
  await store.commitWith(() => ({ kind: 'interpreter.switched', payload: { from, to: to.name, initials: to.initials }, actor: to.name, time }));
}
