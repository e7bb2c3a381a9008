/**
 * Camera pose in the world frame, world ↔ camera transforms, and mirrors as virtual
 * cameras.
 *
 * A pose is `{ rotation, position }`: `rotation` takes camera-frame vectors (x right,
 * y down, z forward) to the world frame, `v_world = R v_camera`, and `position` is the
 * camera centre in the world, metres. So a world point `X` is `Rᵀ (X − C)` in the
 * camera frame.
 *
 * @module
 */
import { checkDirection, checkFloat64Array, checkOut, checkVec3, rangeError, typeError } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';

/** A camera's pose in the world frame. */
export interface CameraPose {
  /**
   * Camera → world rotation, row-major (`v_world = R v_camera`); its columns are the
   * camera's x (right), y (down) and z (forward) axes in the world. Orthonormal; the
   * determinant is +1 for a real camera and −1 for a mirror's virtual camera
   * ({@link reflectPose}).
   */
  readonly rotation: Mat3;
  /** The camera centre in the world frame, metres. */
  readonly position: Vec3;
}

/** A plane through `point` with unit `normal` (either side). */
export interface Plane {
  /** A point on the plane, metres. */
  readonly point: Vec3;
  /** The plane's normal (normalised where used). */
  readonly normal: Vec3;
}

/**
 * Check a rotation matrix: orthonormal within `tolerance` and, unless `allowReflection`, with determinant +1.
 *
 * @returns The matrix.
 * @throws {@link core!MeniscusTypeError} for a wrong shape; {@link core!MeniscusRangeError} when it
 *   is not a rotation.
 * @example
 * ```ts
 * checkRotation('fn', 'rotation', [1, 0, 0, 0, 1, 0, 0, 0, 1]);
 * ```
 */
export function checkRotation(fn: string, parameter: string, value: unknown, tolerance = 1e-6, allowReflection = false): Mat3 {
  const isArr = Array.isArray(value) || value instanceof Float64Array;
  if (!isArr || (value as ArrayLike<number>).length !== 9) {
    typeError(fn, parameter, value, 'a 3 × 3 matrix as 9 numbers, row-major');
  }
  const m = value as ArrayLike<number>;
  for (let k = 0; k < 9; k++) {
    if (typeof m[k] !== 'number') typeError(fn, parameter, value, 'a matrix of numbers');
    if (!Number.isFinite(m[k])) rangeError(fn, parameter, value, 'a matrix of finite numbers');
  }
  let worst = 0;
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      const d = m[i * 3]! * m[j * 3]! + m[i * 3 + 1]! * m[j * 3 + 1]! + m[i * 3 + 2]! * m[j * 3 + 2]! - (i === j ? 1 : 0);
      worst = Math.max(worst, Math.abs(d));
    }
  }
  const det =
    m[0]! * (m[4]! * m[8]! - m[5]! * m[7]!) - m[1]! * (m[3]! * m[8]! - m[5]! * m[6]!) + m[2]! * (m[3]! * m[7]! - m[4]! * m[6]!);
  if (!(worst <= tolerance)) rangeError(fn, parameter, value, `an orthonormal matrix (R Rᵀ = I within ${tolerance})`);
  if (!allowReflection && !(det > 0)) rangeError(fn, parameter, value, 'a proper rotation (determinant +1)');
  return value as unknown as Mat3;
}

/**
 * A camera pose, checked.
 *
 * @param rotation - Camera → world rotation, row-major; orthonormal within 1e-6 with
 *   determinant +1 (or −1 when `allowReflection`, for a mirror's virtual camera).
 * @param position - Camera centre in the world frame, metres.
 * @param allowReflection - Accept a determinant of −1. @defaultValue false
 * @returns The pose (copies of the inputs).
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a non-rotation or a bad position.
 * @example
 * ```ts
 * const pose = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, -0.5]);
 * ```
 */
