/**
 * The sensor's geometry in the world: the aperture mask below the mean water level, the
 * detection plane below the mask, the pose of the whole sensor, and plane coordinates.
 *
 * Sensor frame: origin at the centre of the aperture array in the mask plane, z along the
 * mask's normal pointing up towards the surface, x and y in the mask plane. The detection
 * plane (a diffuser imaged by a camera, or a bare image sensor) is parallel to the mask at
 * `z = −planeDistance`. *Plane coordinates* are the sensor-frame `(x, y)` of a point on
 * the detection plane, metres. World = `centre + R · sensor`, with `centre =
 * [position[0], position[1], −maskDepth]`. Water fills the space between the surface, the
 * mask and the plane.
 *
 * @module
 */
import { checkFinite, checkOptions, checkPositive, checkVec3, IDENTITY3, rangeError, typeError } from '../core/index.js';
import type { Mat3, MutableVec3, Vec3 } from '../core/index.js';
import { checkRotation } from '../camera/pose.js';
import type { ApertureArray } from './lattice.js';

/** What {@link createSensorGeometry} needs. */
export interface SensorGeometrySpec {
  /** The aperture array (see {@link createApertureArray}). */
  apertures: ApertureArray;
  /** Depth of the mask's centre below the mean water level `z = 0`, metres (> 0). */
  maskDepth: number;
  /** Distance from the mask down to the detection plane, metres (> 0: the plane lies below the mask). */
  planeDistance: number;
  /** World `(x, y)` of the array's centre, metres. @defaultValue [0, 0] */
  position?: readonly [number, number];
  /**
   * Sensor → world rotation, row-major (`v_world = R v_sensor`); its third column (the
   * mask normal) must point up. @defaultValue identity (level mask, lattice x along east)
   */
  rotation?: Mat3;
  /** Half-widths of the detection plane along sensor x and y, metres: spots beyond are lost. @defaultValue [Infinity, Infinity] */
  planeHalfSize?: readonly [number, number];
  /** Refractive index of air. @defaultValue 1.000293 */
  nAir?: number;
  /** Refractive index of the water (at the guide light's wavelength). @defaultValue 1.333 */
  nWater?: number;
}

/** A sensor placed in the world. Create one with {@link createSensorGeometry}. */
export interface SensorGeometry {
  /** The aperture array. */
  readonly apertures: ApertureArray;
  /** Mask depth below the mean level, metres. */
  readonly maskDepth: number;
  /** Mask-to-plane distance, metres. */
  readonly planeDistance: number;
  /** World position of the array's centre in the mask plane, metres. */
  readonly centre: Vec3;
  /** Sensor → world rotation. */
  readonly rotation: Mat3;
  /** Half-widths of the detection plane, metres. */
  readonly planeHalfSize: readonly [number, number];
  /** Refractive index of air. */
  readonly nAir: number;
  /** Refractive index of water. */
  readonly nWater: number;
  /** Aperture centres in the world, packed xyz, metres. */
  readonly apertureWorld: Float64Array;
}

/**
 * Place a sensor in the world.
 *
 * @param spec - Aperture array, depths, pose, plane size and refractive indices.
 * @returns The geometry.
 * @throws {@link core!MeniscusRangeError} for a non-positive (or non-finite) mask depth or
 *   plane distance (a plane at or above the mask, i.e. behind it for the light), a
 *   rotation that is not one or turns the mask away from the surface, or bad indices.
 * @example
 * ```ts
 * const g = createSensorGeometry({ apertures: arr, maskDepth: 0.3, planeDistance: 0.05 });
 * ```
 */
