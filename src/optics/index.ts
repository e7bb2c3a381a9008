/**
 * Optics: vector Snell refraction and reflection (total internal reflection as a status),
 * Fresnel coefficients, critical and Brewster angles and Snell's window, refractive-index
 * models of water, sea water and air, the normal-from-ray-pair solver with its
 * covariance, and conversions between normals and slopes.
 *
 * @module optics
 */
export * from './refraction.js';
export * from './fresnel.js';
export * from './water-index.js';
export * from './air-index.js';
export * from './normals.js';
export * from './slopes.js';
