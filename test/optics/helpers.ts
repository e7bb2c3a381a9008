import fc from 'fast-check';
import { expect } from 'vitest';
import { cross, dot, MeniscusRangeError, MeniscusTypeError, norm, normalize } from '../../src/core/index.js';
import type { MutableVec3, Vec3 } from '../../src/core/index.js';

export const FC = { seed: 42, numRuns: 200 } as const;

/** A unit vector drawn uniformly on the sphere from two uniform numbers. */
export const unitVec = fc
  .tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }))
  .map(([z, phi]): MutableVec3 => {
    const r = Math.sqrt(Math.max(0, 1 - z * z));
    return [r * Math.cos(phi), r * Math.sin(phi), z];
  });

/** A vector of length in [0.01, 100] (non-unit on purpose). */
export const anyDirection = fc
  .tuple(unitVec, fc.double({ min: 0.01, max: 100, noNaN: true }))
  .map(([u, s]): MutableVec3 => [u[0] * s, u[1] * s, u[2] * s]);

export const index = fc.double({ min: 1, max: 2.5, noNaN: true });

// The vector helpers are the core area's own.
export { cross, dot, norm, normalize as unit } from '../../src/core/index.js';
/** Angle between two vectors, robust near 0. */
export function angle(a: Vec3, b: Vec3): number {
  return Math.atan2(norm(cross(a, b)), dot(a, b));
}

/** A unit vector perpendicular to `u`. */
export function perpendicular(u: Vec3): MutableVec3 {
  const helper: Vec3 = Math.abs(u[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  return normalize(cross(u, helper));
}

/** The ray that arrives at `theta` from the normal `n` (travelling against it), in the plane spanned by n and `e`. */
export function incidentAt(n: Vec3, e: Vec3, theta: number): MutableVec3 {
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  return [s * e[0] - c * n[0], s * e[1] - c * n[1], s * e[2] - c * n[2]];
}

/** Assert that `f` throws the given error class and that the message names `parameter`. */
export function expectError(f: () => unknown, cls: typeof MeniscusRangeError | typeof MeniscusTypeError, parameter: string): void {
  let caught: unknown;
  try {
    f();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(cls);
  const err = caught as MeniscusRangeError;
  expect(err.parameter).toBe(parameter);
  expect(err.message).toContain(parameter);
}
