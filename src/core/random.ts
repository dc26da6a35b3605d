// A seeded pseudo-random generator for anything that must be the same on every run
// (the demo scene, benchmark data, test inputs). It is MT19937 (Matsumoto & Nishimura
// 1998) seeded with the published init_by_array procedure, so its output can be checked
// against the reference implementation's test output and against CPython's `random`,
// which uses the same generator and seeding. Not for cryptography.

const N = 624;
const M = 397;
const UPPER = 0x80000000;
const LOWER = 0x7fffffff;
const MATRIX_A = 0x9908b0df;

/** The MT19937 state and its raw 32-bit output. */
class Mt19937 {
  private readonly state = new Uint32Array(N);
  private index = N + 1;

  constructor(key: readonly number[]) {
    this.seedByArray(key.length ? key : [0]);
  }

  private seedWord(seed: number): void {
    const mt = this.state;
    mt[0] = seed >>> 0;
    for (let i = 1; i < N; i++) {
      const prev = mt[i - 1] ^ (mt[i - 1] >>> 30);
      mt[i] = (Math.imul(1812433253, prev) + i) >>> 0;
    }
    this.index = N;
  }

  private seedByArray(key: readonly number[]): void {
    const mt = this.state;
    this.seedWord(19650218);
    let i = 1;
    let j = 0;
    for (let k = Math.max(N, key.length); k > 0; k--) {
      const prev = mt[i - 1] ^ (mt[i - 1] >>> 30);
      mt[i] = ((mt[i] ^ Math.imul(prev, 1664525)) + (key[j] >>> 0) + j) >>> 0;
      i++;
      j++;
      if (i >= N) { mt[0] = mt[N - 1]; i = 1; }
      if (j >= key.length) j = 0;
    }
    for (let k = N - 1; k > 0; k--) {
      const prev = mt[i - 1] ^ (mt[i - 1] >>> 30);
      mt[i] = ((mt[i] ^ Math.imul(prev, 1566083941)) - i) >>> 0;
      i++;
      if (i >= N) { mt[0] = mt[N - 1]; i = 1; }
    }
    mt[0] = 0x80000000;
  }

  private twist(): void {
    const mt = this.state;
    for (let k = 0; k < N; k++) {
      const y = (mt[k] & UPPER) | (mt[(k + 1) % N] & LOWER);
      mt[k] = mt[(k + M) % N] ^ (y >>> 1) ^ (y & 1 ? MATRIX_A : 0);
    }
    this.index = 0;
  }

  nextUint32(): number {
    if (this.index >= N) this.twist();
    let y = this.state[this.index++];
    y ^= y >>> 11;
    y ^= (y << 7) & 0x9d2c5680;
    y ^= (y << 15) & 0xefc60000;
    y ^= y >>> 18;
    return y >>> 0;
  }
}

/** Splits a non-negative integer seed into 32-bit words, least significant first. */
function seedKey(seed: number): number[] {
  if (!Number.isSafeInteger(seed) || seed < 0) {
    throw new RangeError(`seed must be a non-negative safe integer, got ${seed}`);
  }
  const key: number[] = [];
  let rest = seed;
  do {
    key.push(rest % 0x100000000);
    rest = Math.floor(rest / 0x100000000);
  } while (rest > 0);
  return key;
}

/** A 32-bit FNV-1a hash of a label, used to derive independent named streams. */
function labelHash(label: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/** A seeded stream of random numbers with the usual helpers. */
export class Random {
  private readonly mt: Mt19937;
  private spareNormal: number | null = null;

  /** `seed`: a non-negative integer; the same seed gives the same stream (as CPython's `random.seed(seed)`). */
  constructor(seed: number, private readonly key: readonly number[] = seedKey(seed)) {
    this.mt = new Mt19937(key);
  }

  /** An independent stream named `label`, the same for the same seed and label whatever
   * was drawn from this one, so adding a draw in one part never shifts another. */
  fork(label: string): Random {
    return new Random(0, [...this.key, labelHash(label), label.length]);
  }

  /** A uniform 32-bit unsigned integer. */
  uint32(): number {
    return this.mt.nextUint32();
  }

  /** A uniform float in [0, 1) with 53 random bits (CPython's `random.random()`). */
  next(): number {
    const a = this.mt.nextUint32() >>> 5;
    const b = this.mt.nextUint32() >>> 6;
    return (a * 67108864 + b) / 9007199254740992;
  }

  /** A uniform float in [min, max). */
  uniform(min: number, max: number): number {
    return min + (max - min) * this.next();
  }

  /** A uniform integer in [0, n), without modulo bias. */
  int(n: number): number {
    if (!Number.isInteger(n) || n < 1 || n > 0x100000000) throw new RangeError(`int(n) needs 1 <= n <= 2^32, got ${n}`);
    const limit = 0x100000000 - (0x100000000 % n);
    for (;;) {
      const u = this.mt.nextUint32();
      if (u < limit) return u % n;
    }
  }

  /** true with probability p. */
  chance(p: number): boolean {
    return this.next() < p;
  }

  /** A standard normal deviate (Marsaglia polar method), times sd, plus mean. */
  normal(mean = 0, sd = 1): number {
    if (this.spareNormal !== null) {
      const z = this.spareNormal;
      this.spareNormal = null;
      return mean + sd * z;
    }
    for (;;) {
      const u = 2 * this.next() - 1;
      const v = 2 * this.next() - 1;
      const s = u * u + v * v;
      if (s > 0 && s < 1) {
        const f = Math.sqrt((-2 * Math.log(s)) / s);
        this.spareNormal = v * f;
        return mean + sd * u * f;
      }
    }
  }

  /** An index drawn with probability proportional to its weight. */
  weighted(weights: readonly number[]): number {
    const total = weights.reduce((sum, w) => sum + w, 0);
    if (!(total > 0)) throw new RangeError('weighted() needs at least one positive weight');
    let r = this.next() * total;
    for (let i = 0; i < weights.length; i++) {
      r -= weights[i];
      if (r < 0) return i;
    }
    return weights.length - 1;
  }

  /** Shuffles in place (Fisher-Yates) and returns the array. */
  shuffle<T>(items: T[]): T[] {
    for (let i = items.length - 1; i > 0; i--) {
      const j = this.int(i + 1);
      [items[i], items[j]] = [items[j], items[i]];
    }
    return items;
  }
}

/** A counter-based hash of integer coordinates to a float in [0, 1): the same inputs
 * always give the same value, with no sequential state, so a raster can be filled in
 * any order or in pieces. (A 32-bit integer mix in the style of MurmurHash3's finaliser.) */
export function hashUnit(seed: number, x: number, y: number, k = 0): number {
  let h = (seed ^ Math.imul(x, 0x9e3779b1)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h ^= Math.imul(y, 0xc2b2ae35);
  h = Math.imul(h ^ (h >>> 13), 0x27d4eb2f);
  h ^= Math.imul(k, 0x165667b1);
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  h ^= h >>> 16;
  return (h >>> 0) / 4294967296;
}
