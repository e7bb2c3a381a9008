/**
 * Surface scores: how far a measured height map or slope field lies from the truth,
 * over a mask, after removing what a measurement cannot see (a constant piston, and
 * optionally a tilt plane).
 *
 * @module
 */
import {
  checkFloat64Array,
  checkGrid,
  checkMask,
  checkOneOf,
  checkOptions,
  checkSameShape,
  rangeError,
  typeError,
} from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';

/** What is removed from the height error before it is scored. */
export type HeightErrorRemoval = 'none' | 'piston' | 'tilt';

/** Options of {@link heightError}. */
export interface HeightErrorOptions {
  /** Which samples count (`1` = valid). @defaultValue every sample */
  mask?: Mask;
  /**
   * What to remove from the error `measured − truth` before scoring: nothing, its
   * mean (piston), or its least-squares plane `c + a·x + b·y` in world coordinates (tilt,
   * which includes the piston).
   * @defaultValue `'piston'`
   */
  remove?: HeightErrorRemoval;
  /**
   * A buffer of `width × height` for the residual error map (metres, after removal);
   * samples outside the mask are set to 0.
   */
  out?: Float64Array;
}

/** The result of {@link heightError}. */
export interface HeightErrorResult {
  /** Root-mean-square residual error over the valid samples, metres. */
  readonly rms: number;
  /** Largest absolute residual error, metres. */
  readonly peak: number;
  /** Largest minus smallest residual error (peak-to-valley), metres. */
  readonly peakToValley: number;
  /** Number of valid samples used. */
  readonly count: number;
  /** The removed constant, metres (the plane's value at the mask's centroid for `'tilt'`; 0 for `'none'`). */
  readonly piston: number;
  /** The removed plane's slope along x, unitless (0 unless `'tilt'`). */
  readonly tiltX: number;
  /** The removed plane's slope along y, unitless (0 unless `'tilt'`). */
  readonly tiltY: number;
  /** The residual error map when `options.out` was given, otherwise `undefined`. */
  readonly residual: Float64Array | undefined;
}

/** A plane `z = c + a·(x − xc) + b·(y − yc)` fitted to a grid. */
export interface PlaneFit {
  /** Value at the centroid `(xc, yc)` of the valid samples, in the grid's unit. */
  readonly c: number;
  /** Slope along x (grid unit per metre). */
  readonly a: number;
  /** Slope along y (grid unit per metre). */
  readonly b: number;
  /** Centroid x of the valid samples, metres. */
  readonly xc: number;
  /** Centroid y of the valid samples, metres. */
  readonly yc: number;
  /** Number of valid samples. */
  readonly count: number;
}

/**
 * Least-squares plane through the valid samples of a grid, in world coordinates.
 *
 * Solves the 3×3 normal equations of `z ≈ c + a·(x − xc) + b·(y − yc)` with the
 * coordinates centred on the samples' centroid, which keeps them well conditioned.
 *
 * @param grid - The field.
 * @param mask - Which samples count. @defaultValue every sample
 * @returns The plane.
 * @throws {@link core!MeniscusTypeError} for a malformed grid or mask.
 * @throws {@link core!MeniscusRangeError} for a non-finite valid sample, or fewer than three
 *   valid samples not on one line (no unique plane).
 * @see Common practice: ordinary linear least squares (normal equations).
 * @example
 * ```ts
 * const g = gridFromFunction({ width: 8, height: 8, dx: 0.1 }, (x, y) => 1 + 2 * x - y);
 * const { a, b } = fitPlane(g); // a ≈ 2, b ≈ -1
 * ```
 */
export function fitPlane(grid: Grid, mask?: Mask): PlaneFit {
  const fn = 'fitPlane';
  checkGrid(fn, 'grid', grid, mask !== undefined);
  if (mask !== undefined) checkMask(fn, 'mask', mask, grid.width, grid.height);
  checkValidFinite(fn, 'grid', grid.data, mask);
  const fit = planeKernel(grid, grid.data, mask);
  if (fit === null) {
    rangeError(fn, 'mask', mask ?? 'every sample', 'at least three valid samples that do not lie on one line');
  }
  return fit;
}

/**
 * Height error of a measured map against the truth: RMS, peak and peak-to-valley of
 * `measured − truth` after removing its piston (default) or its least-squares plane.
 *
 * A height map integrated from slopes is known only up to a constant (and a slope
 * sensor with an uncertain reference direction only up to a tilt), so these are the
 * usual scores of a reconstruction.
 *
 * @param measured - Measured heights, metres.
 * @param truth - True heights on the same grid (same size, spacing and origin).
 * @param options - Mask, what to remove, residual buffer.
 * @returns The scores; `residual` holds the map when `options.out` was given.
 * @throws {@link core!MeniscusTypeError} for malformed or mismatched grids, a mask or `out` of the wrong length.
 * @throws {@link core!MeniscusRangeError} for a non-finite valid sample, an empty mask, or a
 *   mask on which no plane is defined when `remove` is `'tilt'`.
 * @see Common practice in wavefront and surface metrology: piston (and tilt) removed
 *   before the RMS, as in Southwell (1980), "Wave-front estimation from wave-front slope
 *   measurements", JOSA 70(8), 998.
 * @example
 * ```ts
 * const truth = gridFromFunction({ width: 64, height: 64, dx: 0.01 }, (x, y) => 0.002 * Math.sin(10 * x));
 * const measured = gridFromFunction(truth, (x, y) => 0.002 * Math.sin(10 * x) + 0.05);
 * heightError(measured, truth).rms; // ≈ 0 (the 5 cm offset is piston)
 * ```
 */
