/**
 * Platform attitude: heading, pitch and roll, unit quaternions and rotation matrices.
 *
 * **Frames.** The world frame is local east-north-up (ENU). The platform frame is
 * forward-starboard-down (x towards the bow, y to starboard, z down through the keel),
 * the usual body frame of ships and aircraft. The attitude angles are the intrinsic
 * Z-Y′-X″ (yaw-pitch-roll) sequence taken from north-east-down (NED):
 *
 * - **heading** ψ: rotation about the down axis; 0 = bow to north, π/2 = bow to east
 *   (clockwise from north seen from above);
 * - **pitch** θ: then about the new starboard axis; positive raises the bow;
 * - **roll** φ: then about the new forward axis; positive lowers the starboard side.
 *
 * `R_NED←platform = Rz(ψ) Ry(θ) Rx(φ)` with the right-handed rotations
 * `Rz(ψ) = [[cψ, −sψ, 0], [sψ, cψ, 0], [0, 0, 1]]` etc., and
 * `R_ENU←platform = P · R_NED←platform` with `P = [[0, 1, 0], [1, 0, 0], [0, 0, −1]]`.
 * A quaternion here is `[w, x, y, z]` (scalar first, Hamilton product) for the same
 * rotation: `v_ENU = q v_platform q*`.
 *
 * @module
 */
import { checkFinite, checkOptions, checkVec3, rangeError, typeError } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';
import { checkRotation } from '../camera/pose.js';

/** Heading, pitch and roll, radians (intrinsic Z-Y′-X″ from north-east-down; see the module notes). */
export interface Attitude {
  /** Clockwise from north about the down axis, radians (0 = bow to north, π/2 = bow to east). */
  readonly heading: number;
  /** Bow up positive, radians, in [−π/2, π/2] when returned by this library. */
  readonly pitch: number;
  /** Starboard down positive, radians. */
  readonly roll: number;
}

/** A unit quaternion `[w, x, y, z]`, scalar first, Hamilton convention. */
export type Quaternion = readonly [number, number, number, number];

/** A mutable quaternion, as returned by the helpers. */
export type MutableQuaternion = [number, number, number, number];

/** Either way of giving a platform's attitude. */
export type AttitudeInput = Attitude | Quaternion;

const SQRT1_2 = Math.SQRT1_2;
/** Quaternion of P (NED → ENU): 180° about (1, 1, 0)/√2. */
const Q_NED_TO_ENU: Quaternion = [0, SQRT1_2, SQRT1_2, 0];

/**
 * Check an attitude object at a public boundary.
 *
 * @returns The attitude.
 * @throws {@link core!MeniscusTypeError} when it is not an object; {@link core!MeniscusRangeError}
 *   when an angle is not finite.
 * @example
 * ```ts
 * checkAttitude('fn', 'attitude', { heading: 0, pitch: 0, roll: 0 });
 * ```
 */
export function checkAttitude(fn: string, parameter: string, value: unknown): Attitude {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    typeError(fn, parameter, value, 'an object { heading, pitch, roll } in radians');
  }
  const a = value as Attitude;
  checkFinite(fn, `${parameter}.heading`, a.heading);
  checkFinite(fn, `${parameter}.pitch`, a.pitch);
  checkFinite(fn, `${parameter}.roll`, a.roll);
  return a;
}

/**
 * Check a quaternion at a public boundary and return it normalised.
 *
 * @returns A unit quaternion (a new tuple).
 * @throws {@link core!MeniscusTypeError} for a wrong shape; {@link core!MeniscusRangeError} for
 *   non-finite components or zero length.
 * @example
 * ```ts
 * checkQuaternion('fn', 'q', [2, 0, 0, 0]); // [1, 0, 0, 0]
 * ```
 */
