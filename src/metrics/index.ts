/**
 * Metrics: scores that say how much a correction helped. Surface scores (height error
 * after piston or tilt removal, slope error), checkerboard scores (corner detection and
 * indexing, square-size spread, line straightness, corner displacement) and image
 * similarity (MSE, PSNR, SSIM), all over masks.
 *
 * @module metrics
 */
export * from './surface.js';
export * from './similarity.js';
export * from './lattice.js';
export * from './corners.js';
