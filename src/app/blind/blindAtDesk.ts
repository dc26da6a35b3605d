import { openBlindPassOf } from '../../core/blind/index.ts';
import type { Pass, SiteState } from '../../core/site/index.ts';
import { InterpreterProfiles, type KeyValueStore } from './interpreterProfiles.ts';

// For pages beside the desk (export, training sheet): who is at the desk by this
// machine's profile book, and the blind pass they are in, if any. A page that shows or
// writes calls refuses, or reads through blindView, while one runs.

/** The interpreter at the desk; 'Interpreter A' (the desk's default) before any profile exists. */
export function interpreterAtDesk(storage: KeyValueStore): string {
  return new InterpreterProfiles(storage, () => new Date().toISOString()).current?.name ?? 'Interpreter A';
}

export function blindPassAtDesk(state: SiteState, storage: KeyValueStore): Pass | null {
  return openBlindPassOf(state, interpreterAtDesk(storage));
}
