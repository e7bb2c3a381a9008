/**
 * 3 × 3 matrices, row-major, as a readonly tuple of nine numbers. Rotation matrices
 * here map vectors by `v' = M v`.
 *
 * @module
 */
import type { MutableVec3, Vec3 } from './vec3.js';
import { normalize } from './vec3.js';

/** A 3 × 3 matrix, row-major: `[m00, m01, m02, m10, m11, m12, m20, m21, m22]`. */
export type Mat3 = readonly [number, number, number, number, number, number, number, number, number];

/** The identity matrix. */
export const IDENTITY3: Mat3 = [1, 0, 0, 0, 1, 0, 0, 0, 1];

/**
 * @returns `M v`.
 * @example
 * ```ts
 * mat3MulVec(IDENTITY3, [1, 2, 3]); // [1, 2, 3]
 * ```
 */
export function mat3MulVec(m: Mat3, v: Vec3): MutableVec3 {
  return [
    m[0] * v[0] + m[1] * v[1] + m[2] * v[2],
    m[3] * v[0] + m[4] * v[1] + m[5] * v[2],
    m[6] * v[0] + m[7] * v[1] + m[8] * v[2],
  ];
}

/**
 * @returns `Mᵀ v` (the inverse rotation when `M` is a rotation).
 * @example
 * ```ts
 * mat3TransposeMulVec(IDENTITY3, [1, 2, 3]); // [1, 2, 3]
 * ```
 */
export function mat3TransposeMulVec(m: Mat3, v: Vec3): MutableVec3 {
  return [
    m[0] * v[0] + m[3] * v[1] + m[6] * v[2],
    m[1] * v[0] + m[4] * v[1] + m[7] * v[2],
    m[2] * v[0] + m[5] * v[1] + m[8] * v[2],
  ];
}

/**
 * @returns The product `A B`.
 * @example
 * ```ts
 * mat3Mul(IDENTITY3, IDENTITY3); // IDENTITY3
 * ```
 */
export function mat3Mul(a: Mat3, b: Mat3): Mat3 {
  const r: number[] = new Array(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      r[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
    }
  }
  return r as unknown as Mat3;
}

/**
 * @returns `Mᵀ`.
 * @example
 * ```ts
 * mat3Transpose([1, 2, 3, 4, 5, 6, 7, 8, 9]); // [1, 4, 7, 2, 5, 8, 3, 6, 9]
 * ```
 */
export function mat3Transpose(m: Mat3): Mat3 {
  return [m[0], m[3], m[6], m[1], m[4], m[7], m[2], m[5], m[8]];
}

/**
 * @returns The determinant of `M`.
 * @example
 * ```ts
 * mat3Det(IDENTITY3); // 1
 * ```
 */
export function mat3Det(m: Mat3): number {
  return m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) + m[2] * (m[3] * m[7] - m[4] * m[6]);
}

/**
 * The rotation by `angle` about `axis`, right-handed (Rodrigues' formula).
 *
 * @param axis - Rotation axis (any non-zero length; normalised here).
 * @param angle - Angle in radians, counter-clockwise looking down the axis.
 * @returns The rotation matrix.
 * @throws {@link MeniscusRangeError} when `axis` has zero length.
 * @see Rodrigues (1840); any rigid-body kinematics text.
 * @example
 * ```ts
 * mat3MulVec(rotationAboutAxis([0, 0, 1], Math.PI / 2), [1, 0, 0]); // ≈ [0, 1, 0]
 * ```
 */
export function rotationAboutAxis(axis: Vec3, angle: number): Mat3 {
  const [x, y, z] = normalize(axis);
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const C = 1 - c;
  return [
    c + x * x * C,
    x * y * C - z * s,
    x * z * C + y * s,
    y * x * C + z * s,
    c + y * y * C,
    y * z * C - x * s,
    z * x * C - y * s,
    z * y * C + x * s,
    c + z * z * C,
  ];
}
