/**
 * Small argument checks used only inside the optics area (not re-exported).
 *
 * @module
 * @internal
 */
import { checkBoolean, rangeError, typeError } from '../core/index.js';
import type { Mat3 } from '../core/index.js';

/**
 * Require an optional status buffer to be a `Uint8Array` of the given length; create one
 * when it is undefined.
 *
 * @internal
 */
export function checkStatusOut(fn: string, parameter: string, value: unknown, length: number): Uint8Array {
  if (value === undefined) return new Uint8Array(length);
  if (!(value instanceof Uint8Array)) typeError(fn, parameter, value, `a Uint8Array of length ${length}`);
  if (value.length !== length) typeError(fn, parameter, value, `a Uint8Array of length ${length}`);
  return value;
}

/**
 * Require a symmetric, finite 3 × 3 covariance matrix (row-major, nine numbers) with a
 * non-negative diagonal. Symmetry is tested to a relative 1e-9 of the largest entry.
 *
 * @internal
 */
export function checkCovariance3(fn: string, parameter: string, value: unknown): Mat3 {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<unknown>).length !== 9) {
    typeError(fn, parameter, value, 'a 3 × 3 covariance matrix: nine numbers, row-major');
  }
  const m = value as ArrayLike<unknown>;
  let big = 0;
  for (let k = 0; k < 9; k++) {
    const c = m[k];
    if (typeof c !== 'number') typeError(fn, parameter, value, 'a 3 × 3 covariance matrix of numbers');
    if (!Number.isFinite(c)) rangeError(fn, parameter, value, 'a 3 × 3 covariance matrix of finite numbers');
    big = Math.max(big, Math.abs(c));
  }
  const v = value as unknown as Mat3;
  if (!(v[0] >= 0 && v[4] >= 0 && v[8] >= 0)) {
    rangeError(fn, parameter, value, 'a covariance matrix with a non-negative diagonal');
  }
  const tol = 1e-9 * big;
  if (Math.abs(v[1] - v[3]) > tol || Math.abs(v[2] - v[6]) > tol || Math.abs(v[5] - v[7]) > tol) {
    rangeError(fn, parameter, value, 'a symmetric covariance matrix');
  }
  return v;
}

/**
 * Require a symmetric, finite 2 × 2 covariance matrix `[a, b, b, d]` with a non-negative
 * diagonal.
 *
 * @internal
 */
export function checkCovariance2(fn: string, parameter: string, value: unknown): readonly [number, number, number, number] {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<unknown>).length !== 4) {
    typeError(fn, parameter, value, 'a 2 × 2 covariance matrix: four numbers, row-major');
  }
  const m = value as ArrayLike<unknown>;
  for (let k = 0; k < 4; k++) {
    const c = m[k];
    if (typeof c !== 'number') typeError(fn, parameter, value, 'a 2 × 2 covariance matrix of numbers');
    if (!Number.isFinite(c)) rangeError(fn, parameter, value, 'a 2 × 2 covariance matrix of finite numbers');
  }
  const v = value as unknown as readonly [number, number, number, number];
  if (!(v[0] >= 0 && v[3] >= 0)) rangeError(fn, parameter, value, 'a covariance matrix with a non-negative diagonal');
  if (Math.abs(v[1] - v[2]) > 1e-9 * Math.max(Math.abs(v[0]), Math.abs(v[1]), Math.abs(v[2]), Math.abs(v[3]))) {
    rangeError(fn, parameter, value, 'a symmetric covariance matrix');
  }
  return v;
}

/**
 * Read `options.extrapolate` (default false) from an options object already checked with
 * `checkOptions`.
 *
 * @internal
 */
export function readExtrapolate(fn: string, options: { extrapolate?: boolean }): boolean {
  return options.extrapolate === undefined ? false : checkBoolean(fn, 'options.extrapolate', options.extrapolate);
}

/**
 * Check a model input against its validity range; outside it, refuse unless `extrapolate`,
 * in which case only finiteness is required.
 *
 * @internal
 */
export function checkValidity(
  fn: string,
  parameter: string,
  value: unknown,
  lo: number,
  hi: number,
  unit: string,
  model: string,
  extrapolate: boolean,
): number {
  if (typeof value !== 'number') typeError(fn, parameter, value, `a number (${unit})`);
  if (!Number.isFinite(value)) rangeError(fn, parameter, value, `a finite number (${unit})`);
  if (!extrapolate && !(value >= lo && value <= hi)) {
    rangeError(
      fn,
      parameter,
      value,
      `within the validity range of ${model}, ${lo} to ${hi} ${unit} (pass options.extrapolate = true to evaluate outside it)`,
    );
  }
  return value;
}

function badVector(fn: string, parameter: string, a: Float64Array, r: number): never {
  return rangeError(fn, `${parameter}[${3 * r}..${3 * r + 2}]`, [a[3 * r], a[3 * r + 1], a[3 * r + 2]], 'a finite direction of non-zero length');
}

/**
 * Reciprocal length of the vector at ray `r` of a packed array, or throw when it is not a
 * finite direction of non-zero length.
 *
 * @internal
 */
export function invLength(fn: string, parameter: string, a: Float64Array, r: number, x: number, y: number, z: number): number {
  const q = x * x + y * y + z * z;
  // Already unit to 1e-8 (the common case): one Newton step from 1 gives 1/√q with an
  // error below 3(q − 1)²/8 ≤ 4e-17, under half an ulp, without a square root.
  if (q > 0.99999999 && q < 1.00000001) return 1.5 - 0.5 * q;
  if (q > 0 && q < Infinity) return 1 / Math.sqrt(q);
  // under- or overflow of the squares, or a bad vector
  const h = Math.hypot(x, y, z);
  if (h > 0 && h < Infinity) return 1 / h;
  return badVector(fn, parameter, a, r);
}
