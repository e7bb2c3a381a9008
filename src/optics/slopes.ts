/**
 * Conversions between unit surface normals and the slopes `(p, q) = (∂h/∂x, ∂h/∂y)` of a
 * height field `z = h(x, y)`, with their covariances. The normal of a height field is
 * `n = (−p, −q, 1)/√(1 + p² + q²)` (pointing from water into air, world frame
 * east-north-up).
 *
 * @module
 */
import { Status, checkDirection, checkFinite, checkFloat64Array, checkOptions, checkOut, rangeError } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';
import { checkCovariance2, checkCovariance3, checkStatusOut } from './internal.js';

/**
 * A 2 × 2 covariance of slopes, row-major: `[var p, cov pq, cov qp, var q]`
 * (unitless², slopes being dimensionless).
 */
export type SlopeCovariance = readonly [number, number, number, number];

/**
 * The slopes of the height field whose normal is `normal`: `p = −nx/nz`, `q = −ny/nz`.
 * Either orientation of the normal is accepted (the slopes do not depend on its sign).
 *
 * @param normal - Surface normal (any non-zero length), world frame.
 * @returns `[p, q]`, or `null` for a vertical facet (`nz = 0`), which no height field has.
 * @throws {@link core!MeniscusTypeError} when `normal` is not a 3-vector of numbers.
 * @throws {@link core!MeniscusRangeError} when it is non-finite or of zero length.
 * @see The normal of a graph `z = h(x, y)` is along `(−h_x, −h_y, 1)`: e.g. do Carmo,
 *   M. P. (1976), "Differential Geometry of Curves and Surfaces", ch. 2.
 * @example
 * ```ts
 * slopesFromNormal([-0.1, 0, 1]); // [0.1, 0]: the surface rises towards +x
 * ```
 */
export function slopesFromNormal(normal: Vec3): [number, number] | null {
  const n = checkDirection('slopesFromNormal', 'normal', normal);
  if (n[2] === 0) return null;
  return [-n[0] / n[2], -n[1] / n[2]];
}

/**
 * The unit upward normal of a height field with slopes `(p, q)`:
 * `n = (−p, −q, 1)/√(1 + p² + q²)`.
 *
 * @param p - Slope ∂h/∂x (finite).
 * @param q - Slope ∂h/∂y (finite).
 * @returns The unit normal (its z component is > 0).
 * @throws {@link core!MeniscusRangeError} when a slope is not finite.
 * @see do Carmo, M. P. (1976), "Differential Geometry of Curves and Surfaces", ch. 2.
 * @example
 * ```ts
 * normalFromSlopes(0, 0); // [-0, -0, 1]
 * ```
 */
export function normalFromSlopes(p: number, q: number): MutableVec3 {
  const fn = 'normalFromSlopes';
  checkFinite(fn, 'p', p);
  checkFinite(fn, 'q', q);
  return slopeNormal(p, q);
}

function slopeNormal(p: number, q: number): MutableVec3 {
  const big = Math.max(Math.abs(p), Math.abs(q));
  if (big > 1e150) {
    // avoid overflow of p² + q²
    const w = Math.hypot(p, q, 1);
    return [-p / w, -q / w, 1 / w];
  }
  const w = 1 / Math.sqrt(1 + p * p + q * q);
  return [-p * w, -q * w, w];
}

/** Options of {@link slopesFromNormalsBatch}. */
export interface SlopesFromNormalsBatchOptions {
  /** Output buffer for packed slopes `p q p q …`, length `2 × count`. @defaultValue a new `Float64Array` */
  out?: Float64Array;
  /** Output buffer for the status codes, length `count`. @defaultValue a new `Uint8Array` */
  status?: Uint8Array;
}

/** Result of {@link slopesFromNormalsBatch}. */
export interface SlopesFromNormalsBatchResult {
  /** Packed slopes `p q p q …`. */
  slopes: Float64Array;
  /** `Status.ok`, or `Status.inconsistent` for a vertical facet (slopes written as 0, 0). */
  status: Uint8Array;
}

