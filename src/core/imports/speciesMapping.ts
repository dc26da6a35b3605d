import { RESERVED_CLASSES, type RosterEntry } from '../site/types.ts';
import type { FieldFeature } from './fieldFeatures.ts';

// The mapping step: one attribute of the field file (e.g. a species code column) turned
// into roster codes. Values that match a code, scientific or common name (ignoring case
// and surrounding space) map by themselves; the rest are listed for the user to map or
// leave untagged. None is dropped silently.

export interface AttributeSummary {
  name: string;
  /** features that have a non-empty value */
  filled: number;
  /** distinct values (as text), up to 50 */
  sample: string[];
}

/** The attributes of a file's features, for choosing which one holds the species. */
export function summariseAttributes(features: readonly FieldFeature[]): AttributeSummary[] {
  const byName = new Map<string, { filled: number; values: Set<string> }>();
  for (const f of features) {
    for (const [name, value] of Object.entries(f.attributes)) {
      const entry = byName.get(name) ?? { filled: 0, values: new Set<string>() };
      byName.set(name, entry);
      const text = valueText(value);
      if (text === '') continue;
      entry.filled++;
      if (entry.values.size < 50) entry.values.add(text);
    }
  }
  return [...byName].map(([name, e]) => ({ name, filled: e.filled, sample: [...e.values] }));
}

export function valueText(value: unknown): string {
  if (value === null || value === undefined) return '';
  return String(value).trim();
}

export interface SpeciesMapping {
  attribute: string;
  /** attribute value → roster code or reserved class */
  values: Record<string, string>;
  /** values no entry matched, with how many features carry each, most frequent first */
  unknown: { value: string; count: number }[];
  /** features whose attribute is empty or missing */
  empty: number;
}

/** Proposes a mapping of one attribute's values onto the roster. */
export function proposeMapping(features: readonly FieldFeature[], attribute: string, roster: readonly RosterEntry[]): SpeciesMapping {
  const lookup = new Map<string, string>();
  const norm = (s: string) => s.trim().toLowerCase();
  for (const r of RESERVED_CLASSES) lookup.set(r, r);
  for (const e of roster) {
    for (const name of [e.commonName, e.scientificName]) if (name) lookup.set(norm(name), e.code);
  }
  for (const e of roster) lookup.set(norm(e.code), e.code); // codes win over names
  const values: Record<string, string> = {};
  const unknown = new Map<string, number>();
  let empty = 0;
  for (const f of features) {
    const text = valueText(f.attributes[attribute]);
    if (text === '') {
      empty++;
      continue;
    }
    const code = lookup.get(norm(text));
    if (code) values[text] = code;
    else unknown.set(text, (unknown.get(text) ?? 0) + 1);
  }
  return {
    attribute,
    values,
    unknown: [...unknown].map(([value, count]) => ({ value, count })).sort((a, b) => b.count - a.count || a.value.localeCompare(b.value)),
    empty,
  };
}