export function createCameraPose(rotation: Mat3, position: Vec3, allowReflection = false): CameraPose {
  const fn = 'createCameraPose';
  const r = checkRotation(fn, 'rotation', rotation, 1e-6, allowReflection);
  const c = checkVec3(fn, 'position', position);
  return { rotation: Array.from(r) as unknown as Mat3, position: [c[0], c[1], c[2]] };
}

function checkPose(fn: string, pose: unknown): CameraPose {
  if (pose === null || typeof pose !== 'object') typeError(fn, 'pose', pose, 'a pose { rotation, position }');
  const p = pose as CameraPose;
  checkRotation(fn, 'pose.rotation', p.rotation, 1e-6, true);
  checkVec3(fn, 'pose.position', p.position);
  return p;
}

/**
 * The pose of a camera at `eye` looking at `target`, with the image's "up" (−y) as
 * close to `up` as possible.
 *
 * @param eye - Camera centre, world frame, metres.
 * @param target - A point the optical axis passes through.
 * @param up - The world direction that should appear up in the image. @defaultValue [0, 0, 1]
 * @returns The pose.
 * @throws {@link core!MeniscusRangeError} when `eye` equals `target` or `up` is parallel to the view.
 * @example
 * ```ts
 * lookAt([0, 0, 0], [0, 1, 0]); // looking north, image right = east, image down = down
 * ```
 */
export function lookAt(eye: Vec3, target: Vec3, up: Vec3 = [0, 0, 1]): CameraPose {
  const fn = 'lookAt';
  const e = checkVec3(fn, 'eye', eye);
  const t = checkVec3(fn, 'target', target);
  const u = checkDirection(fn, 'up', up);
  const z = [t[0] - e[0], t[1] - e[1], t[2] - e[2]];
  const zn = Math.hypot(z[0]!, z[1]!, z[2]!);
  if (!(zn > 0)) rangeError(fn, 'target', target, 'a point different from eye');
  const zx = z[0]! / zn, zy = z[1]! / zn, zz = z[2]! / zn;
  let xx = zy * u[2] - zz * u[1], xy = zz * u[0] - zx * u[2], xz = zx * u[1] - zy * u[0];
  const xn = Math.hypot(xx, xy, xz);
  if (!(xn > 1e-12)) rangeError(fn, 'up', up, 'a direction not parallel to the line of sight');
  xx /= xn; xy /= xn; xz /= xn;
  const yx = zy * xz - zz * xy, yy = zz * xx - zx * xz, yz = zx * xy - zy * xx;
  return { rotation: [xx, yx, zx, xy, yy, zy, xz, yz, zz], position: [e[0], e[1], e[2]] };
}

/**
 * A world point in the camera frame: `Rᵀ (X − C)`.
 *
 * @param pose - The camera pose.
 * @param point - World point, metres.
 * @returns The point in the camera frame, metres.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * worldToCamera(lookAt([0, 0, 0], [0, 1, 0]), [0, 5, 0]); // [0, 0, 5]
 * ```
 */
export function worldToCamera(pose: CameraPose, point: Vec3): MutableVec3 {
  const p = checkPose('worldToCamera', pose);
  const x = checkVec3('worldToCamera', 'point', point);
  const m = p.rotation, c = p.position;
  const dx = x[0] - c[0], dy = x[1] - c[1], dz = x[2] - c[2];
  return [m[0] * dx + m[3] * dy + m[6] * dz, m[1] * dx + m[4] * dy + m[7] * dz, m[2] * dx + m[5] * dy + m[8] * dz];
}

/**
 * A camera-frame point in the world: `R X + C`.
 *
 * @param pose - The camera pose.
 * @param point - Camera-frame point, metres.
 * @returns The world point, metres.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * cameraToWorld(lookAt([0, 0, 0], [0, 1, 0]), [0, 0, 5]); // [0, 5, 0]
 * ```
 */