export function createSensorGeometry(spec: SensorGeometrySpec): SensorGeometry {
  const fn = 'createSensorGeometry';
  if (spec === undefined) typeError(fn, 'spec', spec, 'a sensor geometry spec object');
  checkOptions(fn, spec, 'spec');
  const a = spec.apertures;
  if (a === null || typeof a !== 'object' || !(a.positions instanceof Float64Array)) {
    typeError(fn, 'spec.apertures', a, 'an ApertureArray from createApertureArray');
  }
  if (typeof spec.maskDepth !== 'number' || !(spec.maskDepth > 0) || spec.maskDepth === Infinity) {
    rangeError(fn, 'spec.maskDepth', spec.maskDepth, 'a depth below the mean water level > 0 m');
  }
  if (typeof spec.planeDistance !== 'number' || !(spec.planeDistance > 0) || spec.planeDistance === Infinity) {
    rangeError(fn, 'spec.planeDistance', spec.planeDistance, 'a distance > 0 m (the plane must lie below the mask, not behind it)');
  }
  let px = 0, py = 0;
  if (spec.position !== undefined) {
    if (!Array.isArray(spec.position) || spec.position.length !== 2) typeError(fn, 'spec.position', spec.position, 'a pair [x, y] in metres');
    px = checkFinite(fn, 'spec.position[0]', spec.position[0]);
    py = checkFinite(fn, 'spec.position[1]', spec.position[1]);
  }
  const R = spec.rotation === undefined ? IDENTITY3 : checkRotation(fn, 'spec.rotation', spec.rotation);
  if (!(R[8] > 0)) rangeError(fn, 'spec.rotation', spec.rotation, 'a rotation that keeps the mask facing up (R[2][2] > 0)');
  let hx = Infinity, hy = Infinity;
  if (spec.planeHalfSize !== undefined) {
    if (!Array.isArray(spec.planeHalfSize) || spec.planeHalfSize.length !== 2) typeError(fn, 'spec.planeHalfSize', spec.planeHalfSize, 'a pair [hx, hy] in metres');
    hx = checkPositive(fn, 'spec.planeHalfSize[0]', spec.planeHalfSize[0]);
    hy = checkPositive(fn, 'spec.planeHalfSize[1]', spec.planeHalfSize[1]);
  }
  const nAir = spec.nAir === undefined ? 1.000293 : checkPositive(fn, 'spec.nAir', spec.nAir);
  const nWater = spec.nWater === undefined ? 1.333 : checkPositive(fn, 'spec.nWater', spec.nWater);
  const centre: Vec3 = [px, py, -spec.maskDepth];
  const apertureWorld = new Float64Array(3 * a.count);
  for (let k = 0; k < a.count; k++) {
    const x = a.positions[2 * k]!, y = a.positions[2 * k + 1]!;
    apertureWorld[3 * k] = centre[0] + R[0] * x + R[1] * y;
    apertureWorld[3 * k + 1] = centre[1] + R[3] * x + R[4] * y;
    apertureWorld[3 * k + 2] = centre[2] + R[6] * x + R[7] * y;
  }
  return {
    apertures: a,
    maskDepth: spec.maskDepth,
    planeDistance: spec.planeDistance,
    centre,
    rotation: R,
    planeHalfSize: [hx, hy],
    nAir,
    nWater,
    apertureWorld,
  };
}

/**
 * The world position of a point of the detection plane.
 *
 * @param geometry - The sensor.
 * @param x - Plane x, metres (sensor frame).
 * @param y - Plane y, metres.
 * @returns The world point, metres.
 * @example
 * ```ts
 * planeToWorld(g, 0, 0); // [0, 0, -(maskDepth + planeDistance)] for a level sensor at the origin
 * ```
 */
export function planeToWorld(geometry: SensorGeometry, x: number, y: number): MutableVec3 {
  checkGeometryArg('planeToWorld', geometry);
  checkFinite('planeToWorld', 'x', x);
  checkFinite('planeToWorld', 'y', y);
  const R = geometry.rotation, c = geometry.centre, z = -geometry.planeDistance;
  return [c[0] + R[0] * x + R[1] * y + R[2] * z, c[1] + R[3] * x + R[4] * y + R[5] * z, c[2] + R[6] * x + R[7] * y + R[8] * z];
}

/**
 * The sensor-frame coordinates of a world point (its plane coordinates are the first two
 * when it lies on the detection plane).
 *
 * @param geometry - The sensor.
 * @param point - World point, metres.
 * @returns `[x, y, z]` in the sensor frame, metres.
 * @example
 * ```ts
 * worldToSensor(g, planeToWorld(g, 0.01, 0.02)); // [0.01, 0.02, -planeDistance]
 * ```
 */
export function worldToSensor(geometry: SensorGeometry, point: Vec3): MutableVec3 {
  checkGeometryArg('worldToSensor', geometry);
  checkVec3('worldToSensor', 'point', point);
  const R = geometry.rotation, c = geometry.centre;
  const dx = point[0] - c[0], dy = point[1] - c[1], dz = point[2] - c[2];
  return [R[0] * dx + R[3] * dy + R[6] * dz, R[1] * dx + R[4] * dy + R[7] * dz, R[2] * dx + R[5] * dy + R[8] * dz];
}

/**
 * The mask's unit normal in the world (the sensor's z axis), pointing up.
 *
 * @param geometry - The sensor.
 * @returns The normal, world frame.
 * @example
 * ```ts
 * maskNormal(g); // [0, 0, 1] for a level sensor
 * ```
 */
export function maskNormal(geometry: SensorGeometry): MutableVec3 {
  checkGeometryArg('maskNormal', geometry);
  const R = geometry.rotation;
  return [R[2], R[5], R[8]];
}

/** Light shape check of a geometry handed to the small per-point helpers. */
function checkGeometryArg(fn: string, geometry: unknown): void {
  const g = geometry as Partial<SensorGeometry> | null;
  if (g === null || typeof g !== 'object' || !Array.isArray(g.rotation) || g.rotation.length !== 9 || !Array.isArray(g.centre) || typeof g.planeDistance !== 'number') {
    typeError(fn, 'geometry', geometry, 'a SensorGeometry from createSensorGeometry');
  }
}
