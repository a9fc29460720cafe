/**
 * Seeded pseudo-random numbers, reproducible bit for bit on every platform.
 *
 * Generator: xoshiro128** 1.1 (Blackman & Vigna, "Scrambled Linear Pseudorandom Number
 * Generators", ACM Transactions on Mathematical Software 47(4), 2021): 128-bit state, period
 * 2^128 − 1, 32-bit outputs, all arithmetic in exact 32-bit integer operations
 * (Math.imul, shifts), so the integer stream is identical on every JavaScript engine.
 *
 * Seeding: the 64-bit seed is expanded with SplitMix64 (Steele, Lea & Flood, "Fast Splittable
 * Pseudorandom Number Generators", OOPSLA 2014), as Blackman & Vigna recommend; two SplitMix64
 * outputs give the four 32-bit state words (high word first). BigInt is used for this once-off
 * expansion only.
 *
 * Independent streams: `jump()` advances the state by 2^64 steps with the published jump
 * polynomial, so `stream(seed, k)` (the seed's generator jumped k times) gives up to 2^64
 * non-overlapping streams of 2^64 numbers each — one per worker or per dispersion sample
 * batch. `fork()` hands the current state to a child and jumps the parent.
 *
 * Doubles: `next()` builds a 53-bit uniform in [0, 1) from two outputs (exact). `normal()`
 * uses Marsaglia's polar method (Marsaglia & Bray, SIAM Review 6(3), 1964), which needs only
 * Math.log and Math.sqrt. Math.sqrt is correctly rounded everywhere; Math.log is not required
 * to be by ECMAScript, so normal deviates are bit-identical across runs of the same engine
 * (V8 in Node and Electron) but could differ in the last bit on another engine. `next()`,
 * `nextUint32()`, `uniform()` and `int()` are exact everywhere.
 */
import { InputError } from './errors.ts';

const MASK64 = (1n << 64n) - 1n;
const GOLDEN64 = 0x9e3779b97f4a7c15n;

/** One SplitMix64 step: advances `state` (a 1-element BigUint64Array) and returns the output. */
function splitmix64Next(state: BigUint64Array): bigint {
  const s = (state[0] + GOLDEN64) & MASK64;
  state[0] = s;
  let z = s;
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64;
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64;
  return z ^ (z >> 31n);
}

/** The first `count` outputs of SplitMix64 from `seed` (exported for reference tests). */
export function splitmix64(seed: bigint, count: number): bigint[] {
  const st = new BigUint64Array([BigInt.asUintN(64, seed)]);
  const out: bigint[] = [];
  for (let k = 0; k < count; k++) out.push(splitmix64Next(st));
  return out;
}

// xoshiro128** jump polynomials (Blackman & Vigna, reference code xoshiro128starstar.c 1.1).
const JUMP = [0x8764000b, 0xf542d2d3, 0x6fa035c3, 0x77f2db5b];
const LONG_JUMP = [0xb523952e, 0x0b6f099f, 0xccf5a0ef, 0x1c580662];

/** A seed: a safe integer (any sign; taken modulo 2^64) or a BigInt. */
export type Seed = number | bigint;

function seedToBigInt(seed: Seed): bigint {
  if (typeof seed === 'bigint') return BigInt.asUintN(64, seed);
  if (typeof seed !== 'number' || !Number.isSafeInteger(seed)) {
    throw new InputError('seed', 'must be a safe integer or a bigint', seed);
  }
  return BigInt.asUintN(64, BigInt(seed));
}

export class Rng {
  /** The four 32-bit state words s0..s3. */
  private readonly s = new Uint32Array(4);
  /** Second deviate of the last polar-method pair, or NaN when none is held. */
  private spare = NaN;

  /** Use `createRng`, `stream` or `Rng.fromState`; the constructor takes raw state words. */
  constructor(s0: number, s1: number, s2: number, s3: number) {
    this.s[0] = s0;
    this.s[1] = s1;
    this.s[2] = s2;
    this.s[3] = s3;
    if ((this.s[0] | this.s[1] | this.s[2] | this.s[3]) === 0) {
      throw new InputError('state', 'must not be all zero (xoshiro fixed point)', [s0, s1, s2, s3]);
    }
  }

  /** A generator with the given state (as returned by `getState`). */
  static fromState(state: ArrayLike<number>): Rng {
    if (!state || (state.length !== 4 && state.length !== 5))
      throw new InputError('state', 'must have 4 words (optionally a 5th: the held normal deviate)', state);
    for (let k = 0; k < 4; k++) {
      const w = state[k];
      if (!Number.isInteger(w) || w < 0 || w > 0xffffffff) throw new InputError(`state[${k}]`, 'must be an integer in [0, 2^32)', w);
    }
    const r = new Rng(state[0], state[1], state[2], state[3]);
    // A held deviate survives only as a finite number (JSON turns NaN into null).
    if (state.length === 5 && typeof state[4] === 'number' && Number.isFinite(state[4])) r.spare = state[4];
    return r;
  }

