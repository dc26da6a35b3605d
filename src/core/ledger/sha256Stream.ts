import { sha256 } from '@noble/hashes/sha2.js';
import { toHex } from './sha256.ts';

// SHA-256 fed piece by piece, for files too large to hold whole: Web Crypto only
// digests a whole buffer at once, so this uses @noble/hashes' incremental SHA-256.

export interface Sha256Stream {
  /** Adds the next bytes of the message. */
  update(bytes: Uint8Array): void;
  /** Lower-case hex digest of everything added; the stream cannot be used after. */
  hex(): string;
}

export function sha256Stream(): Sha256Stream {
  const state = sha256.create();
  return {
    update(bytes) {
      state.update(bytes);
    },
    hex() {
      return toHex(state.digest());
    },
  };
}
