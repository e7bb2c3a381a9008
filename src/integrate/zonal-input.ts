/**
 * Shared argument checks of the zonal reconstructors. Internal.
 *
 * @module
 * @internal
 */
import {
  checkGrid,
  checkInteger,
  checkMask,
  checkOptions,
  checkPositive,
  checkSameShape,
  LIMITS,
  rangeError,
  typeError,
  type Grid,
  type Mask,
} from '../core/index.js';
import type { ProgressCallback } from './types.js';
import type { ZonalOptions } from './zonal.js';

/** @internal */
export interface ZonalInput {
  p: Grid;
  q: Grid;
  /** 1 where the sample is valid and has a positive weight. */
  use: Uint8Array;
  /** Weight of each sample (1 when no weights were given). */
  w: Float64Array;
  tolerance: number;
  maxIterations: number;
  onProgress: ProgressCallback | undefined;
}

/**
 * Validate slopes, mask, weights and solver options. `needFinite(i, j)` says whether
 * the p and q values of a valid sample are read (all of them unless a method ignores a
 * row or column).
 *
 * @internal
 */
export function readZonalInput(
  fn: string,
  p: Grid,
  q: Grid,
  options: ZonalOptions | undefined,
  readsP: (i: number, j: number) => boolean = () => true,
  readsQ: (i: number, j: number) => boolean = () => true,
): ZonalInput {
  const o = checkOptions(fn, options);
  checkGrid(fn, 'p', p, true);
  checkGrid(fn, 'q', q, true);
  checkSameShape(fn, 'q', q, p);
  const { width, height } = p;
  const n = width * height;
  const mask = o.mask === undefined ? undefined : checkMask(fn, 'options.mask', o.mask, width, height);
  let w: Float64Array;
  if (o.weights === undefined) w = new Float64Array(n).fill(1);
  else {
    checkGrid(fn, 'options.weights', o.weights, true);
    checkSameShape(fn, 'options.weights', o.weights, p, false);
    w = o.weights.data;
  }
  const use = new Uint8Array(n);
  let count = 0;
  let valid = 0;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      if (mask && mask[k] === 0) continue;
      valid++;
      if (readsP(i, j) && !Number.isFinite(p.data[k]!)) {
        rangeError(fn, `p.data[${k}]`, p.data[k], 'a finite slope (mark holes with options.mask)');
      }
      if (readsQ(i, j) && !Number.isFinite(q.data[k]!)) {
        rangeError(fn, `q.data[${k}]`, q.data[k], 'a finite slope (mark holes with options.mask)');
      }
      const wk = w[k]!;
      if (!(wk >= 0) || wk === Infinity) rangeError(fn, `options.weights.data[${k}]`, wk, 'a finite weight >= 0');
      if (wk > 0) {
        use[k] = 1;
        count++;
      }
    }
  }
  if (valid === 0) rangeError(fn, 'options.mask', 'no valid sample', 'a mask with at least one valid sample');
  if (count === 0) rangeError(fn, 'options.weights', 'all weights 0', 'at least one valid sample with a weight > 0');
  const tolerance = o.tolerance === undefined ? 1e-10 : checkPositive(fn, 'options.tolerance', o.tolerance);
  const maxIterations =
    o.maxIterations === undefined ? 2000 : checkInteger(fn, 'options.maxIterations', o.maxIterations, 1, LIMITS.maxIterations);
  if (o.onProgress !== undefined && typeof o.onProgress !== 'function') {
    typeError(fn, 'options.onProgress', o.onProgress, 'a function or undefined');
  }
  return { p, q, use, w, tolerance, maxIterations, onProgress: o.onProgress };
}