/**
 * Slopes of many normals at once, as {@link slopesFromNormal} for one. Normals need not
 * be unit and may point up or down; they are checked in the same pass that converts them.
 * Inputs are never modified; after a throw the output buffers may hold partial results.
 *
 * @param normals - Packed normals `xyz xyz …`.
 * @param options - Output buffers.
 * @returns Packed slopes and a status array.
 * @throws {@link core!MeniscusTypeError} on a wrong array type or length.
 * @throws {@link core!MeniscusRangeError} on a non-finite or zero normal (the message names
 *   its position).
 * @see do Carmo, M. P. (1976), "Differential Geometry of Curves and Surfaces", ch. 2.
 * @example
 * ```ts
 * slopesFromNormalsBatch(new Float64Array([-0.1, 0.2, 1])).slopes; // [0.1, -0.2]
 * ```
 */
export function slopesFromNormalsBatch(normals: Float64Array, options?: SlopesFromNormalsBatchOptions): SlopesFromNormalsBatchResult {
  const fn = 'slopesFromNormalsBatch';
  checkFloat64Array(fn, 'normals', normals, 3);
  const o = checkOptions(fn, options);
  const count = normals.length / 3;
  const out = checkOut(fn, 'options.out', o.out, 2 * count);
  const status = checkStatusOut(fn, 'options.status', o.status, count);
  for (let r = 0; r < count; r++) {
    const x = normals[3 * r]!;
    const y = normals[3 * r + 1]!;
    const z = normals[3 * r + 2]!;
    const q2 = x * x + y * y + z * z;
    if (!(q2 > 0 && q2 < Infinity)) {
      const h = Math.hypot(x, y, z);
      if (!(h > 0 && h < Infinity)) {
        rangeError(fn, `normals[${3 * r}..${3 * r + 2}]`, [x, y, z], 'a finite direction of non-zero length');
      }
    }
    if (z === 0) {
      out[2 * r] = 0;
      out[2 * r + 1] = 0;
      status[r] = Status.inconsistent;
    } else {
      const iz = -1 / z;
      out[2 * r] = x * iz;
      out[2 * r + 1] = y * iz;
      status[r] = Status.ok;
    }
  }
  return { slopes: out, status };
}

/** Options of {@link normalsFromSlopesBatch}. */
export interface NormalsFromSlopesBatchOptions {
  /** Output buffer for packed unit normals, length `3 × count`. @defaultValue a new `Float64Array` */
  out?: Float64Array;
}

/**
 * Unit upward normals of many slope pairs, as {@link normalFromSlopes} for one.
 *
 * @param slopes - Packed slopes `p q p q …` (finite; checked in the same pass).
 * @param options - Output buffer.
 * @returns Packed unit normals `xyz xyz …`.
 * @throws {@link core!MeniscusTypeError} on a wrong array type or odd length.
 * @throws {@link core!MeniscusRangeError} on a non-finite slope (the message names its position).
 * @see do Carmo, M. P. (1976), "Differential Geometry of Curves and Surfaces", ch. 2.
 * @example
 * ```ts
 * normalsFromSlopesBatch(new Float64Array([0, 0])); // [-0, -0, 1]
 * ```
 */
export function normalsFromSlopesBatch(slopes: Float64Array, options?: NormalsFromSlopesBatchOptions): Float64Array {
  const fn = 'normalsFromSlopesBatch';
  checkFloat64Array(fn, 'slopes', slopes, 2);
  const o = checkOptions(fn, options);
  const count = slopes.length / 2;
  const out = checkOut(fn, 'options.out', o.out, 3 * count);
  for (let r = 0; r < count; r++) {
    const p = slopes[2 * r]!;
    const q = slopes[2 * r + 1]!;
    const s = 1 + p * p + q * q;
    if (!(s < Infinity)) {
      if (!(Number.isFinite(p) && Number.isFinite(q))) {
        rangeError(fn, `slopes[${2 * r}..${2 * r + 1}]`, [p, q], 'finite slopes');
      }
      const n = slopeNormal(p, q);
      out[3 * r] = n[0];
      out[3 * r + 1] = n[1];
      out[3 * r + 2] = n[2];
      continue;
    }
    const w = 1 / Math.sqrt(s);
    out[3 * r] = -p * w;
    out[3 * r + 1] = -q * w;
    out[3 * r + 2] = w;
  }
  return out;
}

