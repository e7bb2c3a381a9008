/**
 * Guide lights: where the light that reaches a point comes from, and how large the
 * source looks from there. Three providers share one small interface: the sun at a time
 * and site, a fixed direction (a collimated lamp), and a point lamp at a known position.
 *
 * All points and directions are in the world frame (east-north-up, metres). The light
 * travels along `−toLight(point)`.
 *
 * @module
 */
import { checkDirection, checkFloat64Array, checkNonNegative, checkOut, checkVec3, rangeError } from '../core/index.js';
import type { MutableVec3, Vec3 } from '../core/index.js';
import { sunPosition } from './position.js';
import type { Site, SunPosition, SunPositionOptions, TimeInput } from './position.js';

/** The common interface of every guide light. */
export interface GuideLight {
  /** What kind of source this is. */
  readonly kind: 'sun' | 'collimated' | 'point';
  /**
   * The unit vector from `point` towards the light (world frame). The light arriving at
   * `point` travels along its negative.
   *
   * @param point - A point in the world frame, metres.
   * @returns A new unit vector.
   */
  toLight(point: Vec3): MutableVec3;
  /**
   * The apparent angular radius of the source seen from `point`, radians (0 for an
   * ideal point or perfectly collimated source).
   *
   * @param point - A point in the world frame, metres.
   * @returns The half-angle, radians.
   */
  angularRadius(point: Vec3): number;
  /**
   * {@link GuideLight.toLight} for packed points `xyz xyz …`.
   *
   * @param points - Packed points, metres.
   * @param out - Optional output of the same length.
   * @returns Packed unit vectors towards the light.
   */
  toLightBatch(points: Float64Array, out?: Float64Array): Float64Array;
}

/** The sun as a guide light; `position` holds everything {@link sunPosition} found. */
export interface SunLight extends GuideLight {
  readonly kind: 'sun';
  /** The sun's position at the provider's time and site (its `status` tells whether it is up). */
  readonly position: SunPosition;
}

/** A collimated lamp: the same direction everywhere. */
export interface CollimatedLight extends GuideLight {
  readonly kind: 'collimated';
  /** The unit vector towards the lamp, world frame. */
  readonly direction: MutableVec3;
}

/** A lamp at a finite distance: the direction depends on the point. */
export interface PointLight extends GuideLight {
  readonly kind: 'point';
  /** The lamp's position, world frame, metres. */
  readonly position: MutableVec3;
  /** The radius of the (spherical) emitter, metres. */
  readonly radius: number;
}

function fillConstant(fn: string, points: Float64Array, out: Float64Array | undefined, d: Vec3): Float64Array {
  checkFloat64Array(fn, 'points', points, 3);
  const o = checkOut(fn, 'out', out, points.length);
  for (let k = 0; k < points.length; k += 3) {
    o[k] = d[0];
    o[k + 1] = d[1];
    o[k + 2] = d[2];
  }
  return o;
}

/**
 * The sun as a guide light at one time and site. The sun is treated as infinitely far
 * for the points of one scene: `toLight` is the same everywhere (the parallax across a
 * kilometre is below 1e-8 rad). Check `position.status` before trusting a light from
 * below the horizon.
 *
 * The site's east-north-up frame is the world frame (x east, y north, z up).
 *
 * @param time - UTC instant, a `Date` or milliseconds since the Unix epoch.
 * @param site - The observer's latitude, longitude and height.
 * @param options - Refraction and ΔT, as for {@link sunPosition}.
 * @returns The provider.
 * @throws As {@link sunPosition}.
 * @see Reda, I. & Andreas, A. (2004), "Solar position algorithm for solar radiation
 *   applications", Solar Energy 76(5), 577–589.
 * @example
 * ```ts
 * const sun = createSunLight(Date.UTC(2024, 5, 21, 12), { latitudeDeg: 43, longitudeDeg: 5 });
 * sun.toLight([0, 0, 0]);        // toSun in ENU
 * sun.angularRadius([0, 0, 0]);  // ≈ 0.00452 rad
 * ```
 */
export function createSunLight(time: TimeInput, site: Site, options?: SunPositionOptions): SunLight {
  const position = sunPosition(time, site, options);
  const d = position.toSun;
  return {
    kind: 'sun',
    position,
    toLight(point: Vec3): MutableVec3 {
      checkVec3('SunLight.toLight', 'point', point);
      return [d[0], d[1], d[2]];
    },
    angularRadius(point: Vec3): number {
      checkVec3('SunLight.angularRadius', 'point', point);
      return position.angularRadius;
    },
    toLightBatch(points: Float64Array, out?: Float64Array): Float64Array {
      return fillConstant('SunLight.toLightBatch', points, out, d);
    },
  };
}