export function checkQuaternion(fn: string, parameter: string, value: unknown): MutableQuaternion {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<number>).length !== 4) typeError(fn, parameter, value, 'a quaternion [w, x, y, z]');
  const q = value as ArrayLike<unknown>;
  for (let k = 0; k < 4; k++) {
    if (typeof q[k] !== 'number') typeError(fn, parameter, value, 'a quaternion of numbers');
    if (!Number.isFinite(q[k])) rangeError(fn, parameter, value, 'a quaternion of finite numbers');
  }
  const v = value as unknown as Quaternion;
  const n = Math.hypot(v[0], v[1], v[2], v[3]);
  if (!(n > 0) || !Number.isFinite(n)) rangeError(fn, parameter, value, 'a quaternion of non-zero length');
  return [v[0] / n, v[1] / n, v[2] / n, v[3] / n];
}

/**
 * The Hamilton product `a ⊗ b` (apply `b` first, then `a`).
 *
 * @returns The product quaternion.
 * @see Hamilton, W. R. (1844), "On quaternions", Philosophical Magazine 25, 489.
 * @example
 * ```ts
 * quaternionMultiply([1, 0, 0, 0], [0, 1, 0, 0]); // [0, 1, 0, 0]
 * ```
 */
export function quaternionMultiply(a: Quaternion, b: Quaternion): MutableQuaternion {
  checkQuaternionShape('quaternionMultiply', 'a', a);
  checkQuaternionShape('quaternionMultiply', 'b', b);
  return [
    a[0] * b[0] - a[1] * b[1] - a[2] * b[2] - a[3] * b[3],
    a[0] * b[1] + a[1] * b[0] + a[2] * b[3] - a[3] * b[2],
    a[0] * b[2] - a[1] * b[3] + a[2] * b[0] + a[3] * b[1],
    a[0] * b[3] + a[1] * b[2] - a[2] * b[1] + a[3] * b[0],
  ];
}

/**
 * The conjugate `[w, −x, −y, −z]`: the inverse rotation of a unit quaternion.
 *
 * @returns The conjugate.
 * @example
 * ```ts
 * quaternionConjugate([0, 1, 0, 0]); // [0, -1, -0, -0]
 * ```
 */
export function quaternionConjugate(q: Quaternion): MutableQuaternion {
  checkQuaternionShape('quaternionConjugate', 'q', q);
  return [q[0], -q[1], -q[2], -q[3]];
}

/**
 * The rotation matrix of a quaternion (normalised first): `v' = M v = q v q*`.
 *
 * @param q - A quaternion `[w, x, y, z]` of non-zero length.
 * @returns The rotation matrix, row-major.
 * @throws {@link core!MeniscusRangeError} for a zero or non-finite quaternion.
 * @see Shoemake, K. (1985), "Animating rotation with quaternion curves", SIGGRAPH 19(3), 245.
 * @example
 * ```ts
 * quaternionToMatrix([Math.SQRT1_2, 0, 0, Math.SQRT1_2]); // 90° about z
 * ```
 */
export function quaternionToMatrix(q: Quaternion): Mat3 {
  const [w, x, y, z] = checkQuaternion('quaternionToMatrix', 'q', q);
  return [
    1 - 2 * (y * y + z * z),
    2 * (x * y - w * z),
    2 * (x * z + w * y),
    2 * (x * y + w * z),
    1 - 2 * (x * x + z * z),
    2 * (y * z - w * x),
    2 * (x * z - w * y),
    2 * (y * z + w * x),
    1 - 2 * (x * x + y * y),
  ];
}

/**
 * The unit quaternion of a rotation matrix, by Shepperd's method (the numerically
 * stable choice of the largest of w², x², y², z²). The result has `w ≥ 0`.
 *
 * @param m - A rotation matrix (orthonormal within 1e-6, determinant +1).
 * @returns The quaternion `[w, x, y, z]`.
 * @throws {@link core!MeniscusRangeError} when `m` is not a rotation.
 * @see Shepperd, S. W. (1978), "Quaternion from rotation matrix", Journal of Guidance and
 *   Control 1(3), 223–224.
 * @example
 * ```ts
 * matrixToQuaternion([1, 0, 0, 0, 1, 0, 0, 0, 1]); // [1, 0, 0, 0]
 * ```
 */
