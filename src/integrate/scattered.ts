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
  /**
   * How the grid's heights give the slope at a sample. `'bilinear'`: the gradient of the
   * bilinear interpolant of the sample's cell (piecewise constant across cell edges, so a
   * sample that moves over an edge changes its equation abruptly). `'smooth'`: the
   * bilinear interpolation of the grid's edge differences, `p` from the x-differences at
   * the edge midpoints `x0 + (i + ½)dx`, `q` from the y-differences at `y0 + (j + ½)dy`;
   * it changes continuously with the sample's position, which an iteration that moves
   * the samples (refined crossing points) needs in order to settle. It needs a grid of at
   * least 3 × 3 nodes (smaller grids use `'bilinear'`); beyond the outermost midpoints the
   * nearest edge difference holds. @defaultValue 'bilinear'
   */
  model?: 'bilinear' | 'smooth';
  /**
   * Starting heights for the solver, one per grid node (for example the result of a
   * previous pass over nearby samples); the solution does not depend on it, only the
   * iterations do. @defaultValue all 0
   */
  initialGuess?: Float64Array;
}

/** What {@link integrateScattered} returns. */
export interface ScatteredResult extends IntegrationResult {
  /** Samples that lay on the grid and had a positive weight. */
  readonly samplesUsed: number;
  /** Samples outside the grid's extent, ignored. */
  readonly samplesOutside: number;
}

/**
 * Add the thin-plate penalty `ws · Σ [(dx·h_xx)² + 2(√(dx dy)·h_xy)² + (dy·h_yy)²]` (second
 * differences where they exist) of a `width × height` grid whose node `(i, j)` is row
 * `off0 + j·width + i` of a radius-2 stencil matrix: the same sums of `w c cᵀ` as one
 * equation a difference, written straight into the coefficients.
 */
function addThinPlate(coef: Float64Array, width: number, height: number, off0: number, ws: number, dx: number, dy: number): void {
  // Gathered a row at a time: row k takes w·c_k·c_m at offset m − k from every difference
  // that holds node k. Slot of offset (di, dj): 12 + 5·dj + di.
  const cxx = ws / (dx * dx), cyy = ws / (dy * dy), cxy = (2 * ws) / (dx * dy);
  // rows two or more nodes from every edge: all differences exist, the stencil is constant
  const d0 = 6 * cxx + 6 * cyy + 4 * cxy;
  const dx1 = -4 * cxx - 2 * cxy, dy1 = -4 * cyy - 2 * cxy;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const row = (off0 + j * width + i) * 25;
      if (i >= 2 && i <= width - 3 && j >= 2 && j <= height - 3) {
        coef[row + 12]! += d0;
        coef[row + 11]! += dx1;
        coef[row + 13]! += dx1;
        coef[row + 10]! += cxx;
        coef[row + 14]! += cxx;
        coef[row + 7]! += dy1;
        coef[row + 17]! += dy1;
        coef[row + 2]! += cyy;
        coef[row + 22]! += cyy;
        coef[row + 6]! += cxy;
        coef[row + 8]! += cxy;
        coef[row + 16]! += cxy;
        coef[row + 18]! += cxy;
        continue;
      }
      // (dx·h_xx)² along the row, (dy·h_yy)² down the column
      addAxisSecondDifferences(coef, row, i, width, 1, cxx);
      addAxisSecondDifferences(coef, row, j, height, 5, cyy);
      // 2(√(dx dy)·h_xy)²: the cells with corner k, nodes (ci + a, cj + b) with coefficients
      // +1 where a = b, −1 otherwise
      for (let cj = j - 1; cj <= j; cj++) {
        if (cj < 0 || cj > height - 2) continue;
        for (let ci = i - 1; ci <= i; ci++) {
          if (ci < 0 || ci > width - 2) continue;
          const ai = i - ci, aj = j - cj;
          const wk = ai === aj ? cxy : -cxy;
          for (let bj = 0; bj < 2; bj++) {
            for (let bi = 0; bi < 2; bi++) coef[row + 12 + 5 * (bj - aj) + bi - ai]! += bi === bj ? wk : -wk;
          }
        }
      }
    }
  }
}

