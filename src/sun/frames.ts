/**
 * Frames around a platform: east-north-up ↔ platform ↔ camera, the pose of a camera
 * mounted on a platform, and the direction of a guide light inside the water under a
 * flat surface.
 *
 * The platform frame is forward-starboard-down and the attitude convention is that of
 * {@link attitudeToMatrix} (heading clockwise from north, intrinsic Z-Y′-X″ from
 * north-east-down). A camera **mount** is the rotation `R_platform←camera` (row-major;
 * its columns are the camera's x right, y down, z forward axes in the platform frame).
 *
 * @module
 */
import { checkDirection, checkOptions, checkPositive, checkVec3 } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';
import { checkRotation, createCameraPose } from '../camera/pose.js';
import type { CameraPose } from '../camera/pose.js';
import { refract } from '../optics/index.js';
import { platformRotation } from './attitude.js';
import type { AttitudeInput } from './attitude.js';

/**
 * A camera looking straight down through the keel (camera z = platform down), the top
 * of the image towards the bow (camera x = starboard, camera y = aft).
 */
export const MOUNT_LOOKING_DOWN: Mat3 = [0, -1, 0, 1, 0, 0, 0, 0, 1];

/**
 * A camera looking straight up (camera z = platform up), the top of the image towards
 * the bow (camera x = port, camera y = aft).
 */
export const MOUNT_LOOKING_UP: Mat3 = [0, -1, 0, -1, 0, 0, 0, 0, -1];

function mul(a: Mat3, b: Mat3): Mat3 {
  const r: number[] = new Array(9);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) r[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
  return r as unknown as Mat3;
}

/**
 * The rotation `R_ENU←camera` of a camera on a platform: platform attitude times mount.
 *
 * @param attitude - The platform's attitude (angles in radians or a quaternion).
 * @param mount - `R_platform←camera` (a proper rotation).
 * @returns `R_ENU←camera`, row-major.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * cameraRotation({ heading: 0, pitch: 0, roll: 0 }, MOUNT_LOOKING_UP); // camera z = ENU up
 * ```
 */
export function cameraRotation(attitude: AttitudeInput, mount: Mat3): Mat3 {
  const m = checkRotation('cameraRotation', 'mount', mount);
  return mul(platformRotation(attitude), m);
}

/**
 * A vector given in east-north-up, expressed in a mounted camera's frame.
 *
 * @param attitude - The platform's attitude.
 * @param mount - `R_platform←camera`.
 * @param v - The vector in ENU (e.g. `toSun`).
 * @returns The vector in the camera frame (x right, y down, z forward).
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * enuToCamera({ heading: 0, pitch: 0, roll: 0 }, MOUNT_LOOKING_UP, [0, 0, 1]); // [0, 0, 1]
 * ```
 */
export function enuToCamera(attitude: AttitudeInput, mount: Mat3, v: Vec3): MutableVec3 {
  const x = checkVec3('enuToCamera', 'v', v);
  const r = cameraRotation(attitude, mount);
  return [r[0] * x[0] + r[3] * x[1] + r[6] * x[2], r[1] * x[0] + r[4] * x[1] + r[7] * x[2], r[2] * x[0] + r[5] * x[1] + r[8] * x[2]];
}

/**
 * A vector given in a mounted camera's frame, expressed in east-north-up.
 *
 * @param attitude - The platform's attitude.
 * @param mount - `R_platform←camera`.
 * @param v - The vector in the camera frame.
 * @returns The vector in ENU.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * cameraToEnu({ heading: 0, pitch: 0, roll: 0 }, MOUNT_LOOKING_DOWN, [0, 0, 1]); // [0, 0, -1]
 * ```
 */
export function cameraToEnu(attitude: AttitudeInput, mount: Mat3, v: Vec3): MutableVec3 {
  const x = checkVec3('cameraToEnu', 'v', v);
  const r = cameraRotation(attitude, mount);
  return [r[0] * x[0] + r[1] * x[1] + r[2] * x[2], r[3] * x[0] + r[4] * x[1] + r[5] * x[2], r[6] * x[0] + r[7] * x[1] + r[8] * x[2]];
}

/**
 * The world pose of a camera mounted on a platform.
 *
 * @param attitude - The platform's attitude.
 * @param mount - `R_platform←camera`.
 * @param platformPosition - The platform's reference point in the world (ENU), metres. @defaultValue [0, 0, 0]
 * @param lever - The camera centre relative to the reference point, platform frame
 *   (forward, starboard, down), metres. @defaultValue [0, 0, 0]
 * @returns The camera pose (`rotation` = `R_ENU←camera`).
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * const pose = cameraPoseOnPlatform({ heading: 1, pitch: 0.05, roll: -0.02 }, MOUNT_LOOKING_UP, [0, 0, -1.5]);
 * ```
 */
export function cameraPoseOnPlatform(
  attitude: AttitudeInput,
  mount: Mat3,
  platformPosition: Vec3 = [0, 0, 0],
  lever: Vec3 = [0, 0, 0],
): CameraPose {
  const fn = 'cameraPoseOnPlatform';
  const p = checkVec3(fn, 'platformPosition', platformPosition);
  const l = checkVec3(fn, 'lever', lever);
  const m = checkRotation(fn, 'mount', mount);
  const a = platformRotation(attitude);
  const c: Vec3 = [
    p[0] + a[0] * l[0] + a[1] * l[1] + a[2] * l[2],
    p[1] + a[3] * l[0] + a[4] * l[1] + a[5] * l[2],
    p[2] + a[6] * l[0] + a[7] * l[1] + a[8] * l[2],
  ];
  return createCameraPose(mul(a, m), c);
}

/** Options of {@link underwaterLightDirection}. */
export interface UnderwaterLightOptions {
  /** Refractive index of the water. @defaultValue 1.333 */
  nWater?: number;
  /** Refractive index of the air. @defaultValue 1.000293 */
  nAir?: number;
}

/**
 * The direction in which a guide light travels inside the water under a flat, level
 * surface (normal `[0, 0, 1]` in ENU): the light's direction `−toLight` refracted by
 * the vector Snell law from air into water.
 *
 * @param toLight - Unit vector towards the light in ENU (e.g. `SunPosition.toSun`); normalised here.
 * @param options - Refractive indices (common practice: 1.000293 for air, 1.333 for water at visible wavelengths).
 * @returns The unit travel direction in the water (pointing down), or `null` when the
 *   light is at or below the horizon (`toLight[2] ≤ 0`), where no light enters through
 *   a level surface.
 * @throws {@link core!MeniscusRangeError} for a zero or non-finite vector or an index ≤ 0.
 * @see Snell's law in vector form (see the optics module's `refract`).
 * @example
 * ```ts
 * const d = underwaterLightDirection(sun.toSun); // travel direction in water
 * const toSunInWater = d && [-d[0], -d[1], -d[2]];
 * ```
 */
export function underwaterLightDirection(toLight: Vec3, options?: UnderwaterLightOptions): MutableVec3 | null {
  const fn = 'underwaterLightDirection';
  const t = checkDirection(fn, 'toLight', toLight);
  const o = checkOptions(fn, options);
  const nWater = o.nWater === undefined ? 1.333 : checkPositive(fn, 'options.nWater', o.nWater);
  const nAir = o.nAir === undefined ? 1.000293 : checkPositive(fn, 'options.nAir', o.nAir);
  if (!(t[2] > 0)) return null;
  return refract([-t[0], -t[1], -t[2]], [0, 0, 1], nAir, nWater);
}
