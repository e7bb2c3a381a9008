/**
 * Node-only helpers (`meniscus/node`): PNG images and grids, NumPy `.npy` and `.npz`
 * files, and per-frame result folders that Python users can load with NumPy alone.
 *
 * The `.npy` codec (`encodeNpy`, `decodeNpy`, …) and the grid / mask / image conversions
 * are platform-neutral and exported here too.
 *
 * @module node
 */
export * from './npy-codec.js';
export * from './npy-convert.js';
export * from './npy.js';
export * from './npz.js';
export * from './png.js';
export * from './grid-png.js';
export * from './frame-result.js';
