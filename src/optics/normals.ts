/**
 * The inverse of refraction: the surface normal that bends a known incident ray into a
 * known refracted ray, for one pair and for packed batches, and the covariance of that
 * normal from the covariances of the two directions.
 *
 * @module
 */
import { Status, checkDirection, checkFloat64Array, checkOptions, checkOut, checkPositive, rangeError, typeError } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';
import { checkCovariance3, checkStatusOut, invLength } from './internal.js';

function checkIndices(fn: string, n1: number, n2: number): void {
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  if (n1 === n2) rangeError(fn, 'n2', n2, `an index different from n1 (${n1}): equal media bend no ray, so they fix no normal`);
}

/**
 * The unit surface normal of the interface that refracts `incident` into `refracted`.
 *
 * Snell's law keeps the tangential part of `n·direction` continuous, so `n1 i − n2 t`
 * (with unit `i`, `t`) is along the normal. The result is oriented against the incident
 * ray (`normal · incident < 0`, i.e. it points into the incident medium). The pair is
 * consistent — some interface between these media refracts `i` into `t` — exactly when
 * `i` and `t` lie on the same side of that plane of the normal, i.e. `(i·m)(t·m) > 0`
 * for `m = n1 i − n2 t`; otherwise (the rays on opposite sides, a deviation larger than
 * the media allow, a bend the wrong way) the result is `null`. When it is not `null`,
 * {@link refract} with the returned normal gives `refracted` back.
 *
 * @param incident - Direction of travel before the interface (any non-zero length).
 * @param refracted - Direction of travel after it (any non-zero length), same frame.
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the refracted side (> 0, different from `n1`).
 * @returns The unit normal, or `null` when the pair is inconsistent.
 * @throws {@link core!MeniscusTypeError} when a vector is not a 3-vector of numbers.
 * @throws {@link core!MeniscusRangeError} when a vector is non-finite or of zero length, an
 *   index is not a finite number > 0, or `n1 === n2`.
 * @see Snell's law in vector form, `n1 (i × n) = n2 (t × n)`: Born, M. & Wolf, E. (1999),
 *   "Principles of Optics", 7th ed., §1.5.1; Glassner, A. S. (ed.) (1989), "An
 *   Introduction to Ray Tracing", ch. 4.
 * @example
 * ```ts
 * const t = refract([0.5, 0, -Math.sqrt(3) / 2], [0, 0, 1], 1, 1.333)!;
 * normalFromRays([0.5, 0, -Math.sqrt(3) / 2], t, 1, 1.333); // ≈ [0, 0, 1]
 * ```
 */
export function normalFromRays(incident: Vec3, refracted: Vec3, n1: number, n2: number): MutableVec3 | null {
  const fn = 'normalFromRays';
  const i = checkDirection(fn, 'incident', incident);
  const t = checkDirection(fn, 'refracted', refracted);
  checkIndices(fn, n1, n2);
  const mx = n1 * i[0] - n2 * t[0];
  const my = n1 * i[1] - n2 * t[1];
  const mz = n1 * i[2] - n2 * t[2];
  const im = i[0] * mx + i[1] * my + i[2] * mz;
  const tm = t[0] * mx + t[1] * my + t[2] * mz;
  if (!(im * tm > 0)) return null;
  const s = (im > 0 ? -1 : 1) / Math.hypot(mx, my, mz);
  return [mx * s, my * s, mz * s];
}

/** Options of {@link normalFromRaysBatch}. */
export interface NormalFromRaysBatchOptions {
  /**
   * Output buffer for the normals, length `3 × count`; it may be one of the input
   * arrays (in place). @defaultValue a new `Float64Array`
   */
  out?: Float64Array;
  /** Output buffer for the status codes, length `count`. @defaultValue a new `Uint8Array` */
  status?: Uint8Array;
}

/** Result of {@link normalFromRaysBatch}. */
export interface NormalFromRaysBatchResult {
  /** Packed unit normals `xyz xyz …` (the `out` buffer when one was given). */
  normals: Float64Array;
  /** One {@link core!Status} code a pair: `Status.ok` or `Status.inconsistent`. */
  status: Uint8Array;
}

/**
 * The surface normals of a batch of (incident, refracted) pairs, as
 * {@link normalFromRays} finds one, in one pass without per-pair allocation.
 *
 * A consistent pair gets `Status.ok` and its unit normal oriented against the incident
 * ray; an inconsistent pair gets `Status.inconsistent` and the normal `(0, 0, 0)`. No
 * entry is ever NaN. Array types and lengths are checked first, the vectors in the same
 * pass that uses them (their lengths are computed anyway); inputs are never modified;
 * after a throw the output buffers may hold partial results.
 *
 * @param incident - Packed incident directions `xyz xyz …` (any non-zero lengths).
 * @param refracted - Packed refracted directions, same length.
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the refracted side (> 0, different from `n1`).
 * @param options - Output buffers.
 * @returns The normals and a status array.
 * @throws {@link core!MeniscusTypeError} on wrong array types or mismatched lengths.
 * @throws {@link core!MeniscusRangeError} when a vector is non-finite or of zero length (the
 *   message names its position), an index is not a finite number > 0, or `n1 === n2`.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.1.
 * @example
 * ```ts
 * const inc = new Float64Array([0, 0, -1]);
 * normalFromRaysBatch(inc, inc, 1, 1.333).normals; // [0, 0, 1]: normal incidence
 * ```
 */
