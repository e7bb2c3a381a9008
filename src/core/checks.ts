/**
 * Argument checks for public boundaries. Each throws the library's error type with a
 * message naming the function, the parameter, the value and what was expected. Range
 * checks are written so that NaN fails them.
 *
 * Inner kernels do not re-check: validate once where the user's data comes in.
 *
 * @module
 */
import { MeniscusRangeError, MeniscusTypeError } from './errors.js';
import { LIMITS } from './limits.js';
import type { Vec3 } from './vec3.js';

/**
 * Throw a {@link MeniscusRangeError}.
 *
 * @param fn - The public function's name.
 * @param parameter - The parameter's name.
 * @param value - The offending value.
 * @param expected - What was expected, in words.
 * @returns Never.
 * @example
 * ```ts
 * if (!(x > 0)) rangeError('myFn', 'x', x, 'a number > 0');
 * ```
 */
export function rangeError(fn: string, parameter: string, value: unknown, expected: string): never {
  throw new MeniscusRangeError({ fn, parameter, value, expected });
}

/**
 * Throw a {@link MeniscusTypeError}.
 *
 * @param fn - The public function's name.
 * @param parameter - The parameter's name.
 * @param value - The offending value.
 * @param expected - What was expected, in words.
 * @returns Never.
 * @example
 * ```ts
 * if (typeof x !== 'number') typeError('myFn', 'x', x, 'a number');
 * ```
 */
export function typeError(fn: string, parameter: string, value: unknown, expected: string): never {
  throw new MeniscusTypeError({ fn, parameter, value, expected });
}

/**
 * Require a value range `[min, max]`: an array of two finite numbers with `max > min`
 * (the `range` option of the colour-mapping and image-writing functions).
 *
 * @returns The pair as `[min, max]`.
 * @throws {@link MeniscusTypeError} when the value is not a pair;
 *   {@link MeniscusRangeError} for a non-finite end or `max ≤ min`.
 * @example
 * ```ts
 * const [lo, hi] = checkRangePair('fn', 'options.range', [-0.01, 0.01]);
 * ```
 */
export function checkRangePair(fn: string, parameter: string, value: unknown): [number, number] {
  if (!Array.isArray(value) || value.length !== 2) typeError(fn, parameter, value, 'a pair [min, max]');
  const lo = checkFinite(fn, `${parameter}[0]`, value[0]);
  const hi = checkFinite(fn, `${parameter}[1]`, value[1]);
  if (!(hi > lo)) rangeError(fn, parameter, value, 'a pair [min, max] with max > min');
  return [lo, hi];
}

/**
 * Require a finite number.
 *
 * @returns The number.
 * @example
 * ```ts
 * const t = checkFinite('fn', 'temperatureC', 20);
 * ```
 */
export function checkFinite(fn: string, parameter: string, value: unknown): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, 'a finite number');
  if (!Number.isFinite(value)) rangeError(fn, parameter, value, 'a finite number');
  return value;
}

/**
 * Require a finite number strictly greater than zero.
 *
 * @returns The number.
 * @example
 * ```ts
 * checkPositive('fn', 'n1', 1.333);
 * ```
 */
export function checkPositive(fn: string, parameter: string, value: unknown): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, 'a finite number > 0');
  if (!(value > 0) || value === Infinity) rangeError(fn, parameter, value, 'a finite number > 0');
  return value;
}

/**
 * Require a finite number ≥ 0.
 *
 * @returns The number.
 * @example
 * ```ts
 * checkNonNegative('fn', 'depth', 0);
 * ```
 */
export function checkNonNegative(fn: string, parameter: string, value: unknown): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, 'a finite number >= 0');
  if (!(value >= 0) || value === Infinity) rangeError(fn, parameter, value, 'a finite number >= 0');
  return value;
}

/**
 * Require a finite number in the closed interval [lo, hi].
 *
 * @returns The number.
 * @example
 * ```ts
 * checkInRange('sunPosition', 'latitudeDeg', 45, -90, 90);
 * ```
 */
export function checkInRange(fn: string, parameter: string, value: unknown, lo: number, hi: number): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, `a number in [${lo}, ${hi}]`);
  if (!(value >= lo && value <= hi)) rangeError(fn, parameter, value, `a number in [${lo}, ${hi}]`);
  return value;
}

/**
 * Require an integer in [min, max].
 *
 * @returns The integer.
 * @example
 * ```ts
 * checkInteger('createGrid', 'width', 64, 1, 65536);
 * ```
 */
export function checkInteger(
  fn: string,
  parameter: string,
  value: unknown,
  min = Number.MIN_SAFE_INTEGER,
  max = Number.MAX_SAFE_INTEGER,
): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, `an integer in [${min}, ${max}]`);
  if (!Number.isInteger(value) || !(value >= min && value <= max)) {
    rangeError(fn, parameter, value, `an integer in [${min}, ${max}]`);
  }
  return value;
}

/**
 * Require a boolean.
 *
 * @returns The boolean.
 * @example
 * ```ts
 * checkBoolean('fn', 'options.extrapolate', false);
 * ```
 */
export function checkBoolean(fn: string, parameter: string, value: unknown): boolean {
  if (typeof value !== 'boolean') typeError(fn, parameter, value, 'true or false');
  return value;
}