export function matrixToQuaternion(m: Mat3): MutableQuaternion {
  checkRotation('matrixToQuaternion', 'm', m);
  const tr = m[0] + m[4] + m[8];
  let q: MutableQuaternion;
  if (tr >= m[0] && tr >= m[4] && tr >= m[8]) {
    const s = 2 * Math.sqrt(1 + tr);
    q = [s / 4, (m[7] - m[5]) / s, (m[2] - m[6]) / s, (m[3] - m[1]) / s];
  } else if (m[0] >= m[4] && m[0] >= m[8]) {
    const s = 2 * Math.sqrt(1 + m[0] - m[4] - m[8]);
    q = [(m[7] - m[5]) / s, s / 4, (m[1] + m[3]) / s, (m[2] + m[6]) / s];
  } else if (m[4] >= m[8]) {
    const s = 2 * Math.sqrt(1 - m[0] + m[4] - m[8]);
    q = [(m[2] - m[6]) / s, (m[1] + m[3]) / s, s / 4, (m[5] + m[7]) / s];
  } else {
    const s = 2 * Math.sqrt(1 - m[0] - m[4] + m[8]);
    q = [(m[3] - m[1]) / s, (m[2] + m[6]) / s, (m[5] + m[7]) / s, s / 4];
  }
  if (q[0] < 0) q = [-q[0], -q[1], -q[2], -q[3]];
  const n = Math.hypot(q[0], q[1], q[2], q[3]);
  return [q[0] / n, q[1] / n, q[2] / n, q[3] / n];
}

function nedMatrix(h: number, p: number, r: number): Mat3 {
  const ch = Math.cos(h), sh = Math.sin(h), cp = Math.cos(p), sp = Math.sin(p), cr = Math.cos(r), sr = Math.sin(r);
  return [
    ch * cp, ch * sp * sr - sh * cr, ch * sp * cr + sh * sr,
    sh * cp, sh * sp * sr + ch * cr, sh * sp * cr - ch * sr,
    -sp, cp * sr, cp * cr,
  ];
}

/**
 * The rotation matrix that takes platform-frame vectors (forward-starboard-down) to
 * east-north-up: `v_ENU = M v_platform`. Its transpose goes the other way.
 *
 * @param attitude - Heading, pitch, roll in radians (intrinsic Z-Y′-X″ from north-east-down;
 *   heading clockwise from north, bow-up pitch and starboard-down roll positive).
 * @returns `M`, row-major.
 * @throws {@link core!MeniscusRangeError} for a non-finite angle.
 * @see Diebel, J. (2006), "Representing attitude: Euler angles, unit quaternions, and
 *   rotation vectors", Stanford University, eq. 67 (the 3-2-1 sequence).
 * @example
 * ```ts
 * const M = attitudeToMatrix({ heading: Math.PI / 2, pitch: 0, roll: 0 });
 * mat3MulVec(M, [1, 0, 0]); // bow points east: ≈ [1, 0, 0] in ENU
 * ```
 */
export function attitudeToMatrix(attitude: Attitude): Mat3 {
  const a = checkAttitude('attitudeToMatrix', 'attitude', attitude);
  const n = nedMatrix(a.heading, a.pitch, a.roll);
  // P · N with P = [[0,1,0],[1,0,0],[0,0,-1]]: swap the first two rows, negate the third.
  return [n[3], n[4], n[5], n[0], n[1], n[2], -n[6], -n[7], -n[8]];
}

/**
 * The quaternion of {@link attitudeToMatrix}: `v_ENU = q v_platform q*`.
 *
 * @param attitude - Heading, pitch, roll in radians (see {@link attitudeToMatrix}).
 * @returns The unit quaternion `[w, x, y, z]` with `w ≥ 0`.
 * @throws {@link core!MeniscusRangeError} for a non-finite angle.
 * @see Diebel, J. (2006), "Representing attitude: Euler angles, unit quaternions, and
 *   rotation vectors", Stanford University, eq. 84.
 * @example
 * ```ts
 * attitudeToQuaternion({ heading: 0, pitch: 0, roll: 0 }); // [0, 0.7071, 0.7071, 0]
 * ```
 */