export function heightError(measured: Grid, truth: Grid, options?: HeightErrorOptions): HeightErrorResult {
  const fn = 'heightError';
  const o = checkOptions(fn, options);
  const mask = o.mask;
  checkGrid(fn, 'measured', measured, true);
  checkGrid(fn, 'truth', truth, true);
  checkSameShape(fn, 'truth', truth, measured);
  if (mask !== undefined) checkMask(fn, 'options.mask', mask, measured.width, measured.height);
  const remove = o.remove === undefined ? 'piston' : checkOneOf(fn, 'options.remove', o.remove, ['none', 'piston', 'tilt'] as const);
  const n = measured.width * measured.height;
  const out = o.out === undefined ? undefined : checkFloat64Array(fn, 'options.out', o.out, 1, n);
  checkValidFinite(fn, 'measured', measured.data, mask);
  checkValidFinite(fn, 'truth', truth.data, mask);

  const e = new Float64Array(n);
  const md = measured.data;
  const td = truth.data;
  let count = 0;
  for (let k = 0; k < n; k++) {
    if (mask === undefined || mask[k] === 1) {
      e[k] = md[k]! - td[k]!;
      count++;
    }
  }
  if (count === 0) rangeError(fn, 'options.mask', mask, 'a mask with at least one valid sample');

  let piston = 0;
  let a = 0;
  let b = 0;
  let xc = 0;
  let yc = 0;
  if (remove === 'piston') {
    let s = 0;
    for (let k = 0; k < n; k++) if (mask === undefined || mask[k] === 1) s += e[k]!;
    piston = s / count;
  } else if (remove === 'tilt') {
    const fit = planeKernel(measured, e, mask);
    if (fit === null) {
      rangeError(fn, 'options.mask', mask ?? 'every sample', "at least three valid samples not on one line (needed for remove: 'tilt')");
    }
    piston = fit.c;
    a = fit.a;
    b = fit.b;
    xc = fit.xc;
    yc = fit.yc;
  }

  const { width, height, dx, dy, x0, y0 } = measured;
  let ss = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = 0; j < height; j++) {
    const yr = y0 + j * dy - yc;
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      if (mask !== undefined && mask[k] !== 1) {
        e[k] = 0;
        continue;
      }
      const r = e[k]! - piston - a * (x0 + i * dx - xc) - b * yr;
      e[k] = r;
      ss += r * r;
      if (r < lo) lo = r;
      if (r > hi) hi = r;
    }
  }
  if (out !== undefined) out.set(e);
  return {
    rms: Math.sqrt(ss / count),
    peak: Math.max(Math.abs(lo), Math.abs(hi)),
    peakToValley: hi - lo,
    count,
    piston,
    tiltX: a,
    tiltY: b,
    residual: out,
  };
}

/** Options of {@link slopeError}. */
export interface SlopeErrorOptions {
  /** Which samples count (`1` = valid). @defaultValue every sample */
  mask?: Mask;
  /**
   * Remove the mean slope error (a tilt of the whole surface) before scoring.
   * @defaultValue false
   */
  removeMean?: boolean;
}

/** The result of {@link slopeError}. */
export interface SlopeErrorResult {
  /** RMS of the slope-error vector, `√(mean(Δp² + Δq²))`, unitless. */
  readonly rms: number;
  /** RMS of the x-slope error Δp alone, unitless. */
  readonly rmsP: number;
  /** RMS of the y-slope error Δq alone, unitless. */
  readonly rmsQ: number;
  /** Largest length of the slope-error vector `√(Δp² + Δq²)`, unitless. */
  readonly peak: number;
  /** Mean of Δp over the valid samples (removed when `removeMean`), unitless. */
  readonly meanP: number;
  /** Mean of Δq over the valid samples (removed when `removeMean`), unitless. */
  readonly meanQ: number;
  /** Number of valid samples used. */
  readonly count: number;
}

/**
 * Slope error of a measured slope field `(p, q) = (∂h/∂x, ∂h/∂y)` against the truth,
 * over a mask: the RMS of the error vector and of each component, and its peak.
 *
 * @param p - Measured x-slopes.
 * @param q - Measured y-slopes (same grid as `p`).
 * @param trueP - True x-slopes (same grid).
 * @param trueQ - True y-slopes (same grid).
 * @param options - Mask, mean removal.
 * @returns The scores.
 * @throws {@link core!MeniscusTypeError} for malformed or mismatched grids or a mask of the wrong length.
 * @throws {@link core!MeniscusRangeError} for a non-finite valid sample or an empty mask.
 * @see Common practice: root-mean-square error of the gradient field, as used to score
 *   slope sensors (e.g. Southwell 1980, JOSA 70(8), 998).
 * @example
 * ```ts
 * const s = slopeError(p, q, trueP, trueQ, { mask });
 * console.log(s.rms);
 * ```
 */
