/**
 * The slope sensor: aperture-array geometry, the forward model of spot positions and
 * rendered spot frames, spot detection and sub-pixel centroids, spot-to-aperture
 * matching, slopes from spots, refinement and the design calculator.
 *
 * @module sensor
 */
export * from './lattice.js';
export * from './detect.js';
export * from './match.js';
export * from './geometry.js';
export * from './forward.js';
export * from './view.js';
export * from './render.js';
export * from './design.js';
export * from './slopes.js';
export * from './refine.js';
export * from './measure.js';