export function attitudeToQuaternion(attitude: Attitude): MutableQuaternion {
  const a = checkAttitude('attitudeToQuaternion', 'attitude', attitude);
  const qz: Quaternion = [Math.cos(a.heading / 2), 0, 0, Math.sin(a.heading / 2)];
  const qy: Quaternion = [Math.cos(a.pitch / 2), 0, Math.sin(a.pitch / 2), 0];
  const qx: Quaternion = [Math.cos(a.roll / 2), Math.sin(a.roll / 2), 0, 0];
  let q = quaternionMultiply(Q_NED_TO_ENU, quaternionMultiply(qz, quaternionMultiply(qy, qx)));
  if (q[0] < 0 || (q[0] === 0 && (q[1] < 0 || (q[1] === 0 && (q[2] < 0 || (q[2] === 0 && q[3] < 0)))))) {
    q = [-q[0], -q[1], -q[2], -q[3]];
  }
  return q;
}

/** Options of {@link matrixToAttitude} and {@link quaternionToAttitude}. */
export interface AttitudeFromRotationOptions {
  /**
   * Within this distance of pitch ±π/2 (gimbal lock), radians, heading and roll are not
   * separable: roll is set to 0 and the whole turn goes into heading.
   * @defaultValue 1e-9
   */
  gimbalTolerance?: number;
}

/**
 * Heading, pitch and roll of a platform-to-ENU rotation matrix (the inverse of
 * {@link attitudeToMatrix}). Heading in [0, 2π), pitch in [−π/2, π/2], roll in (−π, π].
 * At gimbal lock (pitch ±π/2) roll is 0 by convention.
 *
 * @param m - The rotation `R_ENU←platform`.
 * @param options - Gimbal-lock tolerance.
 * @returns The attitude.
 * @throws {@link core!MeniscusRangeError} when `m` is not a rotation.
 * @see Diebel, J. (2006), "Representing attitude: Euler angles, unit quaternions, and
 *   rotation vectors", Stanford University, eq. 72.
 * @example
 * ```ts
 * matrixToAttitude(attitudeToMatrix({ heading: 1, pitch: 0.2, roll: -0.1 })); // the same angles
 * ```
 */
export function matrixToAttitude(m: Mat3, options?: AttitudeFromRotationOptions): Attitude {
  checkRotation('matrixToAttitude', 'm', m);
  const o = checkOptions('matrixToAttitude', options);
  const tol = o.gimbalTolerance === undefined ? 1e-9 : checkFinite('matrixToAttitude', 'options.gimbalTolerance', o.gimbalTolerance);
  return attitudeFromMatrixKernel(m, tol);
}

function attitudeFromMatrixKernel(m: Mat3, tol: number): Attitude {
  // N = Pᵀ M (P is its own inverse): rows (m1, m0, −m2).
  const n00 = m[3], n01 = m[4], n10 = m[0], n11 = m[1], n20 = -m[6], n21 = -m[7], n22 = -m[8];
  const pitch = Math.atan2(-n20, Math.hypot(n00, n10));
  let heading: number;
  let roll: number;
  if (Math.PI / 2 - Math.abs(pitch) <= tol) {
    roll = 0;
    heading = Math.atan2(-n01, n11);
  } else {
    heading = Math.atan2(n10, n00);
    roll = Math.atan2(n21, n22);
  }
  if (heading < 0) heading += 2 * Math.PI;
  if (heading >= 2 * Math.PI) heading -= 2 * Math.PI;
  if (roll === -Math.PI) roll = Math.PI;
  return { heading, pitch, roll };
}

