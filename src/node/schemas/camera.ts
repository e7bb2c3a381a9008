/**
 * Schemas of how a camera sees the detection plane, of camera models and of guide lights.
 *
 * @module
 */
import { finite, integer, nonNegative, numbers, object, positive, ROTATION_SCHEMA, vec3 } from './common.js';
import type { JsonSchema } from './common.js';

const WIDTH = integer('Image width, pixels.', 1, 65536);
const HEIGHT = integer('Image height, pixels.', 1, 65536);
const kind = (k: string, what: string): JsonSchema => ({ const: k, description: what });

const INTRINSICS = {
  fx: positive('Focal length along x, pixels.'),
  fy: positive('Focal length along y, pixels.'),
  cx: finite('Principal point x, pixels.'),
  cy: finite('Principal point y, pixels.'),
  width: WIDTH,
  height: HEIGHT,
};

/** @internal Camera model parameters, the JSON form of `CameraParameters`. */
export const CAMERA_MODEL_SCHEMA: JsonSchema = {
  type: 'object',
  description: 'A camera model: pinhole with Brown–Conrady distortion, equidistant fisheye or orthographic.',
  required: ['model'],
  discriminator: { propertyName: 'model' },
  oneOf: [
    object(
      'Pinhole camera with Brown–Conrady distortion (k1…k6 radial, p1 p2 tangential).',
      {
        model: kind('pinhole', 'Pinhole model.'),
        ...INTRINSICS,
        k1: finite('Radial coefficient k1.'),
        k2: finite('Radial coefficient k2.'),
        k3: finite('Radial coefficient k3.'),
        k4: finite('Rational coefficient k4.'),
        k5: finite('Rational coefficient k5.'),
        k6: finite('Rational coefficient k6.'),
        p1: finite('Tangential coefficient p1.'),
        p2: finite('Tangential coefficient p2.'),
      },
      ['model', 'fx', 'fy', 'cx', 'cy'],
    ),
    object(
      'Equidistant fisheye camera (k1…k4 on the angle).',
      {
        model: kind('fisheye', 'Equidistant fisheye model.'),
        ...INTRINSICS,
        k1: finite('Coefficient k1.'),
        k2: finite('Coefficient k2.'),
        k3: finite('Coefficient k3.'),
        k4: finite('Coefficient k4.'),
      },
      ['model', 'fx', 'fy', 'cx', 'cy'],
    ),
    object('Orthographic (telecentric) camera; fx, fy in pixels per metre.', { model: kind('orthographic', 'Orthographic model.'), ...INTRINSICS }, [
      'model',
      'fx',
      'fy',
      'cx',
      'cy',
    ]),
  ],
};

/**
 * @internal A camera pose: camera → world rotation (row-major) and centre, or a camera
 * at `eye` looking at `target` (with `up` towards the top of the picture).
 */
export const POSE_SCHEMA: JsonSchema = {
  description: 'The camera pose in the world frame: { rotation, position } or { eye, target, up? }.',
  if: { type: 'object', required: ['eye'] },
  then: object(
    'A camera at eye looking at target.',
    {
      eye: vec3('Camera centre, world frame, metres.'),
      target: vec3('Point the optical axis passes through, world frame, metres.'),
      up: vec3('World direction that appears up in the picture (default [0, 0, 1]; give another when looking straight up or down).'),
    },
    ['eye', 'target'],
  ),
  else: object(
    "The camera's pose by rotation and centre.",
    { rotation: ROTATION_SCHEMA, position: vec3('Camera centre in the world frame, metres.') },
    ['rotation', 'position'],
  ),
};

/**
 * JSON Schema (draft-07) of how the camera sees the detection plane (the JSON form of
 * {@link sensor!PlaneView}). `kind` picks the form:
 * - `"plane"`: a bare image sensor or telecentric camera, by pixel size (see
 *   {@link sensor!createPlaneView});
 * - `"homography"`: a plane-to-pixel homography, row-major;
 * - `"camera"`: a camera model at a pose (camera → world rotation, row-major, and centre).
 *
 * @example
 * ```ts
 * import { validateConfig } from 'meniscus/node';
 * validateConfig('camera', { kind: 'plane', width: 512, height: 512, pixelSize: 2e-4 });
 * ```
 */
