/**
 * Schema of a simulated experiment: the JSON form of the pipeline's
 * {@link pipeline!Scenario}, with the ranges its simulator accepts.
 *
 * @module
 */
import type { Scenario } from '../../pipeline/index.js';
import { integer, numbers, object } from './common.js';
import type { JsonSchema } from './common.js';

/** A scenario as JSON: the pipeline's {@link pipeline!Scenario}, optionally with `$schema`. */
export type ScenarioJson = Scenario & { $schema?: string };

const range = (description: string, minimum: number, maximum: number): JsonSchema => ({ type: 'number', minimum, maximum, description });
const intRange = (description: string, minimum: number, maximum: number): JsonSchema => integer(description, minimum, maximum);

const SITE = object(
  'The (invented) site, for the sun position.',
  {
    name: { type: 'string', description: 'A name for the report.' },
    latitudeDeg: range('Latitude, degrees north.', -90, 90),
    longitudeDeg: range('Longitude, degrees east.', -180, 180),
    height: range('Height above sea level, metres.', -500, 10000),
  },
  ['latitudeDeg', 'longitudeDeg'],
);

const SEA = object(
  'The sea state: a JONSWAP spectrum with cos-2s spreading on a square grid.',
  {
    peakPeriod: range('Peak period, seconds.', 0.05, 30),
    significantHeight: range('Significant wave height, metres.', 1e-5, 20),
    gamma: range('JONSWAP peak enhancement γ.', 1, 10),
    spreadingS: range('Spreading exponent s of cos²ˢ.', 0.1, 100),
    meanDirectionDeg: range('Mean direction the waves travel towards, degrees counter-clockwise from east.', -360, 360),
    depth: range('Water depth, metres (absent: deep water).', 1e-3, 1e4),
    gridSize: { enum: [16, 32, 64, 128, 256, 512, 1024, 2048, 4096], description: 'Grid samples per side (a power of two).' },
    gridSpacing: range('Grid spacing, metres.', 1e-5, 100),
    seed: intRange('Seed of the random sea.', 0, 2 ** 31),
    time: range('Time of the (first) frame, seconds.', -1e6, 1e6),
  },
  ['peakPeriod', 'significantHeight', 'gridSpacing'],
);

const LIGHT: JsonSchema = {
  type: 'object',
  description: 'The guide light: {"type": "sun"} (needs site and time), "collimated" or "point".',
  required: ['type'],
  discriminator: { propertyName: 'type' },
  oneOf: [
    object('The sun at the scenario site and time.', { type: { const: 'sun' } }, ['type']),
    object(
      'A collimated lamp.',
      {
        type: { const: 'collimated' },
        zenithDeg: range('Zenith angle of the lamp, degrees.', 0, 80),
        azimuthDeg: range('Azimuth of the lamp, degrees clockwise from north.', -360, 360),
        angularRadiusDeg: range('Angular radius of the lamp, degrees.', 0, 5),
      },
      ['type', 'zenithDeg', 'azimuthDeg'],
    ),
    object(
      'A point lamp above the water.',
      { type: { const: 'point' }, position: numbers('Lamp position [x, y, z], metres (z > 0).', 3), radius: range('Emitter radius, metres.', 0, 10) },
      ['type', 'position'],
    ),
  ],
};

const SENSOR = object(
  "The slope sensor's design and its camera.",
  {
    lattice: { enum: ['square', 'hexagonal'], description: 'Aperture lattice.' },
    pitch: range('Aperture pitch, metres.', 1e-4, 1),
    columns: intRange('Apertures per row.', 2, 512),
    rows: intRange('Rows of apertures.', 2, 512),
    apertureDiameter: range('Aperture diameter, metres (at most the pitch).', 1e-6, 0.1),
    maskDepth: range('Depth of the mask below the mean level, metres.', 1e-3, 100),
    planeDistance: range('Mask-to-plane distance, metres.', 1e-4, 10),
    frame: object(
      'The camera that images the detection plane.',
      { width: intRange('Frame width, pixels.', 16, 8192), height: intRange('Frame height, pixels.', 16, 8192), pixelSize: range('Pixel size on the plane, metres.', 1e-7, 0.1) },
      ['width', 'height', 'pixelSize'],
    ),
    photonsPerSpot: range('Photo-electrons per spot.', 1, 1e9),
    readNoise: range('Read noise, electrons RMS.', 0, 1000),
    seed: intRange('Seed of the frame noise (the n-th frame of a sequence uses seed + n).', 0, 2 ** 31),
    refinementPasses: intRange('Refinement passes of the reconstruction.', 0, 50),
  },
  ['pitch', 'columns', 'rows', 'apertureDiameter', 'maskDepth', 'planeDistance', 'frame'],
);

