/**
 * A small seeded random generator: xoshiro128** (Blackman & Vigna 2018) with a 32-bit
 * state seeded from one number through the MurmurHash3 32-bit finaliser. Deterministic
 * across platforms: every draw is integer arithmetic (`Math.imul`, shifts) followed by
 * one exact conversion to a double.
 *
 * @module
 */
import { checkFinite, checkFloat64Array, checkInteger, rangeError } from './checks.js';

function fmix32(h: number): number {
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) >>> 0;
}

/**
 * The generator. Create one with {@link createRng}; the same seed gives the same stream
 * on every platform.
 *
 * @see Blackman, D. & Vigna, S. (2018/2021), "Scrambled linear pseudorandom number
 *   generators", ACM Transactions on Mathematical Software 47(4), article 36.
 */
export class Rng {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spare = 0;
  private hasSpare = false;

  /**
   * Start from an explicit 128-bit state (four unsigned 32-bit words, not all zero).
   * Most users want {@link createRng} instead.
   *
   * @throws {@link MeniscusRangeError} when a word is not a 32-bit unsigned integer or all are zero.
   */
  constructor(s0: number, s1: number, s2: number, s3: number) {
    const fn = 'Rng';
    checkInteger(fn, 's0', s0, 0, 0xffffffff);
    checkInteger(fn, 's1', s1, 0, 0xffffffff);
    checkInteger(fn, 's2', s2, 0, 0xffffffff);
    checkInteger(fn, 's3', s3, 0, 0xffffffff);
    if ((s0 | s1 | s2 | s3) === 0) rangeError(fn, 'state', [s0, s1, s2, s3], 'a state that is not all zero');
    this.s0 = s0 | 0;
    this.s1 = s1 | 0;
    this.s2 = s2 | 0;
    this.s3 = s3 | 0;
  }

  /**
   * @returns The next unsigned 32-bit integer of the stream.
   * @example
   * ```ts
   * new Rng(1, 2, 3, 4).nextUint32(); // 11520
   * ```
   */
  nextUint32(): number {
    const s1 = this.s1;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return result;
  }

  /**
   * A uniform double in [0, 1) with 53 random bits.
   *
   * @returns The draw.
   * @example
   * ```ts
   * createRng(1).random(); // in [0, 1)
   * ```
   */
  random(): number {
    const a = this.nextUint32() >>> 5;
    const b = this.nextUint32() >>> 6;
    return (a * 67108864 + b) / 9007199254740992;
  }

  /**
   * A uniform draw in [lo, hi).
   *
   * @returns The draw.
   * @example
   * ```ts
   * createRng(1).uniform(-1, 1);
   * ```
   */
  uniform(lo = 0, hi = 1): number {
    return lo + (hi - lo) * this.random();
  }

  /**
   * A uniform integer in [0, n), without modulo bias.
   *
   * @param n - Upper bound, an integer in [1, 2^32].
   * @returns The draw.
   * @example
   * ```ts
   * createRng(1).integer(6); // 0 … 5
   * ```
   */
  integer(n: number): number {
    checkInteger('Rng.integer', 'n', n, 1, 2 ** 32);
    const limit = 2 ** 32 - (2 ** 32 % n);
    let x: number;
    do x = this.nextUint32();
    while (x >= limit);
    return x % n;
  }

  /**
   * A normal (Gaussian) draw by the Box–Muller transform; the second value of each pair
   * is kept for the next call.
   *
   * @param mean - Mean. @defaultValue 0
   * @param sd - Standard deviation. @defaultValue 1
   * @returns The draw.
   * @see Box, G. E. P. & Muller, M. E. (1958), "A note on the generation of random normal
   *   deviates", Annals of Mathematical Statistics 29(2), 610–611.
   * @example
   * ```ts
   * createRng(7).normal(0, 2);
   * ```
   */
  normal(mean = 0, sd = 1): number {
    if (this.hasSpare) {
      this.hasSpare = false;
      return mean + sd * this.spare;
    }
    const u = 1 - this.random(); // (0, 1]
    const v = this.random();
    const r = Math.sqrt(-2 * Math.log(u));
    const a = 2 * Math.PI * v;
    this.spare = r * Math.sin(a);
    this.hasSpare = true;
    return mean + sd * r * Math.cos(a);
  }

  /**
   * Fill an array with uniform draws in [lo, hi).
   *
   * @returns `out`.
   * @example
   * ```ts
   * createRng(3).fillUniform(new Float64Array(10));
   * ```
   */
  fillUniform(out: Float64Array, lo = 0, hi = 1): Float64Array {
    checkFloat64Array('Rng.fillUniform', 'out', out);
    for (let k = 0; k < out.length; k++) out[k] = lo + (hi - lo) * this.random();
    return out;
  }

  /**
   * Fill an array with normal draws.
   *
   * @returns `out`.
   * @example
   * ```ts
   * createRng(3).fillNormal(new Float64Array(10), 0, 1);
   * ```
   */
  fillNormal(out: Float64Array, mean = 0, sd = 1): Float64Array {
    checkFloat64Array('Rng.fillNormal', 'out', out);
    for (let k = 0; k < out.length; k++) out[k] = this.normal(mean, sd);
    return out;
  }
}

/**
 * A generator seeded from one number. Equal seeds give equal streams everywhere.
 *
 * @param seed - Any finite number; its integer part modulo 2^32 is hashed into the state
 *   by the MurmurHash3 finaliser (fmix32), four times with different offsets.
 * @returns The generator.
 * @throws {@link MeniscusRangeError} when `seed` is not finite.
 * @example
 * ```ts
 * const rng = createRng(42);
 * rng.normal();
 * ```
 */
export function createRng(seed: number): Rng {
  checkFinite('createRng', 'seed', seed);
  const s = Math.trunc(seed) >>> 0;
  let w0 = fmix32(s ^ 0x9e3779b9);
  const w1 = fmix32((s + 0x6a09e667) >>> 0);
  const w2 = fmix32((s + 0xbb67ae85) >>> 0);
  const w3 = fmix32((s + 0x3c6ef372) >>> 0);
  if ((w0 | w1 | w2 | w3) === 0) w0 = 1;
  return new Rng(w0, w1, w2, w3);
}
