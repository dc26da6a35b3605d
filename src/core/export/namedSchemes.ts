import type { RosterEntry } from '../site/types.ts';
import { groupScheme, type Scheme } from '../training/scheme.ts';

// The schemes an export offers by name for a roster: each species its own class
// ("species", no scheme), each group a class ("groups"), or one group's species apart
// with the rest lumped (named after the group).

export interface NamedScheme {
  name: string;
  label: string;
  scheme: Scheme | null;
}

export function namedSchemes(roster: readonly RosterEntry[]): NamedScheme[] {
  const groups = [...new Set(roster.map((e) => e.group))].sort();
  return [
    { name: 'species', label: 'each species its own class', scheme: null },
    { name: 'groups', label: 'one class per group', scheme: { name: 'groups', classOf: Object.fromEntries(roster.map((e) => [e.code, e.group])) } },
    ...groups.map((g) => ({ name: g, label: `${g} species apart, the rest as other`, scheme: groupScheme(roster, g) })),
  ];
}