export function cameraToWorld(pose: CameraPose, point: Vec3): MutableVec3 {
  const p = checkPose('cameraToWorld', pose);
  const x = checkVec3('cameraToWorld', 'point', point);
  const m = p.rotation, c = p.position;
  return [
    m[0] * x[0] + m[1] * x[1] + m[2] * x[2] + c[0],
    m[3] * x[0] + m[4] * x[1] + m[5] * x[2] + c[1],
    m[6] * x[0] + m[7] * x[1] + m[8] * x[2] + c[2],
  ];
}

/**
 * A world direction in the camera frame: `Rᵀ d` (no translation).
 *
 * @returns The direction in the camera frame.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * worldDirectionToCamera(lookAt([0, 0, 0], [0, 1, 0]), [0, 1, 0]); // [0, 0, 1]
 * ```
 */
export function worldDirectionToCamera(pose: CameraPose, direction: Vec3): MutableVec3 {
  const p = checkPose('worldDirectionToCamera', pose);
  const d = checkVec3('worldDirectionToCamera', 'direction', direction);
  const m = p.rotation;
  return [m[0] * d[0] + m[3] * d[1] + m[6] * d[2], m[1] * d[0] + m[4] * d[1] + m[7] * d[2], m[2] * d[0] + m[5] * d[1] + m[8] * d[2]];
}

/**
 * A camera-frame direction in the world: `R d`.
 *
 * @returns The direction in the world frame.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * cameraDirectionToWorld(lookAt([0, 0, 0], [0, 1, 0]), [0, 0, 1]); // [0, 1, 0]
 * ```
 */
export function cameraDirectionToWorld(pose: CameraPose, direction: Vec3): MutableVec3 {
  const p = checkPose('cameraDirectionToWorld', pose);
  const d = checkVec3('cameraDirectionToWorld', 'direction', direction);
  const m = p.rotation;
  return [m[0] * d[0] + m[1] * d[1] + m[2] * d[2], m[3] * d[0] + m[4] * d[1] + m[5] * d[2], m[6] * d[0] + m[7] * d[1] + m[8] * d[2]];
}

/**
 * {@link worldToCamera} for packed points `xyz xyz …`.
 *
 * @param pose - The camera pose.
 * @param points - Packed world points, metres.
 * @param out - Optional output of the same length (may be `points` itself).
 * @returns Packed camera-frame points.
 * @throws {@link core!MeniscusTypeError} for a wrong array length.
 * @example
 * ```ts
 * worldToCameraBatch(pose, new Float64Array([0, 5, 0, 1, 5, 0]));
 * ```
 */
export function worldToCameraBatch(pose: CameraPose, points: Float64Array, out?: Float64Array): Float64Array {
  const fn = 'worldToCameraBatch';
  const p = checkPose(fn, pose);
  checkFloat64Array(fn, 'points', points, 3);
  const o = checkOut(fn, 'out', out, points.length);
  const m = p.rotation, c0 = p.position[0], c1 = p.position[1], c2 = p.position[2];
  const m0 = m[0], m1 = m[1], m2 = m[2], m3 = m[3], m4 = m[4], m5 = m[5], m6 = m[6], m7 = m[7], m8 = m[8];
  for (let k = 0; k < points.length; k += 3) {
    const dx = points[k]! - c0, dy = points[k + 1]! - c1, dz = points[k + 2]! - c2;
    o[k] = m0 * dx + m3 * dy + m6 * dz;
    o[k + 1] = m1 * dx + m4 * dy + m7 * dz;
    o[k + 2] = m2 * dx + m5 * dy + m8 * dz;
  }
  return o;
}

/**
 * {@link cameraToWorld} for packed points `xyz xyz …`.
 *
 * @param pose - The camera pose.
 * @param points - Packed camera-frame points, metres.
 * @param out - Optional output of the same length (may be `points` itself).
 * @returns Packed world points.
 * @throws {@link core!MeniscusTypeError} for a wrong array length.
 * @example
 * ```ts
 * cameraToWorldBatch(pose, new Float64Array([0, 0, 5]));
 * ```
 */
