/**
 * Schema of a processing run: the sensor, camera and light (inline or as paths to their
 * own files), the options of each stage and what to write.
 *
 * @module
 */
import { finite, integer, nonNegative, numbers, object, positive } from './common.js';
import type { JsonSchema } from './common.js';
import type { CameraJson, LightJson, SensorJson } from './types.js';
import type { DetectSpotsOptions, MatchSpotsOptions, ReconstructOptions } from '../../sensor/index.js';
import type { CorrectionOptions, CorrectionTarget } from '../../imaging/index.js';

/** @internal A part given inline or as a path to its own JSON file (relative to the run file). */
function inlineOrPath(ref: string, what: string): JsonSchema {
  return {
    description: `${what}: inline, or the path of its JSON file relative to this file.`,
    if: { type: 'string' },
    then: { type: 'string', minLength: 1 },
    else: { $ref: ref },
  };
}

/** @internal Spot-detection options (the JSON form of `DetectSpotsOptions`). */
export const DETECT_SCHEMA: JsonSchema = object('Spot detection.', {
  background: {
    description: 'Background level, counts per pixel, or "auto".',
    if: { type: 'string' },
    then: { const: 'auto' },
    else: { type: 'number' },
  },
  noise: nonNegative('Standard deviation of the background, counts.'),
  threshold: positive('Detection level above the background, counts.'),
  thresholdSigma: positive('Multiple of the noise for the automatic threshold.'),
  minPixels: integer('Smallest component kept, pixels.', 1, 1e9),
  maxPixels: integer('Largest component kept, pixels.', 1, 1e9),
  connectivity: { enum: [4, 8], description: 'Pixel connectivity of a component.' },
  method: { enum: ['thresholded', 'windowed', 'iterative', 'gaussian'], description: 'Centroid estimator.' },
  window: positive('Half-width of the window of the windowed estimators, pixels.'),
  weightSigma: positive('Width of the Gaussian weight of "iterative", pixels.'),
  saturation: positive('Value at or above which a pixel is saturated, in the frame units.'),
  gain: positive('Photo-electrons per count.'),
  channel: integer('Channel to read from a multi-channel frame.', 0, 3),
  maxSpots: integer('Largest number of spots reported.', 1, 1e9),
});

/** @internal Matching options (the JSON form of `MatchSpotsOptions`). */
export const MATCH_SCHEMA: JsonSchema = object('Spot-to-aperture matching.', {
  method: { enum: ['nearest', 'grow'], description: 'Matching method.' },
  acceptRadius: positive('Acceptance radius, fraction of the pitch.'),
  boundaryMargin: nonNegative('Margin of the ambiguity test, fraction of the pitch.'),
  expectedShift: numbers('Shift applied to the references for "nearest", metres on the plane.', 2),
  offsetMargin: nonNegative('Margin of the offset decision, fraction of the pitch.'),
  minRegion: integer('Smallest region of connected matches kept.', 1, 1e9),
});

/** @internal A grid layout (the JSON form of `GridSpec`). */
export const GRID_SPEC_SCHEMA: JsonSchema = object(
  'A regular grid: size, spacing and origin in metres.',
  {
    width: integer('Columns.', 1, 65536),
    height: integer('Rows.', 1, 65536),
    dx: positive('Spacing along x, metres.'),
    dy: positive('Spacing along y, metres.'),
    x0: finite('World x of column 0, metres.'),
    y0: finite('World y of row 0, metres.'),
  },
  ['width', 'height'],
);

/** @internal Integration and refinement options. */
export const RECONSTRUCT_SCHEMA: JsonSchema = object('Integration of slopes into heights, and refinement.', {
  grid: GRID_SPEC_SCHEMA,
  smoothness: nonNegative('Thin-plate smoothness of the scattered integrator.'),
  refine: { type: 'boolean', description: 'Run the refinement loop.' },
  maxIterations: integer('Largest number of refinement passes.', 1, 1000),
  tolerance: positive('Stop when the largest height change of a pass falls below this, metres.'),
  weighted: { type: 'boolean', description: 'Weight each slope by its inverse variance.' },
});

