// Schemes: named mappings from species codes to training classes (lumping). A scheme
// must say where every species of the training set goes; a species it leaves out is
// an error that names the species, and those patches stay out of every figure.

export interface Scheme {
  name: string;
  /** Species code → class name. */
  classOf: Record<string, string>;
}

/** What a scheme needs to know of a roster entry. */
export interface SchemeSpecies {
  code: string;
  group: string;
}

export const OTHER_CLASS = 'other';

/** Every species its own class. */
export function speciesScheme(species: readonly string[], name = 'all species'): Scheme {
  return { name, classOf: Object.fromEntries(species.map((s) => [s, s])) };
}

/** The species of one group (e.g. conifers) each their own class; every other species lumped. */
export function groupScheme(roster: readonly SchemeSpecies[], group: string, other = OTHER_CLASS, name = `${group}s by species, the rest as ${other}`): Scheme {
  return { name, classOf: Object.fromEntries(roster.map((s) => [s.code, s.group === group ? s.code : other])) };
}

/** One target species against everything else. */
export function oneAgainstRestScheme(species: readonly string[], target: string, rest = `not ${target}`, name = `${target} against the rest`): Scheme {
  return { name, classOf: Object.fromEntries(species.map((s) => [s, s === target ? target : rest])) };
}

export interface SchemeApplied {
  /** The class of each input species, or null when the scheme leaves it unmapped. */
  classes: (string | null)[];
  /** Species the scheme does not map, each once, in first-seen order. */
  unmapped: string[];
  /** One message per unmapped species, naming it and how many items carry it. */
  messages: string[];
}

export function applyScheme(scheme: Scheme, species: readonly string[]): SchemeApplied {
  const missing = new Map<string, number>();
  const classes = species.map((s) => {
    const cls = Object.hasOwn(scheme.classOf, s) ? scheme.classOf[s] : undefined;
    if (cls === undefined) {
      missing.set(s, (missing.get(s) ?? 0) + 1);
      return null;
    }
    return cls;
  });
  const unmapped = [...missing.keys()];
  const messages = unmapped.map((s) =>
    `scheme "${scheme.name}" leaves species ${s} unmapped: its ${missing.get(s)} patch(es) are left out until it is given a class`);
  return { classes, unmapped, messages };
}

/** Why a scheme cannot be used, or null. */
export function schemeProblem(scheme: Scheme): string | null {
  if (typeof scheme.name !== 'string' || scheme.name.trim() === '') return 'a scheme needs a name';
  const entries = Object.entries(scheme.classOf ?? {});
  if (entries.length === 0) return `scheme "${scheme.name}" maps no species`;
  const blank = entries.find(([, cls]) => typeof cls !== 'string' || cls.trim() === '');
  if (blank) return `scheme "${scheme.name}" gives species ${blank[0]} an empty class name`;
  return null;
}
