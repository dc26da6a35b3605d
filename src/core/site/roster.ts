import { RESERVED_CLASSES, type RosterEntry } from './types.ts';

// Rules a roster must keep: codes and keys unique (keys compared case-blind, since a
// key press does not tell 'P' from 'p' reliably across layouts), no code that is a
// reserved class, each key a single character.

export interface RosterProblem {
  /** 1-based row of the entry in its list */
  row: number;
  problem: string;
}

export function rosterProblems(entries: readonly RosterEntry[]): RosterProblem[] {
  const problems: RosterProblem[] = [];
  const codes = new Map<string, number>();
  const keys = new Map<string, number>();
  const reserved = new Set<string>(RESERVED_CLASSES);
  entries.forEach((entry, i) => {
    const row = i + 1;
    const code = entry.code.trim();
    if (!code) problems.push({ row, problem: 'the code is empty' });
    else if (reserved.has(code.toLowerCase())) problems.push({ row, problem: `code '${code}' is a reserved class` });
    else if (codes.has(code)) problems.push({ row, problem: `duplicate code '${code}' (also on row ${codes.get(code)})` });
    else codes.set(code, row);
    const key = entry.key.toLowerCase();
    if (key) {
      if ([...key].length !== 1) problems.push({ row, problem: `key '${entry.key}' is not a single character` });
      else if (keys.has(key)) problems.push({ row, problem: `duplicate key '${entry.key}' (also on row ${keys.get(key)})` });
      else keys.set(key, row);
    }
  });
  return problems;
}

/** Whether a species value can be a tag: a roster code or a reserved class. */
export function isTaggable(roster: readonly RosterEntry[], species: string): boolean {
  return (RESERVED_CLASSES as readonly string[]).includes(species) || roster.some((e) => e.code === species);
}
