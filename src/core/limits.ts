/**
 * Size limits that guard every allocation whose size depends on input.
 *
 * @module
 */

/**
 * The documented limits. A grid, image or buffer larger than these is refused with a
 * {@link MeniscusRangeError} before anything is allocated, so that a bad size gives a
 * clear message instead of exhausting memory.
 *
 * The values are deliberately generous for a 2-D imaging library: 2^26 samples is a
 * 8192 × 8192 grid (512 MiB as `Float64Array`).
 */
export const LIMITS = {
  /** Largest number of samples in one grid, mask or image plane. */
  maxSamples: 2 ** 26,
  /** Largest width or height of a grid or image. */
  maxSide: 65536,
  /** Largest number of elements in any packed batch (rays, points, spots). */
  maxBatch: 2 ** 26,
  /** Largest iteration cap an iterative solver accepts. */
  maxIterations: 1_000_000,
} as const;
