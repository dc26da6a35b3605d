import type { Verb } from '../verb.ts';
import { agree } from './agree.ts';
import { check } from './check.ts';
import { info } from './info.ts';

// One line per verb; each verb lives in its own file beside this one.
export const verbs: Verb[] = [
  agree,
  check,
  info,
];