const CAMERA = object(
  'The scene camera: a pinhole looking straight up from below the water (z < 0) or down from above it (z > 0).',
  {
    width: intRange('Image width, pixels.', 8, 8192),
    height: intRange('Image height, pixels.', 8, 8192),
    fovDeg: range('Horizontal field of view, degrees.', 1, 150),
    z: range('Height of the camera centre, metres (negative below the mean level).', -1000, 1000),
    position: numbers('Horizontal position [x, y], metres.', 2),
    supersample: intRange('Sub-samples per pixel side when rendering.', 1, 8),
  },
  ['width', 'height', 'fovDeg', 'z'],
);

const TARGET: JsonSchema = {
  type: 'object',
  description: 'What the scene camera looks at: "pattern" or "checkerboard" on a horizontal plane at height z.',
  required: ['type'],
  discriminator: { propertyName: 'type' },
  oneOf: [
    object(
      'A smooth random pattern.',
      {
        type: { const: 'pattern' },
        z: range('Height of the target plane, metres.', -1000, 1000),
        size: range('Side of the pattern, metres.', 1e-3, 1e4),
        pixels: intRange('Texture pixels per side.', 8, 8192),
        seed: intRange('Seed of the pattern.', 0, 2 ** 31),
      },
      ['type', 'z', 'size'],
    ),
    object(
      'A checkerboard.',
      {
        type: { const: 'checkerboard' },
        z: range('Height of the target plane, metres.', -1000, 1000),
        squareSize: range('Side of one square, metres.', 1e-4, 100),
        columns: intRange('Squares along x.', 2, 1000),
        rows: intRange('Squares along y.', 2, 1000),
        pixelsPerSquare: intRange('Texture pixels per square side.', 2, 1024),
      },
      ['type', 'z', 'squareSize', 'columns', 'rows'],
    ),
  ],
};

/**
 * JSON Schema (draft-07) of a scenario for `meniscus simulate`: the pipeline's
 * {@link pipeline!Scenario} (an invented site and time, sea state, guide light, sensor,
 * scene camera, target and correction settings).
 *
 * @example
 * ```ts
 * import { validateConfig } from 'meniscus/node';
 * import { tankScenario } from 'meniscus/pipeline';
 * validateConfig('scenario', tankScenario());
 * ```
 */
export const SCENARIO_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:scenario',
  title: 'Scenario',
  ...object(
    'A simulated experiment: site and time, sea, guide light, slope sensor, scene camera and target.',
    {
      $schema: { type: 'string', description: 'Optional reference to this schema.' },
      name: { type: 'string', minLength: 1, description: 'Short name.' },
      description: { type: 'string', description: 'What the scenario shows.' },
      site: SITE,
      time: { type: 'string', description: 'The instant, ISO 8601 UTC, e.g. "2025-06-21T11:00:00Z" (needed for the sun).' },
      water: object('Refractive indices.', { nWater: range('Refractive index of the water.', 1, 2), nAir: range('Refractive index of the air.', 0.9, 1.1) }),
      sea: SEA,
      light: LIGHT,
      sensor: SENSOR,
      camera: CAMERA,
      target: TARGET,
      correction: object('Correction settings for the pipeline.', {
        mode: { enum: ['exact', 'fast'], description: 'Trace every pixel or a mesh.' },
        meshStep: intRange('Mesh spacing of the fast mode, pixels.', 1, 256),
        reference: { enum: ['flat', 'none'], description: 'Correct to flat water or to no water.' },
      }),
    },
    ['name', 'sea', 'light', 'sensor', 'camera', 'target'],
  ),
};



