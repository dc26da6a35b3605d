import type { RosterEntry } from '../site/types.ts';

// What an interpreter may answer in a blind pass beside a roster species. "unknown" is
// a plant the roster does not name (or one the interpreter cannot name); "can't tell"
// means the imagery does not allow a call at all (shadow, blur, cloud), which is worth
// keeping apart because it says something about the scene, not the plant.

export const CANT_TELL = "can't tell";
export const BLIND_ANSWERS = ['mixed', 'unknown', CANT_TELL] as const;
export type BlindAnswer = (typeof BLIND_ANSWERS)[number];

/** Whether `species` is a valid call in a blind pass: a roster code or one of the blind answers. */
export function isBlindCall(roster: readonly RosterEntry[], species: string): boolean {
  return (BLIND_ANSWERS as readonly string[]).includes(species) || roster.some((e) => e.code === species);
}

/** Calls that name no species, so they never settle a patch or count as agreement on one. */
export function namesNoSpecies(species: string): boolean {
  return species === 'unknown' || species === CANT_TELL;
}
