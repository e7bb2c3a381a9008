/**
 * Shared input checks and small kernels of the integrators.
 *
 * @module
 * @internal
 */
import {
  checkAllocation,
  checkFinite,
  checkGrid,
  checkInteger,
  checkMask,
  checkOptions,
  checkPositive,
  LIMITS,
  checkSameShape,
  checkOut,
  createGrid,
  rangeError,
  typeError,
  type Grid,
  type GridSpec,
  type Mask,
} from '../core/index.js';

/** Validated slope input. @internal */
export interface CheckedSlopes {
  readonly p: Grid;
  readonly q: Grid;
  /** The mask, or null for a full rectangle. */
  readonly mask: Mask | null;
  /** Number of valid samples (≥ 1). */
  readonly valid: number;
}

/**
 * Check `p`, `q` and an optional mask: same size and geometry, finite wherever the mask
 * says valid (everywhere without a mask), and at least one valid sample.
 *
 * @internal
 */
export function checkSlopes(fn: string, p: unknown, q: unknown, mask: unknown, maskName = 'options.mask'): CheckedSlopes {
  const hasMask = mask !== undefined && mask !== null;
  const P = checkGrid(fn, 'p', p, hasMask);
  const Q = checkGrid(fn, 'q', q, hasMask);
  checkSameShape(fn, 'q', Q, P);
  const n = P.width * P.height;
  if (!hasMask) return { p: P, q: Q, mask: null, valid: n };
  const M = checkMask(fn, maskName, mask, P.width, P.height);
  let valid = 0;
  const pd = P.data;
  const qd = Q.data;
  for (let k = 0; k < n; k++) {
    if (M[k] === 0) continue;
    valid++;
    if (!Number.isFinite(pd[k]!)) rangeError(fn, `p.data[${k}]`, pd[k], 'a finite number where the mask is 1');
    if (!Number.isFinite(qd[k]!)) rangeError(fn, `q.data[${k}]`, qd[k], 'a finite number where the mask is 1');
  }
  if (valid === 0) rangeError(fn, maskName, M, 'a mask with at least one valid (1) sample');
  return { p: P, q: Q, mask: M, valid };
}

/**
 * Check an optional per-sample weight grid: same size as `like`, finite and ≥ 0 where
 * valid, and not zero everywhere that is valid.
 *
 * @internal
 */
export function checkWeights(fn: string, parameter: string, value: unknown, like: Grid, mask: Mask | null): Grid {
  const W = checkGrid(fn, parameter, value, true);
  checkSameShape(fn, parameter, W, like, false);
  const d = W.data;
  let any = false;
  for (let k = 0; k < d.length; k++) {
    if (mask && mask[k] === 0) continue;
    const v = d[k]!;
    if (!(v >= 0) || v === Infinity) rangeError(fn, `${parameter}.data[${k}]`, v, 'a finite weight >= 0');
    if (v > 0) any = true;
  }
  if (!any) rangeError(fn, parameter, W, 'at least one positive weight on a valid sample (all weights are zero)');
  return W;
}

/** Output height buffer: `out` checked or a new array. @internal */
export function outBuffer(fn: string, out: unknown, n: number): Float64Array {
  return checkOut(fn, 'options.out', out, n);
}

/** A grid with `like`'s geometry over `data`. @internal */
export function gridOver(like: Grid, data: Float64Array): Grid {
  return createGrid(like, data);
}

/** Full mask of n ones. @internal */
export function fullMask(n: number): Mask {
  return new Uint8Array(n).fill(1);
}

/**
 * RMS over every forward-difference pair inside the mask of
 * `(h_b − h_a)/d − (s_a + s_b)/2` (x and y pairs pooled), the residual of the
 * forward-difference model. Returns 0 when there is no pair.
 *
 * @internal
 */