export function slopeError(p: Grid, q: Grid, trueP: Grid, trueQ: Grid, options?: SlopeErrorOptions): SlopeErrorResult {
  const fn = 'slopeError';
  const o = checkOptions(fn, options);
  const mask = o.mask;
  checkGrid(fn, 'p', p, true);
  checkGrid(fn, 'q', q, true);
  checkGrid(fn, 'trueP', trueP, true);
  checkGrid(fn, 'trueQ', trueQ, true);
  checkSameShape(fn, 'q', q, p);
  checkSameShape(fn, 'trueP', trueP, p);
  checkSameShape(fn, 'trueQ', trueQ, p);
  if (mask !== undefined) checkMask(fn, 'options.mask', mask, p.width, p.height);
  if (o.removeMean !== undefined && typeof o.removeMean !== 'boolean') {
    typeError(fn, 'options.removeMean', o.removeMean, 'true or false');
  }
  const removeMean = o.removeMean === true;
  checkValidFinite(fn, 'p', p.data, mask);
  checkValidFinite(fn, 'q', q.data, mask);
  checkValidFinite(fn, 'trueP', trueP.data, mask);
  checkValidFinite(fn, 'trueQ', trueQ.data, mask);
  const n = p.width * p.height;
  const pd = p.data;
  const qd = q.data;
  const tp = trueP.data;
  const tq = trueQ.data;
  let count = 0;
  let sp = 0;
  let sq = 0;
  for (let k = 0; k < n; k++) {
    if (mask !== undefined && mask[k] !== 1) continue;
    sp += pd[k]! - tp[k]!;
    sq += qd[k]! - tq[k]!;
    count++;
  }
  if (count === 0) rangeError(fn, 'options.mask', mask, 'a mask with at least one valid sample');
  const meanP = sp / count;
  const meanQ = sq / count;
  const mp = removeMean ? meanP : 0;
  const mq = removeMean ? meanQ : 0;
  let ssp = 0;
  let ssq = 0;
  let peak2 = 0;
  for (let k = 0; k < n; k++) {
    if (mask !== undefined && mask[k] !== 1) continue;
    const ep = pd[k]! - tp[k]! - mp;
    const eq = qd[k]! - tq[k]! - mq;
    ssp += ep * ep;
    ssq += eq * eq;
    const e2 = ep * ep + eq * eq;
    if (e2 > peak2) peak2 = e2;
  }
  return {
    rms: Math.sqrt((ssp + ssq) / count),
    rmsP: Math.sqrt(ssp / count),
    rmsQ: Math.sqrt(ssq / count),
    peak: Math.sqrt(peak2),
    meanP,
    meanQ,
    count,
  };
}

/** Refuse a non-finite sample where the mask says valid (or anywhere without a mask). */
function checkValidFinite(fn: string, parameter: string, d: Float64Array, mask: Mask | undefined): void {
  for (let k = 0; k < d.length; k++) {
    if ((mask === undefined || mask[k] === 1) && !Number.isFinite(d[k]!)) {
      rangeError(fn, `${parameter}.data[${k}]`, d[k], 'a finite number where the mask is valid');
    }
  }
}

/** Least-squares plane of `values` on `grid`'s geometry; `null` when it is not unique. */
function planeKernel(grid: Grid, values: Float64Array, mask: Mask | undefined): PlaneFit | null {
  const { width, height, dx, dy, x0, y0 } = grid;
  let count = 0;
  let sx = 0;
  let sy = 0;
  let sz = 0;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      if (mask !== undefined && mask[k] !== 1) continue;
      sx += x0 + i * dx;
      sy += y0 + j * dy;
      sz += values[k]!;
      count++;
    }
  }
  if (count < 3) return null;
  const xc = sx / count;
  const yc = sy / count;
  const c = sz / count;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  let sxz = 0;
  let syz = 0;
  for (let j = 0; j < height; j++) {
    const yr = y0 + j * dy - yc;
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      if (mask !== undefined && mask[k] !== 1) continue;
      const xr = x0 + i * dx - xc;
      const z = values[k]! - c;
      sxx += xr * xr;
      sxy += xr * yr;
      syy += yr * yr;
      sxz += xr * z;
      syz += yr * z;
    }
  }
  const det = sxx * syy - sxy * sxy;
  // Collinear samples: the determinant vanishes relative to the spread of the points.
  if (!(det > 1e-12 * (sxx + syy) * (sxx + syy))) return null;
  const a = (sxz * syy - syz * sxy) / det;
  const b = (syz * sxx - sxz * sxy) / det;
  return { c, a, b, xc, yc, count };
}
