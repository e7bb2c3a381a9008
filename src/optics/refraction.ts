/**
 * Vector refraction (Snell's law) and specular reflection at a flat interface, for one
 * ray and for packed batches of rays.
 *
 * @module
 */
import { Status, checkDirection, checkFloat64Array, checkOptions, checkOut, checkPositive, typeError } from '../core/index.js';
import type { MutableVec3, Vec3 } from '../core/index.js';
import { checkStatusOut, invLength } from './internal.js';

/**
 * Refract one ray at an interface (vector form of Snell's law).
 *
 * The normal may point to either side of the interface: it is first turned to face the
 * incident ray (so that `normal · incident < 0`). The refracted ray always continues to
 * the far side, the side the incident ray is travelling towards: its component along the
 * normal has the same sign as the incident ray's. A ray exactly tangent to the surface
 * (`normal · incident = 0`) is treated as arriving against the normal as given.
 *
 * With the normal `n` facing the ray, `η = n1/n2`, `c1 = −n·i` and
 * `k = 1 − η²(1 − c1²)`: `t = η i + (η c1 − √k) n`, and `k < 0` is total internal
 * reflection.
 *
 * @param incident - Direction of travel of the incident light (any non-zero length; it is
 *   normalised). Any frame; `normal` must be in the same frame.
 * @param normal - Surface normal (any non-zero length, either side of the interface).
 * @param n1 - Refractive index on the incident side (> 0).
 * @param n2 - Refractive index on the far side (> 0).
 * @returns The unit refracted direction, or `null` on total internal reflection.
 * @throws {@link core!MeniscusTypeError} when a vector is not a 3-vector of numbers.
 * @throws {@link core!MeniscusRangeError} when a vector is non-finite or of zero length, or an
 *   index is not a finite number > 0.
 * @see Snell's law of refraction in vector form: Glassner, A. S. (ed.) (1989), "An
 *   Introduction to Ray Tracing", Academic Press, ch. 4 (Heckbert's derivation); the same
 *   expression defines `refract` in the Khronos "OpenGL Shading Language" specification
 *   (built-in geometric functions).
 * @example
 * ```ts
 * // sunlight 30° from the zenith entering calm water (normal up, light going down)
 * const t = refract([0.5, 0, -Math.sqrt(3) / 2], [0, 0, 1], 1.000293, 1.333);
 * // t ≈ [0.3752, 0, -0.9269]: 22.04° from the nadir
 * ```
 */
export function refract(incident: Vec3, normal: Vec3, n1: number, n2: number): MutableVec3 | null {
  const fn = 'refract';
  const i = checkDirection(fn, 'incident', incident);
  const n = checkDirection(fn, 'normal', normal);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return refractUnit(i[0], i[1], i[2], n[0], n[1], n[2], n1 / n2);
}

/** Kernel on unit vectors; `eta = n1/n2`. */
function refractUnit(ix: number, iy: number, iz: number, nx: number, ny: number, nz: number, eta: number): MutableVec3 | null {
  let c = nx * ix + ny * iy + nz * iz;
  if (c > 0) {
    nx = -nx;
    ny = -ny;
    nz = -nz;
    c = -c;
  }
  const k = 1 - eta * eta * (1 - c * c);
  if (k < 0) return null;
  const s = -eta * c - Math.sqrt(k);
  return [eta * ix + s * nx, eta * iy + s * ny, eta * iz + s * nz];
}

/** Options of {@link refractBatch}. */
export interface RefractBatchOptions {
  /**
   * Output buffer for the directions, length `3 × count`. It may be the `incident` array
   * itself (refraction in place). @defaultValue a new `Float64Array`
   */
  out?: Float64Array;
  /** Output buffer for the status codes, length `count`. @defaultValue a new `Uint8Array` */
  status?: Uint8Array;
}

/** Result of {@link refractBatch}. */
export interface RefractBatchResult {
  /** Packed unit directions `xyz xyz …` (the `out` buffer when one was given). */
  directions: Float64Array;
  /** One {@link core!Status} code a ray: `Status.ok` or `Status.tir`. */
  status: Uint8Array;
}

