/**
 * The composed pipeline: one function from a sensor frame and a simultaneous scene image
 * to the measured surface, the corrected image and diagnostics; the scenario simulator
 * that produces such frames (and the truth) from a plain JSON scenario; the two shipped
 * scenarios; and the procedural targets they use.
 *
 * @module pipeline
 */
export * from './process.js';
export * from './scenario.js';
export * from './defaults.js';
export * from './targets.js';
