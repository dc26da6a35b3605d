import { afterAll, describe, expect, it } from 'vitest';
import { StoredFingerprints } from '../../../src/app/sites/fingerprintCache.ts';

// The fingerprints kept on this machine, in real IndexedDB in Chromium: kept by name, size
// and modification time across instances (a later page), nothing kept for a file with no
// time, and a value that is not a SHA-256 never handed back. The cache computes nothing;
// the two digests kept are SHA-256 of "abc" (NIST FIPS PUB 180-2, Appendix B.1) and of the
// empty message (from memory).

const ABC = 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad';
const EMPTY = 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855';

afterAll(async () => {
  await new Promise((resolve) => { const r = indexedDB.deleteDatabase('fellfield-fingerprints'); r.onsuccess = r.onerror = resolve; });
});

describe('the fingerprints kept in IndexedDB', () => {
  it('hands back a fingerprint in a later page only for the same name, size and time', async () => {
    const file = { id: 'x', name: 'north-pan.tif', size: 3, modified: 1_717_000_000_000 };
    await new StoredFingerprints().put(file, ABC);
    await new StoredFingerprints().put({ ...file, name: 'north-ms.tif' }, EMPTY);
    const later = new StoredFingerprints();
    expect(await later.get({ ...file, id: 'another ref' })).toBe(ABC);
    expect(await later.get({ ...file, name: 'north-ms.tif' })).toBe(EMPTY);
    expect(await later.get({ ...file, modified: file.modified + 1 })).toBeNull();
    expect(await later.get({ ...file, size: 4 })).toBeNull();
    await later.put({ id: 'y', name: 'demo-pan.tif', size: 3 }, ABC);
    expect(await later.get({ id: 'y', name: 'demo-pan.tif', size: 3 })).toBeNull();
    await later.put({ ...file, name: 'bad.tif' }, 'not a digest');
    expect(await later.get({ ...file, name: 'bad.tif' })).toBeNull();
  });
});