/**
 * A collimated lamp (a lamp at the focus of a lens or mirror): the light arrives from
 * the same direction everywhere, with a fixed angular radius (the residual divergence).
 *
 * @param toLight - Direction towards the lamp, world frame (normalised here).
 * @param angularRadius - The half-angle of the beam's divergence, radians. @defaultValue 0
 * @returns The provider.
 * @throws {@link core!MeniscusRangeError} for a zero or non-finite direction or a negative radius.
 * @example
 * ```ts
 * const lamp = createCollimatedLight([0, 0, 1]); // light falling straight down
 * lamp.toLight([1, 2, 0]); // [0, 0, 1]
 * ```
 */
export function createCollimatedLight(toLight: Vec3, angularRadius = 0): CollimatedLight {
  const fn = 'createCollimatedLight';
  const d = checkDirection(fn, 'toLight', toLight);
  const r = checkNonNegative(fn, 'angularRadius', angularRadius);
  if (!(r <= Math.PI / 2)) rangeError(fn, 'angularRadius', r, 'an angle in [0, π/2] radians');
  return {
    kind: 'collimated',
    direction: [d[0], d[1], d[2]],
    toLight(point: Vec3): MutableVec3 {
      checkVec3('CollimatedLight.toLight', 'point', point);
      return [d[0], d[1], d[2]];
    },
    angularRadius(point: Vec3): number {
      checkVec3('CollimatedLight.angularRadius', 'point', point);
      return r;
    },
    toLightBatch(points: Float64Array, out?: Float64Array): Float64Array {
      return fillConstant('CollimatedLight.toLightBatch', points, out, d);
    },
  };
}

/**
 * A lamp at a known position: the light reaching a point comes from the lamp along the
 * straight line between them, and a spherical emitter of radius `radius` subtends
 * `asin(radius / distance)`.
 *
 * @param position - The lamp's centre, world frame, metres.
 * @param radius - The emitter's radius, metres. @defaultValue 0
 * @returns The provider. Its `toLight`, `toLightBatch` and `angularRadius` throw a
 *   {@link core!MeniscusRangeError} for a point at the lamp (or inside the emitter, for the radius).
 * @throws {@link core!MeniscusRangeError} for a non-finite position or a negative radius.
 * @example
 * ```ts
 * const lamp = createPointLight([0, 0, 2]);
 * lamp.toLight([2, 0, 0]); // [-0.7071, 0, 0.7071]
 * ```
 */
export function createPointLight(position: Vec3, radius = 0): PointLight {
  const fn = 'createPointLight';
  const p = checkVec3(fn, 'position', position);
  const px = p[0], py = p[1], pz = p[2];
  const r = checkNonNegative(fn, 'radius', radius);
  return {
    kind: 'point',
    position: [px, py, pz],
    radius: r,
    toLight(point: Vec3): MutableVec3 {
      const q = checkVec3('PointLight.toLight', 'point', point);
      const dx = px - q[0], dy = py - q[1], dz = pz - q[2];
      const n = Math.hypot(dx, dy, dz);
      if (!(n > 0)) rangeError('PointLight.toLight', 'point', point, 'a point away from the lamp');
      return [dx / n, dy / n, dz / n];
    },
    angularRadius(point: Vec3): number {
      const q = checkVec3('PointLight.angularRadius', 'point', point);
      const n = Math.hypot(px - q[0], py - q[1], pz - q[2]);
      if (!(n > r)) rangeError('PointLight.angularRadius', 'point', point, 'a point outside the emitter');
      return Math.asin(r / n);
    },
    toLightBatch(points: Float64Array, out?: Float64Array): Float64Array {
      const f = 'PointLight.toLightBatch';
      checkFloat64Array(f, 'points', points, 3);
      const o = checkOut(f, 'out', out, points.length);
      for (let k = 0; k < points.length; k += 3) {
        const dx = px - points[k]!, dy = py - points[k + 1]!, dz = pz - points[k + 2]!;
        const n = Math.hypot(dx, dy, dz);
        if (!(n > 0) || !Number.isFinite(n)) rangeError(f, `points[${k / 3}]`, [points[k], points[k + 1], points[k + 2]], 'a finite point away from the lamp');
        o[k] = dx / n;
        o[k + 1] = dy / n;
        o[k + 2] = dz / n;
      }
      return o;
    },
  };
}