/**
 * Heading, pitch and roll of a platform-to-ENU quaternion (the inverse of
 * {@link attitudeToQuaternion}); see {@link matrixToAttitude} for ranges and gimbal lock.
 *
 * @param q - A quaternion `[w, x, y, z]` (normalised here).
 * @param options - Gimbal-lock tolerance.
 * @returns The attitude.
 * @throws {@link core!MeniscusRangeError} for a zero or non-finite quaternion.
 * @example
 * ```ts
 * quaternionToAttitude(attitudeToQuaternion({ heading: 3, pitch: -0.4, roll: 1 }));
 * ```
 */
export function quaternionToAttitude(q: Quaternion, options?: AttitudeFromRotationOptions): Attitude {
  const o = checkOptions('quaternionToAttitude', options);
  const tol =
    o.gimbalTolerance === undefined ? 1e-9 : checkFinite('quaternionToAttitude', 'options.gimbalTolerance', o.gimbalTolerance);
  return attitudeFromMatrixKernel(quaternionToMatrix(q), tol);
}

/**
 * The platform-to-ENU rotation matrix of an attitude given either way.
 *
 * @param attitude - Heading/pitch/roll (radians, see {@link attitudeToMatrix}) or a quaternion.
 * @returns `R_ENU←platform`.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * platformRotation([0, Math.SQRT1_2, Math.SQRT1_2, 0]); // level, bow to north
 * ```
 */
export function platformRotation(attitude: AttitudeInput): Mat3 {
  if (Array.isArray(attitude) || attitude instanceof Float64Array) return quaternionToMatrix(attitude as Quaternion);
  return attitudeToMatrix(attitude as Attitude);
}

/**
 * A vector given in east-north-up, expressed in the platform frame (forward-starboard-down).
 *
 * @param attitude - The platform's attitude (see {@link attitudeToMatrix}).
 * @param v - The vector in ENU.
 * @returns The vector in the platform frame.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * enuToPlatform({ heading: 0, pitch: 0, roll: 0 }, [0, 0, 1]); // up = [0, 0, -1] (z is down)
 * ```
 */
export function enuToPlatform(attitude: AttitudeInput, v: Vec3): MutableVec3 {
  checkVec3('enuToPlatform', 'v', v);
  const m = platformRotation(attitude);
  return [m[0] * v[0] + m[3] * v[1] + m[6] * v[2], m[1] * v[0] + m[4] * v[1] + m[7] * v[2], m[2] * v[0] + m[5] * v[1] + m[8] * v[2]];
}

/**
 * A vector given in the platform frame (forward-starboard-down), expressed in east-north-up.
 *
 * @param attitude - The platform's attitude (see {@link attitudeToMatrix}).
 * @param v - The vector in the platform frame.
 * @returns The vector in ENU.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * platformToEnu({ heading: Math.PI / 2, pitch: 0, roll: 0 }, [1, 0, 0]); // ≈ [1, 0, 0] (east)
 * ```
 */
export function platformToEnu(attitude: AttitudeInput, v: Vec3): MutableVec3 {
  checkVec3('platformToEnu', 'v', v);
  const m = platformRotation(attitude);
  return [m[0] * v[0] + m[1] * v[1] + m[2] * v[2], m[3] * v[0] + m[4] * v[1] + m[5] * v[2], m[6] * v[0] + m[7] * v[1] + m[8] * v[2]];
}

/** Four finite numbers (any length, not normalised): the algebra helpers keep their input's scale. */
function checkQuaternionShape(fn: string, parameter: string, value: unknown): void {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<number>).length !== 4) typeError(fn, parameter, value, 'a quaternion [w, x, y, z]');
  for (let k = 0; k < 4; k++) {
    const c = (value as ArrayLike<unknown>)[k];
    if (typeof c !== 'number') typeError(fn, parameter, value, 'a quaternion of numbers');
    if (!Number.isFinite(c)) rangeError(fn, parameter, value, 'a quaternion of finite numbers');
  }
}