/** @internal Correction of the scene images through the measured surface. */
export const CORRECT_SCHEMA: JsonSchema = object(
  'Seeing the scene through the measured surface (used with scene images).',
  {
    camera: inlineOrPath('meniscus:camera', 'The scene camera (a camera file of kind "camera": model and pose)'),
    target: {
      type: 'object',
      description: 'Where the scene lies: {"type": "sky"} or {"type": "plane", "z": height in metres}.',
      required: ['type'],
      discriminator: { propertyName: 'type' },
      oneOf: [
        object('A scene at infinity.', { type: { const: 'sky' } }, ['type']),
        object('A scene on a horizontal plane.', { type: { const: 'plane' }, z: finite('Height of the plane, metres.') }, ['type', 'z']),
      ],
    },
    mode: { enum: ['exact', 'fast'], description: 'Trace every pixel ("exact") or a mesh ("fast").' },
    meshStep: integer('Mesh spacing of the fast mode, pixels.', 1, 1024),
    reference: { enum: ['flat', 'none'], description: 'See the corrected scene through flat water, or through no water.' },
    level: finite('Height of the flat reference water level, metres.'),
    interpolation: { enum: ['bilinear', 'bicubic', 'nearest'], description: 'Interpolation of the distorted image.' },
    nWater: positive('Refractive index of the water.'),
    nAir: positive('Refractive index of the air.'),
    tolerance: positive('Largest accepted |z − h(x, y)| at a surface hit, metres.'),
  },
  ['camera', 'target'],
);

/** The run configuration as JSON (see `RUN_SCHEMA`). */
export interface RunConfigJson {
  /** Optional reference to the schema. */
  $schema?: string;
  /** The sensor, inline or as a path. */
  sensor: SensorJson | string;
  /** The camera's view of the plane, inline or as a path. */
  camera: CameraJson | string;
  /** The guide light, inline or as a path. */
  light: LightJson | string;
  /** Spot detection options. */
  detect?: Omit<DetectSpotsOptions, 'saturation'> & { saturation?: number };
  /** Matching options. */
  match?: MatchSpotsOptions & { expectedShift?: [number, number] };
  /** Integration options (those of `reconstructSurface` that JSON can hold). */
  reconstruct?: Pick<ReconstructOptions, 'grid' | 'smoothness' | 'refine' | 'maxIterations' | 'tolerance' | 'weighted'>;
  /** Seeing the scene through the measured surface. */
  correct?: CorrectionJson;
  /** What to write. */
  output?: {
    /** Element type of the grids. @defaultValue "float64" */
    dtype?: 'float64' | 'float32';
    /** Write a height-map picture beside each frame's arrays. @defaultValue false */
    pictures?: boolean;
  };
}

/** How scene images are corrected (see `RUN_SCHEMA`). */
export interface CorrectionJson extends Omit<CorrectionOptions, 'width' | 'height'> {
  /** The scene camera (a camera view of kind `"camera"`), inline or a path. */
  camera: CameraJson | string;
  /** Where the scene lies. */
  target: CorrectionTarget;
}

/**
 * JSON Schema (draft-07) of a processing run for the command line's frame processing:
 * the sensor, camera and light (inline objects, or paths of their own files relative to
 * the run file) and the options of each stage.
 *
 * @example
 * ```ts
 * import { validateConfig } from 'meniscus/node';
 * validateConfig('run', { sensor: 'sensor.json', camera: 'camera.json', light: 'light.json',
 *   detect: { method: 'iterative' }, output: { dtype: 'float32' } });
 * ```
 */
export const RUN_SCHEMA: JsonSchema = {
  $schema: 'http://json-schema.org/draft-07/schema#',
  $id: 'meniscus:run',
  title: 'Processing run',
  ...object(
    'A processing run: the sensor, camera and light, and the options of each stage.',
    {
      $schema: { type: 'string', description: 'Optional reference to this schema.' },
      sensor: inlineOrPath('meniscus:sensor', 'The sensor'),
      camera: inlineOrPath('meniscus:camera', 'How the camera sees the detection plane'),
      light: inlineOrPath('meniscus:light', 'The guide light'),
      detect: DETECT_SCHEMA,
      match: MATCH_SCHEMA,
      reconstruct: RECONSTRUCT_SCHEMA,
      correct: CORRECT_SCHEMA,
      output: object('What to write.', {
        dtype: { enum: ['float64', 'float32'], description: 'Element type of the written grids.' },
        pictures: { type: 'boolean', description: 'Write a colour-mapped height picture beside each frame.' },
      }),
    },
    ['sensor', 'camera', 'light'],
  ),
};
