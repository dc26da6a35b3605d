import type { RosterEntry } from '../site/types.ts';
import { groupScheme, type Scheme } from '../training/scheme.ts';

// The schemes an export offers by name: first those stored with the site (edited on the
// Training sheet), then the ones every roster has: each species its own class
// ("species", no scheme), each group a class ("groups"), or one group's species apart
// with the rest lumped (named after the group). A stored scheme keeps its name; a
// built-in one of the same name gives way to it.

export interface NamedScheme {
  name: string;
  label: string;
  scheme: Scheme | null;
  /** stored with the site */
  stored: boolean;
}

export function namedSchemes(roster: readonly RosterEntry[], stored: readonly Scheme[] = []): NamedScheme[] {
  const groups = [...new Set(roster.map((e) => e.group))].sort();
  const own = stored.map((s) => ({ name: s.name, label: 'stored with the site', scheme: s, stored: true }));
  const taken = new Set(own.map((s) => s.name));
  const builtIn: NamedScheme[] = [
    { name: 'species', label: 'each species its own class', scheme: null, stored: false },
    { name: 'groups', label: 'one class per group', scheme: { name: 'groups', classOf: Object.fromEntries(roster.map((e) => [e.code, e.group])) }, stored: false },
    ...groups.map((g) => ({ name: g, label: `${g} species apart, the rest as other`, scheme: groupScheme(roster, g), stored: false })),
  ];
  return [...own, ...builtIn.filter((s) => !taken.has(s.name))];
}
