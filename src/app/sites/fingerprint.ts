import { PlatformError } from '../../platform/errors.ts';
import type { FileRef, Platform } from '../../platform/types.ts';
import { hashFile, type Hasher } from './fileHash.ts';
import type { FingerprintCache } from './fingerprintCache.ts';
import type { ProgressOptions } from './sceneImagery.ts';

// The SHA-256 fingerprints of a set of imagery files, for a new site (recorded in its
// ledger) and for a stored site's files (compared with the ledger). A file whose name,
// size and modification time were fingerprinted before on this machine is taken from the
// cache; the others are read through and hashed, with progress over their bytes, and kept.

export interface Fingerprint {
  /** lower-case hex SHA-256 */
  sha256: string;
  /** 'earlier': the file is unchanged since it was fingerprinted before; 'now': read and hashed now */
  how: 'earlier' | 'now';
}

export interface FingerprintOptions extends ProgressOptions {
  hasher: Hasher;
  /** fingerprints taken before; none: every file is hashed */
  cache?: FingerprintCache;
}

/** What a screen holds to fingerprint with: the hashing worker and the fingerprints kept on this machine. */
export type FingerprintTools = Pick<FingerprintOptions, 'hasher' | 'cache'>;

/** The fingerprint of each file, in order. */
export async function fingerprint(platform: Pick<Platform, 'readRange'>, files: FileRef[], options: FingerprintOptions): Promise<Fingerprint[]> {
  const { onProgress = () => {}, signal, hasher, cache } = options;
  const known = await Promise.all(files.map((f) => cache?.get(f) ?? null));
  const toHash = files.filter((_, i) => known[i] === null);
  const total = toHash.reduce((s, f) => s + f.size, 0) || 1;
  let before = 0;
  const result: Fingerprint[] = [];
  for (const [i, file] of files.entries()) {
    if (signal?.aborted) throw new PlatformError('aborted', 'the check was cancelled', file.name);
    const earlier = known[i];
    if (earlier !== null) {
      result.push({ sha256: earlier, how: 'earlier' });
      continue;
    }
    const label = `Fingerprinting ${file.name} (SHA-256)`;
    onProgress({ label, fraction: before / total });
    const sha256 = await hashFile(platform, file, hasher, { signal, onBytes: (n) => onProgress({ label, fraction: (before + n) / total }) });
    await cache?.put(file, sha256);
    result.push({ sha256, how: 'now' });
    before += file.size;
  }
  return result;
}