/**
 * Require one of a fixed set of strings.
 *
 * @returns The string, typed as the union.
 * @example
 * ```ts
 * const m = checkOneOf('integrate', 'options.method', 'dct', ['fft', 'dct'] as const);
 * ```
 */
export function checkOneOf<T extends string>(fn: string, parameter: string, value: unknown, options: readonly T[]): T {
  if (typeof value !== 'string' || !(options as readonly string[]).includes(value)) {
    (typeof value === 'string' ? rangeError : typeError)(
      fn,
      parameter,
      value,
      `one of ${options.map((o) => JSON.stringify(o)).join(', ')}`,
    );
  }
  return value as T;
}

/**
 * Require a plain object (or undefined, which becomes `{}`): used for `options`.
 *
 * @returns The object.
 * @example
 * ```ts
 * const o = checkOptions('fn', options);
 * ```
 */
export function checkOptions<T extends object>(fn: string, value: T | undefined, parameter = 'options'): T {
  if (value === undefined) return {} as T;
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    typeError(fn, parameter, value, 'an options object or undefined');
  }
  return value;
}

/**
 * Require a 3-vector of finite numbers (array or typed array of length 3).
 *
 * @returns The vector, unchanged.
 * @example
 * ```ts
 * checkVec3('refract', 'normal', [0, 0, 1]);
 * ```
 */
export function checkVec3(fn: string, parameter: string, value: unknown): Vec3 {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<number>).length !== 3) {
    typeError(fn, parameter, value, 'a 3-vector [x, y, z]');
  }
  const v = value as ArrayLike<unknown>;
  for (let k = 0; k < 3; k++) {
    const c = v[k];
    if (typeof c !== 'number') typeError(fn, parameter, value, 'a 3-vector of numbers');
    if (!Number.isFinite(c)) rangeError(fn, parameter, value, 'a 3-vector of finite numbers');
  }
  return value as unknown as Vec3;
}

/**
 * Require a finite 3-vector of non-zero length and return it normalised (a new tuple;
 * the input is not touched).
 *
 * @returns The unit vector.
 * @example
 * ```ts
 * checkDirection('refract', 'incident', [1, 0, -1]); // [0.7071…, 0, -0.7071…]
 * ```
 */
export function checkDirection(fn: string, parameter: string, value: unknown): [number, number, number] {
  const v = checkVec3(fn, parameter, value);
  let x = v[0], y = v[1], z = v[2];
  let n = Math.hypot(x, y, z);
  if (n > 0 && n < 1e-150) {
    // tiny (subnormal) components lose their ratio when divided directly: scale by an exact power of two first
    x *= 2 ** 600;
    y *= 2 ** 600;
    z *= 2 ** 600;
    n = Math.hypot(x, y, z);
  }
  if (!(n > 0) || !Number.isFinite(n)) rangeError(fn, parameter, value, 'a direction of non-zero length');
  return [x / n, y / n, z / n];
}

/**
 * Require a `Float64Array` whose length is a multiple of `stride` (and, optionally,
 * exactly `length`). Values are not scanned here.
 *
 * @returns The array.
 * @example
 * ```ts
 * checkFloat64Array('refractBatch', 'incident', dirs, 3);
 * ```
 */
export function checkFloat64Array(
  fn: string,
  parameter: string,
  value: unknown,
  stride = 1,
  length?: number,
): Float64Array {
  if (!(value instanceof Float64Array)) typeError(fn, parameter, value, 'a Float64Array');
  if (value.length % stride !== 0) {
    typeError(fn, parameter, value, `a Float64Array whose length is a multiple of ${stride}`);
  }
  if (length !== undefined && value.length !== length) {
    typeError(fn, parameter, value, `a Float64Array of length ${length}`);
  }
  if (value.length > LIMITS.maxBatch * Math.max(1, stride)) {
    rangeError(fn, parameter, value, `at most ${LIMITS.maxBatch} elements (LIMITS.maxBatch)`);
  }
  return value;
}

/**
 * Require every element of a numeric array to be finite.
 *
 * @returns The array.
 * @example
 * ```ts
 * checkAllFinite('fn', 'slopes', new Float64Array([0, 1]));
 * ```
 */
export function checkAllFinite<T extends ArrayLike<number>>(fn: string, parameter: string, value: T): T {
  for (let i = 0; i < value.length; i++) {
    if (!Number.isFinite(value[i]!)) {
      rangeError(fn, `${parameter}[${i}]`, value[i], 'a finite number (use a mask for holes)');
    }
  }
  return value;
}

/**
 * Require an optional output buffer to be a `Float64Array` of the given length; create
 * one when it is undefined.
 *
 * @returns The buffer to write into.
 * @example
 * ```ts
 * const out = checkOut('refractBatch', 'options.out', options.out, n * 3);
 * ```
 */
export function checkOut(fn: string, parameter: string, value: unknown, length: number): Float64Array {
  if (value === undefined) return new Float64Array(length);
  return checkFloat64Array(fn, parameter, value, 1, length);
}

/**
 * Refuse an allocation of `count` elements above `limit`.
 *
 * @returns `count`.
 * @example
 * ```ts
 * checkAllocation('createGrid', 'width × height', w * h);
 * ```
 */
export function checkAllocation(fn: string, parameter: string, count: number, limit: number = LIMITS.maxSamples): number {
  if (!(count >= 0 && count <= limit)) {
    rangeError(fn, parameter, count, `at most ${limit} elements (see LIMITS)`);
  }
  return count;
}
