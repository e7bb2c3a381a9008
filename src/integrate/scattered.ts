/**
 * Heights on a regular grid from slopes known at scattered points (where light rays
 * crossed the surface), by penalised least squares.
 *
 * @module
 */
import {
  checkInteger,
  checkOneOf,
  checkOptions,
  checkPositive,
  createGrid,
  LIMITS,
  rangeError,
  typeError,
  type GridSpec,
} from '../core/index.js';
import type { IntegrationResult, ProgressCallback } from './types.js';
import { addEquation, createStencilMatrix, removeLabelMeans, solveStencil, stencilComponents } from './zonal-sparse.js';

/** Slopes known at scattered points (world coordinates, metres). */
export interface ScatteredSlopes {
  /** x of each sample, metres. */
  readonly x: Float64Array;
  /** y of each sample, metres (same length as `x`). */
  readonly y: Float64Array;
  /** `∂h/∂x` at each sample (unitless). */
  readonly p: Float64Array;
  /** `∂h/∂y` at each sample (unitless). */
  readonly q: Float64Array;
  /** Optional weights ≥ 0 (for example inverse slope variances); 0 drops a sample. @defaultValue all 1 */
  readonly weights?: Float64Array;
}

/** Options of {@link integrateScattered}. */
export interface ScatteredOptions {
  /**
   * Weight of the thin-plate smoothness term relative to the data (> 0); see
   * {@link integrateScattered}. Larger values give smoother surfaces and a faster solve,
   * smaller values follow the data more closely. @defaultValue 0.01
   */
  smoothness?: number;
  /**
   * Which nodes the result reports: `'supported'` marks the corners of grid cells that
   * hold at least one used sample (other nodes are 0, mask 0); `'grid'` reports the
   * whole grid, the nodes without data held by the smoothness term. @defaultValue 'supported'
   */
  region?: 'supported' | 'grid';
  /** PCG stops when ‖r‖ ≤ tolerance · ‖b‖ on the normal equations. @defaultValue 1e-10 */
  tolerance?: number;
  /** PCG iteration cap. @defaultValue 5000 */
  maxIterations?: number;
  /** Called every PCG iteration with (iteration, relative residual); return `false` to stop. */
  onProgress?: ProgressCallback;
}

/** What {@link integrateScattered} returns. */
export interface ScatteredResult extends IntegrationResult {
  /** Samples that lay on the grid and had a positive weight. */
  readonly samplesUsed: number;
  /** Samples outside the grid's extent, ignored. */
  readonly samplesOutside: number;
}

/**
 * Fit heights on a regular grid to slopes known at scattered points. Inside each grid
 * cell the surface is the bilinear interpolant of its four corner heights, and each
 * sample asks that the interpolant's gradient at the sample equals its slopes:
 *
 * `[(1−v)(h10 − h00) + v(h11 − h01)] / dx = p`, `[(1−u)(h01 − h00) + u(h11 − h10)] / dy = q`,
 *
 * with `(u, v)` the sample's position within the cell. A thin-plate penalty on the
 * second differences holds the nodes that data do not reach and keeps the fit smooth:
 * `λ · w̄ · Σ [(dx·h_xx)² + 2(√(dx dy)·h_xy)² + (dy·h_yy)²]` over the nodes (second
 * differences where they exist), with `λ = smoothness` and `w̄` the total sample weight
 * per grid cell, so the balance does not depend on the sample density. The penalty is
 * zero for any plane, so a tilted plane is recovered exactly; elsewhere it biases the
 * result slightly towards lower curvature. Islands of data are tied together only
 * through the penalty (their relative height is an extrapolation).
 *
 * Samples outside the grid's extent `[x0, x0 + (width−1)dx] × [y0, y0 + (height−1)dy]`
 * are ignored and counted in `samplesOutside`. Heights have zero mean over the reported
 * region (see {@link ScatteredOptions.region}). `rmsResidual` is the RMS over the used
 * samples, both components, of (interpolant gradient − slope).
 *
 * Cost: assembly O(samples); each PCG iteration O(grid nodes) (25-point stencil with
 * an incomplete-Cholesky preconditioner); iterations grow with the grid's side and with
 * the size of data-free regions.
 *
 * @param samples - Positions, slopes and optional weights.
 * @param grid - The output grid: at least 2 × 2 nodes.
 * @param options - Smoothness, region and solver controls.
 * @returns Heights on the grid, with diagnostics.
 * @throws {@link core!MeniscusTypeError} for non-`Float64Array` fields or arrays of different lengths.
 * @throws {@link core!MeniscusRangeError} for non-finite positions or slopes, negative weights,
 *   a grid smaller than 2 × 2, a non-positive smoothness, or no usable sample on the grid.
 * @see Harker, M. & O'Leary, P. (2008), "Least squares surface reconstruction from
 *   measured gradient fields", CVPR 2008 (regularised least-squares integration).
 * @see Terzopoulos, D. (1988), "The computation of visible-surface representations",
 *   IEEE TPAMI 10(4), 417–438 (thin-plate smoothing of scattered data on a grid).
 * @example
 * ```ts
 * const x = new Float64Array([0.1, 0.5, 0.9]), y = new Float64Array([0.2, 0.6, 0.4]);
 * const p = new Float64Array(3).fill(0.01), q = new Float64Array(3);
 * const r = integrateScattered({ x, y, p, q }, { width: 11, height: 11, dx: 0.1 }, { region: 'grid' });
 * ```
 */
