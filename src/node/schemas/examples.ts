/**
 * Example configuration files, one per kind, for an invented wave tank: starting points
 * for users and fixtures for the tests (each validates against its schema).
 *
 * @module
 */
import { tankScenario } from '../../pipeline/index.js';
import type { RunConfigJson } from './run.js';
import type { CameraJson, LightJson, SensorDesignJson, SensorJson } from './types.js';

/** A design for the invented wind-wave tank's slope sensor. */
export const EXAMPLE_SENSOR_DESIGN: SensorDesignJson = {
  lattice: 'hexagonal',
  pitch: 0.008,
  apertureDiameter: 0.0008,
  planeDistance: 0.04,
  maskDepth: 0.4,
  sourceAngularRadius: 0.00465,
  sourceZenith: 0.61,
  wavelengthNm: 550,
  pixelSize: 0.0002,
  centroidPrecision: 0.05,
  diffuserBlur: 0.0001,
  sea: { meanSquareSlope: 0.01, shortestWavelength: 0.05, significantWaveHeight: 0.03 },
};

/** The invented tank's sensor as built: 24 × 24 pinholes, 1 cm apart, 30 cm down. */
export const EXAMPLE_SENSOR: SensorJson = {
  apertures: { lattice: 'square', pitch: 0.01, columns: 24, rows: 24, apertureDiameter: 0.001 },
  maskDepth: 0.3,
  planeDistance: 0.05,
};

/** A bare image sensor under the diffuser, 0.5 mm a pixel. */
export const EXAMPLE_CAMERA: CameraJson = { kind: 'plane', width: 512, height: 512, pixelSize: 0.0005 };

/** The tank's lamp: collimated, 10° from the zenith, 2 mrad across. */
export const EXAMPLE_LIGHT: LightJson = { kind: 'collimated', toLight: [0.1736, 0, 0.9848], angularRadius: 0.002 };

/** A processing run using the three parts above (given as files beside the run file). */
export const EXAMPLE_RUN: RunConfigJson = {
  sensor: 'sensor.json',
  camera: 'camera.json',
  light: 'light.json',
  detect: { method: 'iterative' },
  match: { method: 'grow' },
  reconstruct: { refine: true, maxIterations: 3 },
  output: { dtype: 'float64', pictures: false },
};

/** An example of every configuration kind. */
export const EXAMPLE_CONFIGS: Readonly<Record<import('./validate.js').ConfigKind, unknown>> = {
  'sensor-design': EXAMPLE_SENSOR_DESIGN,
  sensor: EXAMPLE_SENSOR,
  camera: EXAMPLE_CAMERA,
  light: EXAMPLE_LIGHT,
  scenario: tankScenario(),
  run: EXAMPLE_RUN,
};
