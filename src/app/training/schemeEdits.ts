import type { LedgerEvent, SiteState } from '../../core/site/index.ts';
import { schemeProblem, type Scheme } from '../../core/training/scheme.ts';
import type { DraftMaker } from '../../store/SiteStore.ts';

// The site's named training schemes, edited on the Training sheet. Every change stores
// the whole list with the list it replaces (one 'schemes.set' event), so it can be undone
// like any edit, and a refused change writes nothing.

/** What a use case needs of a store: one event made from the current state (SiteStore fits). */
export interface SchemeStore {
  readonly state: SiteState;
  commitWith(make: DraftMaker): Promise<LedgerEvent | null>;
}

export class SchemeRefused extends Error {
  override name = 'SchemeRefused';
}

/** The scheme as it will be stored: a trimmed name, class names trimmed, blank ones left unmapped. */
export function cleanScheme(scheme: Scheme): Scheme {
  const classOf: Record<string, string> = {};
  for (const [species, cls] of Object.entries(scheme.classOf)) if (cls.trim()) classOf[species] = cls.trim();
  return { name: scheme.name.trim(), classOf };
}

/**
 * Stores a scheme: a new one (replacing null) goes last; an edited one keeps its place
 * (and may be renamed). Refused, with the reason, when it is empty or takes another
 * scheme's name. Resolves to null when nothing changed.
 */
export function saveScheme(store: SchemeStore, scheme: Scheme, replacing: string | null, who: { interpreter: string; time: string }): Promise<LedgerEvent | null> {
  const clean = cleanScheme(scheme);
  return store.commitWith((state) => {
    const problem = schemeProblem(clean);
    if (problem) throw new SchemeRefused(`The scheme was not saved: ${problem}.`);
    const at = replacing === null ? -1 : state.schemes.findIndex((s) => s.name === replacing);
    if (replacing !== null && at < 0) throw new SchemeRefused(`The scheme "${replacing}" is no longer stored (changed in another window?): nothing was saved.`);
    if (state.schemes.some((s, i) => i !== at && s.name.toLowerCase() === clean.name.toLowerCase())) {
      throw new SchemeRefused(`The scheme was not saved: another scheme is already called "${clean.name}".`);
    }
    const schemes = at < 0 ? [...state.schemes, clean] : state.schemes.map((s, i) => (i === at ? clean : s));
    if (JSON.stringify(schemes) === JSON.stringify(state.schemes)) return null;
    return { kind: 'schemes.set', payload: { schemes, previous: [...state.schemes] }, actor: who.interpreter, time: who.time };
  });
}

/** Removes a stored scheme by name (one undoable event). */
export function deleteScheme(store: SchemeStore, name: string, who: { interpreter: string; time: string }): Promise<LedgerEvent | null> {
  return store.commitWith((state) => {
    if (!state.schemes.some((s) => s.name === name)) throw new SchemeRefused(`There is no stored scheme called "${name}".`);
    const schemes = state.schemes.filter((s) => s.name !== name);
    return { kind: 'schemes.set', payload: { schemes, previous: [...state.schemes] }, actor: who.interpreter, time: who.time };
  });
}