export function integrateScattered(samples: ScatteredSlopes, grid: GridSpec, options?: ScatteredOptions): ScatteredResult {
  const fn = 'integrateScattered';
  if (samples === null || typeof samples !== 'object') typeError(fn, 'samples', samples, 'a { x, y, p, q, weights? } object');
  const { x, y, p, q, weights } = samples;
  if (!(x instanceof Float64Array)) typeError(fn, 'samples.x', x, 'a Float64Array');
  const m = x.length;
  for (const [name, arr] of [
    ['samples.y', y],
    ['samples.p', p],
    ['samples.q', q],
  ] as const) {
    if (!(arr instanceof Float64Array) || arr.length !== m) typeError(fn, name, arr, `a Float64Array of length ${m} (as samples.x)`);
  }
  if (weights !== undefined && (!(weights instanceof Float64Array) || weights.length !== m)) {
    typeError(fn, 'samples.weights', weights, `a Float64Array of length ${m} or undefined`);
  }
  if (m > LIMITS.maxBatch) rangeError(fn, 'samples.x.length', m, `at most ${LIMITS.maxBatch} samples`);
  const o = checkOptions(fn, options);
  const g = createGrid(grid);
  const { width, height, dx, dy, x0, y0 } = g;
  if (width < 2) rangeError(fn, 'grid.width', width, 'at least 2 nodes');
  if (height < 2) rangeError(fn, 'grid.height', height, 'at least 2 nodes');
  const smoothness = o.smoothness === undefined ? 0.01 : checkPositive(fn, 'options.smoothness', o.smoothness);
  const region = o.region === undefined ? 'supported' : checkOneOf(fn, 'options.region', o.region, ['supported', 'grid'] as const);
  const tolerance = o.tolerance === undefined ? 1e-10 : checkPositive(fn, 'options.tolerance', o.tolerance);
  const maxIterations =
    o.maxIterations === undefined ? 5000 : checkInteger(fn, 'options.maxIterations', o.maxIterations, 1, LIMITS.maxIterations);
  if (o.onProgress !== undefined && typeof o.onProgress !== 'function') {
    typeError(fn, 'options.onProgress', o.onProgress, 'a function or undefined');
  }

  const n = width * height;
  const A = createStencilMatrix(width, height, 2);
  const rhs = new Float64Array(n);
  const nodes = new Int32Array(4);
  const cx = new Float64Array(4);
  const cy = new Float64Array(4);
  const cellOf = new Int32Array(m).fill(-1);
  const supported = new Uint8Array(n);
  let used = 0;
  let outside = 0;
  let totalWeight = 0;
  const umax = width - 1;
  const vmax = height - 1;
  for (let s = 0; s < m; s++) {
    const xs = x[s]!;
    const ys = y[s]!;
    const ps = p[s]!;
    const qs = q[s]!;
    if (!Number.isFinite(xs)) rangeError(fn, `samples.x[${s}]`, xs, 'a finite number');
    if (!Number.isFinite(ys)) rangeError(fn, `samples.y[${s}]`, ys, 'a finite number');
    if (!Number.isFinite(ps)) rangeError(fn, `samples.p[${s}]`, ps, 'a finite slope');
    if (!Number.isFinite(qs)) rangeError(fn, `samples.q[${s}]`, qs, 'a finite slope');
    const w = weights === undefined ? 1 : weights[s]!;
    if (!(w >= 0) || w === Infinity) rangeError(fn, `samples.weights[${s}]`, w, 'a finite weight >= 0');
    const u = (xs - x0) / dx;
    const v = (ys - y0) / dy;
    if (!(u >= 0 && u <= umax && v >= 0 && v <= vmax)) {
      outside++;
      continue;
    }
    if (w === 0) continue;
    const ci = Math.min(Math.floor(u), width - 2);
    const cj = Math.min(Math.floor(v), height - 2);
    const fu = u - ci;
    const fv = v - cj;
    const c00 = cj * width + ci;
    nodes[0] = c00;
    nodes[1] = c00 + 1;
    nodes[2] = c00 + width;
    nodes[3] = c00 + width + 1;
    cx[0] = -(1 - fv) / dx;
    cx[1] = (1 - fv) / dx;
    cx[2] = -fv / dx;
    cx[3] = fv / dx;
    cy[0] = -(1 - fu) / dy;
    cy[1] = -fu / dy;
    cy[2] = (1 - fu) / dy;
    cy[3] = fu / dy;
    addEquation(A, rhs, nodes, cx, 4, w, ps);
    addEquation(A, rhs, nodes, cy, 4, w, qs);
    cellOf[s] = c00;
    for (let t = 0; t < 4; t++) supported[nodes[t]!] = 1;
    used++;
    totalWeight += w;
  }
  if (used === 0) {
    rangeError(fn, 'samples', `${m} samples, ${outside} outside the grid`, 'at least one sample with a weight > 0 on the grid');
  }
  // thin-plate penalty
  const ws = (smoothness * totalWeight) / ((width - 1) * (height - 1));
  const sxx = new Float64Array([1 / dx, -2 / dx, 1 / dx]);
  const syy = new Float64Array([1 / dy, -2 / dy, 1 / dy]);
  const r = 1 / Math.sqrt(dx * dy);
  const sxy = new Float64Array([r, -r, -r, r]);
  const zero = new Float64Array(n);
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      if (i > 0 && i + 1 < width) {
        nodes[0] = k - 1;
        nodes[1] = k;
        nodes[2] = k + 1;
        addEquation(A, zero, nodes, sxx, 3, ws, 0);
      }
      if (j > 0 && j + 1 < height) {
        nodes[0] = k - width;
        nodes[1] = k;
        nodes[2] = k + width;
        addEquation(A, zero, nodes, syy, 3, ws, 0);
      }
      if (i + 1 < width && j + 1 < height) {
        nodes[0] = k;
        nodes[1] = k + 1;
        nodes[2] = k + width;
        nodes[3] = k + width + 1;
        addEquation(A, zero, nodes, sxy, 4, 2 * ws, 0);
      }
    }
  }
  const { labels, count } = stencilComponents(A);
  const { x: h, result } = solveStencil(A, rhs, labels, count, { tolerance, maxIterations, onProgress: o.onProgress });

  // residual at the samples
  let sum = 0;
  for (let s = 0; s < m; s++) {
    const c00 = cellOf[s]!;
    if (c00 < 0) continue;
    const u = (x[s]! - x0) / dx;
    const v = (y[s]! - y0) / dy;
    const ci = c00 % width;
    const cj = (c00 - ci) / width;
    const fu = u - ci;
    const fv = v - cj;
    const h00 = h[c00]!;
    const h10 = h[c00 + 1]!;
    const h01 = h[c00 + width]!;
    const h11 = h[c00 + width + 1]!;
    const ep = ((1 - fv) * (h10 - h00) + fv * (h11 - h01)) / dx - p[s]!;
    const eq = ((1 - fu) * (h01 - h00) + fu * (h11 - h10)) / dy - q[s]!;
    sum += ep * ep + eq * eq;
  }
  const mask = region === 'grid' ? new Uint8Array(n).fill(1) : supported;
  const regionLabels = new Int32Array(n);
  for (let k = 0; k < n; k++) regionLabels[k] = mask[k]! ? 1 : 0;
  removeLabelMeans(h, regionLabels, 1, new Float64Array(2), new Float64Array(2));
  return {
    height: createGrid(g, h),
    mask,
    rmsResidual: Math.sqrt(sum / (2 * used)),
    iterations: result.iterations,
    converged: result.converged,
    relativeResidual: result.relativeResidual,
    samplesUsed: used,
    samplesOutside: outside,
  };
}
