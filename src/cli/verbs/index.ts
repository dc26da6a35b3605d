import type { Verb } from '../verb.ts';
import { agree } from './agree.ts';
import { check } from './check.ts';
import { exportVerb } from './export.ts';
import { folds } from './folds.ts';
import { info } from './info.ts';
import { offset } from './offset.ts';
import { pixels } from './pixels.ts';

// One line per verb; each verb lives in its own file beside this one.
export const verbs: Verb[] = [
  agree,
  check,
  exportVerb,
  folds,
  info,
  offset,
  pixels,
];
