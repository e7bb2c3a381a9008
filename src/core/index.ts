/**
 * Core: vector and rotation helpers, the `Grid`, mask and `Image` types, seeded random
 * numbers, the library's error types, argument checks and size limits.
 *
 * @module core
 */
export * from './errors.js';
export * from './limits.js';
export * from './checks.js';
export * from './vec3.js';
export * from './mat3.js';
export * from './grid.js';
export * from './image.js';
export * from './random.js';
export * from './status.js';