/**
 * Row `row`'s share of the squared second differences along one axis, weight `cw`: the
 * differences centred at `c = i − 1, i, i + 1` (those inside `1 … n − 2`) over the nodes
 * `c − 1, c, c + 1` with coefficients `(1, −2, 1)`; `stride` is the slot step of one node
 * along the axis (1 along a row, 5 down a column).
 */
function addAxisSecondDifferences(coef: Float64Array, row: number, i: number, n: number, stride: number, cw: number): void {
  for (let c = i - 1; c <= i + 1; c++) {
    if (c < 1 || c > n - 2) continue;
    const wk = cw * (c === i ? -2 : 1);
    for (let m = c - 1; m <= c + 1; m++) coef[row + 12 + stride * (m - i)]! += wk * (m === c ? -2 : 1);
  }
}

/**
 * The two equations of one sample: nodes and coefficients of `p` and of `q` in terms of
 * the grid's heights, for either slope model (see {@link ScatteredOptions.model}).
 */
class SampleEquations {
  readonly np = new Int32Array(6);
  readonly nq = new Int32Array(6);
  readonly cp = new Float64Array(6);
  readonly cq = new Float64Array(6);
  count = 4;
  /**
   * Fill the equations of a sample at grid coordinates `(u, v)` (inside the grid);
   * returns the index of the top-left node of the sample's cell.
   */
  set(u: number, v: number, width: number, height: number, dx: number, dy: number, smooth: boolean): number {
    const ci = Math.min(Math.floor(u), width - 2);
    const cj = Math.min(Math.floor(v), height - 2);
    const fu = u - ci;
    const fv = v - cj;
    const c00 = cj * width + ci;
    const { np, nq, cp, cq } = this;
    if (!smooth) {
      this.count = 4;
      np[0] = nq[0] = c00;
      np[1] = nq[1] = c00 + 1;
      np[2] = nq[2] = c00 + width;
      np[3] = nq[3] = c00 + width + 1;
      cp[0] = -(1 - fv) / dx;
      cp[1] = (1 - fv) / dx;
      cp[2] = -fv / dx;
      cp[3] = fv / dx;
      cq[0] = -(1 - fu) / dy;
      cq[1] = -fu / dy;
      cq[2] = (1 - fu) / dy;
      cq[3] = fu / dy;
      return c00;
    }
    this.count = 6;
    // p: x-differences at the edge midpoints (i + ½, j), interpolated bilinearly.
    const a = u - 0.5;
    const ia = Math.min(Math.max(Math.floor(a), 0), width - 3);
    const fa = Math.min(Math.max(a - ia, 0), 1);
    const pa = cj * width + ia;
    const k0 = -(1 - fa) / dx, k1 = (1 - 2 * fa) / dx, k2 = fa / dx;
    np[0] = pa;
    np[1] = pa + 1;
    np[2] = pa + 2;
    np[3] = pa + width;
    np[4] = pa + width + 1;
    np[5] = pa + width + 2;
    cp[0] = (1 - fv) * k0;
    cp[1] = (1 - fv) * k1;
    cp[2] = (1 - fv) * k2;
    cp[3] = fv * k0;
    cp[4] = fv * k1;
    cp[5] = fv * k2;
    // q: y-differences at the edge midpoints (i, j + ½), interpolated bilinearly.
    const b = v - 0.5;
    const jb = Math.min(Math.max(Math.floor(b), 0), height - 3);
    const fb = Math.min(Math.max(b - jb, 0), 1);
    const qa = jb * width + ci;
    const l0 = -(1 - fb) / dy, l1 = (1 - 2 * fb) / dy, l2 = fb / dy;
    nq[0] = qa;
    nq[1] = qa + 1;
    nq[2] = qa + width;
    nq[3] = qa + width + 1;
    nq[4] = qa + 2 * width;
    nq[5] = qa + 2 * width + 1;
    cq[0] = (1 - fu) * l0;
    cq[1] = fu * l0;
    cq[2] = (1 - fu) * l1;
    cq[3] = fu * l1;
    cq[4] = (1 - fu) * l2;
    cq[5] = fu * l2;
    return c00;
  }
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
 * the size of data-free regions. A good {@link ScatteredOptions.initialGuess} saves a
 * few of them.
 *
 * With `model: 'smooth'` (see {@link ScatteredOptions.model}) each sample's slopes are
 * instead the bilinear interpolation of the grid's edge differences, whose equations
 * change continuously as a sample moves; the penalty and everything else are the same.
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
  if (grid === null || typeof grid !== 'object') typeError(fn, 'grid', grid, 'a grid spec { width, height, dx?, dy?, x0?, y0? }');
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
  const model = o.model === undefined ? 'bilinear' : checkOneOf(fn, 'options.model', o.model, ['bilinear', 'smooth'] as const);
  const smooth = model === 'smooth' && width >= 3 && height >= 3;
  const n = width * height;
  if (o.initialGuess !== undefined) {
    const g0 = o.initialGuess;
    if (!(g0 instanceof Float64Array) || g0.length !== n) typeError(fn, 'options.initialGuess', g0, `a Float64Array of ${n} heights (one per grid node)`);
    for (let k = 0; k < n; k++) if (!Number.isFinite(g0[k]!)) rangeError(fn, `options.initialGuess[${k}]`, g0[k], 'a finite height');
  }