export function normalFromRaysBatch(
  incident: Float64Array,
  refracted: Float64Array,
  n1: number,
  n2: number,
  options?: NormalFromRaysBatchOptions,
): NormalFromRaysBatchResult {
  const fn = 'normalFromRaysBatch';
  checkFloat64Array(fn, 'incident', incident, 3);
  checkFloat64Array(fn, 'refracted', refracted, 3);
  if (refracted.length !== incident.length) {
    typeError(fn, 'refracted', refracted, `a Float64Array of the same length as incident (${incident.length})`);
  }
  checkIndices(fn, n1, n2);
  const o = checkOptions(fn, options);
  const count = incident.length / 3;
  const out = checkOut(fn, 'options.out', o.out, incident.length);
  const status = checkStatusOut(fn, 'options.status', o.status, count);
  normalsKernel(fn, incident, refracted, n1, n2, out, status);
  return { normals: out, status };
}

/** The batch loop over validated buffers. */
function normalsKernel(
  fn: string,
  incident: Float64Array,
  refracted: Float64Array,
  n1: number,
  n2: number,
  out: Float64Array,
  status: Uint8Array,
): void {
  const count = incident.length / 3;
  const ok = Status.ok;
  const bad = Status.inconsistent;
  for (let r = 0, b = 0; r < count; r++, b += 3) {
    let ax = incident[b]!;
    let ay = incident[b + 1]!;
    let az = incident[b + 2]!;
    let bx = refracted[b]!;
    let by = refracted[b + 1]!;
    let bz = refracted[b + 2]!;
    let qi = ax * ax + ay * ay + az * az;
    let qt = bx * bx + by * by + bz * bz;
    // both already unit to 1e-8 (the common case): one Newton step from 1 gives 1/√q
    // with an error below 3(q − 1)²/8 ≤ 4e-17, under half an ulp, without a square root
    const ei = qi - 1;
    const et = qt - 1;
    let li = 1.5 - 0.5 * qi;
    let lt = 1.5 - 0.5 * qt;
    if (!(ei * ei + et * et < 1e-16)) {
      // not unit: scale both to unit length first (the raw squares may have under- or
      // overflowed), then go on as for unit vectors
      li = invLength(fn, 'incident', incident, r, ax, ay, az);
      lt = invLength(fn, 'refracted', refracted, r, bx, by, bz);
      ax *= li; ay *= li; az *= li;
      bx *= lt; by *= lt; bz *= lt;
      qi = ax * ax + ay * ay + az * az;
      qt = bx * bx + by * by + bz * bz;
      li = 1;
      lt = 1;
    }
    // m = n1 î − n2 t̂ with î = li·a, t̂ = lt·b; the signs of î·m and t̂·m are those of
    // a·m and b·m (li, lt > 0), taken from the raw dot products so that neither the unit
    // vectors nor m have to be formed first
    const g1 = n1 * li;
    const g2 = n2 * lt;
    const ab = ax * bx + ay * by + az * bz;
    const mx = g1 * ax - g2 * bx;
    const my = g1 * ay - g2 * by;
    const mz = g1 * az - g2 * bz;
    const im = g1 * qi - g2 * ab;
    const tm = g1 * ab - g2 * qt;
    if (im * tm > 0) {
      const s = (im > 0 ? -1 : 1) / Math.sqrt(mx * mx + my * my + mz * mz);
      out[b] = mx * s;
      out[b + 1] = my * s;
      out[b + 2] = mz * s;
      status[r] = ok;
    } else {
      out[b] = 0;
      out[b + 1] = 0;
      out[b + 2] = 0;
      status[r] = bad;
    }
  }
}

/** `P = I − u uᵀ` for a unit `u`, scaled by `s`. */
function projector(u: Vec3, s: number): number[] {
  const [x, y, z] = u;
  return [s * (1 - x * x), -s * x * y, -s * x * z, -s * y * x, s * (1 - y * y), -s * y * z, -s * z * x, -s * z * y, s * (1 - z * z)];
}

function mul(a: ArrayLike<number>, b: ArrayLike<number>): number[] {
  const r = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      r[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
    }
  }
  return r;
}

/** `A Σ Aᵀ`. */
function sandwich(a: ArrayLike<number>, sigma: ArrayLike<number>): number[] {
  const as = mul(a, sigma);
  const r = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      r[i * 3 + j] = as[i * 3]! * a[j * 3]! + as[i * 3 + 1]! * a[j * 3 + 1]! + as[i * 3 + 2]! * a[j * 3 + 2]!;
    }
  }
  return r;
}