export function pairRms(
  h: Float64Array,
  p: Float64Array,
  q: Float64Array,
  mask: Mask | null,
  w: number,
  hgt: number,
  dx: number,
  dy: number,
): number {
  let s = 0;
  let count = 0;
  const ix = 1 / dx;
  const iy = 1 / dy;
  for (let j = 0; j < hgt; j++) {
    const row = j * w;
    for (let i = 0; i < w; i++) {
      const k = row + i;
      if (mask && mask[k] === 0) continue;
      if (i + 1 < w && (!mask || mask[k + 1] === 1)) {
        const e = (h[k + 1]! - h[k]!) * ix - 0.5 * (p[k]! + p[k + 1]!);
        s += e * e;
        count++;
      }
      if (j + 1 < hgt && (!mask || mask[k + w] === 1)) {
        const e = (h[k + w]! - h[k]!) * iy - 0.5 * (q[k]! + q[k + w]!);
        s += e * e;
        count++;
      }
    }
  }
  return count > 0 ? Math.sqrt(s / count) : 0;
}

/** {@link pairRms} for a full rectangle (no mask), branch-free. @internal */
export function pairRmsFull(
  h: Float64Array,
  p: Float64Array,
  q: Float64Array,
  w: number,
  hgt: number,
  dx: number,
  dy: number,
): number {
  let s = 0;
  const ix = 1 / dx;
  const iy = 1 / dy;
  for (let j = 0; j < hgt; j++) {
    const row = j * w;
    const end = row + w - 1;
    for (let k = row; k < end; k++) {
      const e = (h[k + 1]! - h[k]!) * ix - 0.5 * (p[k]! + p[k + 1]!);
      s += e * e;
    }
  }
  const endY = (hgt - 1) * w;
  for (let k = 0; k < endY; k++) {
    const e = (h[k + w]! - h[k]!) * iy - 0.5 * (q[k]! + q[k + w]!);
    s += e * e;
  }
  const count = (w - 1) * hgt + w * (hgt - 1);
  return count > 0 ? Math.sqrt(s / count) : 0;
}

/** Subtract the mean over valid samples; returns the constant added. @internal */
export function removeMean(h: Float64Array, mask: Mask | null): number {
  let s = 0;
  let c = 0;
  for (let k = 0; k < h.length; k++) {
    if (mask && mask[k] === 0) continue;
    s += h[k]!;
    c++;
  }
  const piston = c > 0 ? -s / c : 0;
  for (let k = 0; k < h.length; k++) {
    if (mask && mask[k] === 0) h[k] = 0;
    else h[k] = h[k]! + piston;
  }
  return piston;
}

/** Reject an option a method does not support. @internal */
export function refuseOption(fn: string, options: object, names: readonly string[], why: string): void {
  for (const name of names) {
    const v = (options as Record<string, unknown>)[name];
    if (v !== undefined) typeError(fn, `options.${name}`, v, `undefined (${why})`);
  }
}

/**
 * Validate the grid spec given to a prepared transform solver.
 *
 * @param allocationFactor - Samples the solver allocates per grid sample, for the size guard.
 * @returns The size and spacing, defaults unpacked (dx 1, dy dx).
 * @internal
 */
export function checkSolverSpec(
  fn: string,
  spec: GridSpec | undefined,
  allocationFactor: number,
): { w: number; h: number; dx: number; dy: number } {
  if (spec === undefined) typeError(fn, 'spec', spec, 'a grid spec {width, height, dx?, dy?, x0?, y0?}');
  checkOptions(fn, spec, 'spec');
  const w = checkInteger(fn, 'spec.width', spec.width, 1, LIMITS.maxSide);
  const h = checkInteger(fn, 'spec.height', spec.height, 1, LIMITS.maxSide);
  checkAllocation(fn, 'spec.width × spec.height', allocationFactor * w * h);
  const dx = spec.dx === undefined ? 1 : checkPositive(fn, 'spec.dx', spec.dx);
  const dy = spec.dy === undefined ? dx : checkPositive(fn, 'spec.dy', spec.dy);
  if (spec.x0 !== undefined) checkFinite(fn, 'spec.x0', spec.x0);
  if (spec.y0 !== undefined) checkFinite(fn, 'spec.y0', spec.y0);
  return { w, h, dx, dy };
}
