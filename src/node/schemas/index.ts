/**
 * Configuration schemas (JSON Schema draft-07), their validation with field-naming
 * messages, and the conversion of valid configurations into the library's objects.
 *
 * @module
 */
export type { JsonSchema } from './common.js';
export * from './types.js';
export { SENSOR_DESIGN_SCHEMA, SENSOR_SCHEMA } from './sensor.js';
export { CAMERA_SCHEMA, LIGHT_SCHEMA } from './camera.js';
export { RUN_SCHEMA } from './run.js';
export type { RunConfigJson, CorrectionJson } from './run.js';
export { SCENARIO_SCHEMA } from './scenario.js';
export type { ScenarioJson } from './scenario.js';
export * from './validate.js';
export * from './build.js';
export * from './examples.js';