/**
 * Refract a batch of rays at interfaces (vector Snell law), in one pass without
 * per-ray allocation.
 *
 * Each ray follows the rules of {@link refract}: incident directions need not be unit;
 * each normal may point to either side; the refracted ray continues to the far side. A
 * ray that is totally internally reflected gets `Status.tir` and, in `directions`, the
 * specularly **reflected** unit direction (where the light goes); other rays get
 * `Status.ok` and the refracted unit direction. No entry is ever NaN.
 *
 * Validation: array types and lengths are checked first; the vectors themselves are
 * checked in the same pass that refracts them (their lengths are computed anyway), so a
 * zero-length or non-finite vector throws when it is reached. Inputs are never modified;
 * after a throw, `options.out` and `options.status` may hold partial results.
 *
 * @param incident - Packed incident directions `xyz xyz …` (length `3 × count`).
 * @param normals - Packed normals, one a ray (length `3 × count`) or one shared by all
 *   rays (length 3).
 * @param n1 - Refractive index on the incident side (> 0).
 * @param n2 - Refractive index on the far side (> 0).
 * @param options - Output buffers.
 * @returns The directions and a status array.
 * @throws {@link core!MeniscusTypeError} when an array is not a `Float64Array` of a fitting
 *   length, or a buffer in `options` has the wrong type or length.
 * @throws {@link core!MeniscusRangeError} when an index is not a finite number > 0, or a
 *   vector is non-finite or of zero length (the message names its position).
 * @see Glassner, A. S. (ed.) (1989), "An Introduction to Ray Tracing", ch. 4; Khronos
 *   "OpenGL Shading Language" specification, `refract`.
 * @example
 * ```ts
 * const inc = new Float64Array([0, 0, -1, 0.6, 0, -0.8]);
 * const { directions, status } = refractBatch(inc, new Float64Array([0, 0, 1]), 1, 1.333);
 * // status: [Status.ok, Status.ok]
 * ```
 */
export function refractBatch(
  incident: Float64Array,
  normals: Float64Array,
  n1: number,
  n2: number,
  options?: RefractBatchOptions,
): RefractBatchResult {
  const fn = 'refractBatch';
  checkFloat64Array(fn, 'incident', incident, 3);
  checkFloat64Array(fn, 'normals', normals, 3);
  const count = incident.length / 3;
  if (normals.length !== 3 && normals.length !== incident.length) {
    typeError(fn, 'normals', normals, `a Float64Array of length 3 (one shared normal) or ${incident.length} (one a ray)`);
  }
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  const o = checkOptions(fn, options);
  const out = checkOut(fn, 'options.out', o.out, incident.length);
  const status = checkStatusOut(fn, 'options.status', o.status, count);
  // a shared normal is normalised once and read with stride 0
  const shared = normals.length === 3 && count !== 1;
  const nrm = shared ? Float64Array.from(checkDirection(fn, 'normals', normals)) : normals;
  refractKernel(fn, incident, nrm, shared ? 0 : 3, n1 / n2, out, status);
  return { directions: out, status };
}

/** The batch loop: validated buffers, normals read with stride `ns` (0 or 3). */
function refractKernel(
  fn: string,
  incident: Float64Array,
  normals: Float64Array,
  ns: number,
  eta: number,
  out: Float64Array,
  status: Uint8Array,
): void {
  const count = incident.length / 3;
  const eta2 = eta * eta;
  const ok = Status.ok;
  const tir = Status.tir;
  for (let r = 0, b = 0, c3 = 0; r < count; r++, b += 3, c3 += ns) {
    let ax = incident[b]!;
    let ay = incident[b + 1]!;
    let az = incident[b + 2]!;
    let bx = normals[c3]!;
    let by = normals[c3 + 1]!;
    let bz = normals[c3 + 2]!;
    const qi = ax * ax + ay * ay + az * az;
    const qn = bx * bx + by * by + bz * bz;
    let ab = bx * ax + by * ay + bz * az;
    // both already unit to 1e-8 (the common case): one Newton step from 1 gives 1/√q
    // with an error below 3(q − 1)²/8 ≤ 4e-17, under half an ulp, without a square root
    const ei = qi - 1;
    const en = qn - 1;
    let li = 1.5 - 0.5 * qi;
    let ln = 1.5 - 0.5 * qn;
    if (!(ei * ei + en * en < 1e-16)) {
      // not unit: scale both to unit length first (the raw squares and dot product may
      // have under- or overflowed), then go on as for unit vectors
      li = invLength(fn, 'incident', incident, r, ax, ay, az);
      ln = invLength(fn, 'normals', normals, ns === 0 ? 0 : r, bx, by, bz);
      ax *= li; ay *= li; az *= li;
      bx *= ln; by *= ln; bz *= ln;
      ab = bx * ax + by * ay + bz * az;
      li = 1;
      ln = 1;
    }
    // c = n̂·î from the raw dot product (the unit vectors themselves are never formed,
    // which keeps the dependency chain to the square root short); the normal is turned to
    // face the ray by the sign folded into sg
    const c0 = ab * (li * ln);
    const c = c0 > 0 ? -c0 : c0;
    const sg = c0 > 0 ? -ln : ln;
    const k = 1 - eta2 * (1 - c * c);
    // refracted: t = η î + (−η c − √k) n̂; reflected (TIR): r = î − 2c n̂; with
    // î = li·a and n̂ = ln·b, the factors li and ln go into e and s
    let e = eta * li;
    let s: number;
    let st: number = ok;
    if (k >= 0) s = (-eta * c - Math.sqrt(k)) * sg;
    else {
      s = -2 * c * sg;
      e = li;
      st = tir;
    }
    out[b] = e * ax + s * bx;
    out[b + 1] = e * ay + s * by;
    out[b + 2] = e * az + s * bz;
    status[r] = st;
  }
}

