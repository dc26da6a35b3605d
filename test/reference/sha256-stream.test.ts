import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { sha256Stream } from '../../src/core/ledger/sha256Stream.ts';
import { Random } from '../../src/core/random.ts';

// The incremental SHA-256 that fingerprints imagery files, checked against the examples
// of the standard and against Node's own crypto, fed in pieces of awkward sizes.

function streamed(message: Uint8Array, pieces: number[]): string {
  const hash = sha256Stream();
  let at = 0, i = 0;
  while (at < message.length) {
    const size = pieces[i++ % pieces.length];
    hash.update(message.subarray(at, at + size));
    at += size;
  }
  return hash.hex();
}

const ascii = (text: string) => new TextEncoder().encode(text);

describe('sha256Stream', () => {
  // NIST FIPS 180-2 (2002), Appendix B: B.1 "abc", B.2 the 448-bit message, B.3 one
  // million "a". Digests from memory, confirmed below by Node's crypto (OpenSSL).
  const examples: [string, Uint8Array, string][] = [
    ['B.1', ascii('abc'), 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'],
    ['B.2', ascii('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq'), '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'],
    ['B.3', new Uint8Array(1_000_000).fill(0x61), 'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0'],
  ];

  it.each(examples)('gives the digest of FIPS 180-2 example %s, whole and in pieces', (_, message, digest) => {
    expect(createHash('sha256').update(message).digest('hex')).toBe(digest);
    expect(streamed(message, [message.length])).toBe(digest);
    expect(streamed(message, [1, 63, 64, 65, 7919])).toBe(digest);
  });

  it('matches Node crypto on random bytes cut at block edges and between them', () => {
    const random = new Random(7);
    const message = Uint8Array.from({ length: 3 * 1024 * 1024 + 17 }, () => random.uint32() & 0xff);
    const expected = createHash('sha256').update(message).digest('hex');
    for (const pieces of [[4 * 1024 * 1024], [1024 * 1024], [55, 56, 57, 64 * 1024 - 1]]) expect(streamed(message, pieces)).toBe(expected);
  });

  it('hashes the empty message (FIPS 180-2 padding of a zero-length message; digest from Node crypto)', () => {
    expect(streamed(new Uint8Array(0), [1])).toBe(createHash('sha256').update(new Uint8Array(0)).digest('hex'));
  });
});
