// Storage failures told in words a user can act on. IndexedDB reports a full disk or a
// used-up quota as QuotaExceededError, but inside a transaction it often surfaces as an
// AbortError whose `inner` (Dexie) or `cause` carries the quota error, or as a Dexie
// BulkError whose `failures` hold it, so we look down the chain.

export class StorageError extends Error {
  constructor(
    message: string,
    readonly kind: 'full' | 'refused' | 'stale' | 'unavailable' | 'other',
    readonly original?: unknown,
  ) {
    super(message);
    this.name = 'StorageError';
  }
}

type Link = { name?: string; message?: string; inner?: unknown; cause?: unknown; failures?: unknown };

function chain(error: unknown): Link[] {
  const seen: Link[] = [];
  let current = error as Link | undefined;
  while (current && typeof current === 'object' && seen.length < 8) {
    seen.push(current);
    // A bulk write fails as a whole when one of its writes fails: follow the first.
    const failure = Array.isArray(current.failures) ? current.failures[0] : undefined;
    current = (current.inner ?? current.cause ?? failure) as Link | undefined;
  }
  return seen;
}

/** Errors that only wrap another: they say nothing of the cause themselves. */
const WRAPPERS = new Set(['Error', 'BulkError']);

export function isQuotaError(error: unknown): boolean {
  return chain(error).some((e) => e.name === 'QuotaExceededError' || /quota/i.test(e.message ?? ''));
}

/** Turns a failed IndexedDB operation into a StorageError naming the site and what to do. */
export function storageError(error: unknown, siteName: string): StorageError {
  if (error instanceof StorageError) return error;
  if (isQuotaError(error)) {
    return new StorageError(
      `Site "${siteName}": the last change was not saved because the disk is full or this app's storage quota is used up. ` +
        'Everything saved before it is kept. Free some disk space (or remove sites you no longer need), ' +
        'save a backup of this site to another disk, then try the change again.',
      'full',
      error,
    );
  }
  const first = chain(error)[0];
  // Dexie appends the inner error's text on further lines; one line is enough to show.
  const said = `${first?.name ?? 'Error'}: ${(first?.message ?? String(error)).split('\n')[0]}`;
  // A transaction aborted with no other cause: what Chromium reports when the disk itself
  // fills before the quota is reached.
  const links = chain(error);
  const aborted = (e: { name?: string }) => e.name === 'AbortError' || e.name === 'UnknownError';
  if (links.some(aborted) && links.every((e) => aborted(e) || WRAPPERS.has(e.name ?? ''))) {
    return new StorageError(
      `Site "${siteName}": the last change was not saved because the browser's storage refused it (${said}); a full disk is the usual cause. ` +
        'Everything saved before it is kept. Free some disk space, save a backup of this site to another disk, then try the change again.',
      'refused',
      error,
    );
  }
  if (first?.name === 'InvalidStateError' || first?.name === 'UnknownError' || first?.name === 'DatabaseClosedError') {
    return new StorageError(
      `Site "${siteName}": the browser's storage is not available (${said}). ` +
        'Close other windows of the app and reopen the site; if the store stays unreadable, restore it from the copy on disk or a backup.',
      'unavailable',
      error,
    );
  }
  return new StorageError(`Site "${siteName}": saving failed (${said})`, 'other', error);
}