export const CAMERA_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:camera',
  title: 'Camera view of the detection plane',
  type: 'object',
  description: 'How the camera sees the detection plane; "kind" is "plane", "homography" or "camera".',
  required: ['kind'],
  discriminator: { propertyName: 'kind' },
  oneOf: [
    object(
      'A bare image sensor in the plane (or a telecentric camera): scale and shift.',
      {
        $schema: { type: 'string' },
        kind: kind('plane', 'View by pixel size.'),
        width: WIDTH,
        height: HEIGHT,
        pixelSize: positive('Size of one pixel on the plane, metres.'),
        centre: numbers('Plane coordinates seen at the image centre, metres.', 2),
        yDown: { type: 'boolean', description: 'Image rows run along +y (true) or −y (false).' },
      },
      ['kind', 'width', 'height', 'pixelSize'],
    ),
    object(
      'A plane (metres) → pixel homography.',
      {
        $schema: { type: 'string' },
        kind: kind('homography', 'View by homography.'),
        width: WIDTH,
        height: HEIGHT,
        planeToPixel: numbers('Plane → pixel homography, row-major, nine numbers.', 9),
      },
      ['kind', 'width', 'height', 'planeToPixel'],
    ),
    object(
      'A camera model at a pose in the world.',
      {
        $schema: { type: 'string' },
        kind: kind('camera', 'View by camera model and pose.'),
        width: WIDTH,
        height: HEIGHT,
        camera: CAMERA_MODEL_SCHEMA,
        pose: POSE_SCHEMA,
      },
      ['kind', 'width', 'height', 'camera', 'pose'],
    ),
  ],
};

/**
 * JSON Schema (draft-07) of a guide light. `kind` picks the source:
 * - `"sun"`: the sun at a UTC instant (ISO 8601 string or milliseconds since the epoch)
 *   and site (see {@link sun!createSunLight});
 * - `"collimated"`: a lamp at infinity, by the unit vector towards it (see
 *   {@link sun!createCollimatedLight});
 * - `"point"`: a lamp at a position (see {@link sun!createPointLight}).
 *
 * @example
 * ```ts
 * import { validateConfig } from 'meniscus/node';
 * validateConfig('light', { kind: 'collimated', toLight: [0.3, 0, 0.95], angularRadius: 0.00465 });
 * ```
 */
export const LIGHT_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:light',
  title: 'Guide light',
  type: 'object',
  description: 'The guide light; "kind" is "sun", "collimated" or "point".',
  required: ['kind'],
  discriminator: { propertyName: 'kind' },
  oneOf: [
    object(
      'The sun at a time and place.',
      {
        $schema: { type: 'string' },
        kind: kind('sun', 'The sun.'),
        time: {
          type: ['string', 'number'],
          description: 'UTC instant: an ISO 8601 string such as "2024-06-01T12:00:00Z", or milliseconds since the Unix epoch.',
        },
        site: object(
          'Where the sensor is.',
          {
            latitudeDeg: { type: 'number', minimum: -90, maximum: 90, description: 'Geodetic latitude, degrees north.' },
            longitudeDeg: { type: 'number', minimum: -180, maximum: 180, description: 'Longitude, degrees east.' },
            height: finite('Height above sea level, metres.'),
          },
          ['latitudeDeg', 'longitudeDeg'],
        ),
        refraction: { type: 'boolean', description: 'Apply atmospheric refraction to the altitude.' },
        pressureHPa: positive('Air pressure at the site, hPa.'),
        temperatureC: { type: 'number', minimum: -90, maximum: 60, description: 'Air temperature at the site, °C.' },
      },
      ['kind', 'time', 'site'],
    ),
    object(
      'A collimated lamp: one direction everywhere.',
      {
        $schema: { type: 'string' },
        kind: kind('collimated', 'A collimated lamp.'),
        toLight: vec3('Vector from the water towards the lamp (normalised on use), world frame.'),
        angularRadius: nonNegative('Apparent angular radius of the source, radians.'),
      },
      ['kind', 'toLight'],
    ),
    object(
      'A lamp at a finite distance.',
      {
        $schema: { type: 'string' },
        kind: kind('point', 'A point lamp.'),
        position: vec3('Lamp position, world frame, metres.'),
        radius: nonNegative('Radius of the spherical emitter, metres.'),
      },
      ['kind', 'position'],
    ),
  ],
};