/**
 * The covariance of the slopes `(p, q)` from the covariance of a normal, to first order:
 * `Σ_pq = J Σ_n Jᵀ` with `J = [[−1/nz, 0, nx/nz²], [0, −1/nz, ny/nz²]]`. Either
 * orientation of the normal gives the same result. The normal is used as given (not
 * normalised): pass the unit normal whose covariance `normalCovariance` is.
 *
 * @param normal - The unit normal (as returned by {@link normalFromRays}).
 * @param normalCovariance - Its 3 × 3 covariance, row-major, symmetric.
 * @returns The 2 × 2 slope covariance, or `null` for a vertical facet (`nz = 0`).
 * @throws {@link core!MeniscusTypeError} on wrong shapes.
 * @throws {@link core!MeniscusRangeError} on a non-finite or zero normal or a covariance that
 *   is non-finite, not symmetric, or has a negative diagonal entry.
 * @see JCGM 100:2008 (GUM), §5.1.2, law of propagation of uncertainty.
 * @example
 * ```ts
 * const c = slopeCovarianceFromNormal([0, 0, 1], [1e-6, 0, 0, 0, 1e-6, 0, 0, 0, 0]);
 * // [1e-6, 0, 0, 1e-6]: near the zenith, slope error ≈ normal tilt error
 * ```
 */
export function slopeCovarianceFromNormal(normal: Vec3, normalCovariance: Mat3): SlopeCovariance | null {
  const fn = 'slopeCovarianceFromNormal';
  checkDirection(fn, 'normal', normal);
  const c = checkCovariance3(fn, 'normalCovariance', normalCovariance);
  const [x, y, z] = normal;
  if (z === 0) return null;
  const a = -1 / z;
  const bx = x / (z * z);
  const by = y / (z * z);
  // J rows: [a, 0, bx], [0, a, by]
  const j0 = [a, 0, bx];
  const j1 = [0, a, by];
  const quad = (u: number[], v: number[]): number => {
    let s = 0;
    for (let r = 0; r < 3; r++) for (let k = 0; k < 3; k++) s += u[r]! * c[r * 3 + k]! * v[k]!;
    return s;
  };
  const pp = quad(j0, j0);
  const pq = quad(j0, j1);
  const qq = quad(j1, j1);
  return [pp, pq, pq, qq];
}

/**
 * The covariance of the unit normal `(−p, −q, 1)/w`, `w = √(1 + p² + q²)`, from the
 * covariance of the slopes, to first order: `Σ_n = J Σ_pq Jᵀ` with
 * `∂n/∂p = (−1/w, 0, 0) + p (p, q, −1)/w³` and `∂n/∂q = (0, −1/w, 0) + q (p, q, −1)/w³`.
 *
 * @param p - Slope ∂h/∂x (finite).
 * @param q - Slope ∂h/∂y (finite).
 * @param slopeCovariance - The 2 × 2 covariance of `(p, q)`, row-major, symmetric.
 * @returns The 3 × 3 covariance of the normal, row-major.
 * @throws {@link core!MeniscusTypeError} on a wrong shape.
 * @throws {@link core!MeniscusRangeError} on a non-finite slope or a covariance that is
 *   non-finite, not symmetric, or has a negative diagonal entry.
 * @see JCGM 100:2008 (GUM), §5.1.2, law of propagation of uncertainty.
 * @example
 * ```ts
 * normalCovarianceFromSlopes(0, 0, [1e-6, 0, 0, 1e-6]); // diag(1e-6, 1e-6, 0)
 * ```
 */
export function normalCovarianceFromSlopes(p: number, q: number, slopeCovariance: SlopeCovariance): Mat3 {
  const fn = 'normalCovarianceFromSlopes';
  checkFinite(fn, 'p', p);
  checkFinite(fn, 'q', q);
  const c = checkCovariance2(fn, 'slopeCovariance', slopeCovariance);
  const w2 = 1 + p * p + q * q;
  const w = Math.sqrt(w2);
  const w3 = w2 * w;
  // columns of J: dn/dp and dn/dq
  const dp = [-1 / w + (p * p) / w3, (p * q) / w3, -p / w3];
  const dq = [(q * p) / w3, -1 / w + (q * q) / w3, -q / w3];
  const r = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let k = 0; k < 3; k++) {
      r[i * 3 + k] =
        dp[i]! * c[0] * dp[k]! + dp[i]! * c[1] * dq[k]! + dq[i]! * c[2] * dp[k]! + dq[i]! * c[3] * dq[k]!;
    }
  }
  return r as unknown as Mat3;
}
