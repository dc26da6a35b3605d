import { readBlindPackage, type BlindPackage } from '../../core/blind/index.ts';
import { SiteStore, type StoreOptions } from '../../store/SiteStore.ts';
import { StorageError } from '../../store/StorageError.ts';
import { receiveBlindPackage, receivedSiteEvents, receivedSiteId } from './blindFiles.ts';
import { InterpreterProfiles, ProfileRefused } from './interpreterProfiles.ts';

// On the answering machine: a blind package file becomes a site of its own (its scenes,
// roster, outlines and the open blind pass, no call of anyone), checked to rebuild the
// very package it came from. Opening the same package again opens that site as it was
// left; a site cut short by a crash is made again from the file.

export interface ReceivedPackage {
  store: SiteStore;
  pkg: BlindPackage;
  /** false when the package had been opened on this machine before */
  fresh: boolean;
}

async function existing(siteId: string, options: StoreOptions): Promise<SiteStore | null> {
  try {
    return await SiteStore.open(siteId, options);
  } catch (error) {
    if (error instanceof StorageError && error.kind === 'unavailable' && /^No site/.test(error.message)) return null;
    throw error;
  }
}

export async function receivePackageFile(fileName: string, text: string, now: () => string, options: StoreOptions = {}): Promise<ReceivedPackage> {
  const pkg = await readBlindPackage(fileName, text);
  const id = receivedSiteId(pkg);
  const before = await existing(id, options);
  if (before?.state.passes.has(pkg.pass.id)) return { store: before, pkg, fresh: false };
  if (before) {
    before.close();
    await SiteStore.remove(id, options);
  }
  const actor = { interpreter: pkg.pass.interpreter, time: now() };
  const store = await SiteStore.create(receivedSiteEvents(pkg, actor).site, actor.interpreter, options);
  try {
    await receiveBlindPackage(store, pkg, actor);
  } catch (error) {
    store.close();
    await SiteStore.remove(id, options);
    throw error;
  }
  return { store, pkg, fresh: true };
}

/** Initials to try for a name: the words' first letters, then longer cuts. */
function initialsFor(name: string): string[] {
  const words = name.split(/[^\p{L}]+/u).filter(Boolean);
  const letters = words.join('');
  const tries = [words.map((w) => w[0]).join('').slice(0, 4), letters.slice(0, 2), letters.slice(0, 3), letters.slice(0, 4), `${letters[0] ?? ''}${letters.at(-1) ?? ''}`];
  return [...new Set(tries.map((t) => t.toUpperCase()).filter((t) => t.length > 0))];
}

/**
 * Puts the interpreter the package is addressed to at this machine's desk (the switch is
 * recorded in the profile book), adding their profile first when this machine has none.
 */
export function deskForPackage(profiles: InterpreterProfiles, interpreter: string): string {
  if (!profiles.profiles.some((p) => p.name === interpreter)) {
    let added = false;
    for (const initials of initialsFor(interpreter)) {
      try {
        profiles.add(interpreter, initials);
        added = true;
        break;
      } catch (error) {
        if (!(error instanceof ProfileRefused) || /already an interpreter called/.test(error.message)) throw error;
      }
    }
    if (!added) throw new ProfileRefused(`No free initials for ${interpreter}: add their profile on the desk first.`);
  }
  profiles.switchTo(interpreter);
  return interpreter;
}