export function cameraToWorldBatch(pose: CameraPose, points: Float64Array, out?: Float64Array): Float64Array {
  const fn = 'cameraToWorldBatch';
  const p = checkPose(fn, pose);
  checkFloat64Array(fn, 'points', points, 3);
  const o = checkOut(fn, 'out', out, points.length);
  const m = p.rotation, c0 = p.position[0], c1 = p.position[1], c2 = p.position[2];
  const m0 = m[0], m1 = m[1], m2 = m[2], m3 = m[3], m4 = m[4], m5 = m[5], m6 = m[6], m7 = m[7], m8 = m[8];
  for (let k = 0; k < points.length; k += 3) {
    const x = points[k]!, y = points[k + 1]!, z = points[k + 2]!;
    o[k] = m0 * x + m1 * y + m2 * z + c0;
    o[k + 1] = m3 * x + m4 * y + m5 * z + c1;
    o[k + 2] = m6 * x + m7 * y + m8 * z + c2;
  }
  return o;
}

function checkPlane(fn: string, plane: unknown): { p: Vec3; n: MutableVec3 } {
  if (plane === null || typeof plane !== 'object') typeError(fn, 'plane', plane, 'a plane { point, normal }');
  const pl = plane as Plane;
  return { p: checkVec3(fn, 'plane.point', pl.point), n: checkDirection(fn, 'plane.normal', pl.normal) };
}

/**
 * The mirror image of a point across a plane: `X − 2 ((X − P)·n) n`.
 *
 * @param plane - The mirror plane.
 * @param point - The point, metres.
 * @returns The reflected point.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @example
 * ```ts
 * reflectPoint({ point: [0, 0, 1], normal: [0, 0, 1] }, [3, 4, 0]); // [3, 4, 2]
 * ```
 */
export function reflectPoint(plane: Plane, point: Vec3): MutableVec3 {
  const { p, n } = checkPlane('reflectPoint', plane);
  const x = checkVec3('reflectPoint', 'point', point);
  const s = 2 * ((x[0] - p[0]) * n[0] + (x[1] - p[1]) * n[1] + (x[2] - p[2]) * n[2]);
  return [x[0] - s * n[0], x[1] - s * n[1], x[2] - s * n[2]];
}

/**
 * The virtual camera of a real camera seen in a plane mirror: its centre is the mirror
 * image of the real centre and its rotation is `S R` with `S = I − 2 n nᵀ`, so its
 * determinant is −1 (a mirrored, left-handed frame). Projecting a world point with the
 * virtual pose and the real camera's intrinsics gives exactly the pixel where the point
 * appears in the mirror; every transform in this module works unchanged with it.
 *
 * @param pose - The real camera's pose.
 * @param plane - The mirror plane.
 * @returns The virtual camera's pose (reflecting twice gives the original back).
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad input.
 * @see Hartley, R. & Zisserman, A. (2003), Multiple View Geometry in Computer Vision,
 *   2nd ed., Cambridge University Press (camera matrices and planar transformations).
 * @example
 * ```ts
 * const virtual = reflectPose(pose, { point: [0, 0, 0.3], normal: [0, 0, 1] });
 * ```
 */
export function reflectPose(pose: CameraPose, plane: Plane): CameraPose {
  const fn = 'reflectPose';
  const ps = checkPose(fn, pose);
  const { n } = checkPlane(fn, plane);
  const m = ps.rotation;
  const r: number[] = new Array(9);
  for (let j = 0; j < 3; j++) {
    const d = n[0] * m[j]! + n[1] * m[3 + j]! + n[2] * m[6 + j]!;
    r[j] = m[j]! - 2 * n[0] * d;
    r[3 + j] = m[3 + j]! - 2 * n[1] * d;
    r[6 + j] = m[6 + j]! - 2 * n[2] * d;
  }
  return { rotation: r as unknown as Mat3, position: reflectPoint(plane, ps.position) };
}