/**
 * Reflect one ray specularly: `r = i − 2 (n·i) n` with unit `i` and `n`. The side the
 * normal points to does not matter; the reflected ray returns to the incident side.
 *
 * @param incident - Direction of travel (any non-zero length; normalised).
 * @param normal - Surface normal (any non-zero length, either side).
 * @returns The unit reflected direction.
 * @throws {@link core!MeniscusTypeError} when a vector is not a 3-vector of numbers.
 * @throws {@link core!MeniscusRangeError} when a vector is non-finite or of zero length.
 * @see The law of reflection in vector form: Glassner, A. S. (ed.) (1989), "An
 *   Introduction to Ray Tracing", ch. 4; Khronos "OpenGL Shading Language"
 *   specification, `reflect`.
 * @example
 * ```ts
 * reflect([1, 0, -1], [0, 0, 1]); // [0.7071…, 0, 0.7071…]
 * ```
 */
export function reflect(incident: Vec3, normal: Vec3): MutableVec3 {
  const fn = 'reflect';
  const i = checkDirection(fn, 'incident', incident);
  const n = checkDirection(fn, 'normal', normal);
  const s = -2 * (n[0] * i[0] + n[1] * i[1] + n[2] * i[2]);
  return [i[0] + s * n[0], i[1] + s * n[1], i[2] + s * n[2]];
}

/** Options of {@link reflectBatch}. */
export interface ReflectBatchOptions {
  /**
   * Output buffer, length `3 × count`; it may be the `incident` array itself.
   * @defaultValue a new `Float64Array`
   */
  out?: Float64Array;
}

/**
 * Reflect a batch of rays specularly, as {@link reflect} does for one.
 *
 * Vectors are validated in the same pass that reflects them; inputs are never modified;
 * after a throw `options.out` may hold partial results.
 *
 * @param incident - Packed directions of travel `xyz xyz …` (any non-zero lengths).
 * @param normals - Packed normals, one a ray or one shared (length 3).
 * @param options - Output buffer.
 * @returns Packed unit reflected directions (the `out` buffer when one was given).
 * @throws {@link core!MeniscusTypeError} on wrong array types or lengths.
 * @throws {@link core!MeniscusRangeError} when a vector is non-finite or of zero length.
 * @see Glassner, A. S. (ed.) (1989), "An Introduction to Ray Tracing", ch. 4.
 * @example
 * ```ts
 * reflectBatch(new Float64Array([1, 0, -1]), new Float64Array([0, 0, 1])); // [0.707…, 0, 0.707…]
 * ```
 */
export function reflectBatch(incident: Float64Array, normals: Float64Array, options?: ReflectBatchOptions): Float64Array {
  const fn = 'reflectBatch';
  checkFloat64Array(fn, 'incident', incident, 3);
  checkFloat64Array(fn, 'normals', normals, 3);
  const count = incident.length / 3;
  if (normals.length !== 3 && normals.length !== incident.length) {
    typeError(fn, 'normals', normals, `a Float64Array of length 3 (one shared normal) or ${incident.length} (one a ray)`);
  }
  const o = checkOptions(fn, options);
  const out = checkOut(fn, 'options.out', o.out, incident.length);
  const shared = normals.length === 3 && count !== 1;
  let snx = 0;
  let sny = 0;
  let snz = 0;
  if (shared) {
    const u = checkDirection(fn, 'normals', normals);
    snx = u[0];
    sny = u[1];
    snz = u[2];
  }
  for (let r = 0, b = 0; r < count; r++, b += 3) {
    const ax = incident[b]!;
    const ay = incident[b + 1]!;
    const az = incident[b + 2]!;
    const qli = ax * ax + ay * ay + az * az;
    const li = qli > 0.99999999 && qli < 1.00000001 ? 1.5 - 0.5 * qli : invLength(fn, 'incident', incident, r, ax, ay, az);
    const ix = ax * li;
    const iy = ay * li;
    const iz = az * li;
    let nx = snx;
    let ny = sny;
    let nz = snz;
    if (!shared) {
      const bx = normals[b]!;
      const by = normals[b + 1]!;
      const bz = normals[b + 2]!;
      const qln = bx * bx + by * by + bz * bz;
      const ln = qln > 0.99999999 && qln < 1.00000001 ? 1.5 - 0.5 * qln : invLength(fn, 'normals', normals, r, bx, by, bz);
      nx = bx * ln;
      ny = by * ln;
      nz = bz * ln;
    }
    const s = -2 * (nx * ix + ny * iy + nz * iz);
    out[b] = ix + s * nx;
    out[b + 1] = iy + s * ny;
    out[b + 2] = iz + s * nz;
  }
  return out;
}
