/**
 * Schemas of the sensor descriptions: the design calculator's input and a built sensor
 * (aperture array and its place in the water).
 *
 * @module
 */
import { finite, integer, nonNegative, numbers, object, positive, ROTATION_SCHEMA } from './common.js';
import type { JsonSchema } from './common.js';

const LATTICE: JsonSchema = { enum: ['square', 'hexagonal'], description: 'Lattice type of the aperture array.' };

const EXPECTED_SEA: JsonSchema = object('The sea the sensor is meant for; give any of these.', {
  maxSlope: nonNegative('The steepest slope magnitude to be measured (unitless).'),
  shortestWavelength: positive('The shortest wavelength to be resolved, metres.'),
  meanSquareSlope: nonNegative('Mean-square slope, both components together (unitless).'),
  slopeStd: numbers('Standard deviations of the two slope components [σp, σq] (unitless).', 2, { type: 'number', minimum: 0 }),
  spectrum: object(
    'An omnidirectional wavenumber spectrum F(k), m³, sampled at increasing k (rad/m).',
    {
      k: { type: 'array', items: { type: 'number', exclusiveMinimum: 0 }, minItems: 2, description: 'Wavenumbers, rad/m, increasing.' },
      F: { type: 'array', items: { type: 'number', minimum: 0 }, minItems: 2, description: 'Spectral density at each k, m³.' },
    },
    ['k', 'F'],
  ),
  significantWaveHeight: nonNegative('Significant wave height, metres.'),
});

/**
 * JSON Schema (draft-07) of the design calculator's input, the JSON form of
 * {@link sensor!SensorDesignInput}: lengths in metres, angles in radians.
 *
 * @example
 * ```ts
 * import { SENSOR_DESIGN_SCHEMA } from 'meniscus/node';
 * console.log(JSON.stringify(SENSOR_DESIGN_SCHEMA, null, 2));
 * ```
 */
export const SENSOR_DESIGN_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:sensor-design',
  title: 'Slope-sensor design',
  ...object(
    'A slope-sensor design for the design calculator. Lengths in metres, angles in radians.',
    {
      $schema: { type: 'string', description: 'Optional reference to this schema.' },
      lattice: LATTICE,
      pitch: positive('Aperture pitch, metres.'),
      apertureDiameter: positive('Aperture diameter, metres.'),
      focalLength: { type: ['number', 'null'], exclusiveMinimum: 0, description: 'Lenslet focal length, metres; null or absent for pinholes.' },
      planeDistance: positive('Mask-to-plane distance, metres.'),
      maskDepth: positive('Mask depth below the mean water level, metres.'),
      sourceAngularRadius: nonNegative('Angular radius of the guide light, radians (the sun ≈ 0.00465).'),
      sourceZenith: { type: 'number', minimum: 0, exclusiveMaximum: Math.PI / 2, description: 'Zenith angle of the guide light, radians, in [0, π/2).' },
      wavelengthNm: positive('Wavelength of the guide light in vacuum, nanometres.'),
      pixelSize: positive('Size of one camera pixel on the plane, metres.'),
      centroidPrecision: positive('Centroid precision, pixels RMS.'),
      diffuserBlur: nonNegative('Gaussian σ of the diffuser blur on the plane, metres.'),
      sea: EXPECTED_SEA,
      nAir: positive('Refractive index of air.'),
      nWater: positive('Refractive index of water.'),
    },
    ['pitch', 'apertureDiameter', 'planeDistance', 'maskDepth', 'sourceAngularRadius', 'pixelSize'],
  ),
};

/** @internal The aperture array as JSON (the JSON form of `ApertureArraySpec`). */
export const APERTURES_SCHEMA: JsonSchema = object(
  'The aperture array in the mask.',
  {
    lattice: LATTICE,
    pitch: positive('Distance between neighbouring apertures, metres.'),
    columns: integer('Apertures per row.', 1, 65536),
    rows: integer('Rows of apertures.', 1, 65536),
    apertureDiameter: positive('Diameter of each pinhole or lenslet, metres (at most the pitch).'),
    rotation: finite('Turn of the lattice about the sensor z axis, radians, counter-clockwise.'),
    focalLength: { type: ['number', 'null'], exclusiveMinimum: 0, description: 'Lenslet focal length, metres; null or absent for pinholes.' },
  },
  ['pitch', 'columns', 'rows', 'apertureDiameter'],
);

/**
 * JSON Schema (draft-07) of a built sensor: its aperture array and where it sits (the
 * JSON form of {@link sensor!SensorGeometrySpec} with the array given by its
 * {@link sensor!ApertureArraySpec}).
 *
 * @example
 * ```ts
 * import { SENSOR_SCHEMA, validateConfig } from 'meniscus/node';
 * validateConfig('sensor', { apertures: { pitch: 0.01, columns: 16, rows: 16, apertureDiameter: 0.001 },
 *   maskDepth: 0.3, planeDistance: 0.05 });
 * ```
 */
export const SENSOR_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:sensor',
  title: 'Slope sensor',
  ...object(
    'A slope sensor placed in the water: aperture array, depths, pose. Metres and radians.',
    {
      $schema: { type: 'string', description: 'Optional reference to this schema.' },
      apertures: APERTURES_SCHEMA,
      maskDepth: positive('Depth of the mask centre below the mean water level, metres.'),
      planeDistance: positive('Distance from the mask down to the detection plane, metres.'),
      position: numbers('World (x, y) of the array centre, metres.', 2),
      rotation: ROTATION_SCHEMA,
      planeHalfSize: numbers('Half-widths of the detection plane along sensor x and y, metres.', 2, { type: 'number', exclusiveMinimum: 0 }),
      nAir: positive('Refractive index of air.'),
      nWater: positive('Refractive index of the water at the guide light wavelength.'),
    },
    ['apertures', 'maskDepth', 'planeDistance'],
  ),
};