/** Result of {@link normalFromRaysWithCovariance}. */
export interface NormalWithCovariance {
  /** The unit normal, oriented against the incident ray (as {@link normalFromRays}). */
  normal: MutableVec3;
  /** Its 3 × 3 covariance, row-major (singular: it has no component along the normal). */
  covariance: Mat3;
}

/**
 * The normal from a ray pair (as {@link normalFromRays}) and its covariance, propagated
 * to first order from the covariances of the two given direction vectors, taken as
 * independent.
 *
 * With `î = i/|i|`, `t̂ = t/|t|`, `m = n1 î − n2 t̂` and `N = ±m/|m|`, the analytic
 * Jacobians are `∂N/∂i = n1/(|m| |i|) · P_N P_î` and `∂N/∂t = −n2/(|m| |t|) · P_N P_t̂`,
 * with the projectors `P_u = I − u uᵀ`; then `Σ_N = J_i Σ_i J_iᵀ + J_t Σ_t J_tᵀ`. The
 * covariances may be of raw (non-unit) vectors: the normalisation is part of the
 * Jacobian, so a component of the error along a direction has no effect.
 *
 * @param incident - Incident direction (any non-zero length).
 * @param refracted - Refracted direction (any non-zero length).
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the refracted side (> 0, ≠ n1).
 * @param incidentCovariance - 3 × 3 covariance of `incident`, row-major, symmetric.
 * @param refractedCovariance - 3 × 3 covariance of `refracted`, row-major, symmetric.
 * @returns The normal with its covariance, or `null` when the pair is inconsistent.
 * @throws {@link core!MeniscusTypeError} when a vector or matrix has the wrong shape.
 * @throws {@link core!MeniscusRangeError} on a non-finite or zero vector, a bad index,
 *   `n1 === n2`, or a covariance that is non-finite, not symmetric or has a negative
 *   diagonal entry.
 * @see First-order (linear) propagation of covariance: JCGM 100:2008, "Evaluation of
 *   measurement data — Guide to the expression of uncertainty in measurement", §5.1.2,
 *   in its multivariate form of JCGM 102:2011 (GUM Supplement 2); Snell's law as for
 *   {@link normalFromRays}.
 * @example
 * ```ts
 * const s = 1e-6; // variance of each component, rad²
 * const iso: Mat3 = [s, 0, 0, 0, s, 0, 0, 0, s];
 * const r = normalFromRaysWithCovariance([0, 0, -1], [0, 0, -1], 1, 1.333, iso, iso);
 * // r.covariance[0] ≈ (1 + 1.333²)/0.333² · 1e-6 ≈ 2.50e-5
 * ```
 */
export function normalFromRaysWithCovariance(
  incident: Vec3,
  refracted: Vec3,
  n1: number,
  n2: number,
  incidentCovariance: Mat3,
  refractedCovariance: Mat3,
): NormalWithCovariance | null {
  const fn = 'normalFromRaysWithCovariance';
  const i = checkDirection(fn, 'incident', incident);
  const t = checkDirection(fn, 'refracted', refracted);
  checkIndices(fn, n1, n2);
  const si = checkCovariance3(fn, 'incidentCovariance', incidentCovariance);
  const st = checkCovariance3(fn, 'refractedCovariance', refractedCovariance);
  const li = Math.hypot(incident[0], incident[1], incident[2]);
  const lt = Math.hypot(refracted[0], refracted[1], refracted[2]);
  const m: MutableVec3 = [n1 * i[0] - n2 * t[0], n1 * i[1] - n2 * t[1], n1 * i[2] - n2 * t[2]];
  const im = i[0] * m[0] + i[1] * m[1] + i[2] * m[2];
  const tm = t[0] * m[0] + t[1] * m[1] + t[2] * m[2];
  if (!(im * tm > 0)) return null;
  const lm = Math.hypot(m[0], m[1], m[2]);
  const s = (im > 0 ? -1 : 1) / lm;
  const normal: MutableVec3 = [m[0] * s, m[1] * s, m[2] * s];
  const pn = projector(normal, 1);
  const ji = mul(pn, projector(i, n1 / (lm * li)));
  const jt = mul(pn, projector(t, -n2 / (lm * lt)));
  const a = sandwich(ji, si);
  const b = sandwich(jt, st);
  const c = new Array<number>(9);
  for (let k = 0; k < 9; k++) c[k] = a[k]! + b[k]!;
  // symmetrise against rounding
  for (let r = 0; r < 3; r++) {
    for (let q = r + 1; q < 3; q++) {
      const v = 0.5 * (c[r * 3 + q]! + c[q * 3 + r]!);
      c[r * 3 + q] = v;
      c[q * 3 + r] = v;
    }
  }
  return { normal, covariance: c as unknown as Mat3 };
}