  // The system lives on the grid padded with PAD empty rows above and below: those rows
  // have no equations (they drop out of the solve), and every row of the grid itself then
  // takes the solver's unrolled path, which needs 3 rows on either side.
  const pad = 3;
  const off0 = pad * width;
  const A = createStencilMatrix(width, height + 2 * pad, 2);
  const np = n + 2 * off0;
  const rhs = new Float64Array(np);
  const eq = new SampleEquations();
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
    const c00 = eq.set(u, v, width, height, dx, dy, smooth);
    for (let t = 0; t < eq.count; t++) {
      eq.np[t]! += off0;
      eq.nq[t]! += off0;
    }
    addEquation(A, rhs, eq.np, eq.cp, eq.count, w, ps);
    addEquation(A, rhs, eq.nq, eq.cq, eq.count, w, qs);
    cellOf[s] = c00;
    supported[c00] = supported[c00 + 1] = supported[c00 + width] = supported[c00 + width + 1] = 1;
    used++;
    totalWeight += w;
  }
  if (used === 0) {
    rangeError(fn, 'samples', `${m} samples, ${outside} outside the grid`, 'at least one sample with a weight > 0 on the grid');
  }
  // thin-plate penalty
  const ws = (smoothness * totalWeight) / ((width - 1) * (height - 1));
  addThinPlate(A.coef, width, height, off0, ws, dx, dy);
  const { labels, count } = stencilComponents(A);
  let start: Float64Array | undefined;
  if (o.initialGuess !== undefined) {
    start = new Float64Array(np);
    start.set(o.initialGuess, off0);
  }
  const { x: hp, result } = solveStencil(A, rhs, labels, count, { tolerance, maxIterations, onProgress: o.onProgress }, start);
  const h = hp.slice(off0, off0 + n);

  // residual at the samples
  let sum = 0;
  for (let s = 0; s < m; s++) {
    if (cellOf[s]! < 0) continue;
    eq.set((x[s]! - x0) / dx, (y[s]! - y0) / dy, width, height, dx, dy, smooth);
    let ep = -p[s]!;
    let eqq = -q[s]!;
    for (let t = 0; t < eq.count; t++) {
      ep += eq.cp[t]! * h[eq.np[t]!]!;
      eqq += eq.cq[t]! * h[eq.nq[t]!]!;
    }
    sum += ep * ep + eqq * eqq;
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
