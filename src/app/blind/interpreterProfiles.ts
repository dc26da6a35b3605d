// The interpreters who work on this machine: name and initials, which one is at the
// desk, and a record of every switch (who, to whom, when). Switching is always an
// explicit act, never implied by a pass or a file. The book lives in a small key-value
// store of the machine (the browser's local storage in the app), not in a site: one
// person works on many sites.

export interface InterpreterProfile {
  name: string;
  initials: string;
}

export interface ProfileSwitch {
  from: string | null;
  to: string;
  time: string;
}

/** Where the book is kept: the plain string get/set of local storage. */
export interface KeyValueStore {
  getItem(key: string): string | null;
  setItem(key: string, value: string): void;
}

interface Book {
  profiles: InterpreterProfile[];
  current: string | null;
  switches: ProfileSwitch[];
}

const KEY = 'fellfield.interpreters';
/** Switches kept; older ones fall off (tags record their interpreter themselves). */
const SWITCHES_KEPT = 500;

export class ProfileRefused extends Error {
  override name = 'ProfileRefused';
}

export class InterpreterProfiles {
  #book: Book;

  constructor(private readonly storage: KeyValueStore, private readonly now: () => string) {
    this.#book = read(storage.getItem(KEY));
  }

  get profiles(): readonly InterpreterProfile[] {
    return this.#book.profiles;
  }

  get current(): InterpreterProfile | null {
    return this.#book.profiles.find((p) => p.name === this.#book.current) ?? null;
  }

  get switches(): readonly ProfileSwitch[] {
    return this.#book.switches;
  }

  /** Adds a profile; the first one added is taken to the desk at once (and that is recorded). */
  add(name: string, initials: string): InterpreterProfile {
    const profile = { name: name.trim().replace(/\s+/g, ' '), initials: initials.trim().toUpperCase() };
    if (!profile.name) throw new ProfileRefused('Give the interpreter a name.');
    if (profile.name.length > 60) throw new ProfileRefused('Keep the name under 60 characters.');
    if (!/^\p{L}{1,4}$/u.test(profile.initials)) throw new ProfileRefused('Initials are one to four letters, e.g. "AB".');
    const clash = this.#book.profiles.find((p) => p.name.toLowerCase() === profile.name.toLowerCase() || p.initials === profile.initials);
    if (clash) throw new ProfileRefused(clash.initials === profile.initials && clash.name.toLowerCase() !== profile.name.toLowerCase()
      ? `${clash.name} already uses the initials ${profile.initials}.`
      : `There is already an interpreter called ${clash.name}.`);
    this.#book = { ...this.#book, profiles: [...this.#book.profiles, profile] };
    if (!this.#book.current) this.switchTo(profile.name);
    else this.#save();
    return profile;
  }

  /** Puts another interpreter at the desk, recording the switch. */
  switchTo(name: string): InterpreterProfile {
    const profile = this.#book.profiles.find((p) => p.name === name);
    if (!profile) throw new ProfileRefused(`There is no interpreter called ${name} on this machine.`);
    if (this.#book.current === name) return profile;
    const entry: ProfileSwitch = { from: this.#book.current, to: name, time: this.now() };
    this.#book = { ...this.#book, current: name, switches: [...this.#book.switches, entry].slice(-SWITCHES_KEPT) };
    this.#save();
    return profile;
  }

  #save(): void {
    this.storage.setItem(KEY, JSON.stringify(this.#book));
  }
}

function read(text: string | null): Book {
  const empty: Book = { profiles: [], current: null, switches: [] };
  if (!text) return empty;
  try {
    const doc = JSON.parse(text) as Partial<Book>;
    const profiles = Array.isArray(doc.profiles)
      ? doc.profiles.filter((p): p is InterpreterProfile => typeof p?.name === 'string' && typeof p?.initials === 'string')
      : [];
    const current = typeof doc.current === 'string' && profiles.some((p) => p.name === doc.current) ? doc.current : null;
    const switches = Array.isArray(doc.switches) ? doc.switches.filter((s) => typeof s?.to === 'string' && typeof s?.time === 'string') : [];
    return { profiles, current, switches };
  } catch {
    // A damaged book starts afresh: tags keep their interpreter names whatever happens here.
    return empty;
  }
}
