/**
 * Node-only helpers (`meniscus/node`): PNG images and grids, NumPy `.npy` and `.npz`
 * files, and per-frame result folders that Python users can load with NumPy alone.
 *
 * Also: the configuration schemas with their validation, a worker-thread pool with a
 * progress bar, and the `meniscus` command line ({@link runCli}).
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
export * from './schemas/index.js';
export * from './batch/pool.js';
export * from './batch/progress.js';
export { runCli } from './cli/run.js';
export { EXIT_CODES, UsageError } from './cli/exit-codes.js';
export type { ExitCode } from './cli/exit-codes.js';
export type { CliIO } from './cli/io.js';
