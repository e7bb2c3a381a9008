/**
 * Small 3-vector helpers on `readonly [x, y, z]` tuples. Each returns a new tuple and
 * never mutates its arguments. Batch code works on packed `Float64Array`s instead.
 *
 * @module
 */
import { rangeError } from './checks.js';

/** A 3-vector (a direction, a point, a normal) in metres or unitless, as documented at use. */
export type Vec3 = readonly [number, number, number];

/** A mutable 3-vector, as returned by the helpers. */
export type MutableVec3 = [number, number, number];

/**
 * @returns `a + b`.
 * @example
 * ```ts
 * add([1, 2, 3], [1, 1, 1]); // [2, 3, 4]
 * ```
 */
export function add(a: Vec3, b: Vec3): MutableVec3 {
  return [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
}

/**
 * @returns `a − b`.
 * @example
 * ```ts
 * sub([1, 2, 3], [1, 1, 1]); // [0, 1, 2]
 * ```
 */
export function sub(a: Vec3, b: Vec3): MutableVec3 {
  return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}

/**
 * @returns `s · a`.
 * @example
 * ```ts
 * scale([1, 2, 3], 2); // [2, 4, 6]
 * ```
 */
export function scale(a: Vec3, s: number): MutableVec3 {
  return [a[0] * s, a[1] * s, a[2] * s];
}

/**
 * @returns `a + s · b`.
 * @example
 * ```ts
 * addScaled([0, 0, 0], [1, 0, 0], 3); // [3, 0, 0]
 * ```
 */
export function addScaled(a: Vec3, b: Vec3, s: number): MutableVec3 {
  return [a[0] + s * b[0], a[1] + s * b[1], a[2] + s * b[2]];
}

/**
 * @returns The dot product `a · b`.
 * @example
 * ```ts
 * dot([1, 0, 0], [0, 1, 0]); // 0
 * ```
 */
export function dot(a: Vec3, b: Vec3): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

/**
 * @returns The cross product `a × b` (right-handed).
 * @example
 * ```ts
 * cross([1, 0, 0], [0, 1, 0]); // [0, 0, 1]
 * ```
 */
export function cross(a: Vec3, b: Vec3): MutableVec3 {
  return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
}

/**
 * @returns The Euclidean length `|a|`.
 * @example
 * ```ts
 * norm([3, 4, 0]); // 5
 * ```
 */
export function norm(a: Vec3): number {
  return Math.hypot(a[0], a[1], a[2]);
}

/**
 * The unit vector along `a`.
 *
 * @param a - A finite vector of non-zero length.
 * @returns `a / |a|`.
 * @throws {@link MeniscusRangeError} when `a` has zero or non-finite length.
 * @example
 * ```ts
 * normalize([0, 0, 2]); // [0, 0, 1]
 * ```
 */
export function normalize(a: Vec3): MutableVec3 {
  const n = Math.hypot(a[0], a[1], a[2]);
  if (!(n > 0) || !Number.isFinite(n)) rangeError('normalize', 'a', a, 'a finite vector of non-zero length');
  return [a[0] / n, a[1] / n, a[2] / n];
}

/**
 * The angle between two vectors, robust near 0 and π (atan2 of |a × b| and a · b).
 *
 * @returns The angle in radians, in [0, π].
 * @example
 * ```ts
 * angleBetween([1, 0, 0], [0, 1, 0]); // π/2
 * ```
 */
export function angleBetween(a: Vec3, b: Vec3): number {
  return Math.atan2(norm(cross(a, b)), dot(a, b));
}
