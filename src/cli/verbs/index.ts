import type { Verb } from '../verb.ts';

// One line per verb; each verb lives in its own file beside this one.
export const verbs: Verb[] = [
];