  /**
   * The state [s0, s1, s2, s3, spare] as plain numbers, for handing to a worker or saving;
   * spare is the held normal deviate, NaN when none is held.
   */
  getState(): number[] {
    return [this.s[0], this.s[1], this.s[2], this.s[3], this.spare];
  }

  /** The next 32-bit output as an unsigned integer in [0, 2^32). */
  nextUint32(): number {
    const s = this.s;
    const s1 = s[1];
    // result = rotl(s1 * 5, 7) * 9
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    const t = s1 << 9;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = (s[3] << 11) | (s[3] >>> 21);
    return result;
  }

  /** Uniform double in [0, 1) with 53 random bits. */
  next(): number {
    const hi = this.nextUint32() >>> 5; // 27 bits
    const lo = this.nextUint32() >>> 6; // 26 bits
    return (hi * 67108864 + lo) / 9007199254740992;
  }

  /** Uniform double in [lo, hi). */
  uniform(lo = 0, hi = 1): number {
    return lo + (hi - lo) * this.next();
  }

  /** Uniform integer in [0, n) without modulo bias (rejection), n ≤ 2^32. */
  int(n: number): number {
    if (!Number.isInteger(n) || n < 1 || n > 0x100000000) throw new InputError('n', 'must be an integer in [1, 2^32]', n);
    if (n === 0x100000000) return this.nextUint32();
    const limit = 0x100000000 - (0x100000000 % n); // accept x < limit
    for (;;) {
      const x = this.nextUint32();
      if (x < limit) return x % n;
    }
  }

  /** Normal deviate with the given mean and standard deviation (Marsaglia polar method). */
  normal(mean = 0, sd = 1): number {
    if (!Number.isNaN(this.spare)) {
      const z = this.spare;
      this.spare = NaN;
      return mean + sd * z;
    }
    let u: number;
    let v: number;
    let q: number;
    do {
      u = 2 * this.next() - 1;
      v = 2 * this.next() - 1;
      q = u * u + v * v;
    } while (q >= 1 || q === 0);
    const f = Math.sqrt((-2 * Math.log(q)) / q);
    this.spare = v * f;
    return mean + sd * (u * f);
  }

  /** Advances the state by 2^64 outputs (start of the next independent stream). */
  jump(): this {
    return this.applyJump(JUMP);
  }

  /** Advances the state by 2^96 outputs. */
  longJump(): this {
    return this.applyJump(LONG_JUMP);
  }

  /**
   * A child generator that continues this one's current sequence; this generator then jumps
   * 2^64 ahead, so parent and child never overlap (for up to 2^64 draws each). Forking
   * repeatedly gives consecutive non-overlapping streams.
   */
  fork(): Rng {
    const child = new Rng(this.s[0], this.s[1], this.s[2], this.s[3]);
    this.spare = NaN;
    this.jump();
    return child;
  }

  /** A copy with identical state (the same sequence from here on). */
  clone(): Rng {
    const c = new Rng(this.s[0], this.s[1], this.s[2], this.s[3]);
    c.spare = this.spare;
    return c;
  }

  private applyJump(poly: readonly number[]): this {
    let s0 = 0;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    for (let i = 0; i < 4; i++) {
      const word = poly[i];
      for (let b = 0; b < 32; b++) {
        if ((word >>> b) & 1) {
          s0 ^= this.s[0];
          s1 ^= this.s[1];
          s2 ^= this.s[2];
          s3 ^= this.s[3];
        }
        this.nextUint32();
      }
    }
    this.s[0] = s0;
    this.s[1] = s1;
    this.s[2] = s2;
    this.s[3] = s3;
    this.spare = NaN;
    return this;
  }
}

/** A generator seeded from `seed` through SplitMix64. */
export function createRng(seed: Seed): Rng {
  const st = new BigUint64Array([seedToBigInt(seed)]);
  const a = splitmix64Next(st);
  const b = splitmix64Next(st);
  const w0 = Number(a >> 32n);
  const w1 = Number(a & 0xffffffffn);
  const w2 = Number(b >> 32n);
  const w3 = Number(b & 0xffffffffn);
  // All-zero state is impossible in practice (SplitMix64 outputs are a bijection of distinct
  // counter values); guard anyway.
  if ((w0 | w1 | w2 | w3) === 0) return new Rng(0x9e3779b9, 0, 0, 0);
  return new Rng(w0, w1, w2, w3);
}

/**
 * Stream `index` of `seed`: the seeded generator jumped `index` times (2^64 outputs apart).
 * Stream 0 is `createRng(seed)`. Costs about 128·index generator steps.
 */
export function stream(seed: Seed, index: number): Rng {
  if (!Number.isSafeInteger(index) || index < 0) throw new InputError('index', 'must be an integer >= 0', index);
  const r = createRng(seed);
  for (let k = 0; k < index; k++) r.jump();
  return r;
}
