/**
 * A height field sampled on a `Grid`, interpolated bilinearly, by bicubic cubic
 * convolution (Keys 1981, a = −1/2: C¹, third-order accurate) or by the natural cubic
 * spline (C², fourth-order accurate), with the analytic gradient of the interpolant.
 *
 * @module
 */
import { checkGrid, checkOneOf, checkOptions, rangeError } from '../core/index.js';
import type { Grid } from '../core/index.js';
import type { Surface, SurfaceBounds } from './types.js';
import { checkMany } from './types.js';

/** How a grid surface is interpolated between samples. */
export type GridInterpolation = 'bicubic' | 'bilinear' | 'bspline';

/** Options of {@link createGridSurface}. */
export interface GridSurfaceOptions {
  /**
   * `'bicubic'`: Keys cubic convolution with a = −1/2 (continuous height and slopes).
   * `'bspline'`: the natural interpolating cubic spline in tensor-product B-spline form
   * (continuous height, slopes and curvatures; fourth-order accurate inside, zero second
   * derivative across the edges). Its normals bend smoothly from cell to cell, so a map
   * traced through it (the imaging area's correction) is smooth as well.
   * `'bilinear'`: continuous height, slopes constant along one axis within a cell and
   * discontinuous across cells.
   * @defaultValue 'bicubic'
   */
  interpolation?: GridInterpolation;
}

// Keys kernel weights for the samples at offsets −1, 0, 1, 2 and fractional position t.
function keysSums(t: number): { w: number; b: number } {
  const t2 = t * t;
  const t3 = t2 * t;
  const w = [(-t3 + 2 * t2 - t) / 2, (3 * t3 - 5 * t2 + 2) / 2, (-3 * t3 + 4 * t2 + t) / 2, (t3 - t2) / 2];
  const d = [(-3 * t2 + 4 * t - 1) / 2, (9 * t2 - 10 * t) / 2, (-9 * t2 + 8 * t + 1) / 2, (3 * t2 - 2 * t) / 2];
  // f' = Σ d_m f_m = Σ_k β_k (f_{k+1} − f_k), β_k = −Σ_{m≤k} d_m.
  const b0 = -d[0]!;
  const b1 = b0 - d[1]!;
  const b2 = b1 - d[2]!;
  return { w: Math.abs(w[0]!) + Math.abs(w[1]!) + Math.abs(w[2]!) + Math.abs(w[3]!), b: Math.abs(b0) + Math.abs(b1) + Math.abs(b2) };
}

// Largest Σ|w| (weight sum, ≈ 1.25 at t = 1/2) and largest Σ|β| (≈ 1.5 at t = 1/2)
// over t ∈ [0, 1], found on a fine sampling of these low-degree polynomials and padded
// by a margin far above the sampling error, so the bounds they give are guaranteed.
const KEYS_BOUNDS = (() => {
  let w = 0;
  let b = 0;
  for (let k = 0; k <= 4096; k++) {
    const s = keysSums(k / 4096);
    if (s.w > w) w = s.w;
    if (s.b > b) b = s.b;
  }
  return { w: w * 1.001, b: b * 1.001 };
})();

/**
 * A surface interpolating a height grid. Sample `(i, j)` of `grid` sits at
 * `x = x0 + i·dx`, `y = y0 + j·dy`; the domain is the rectangle of the samples,
 * `[x0, x0 + (width − 1)·dx] × [y0, y0 + (height − 1)·dy]`.
 *
 * Bicubic interpolation uses the Keys cubic-convolution kernel with a = −1/2 (the
 * uniform Catmull–Rom spline): the height and both slopes are continuous; the slopes
 * returned are the exact derivatives of the interpolant. At the grid's edges the missing
 * neighbours are extrapolated by Keys' boundary rule `f₋₁ = 3f₀ − 3f₁ + f₂`, which keeps
 * third-order accuracy (a 2-sample side uses linear extrapolation).
 *
 * The `'bspline'` interpolation solves the natural cubic spline's interpolation
 * conditions for tensor-product B-spline coefficients (a tridiagonal system along every
 * row, then every column, O(samples)) and evaluates `Σ cᵢⱼ β³(u − i) β³(v − j)`. It
 * passes through every sample, reproduces planes exactly, and has continuous second
 * derivatives; its bounds are the coefficients' range (the B-spline weights are
 * non-negative and sum to one) and their largest difference over the spacing.
 *
 * A cubic surface of up to 65 536 cells keeps each cell's interpolant as 16 power-basis
 * coefficients (at most 8 MiB), which halves the work of an evaluation; larger grids are
 * evaluated from the samples' weights, with the same values to rounding.
 *
 * **Outside the domain** the coordinates are clamped to it: height and slopes are those
 * at the nearest point of the domain (so a point a rounding error outside an edge gets
 * the edge's values). The intersector never asks outside the domain.
 *
 * **Bounds**: `zMin`/`zMax` and `maxSlope` are guaranteed (not tightest) bounds of the
 * interpolant, from the sample range and the largest sample difference along each axis.
 *
 * The grid's samples are copied: later changes to `grid.data` do not affect the surface.
 *
 * @param grid - Heights, m, on a grid of at least 2 × 2 finite samples.
 * @param options - Interpolation.
 * @returns The surface.
 * @throws {@link core!MeniscusTypeError} when `grid` is not a grid.
 * @throws {@link core!MeniscusRangeError} for non-finite samples, a grid narrower than 2
 *   samples in either direction, or an unknown interpolation.
 * @see Keys, R. G. (1981), "Cubic convolution interpolation for digital image
 *   processing", IEEE Transactions on Acoustics, Speech, and Signal Processing 29(6),
 *   1153–1160, eqs. (15) (kernel with a = −1/2) and (25) (boundary condition).
 * @see Unser, M. (1999), "Splines: a perfect fit for signal and image processing", IEEE
 *   Signal Processing Magazine 16(6), 22–38 (B-spline interpolation: coefficients from
 *   the samples, then the B-spline sum); de Boor, C. (1978), "A Practical Guide to
 *   Splines", Springer, ch. IV (the natural end condition).
 * @example
 * ```ts
 * const g = gridFromFunction({ width: 64, height: 64, dx: 0.01 }, (x, y) => 0.002 * Math.sin(10 * x));
 * const s = createGridSurface(g);
 * const slope = new Float64Array(2);
 * s.heightGradient(0.3, 0.3, slope); // ≈ 0.002 sin 3, slope ≈ [0.02 cos 3, 0]
 * ```
 */
export function createGridSurface(grid: Grid, options?: GridSurfaceOptions): Surface {
  const fn = 'createGridSurface';
  const g = checkGrid(fn, 'grid', grid);
  const o = checkOptions(fn, options);
  const interpolation = o.interpolation === undefined ? 'bicubic' : checkOneOf(fn, 'options.interpolation', o.interpolation, ['bicubic', 'bilinear', 'bspline'] as const);
  if (g.width < 2) rangeError(fn, 'grid.width', g.width, 'at least 2 samples');
  if (g.height < 2) rangeError(fn, 'grid.height', g.height, 'at least 2 samples');
  if (interpolation === 'bilinear') return bilinearSurface(g);
  return interpolation === 'bspline' ? cubicSurface(g, splinePadded(g), true) : cubicSurface(g, keysPadded(g), false);
}

/**
 * The range of a row-major w × h array and its largest step between neighbours along each
 * axis (the bounds and slope bounds of the interpolants below).
 */
function valueSpread(a: Float64Array, w: number, h: number): { lo: number; hi: number; ddx: number; ddy: number } {
  let lo = Infinity;
  let hi = -Infinity;
  let ddx = 0;
  let ddy = 0;
  for (let j = 0; j < h; j++) {
    for (let i = 0; i < w; i++) {
      const v = a[j * w + i]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      if (i + 1 < w) ddx = Math.max(ddx, Math.abs(a[j * w + i + 1]! - v));
      if (j + 1 < h) ddy = Math.max(ddy, Math.abs(a[(j + 1) * w + i]! - v));
    }
  }
  return { lo, hi, ddx, ddy };
}

/** `heightGradientMany` of a surface whose kernel is the one-point form. */
function manyByPoint(f: (x: number, y: number, out: Float64Array) => number, xy: Float64Array, n: number, out: Float64Array, scratch: Float64Array): void {
  for (let k = 0; k < n; k++) {
    out[3 * k] = f(xy[2 * k]!, xy[2 * k + 1]!, scratch);
    out[3 * k + 1] = scratch[0]!;
    out[3 * k + 2] = scratch[1]!;
  }
}

function domainOf(g: Grid): { xMin: number; xMax: number; yMin: number; yMax: number } {
  return { xMin: g.x0, xMax: g.x0 + (g.width - 1) * g.dx, yMin: g.y0, yMax: g.y0 + (g.height - 1) * g.dy };
}

function bilinearSurface(g: Grid): Surface {
  const { width: W, height: H, dx, dy, x0, y0 } = g;
  const f = g.data.slice();
  const { lo, hi, ddx, ddy } = valueSpread(f, W, H);
  const idx = 1 / dx;
  const idy = 1 / dy;
  const uMax = W - 1;
  const vMax = H - 1;
  const heightGradient = (x: number, y: number, out: Float64Array | number[]): number => {
    let u = (x - x0) * idx;
    let v = (y - y0) * idy;
    if (u < 0) u = 0;
    else if (u > uMax) u = uMax;
    if (v < 0) v = 0;
    else if (v > vMax) v = vMax;
    let i = Math.floor(u);
    let j = Math.floor(v);
    if (i > W - 2) i = W - 2;
    if (j > H - 2) j = H - 2;
    const tu = u - i;
    const tv = v - j;
    const k = j * W + i;
    const f00 = f[k]!;
    const f10 = f[k + 1]!;
    const f01 = f[k + W]!;
    const f11 = f[k + W + 1]!;
    const a = f00 + (f10 - f00) * tu;
    const b = f01 + (f11 - f01) * tu;
    out[0] = ((f10 - f00) * (1 - tv) + (f11 - f01) * tv) * idx;
    out[1] = (b - a) * idy;
    return a + (b - a) * tv;
  };
  const tmp = new Float64Array(2);
  const bounds: SurfaceBounds = { ...domainOf(g), zMin: lo, zMax: hi };
  return {
    bounds,
    maxSlope: Math.hypot(ddx * idx, ddy * idy) * (1 + 1e-12),
    lengthScale: Math.min(dx, dy),
    height: (x, y) => heightGradient(x, y, tmp),
    gradient(x, y, out) {
      heightGradient(x, y, out);
    },
    heightGradient,
    heightGradientMany(xy, n, out) {
      checkMany('Surface.heightGradientMany', xy, n, out);
      manyByPoint(heightGradient, xy, n, out, tmp);
    },
  };
}

/** Padded copy of the samples, one ghost sample around, ghosts by Keys' boundary rule. */
function keysPadded(g: Grid): Float64Array {
  const { width: W, height: H, data } = g;
  const PW = W + 2;
  const P = new Float64Array(PW * (H + 2));
  for (let j = 0; j < H; j++) {
    const r = (j + 1) * PW;
    for (let i = 0; i < W; i++) P[r + i + 1] = data[j * W + i]!;
    // Ghost columns by Keys' boundary rule (linear for a 2-sample row).
    if (W >= 3) {
      P[r] = 3 * P[r + 1]! - 3 * P[r + 2]! + P[r + 3]!;
      P[r + W + 1] = 3 * P[r + W]! - 3 * P[r + W - 1]! + P[r + W - 2]!;
    } else {
      P[r] = 2 * P[r + 1]! - P[r + 2]!;
      P[r + W + 1] = 2 * P[r + W]! - P[r + W - 1]!;
    }
  }
  for (let i = 0; i < PW; i++) {
    const c = (r: number): number => r * PW + i;
    if (H >= 3) {
      P[c(0)] = 3 * P[c(1)]! - 3 * P[c(2)]! + P[c(3)]!;
      P[c(H + 1)] = 3 * P[c(H)]! - 3 * P[c(H - 1)]! + P[c(H - 2)]!;
    } else {
      P[c(0)] = 2 * P[c(1)]! - P[c(2)]!;
      P[c(H + 1)] = 2 * P[c(H)]! - P[c(H - 1)]!;
    }
  }
  return P;
}

/**
 * Solve the natural cubic spline's interpolation conditions for B-spline coefficients,
 * in place along `n` values `a[o], a[o + s], …`: `(c[k−1] + 4 c[k] + c[k+1]) / 6 = f[k]`
 * with `c[0] = f[0]`, `c[n−1] = f[n−1]` (zero second derivative at the ends). Thomas
 * algorithm with the factors `m` precomputed by {@link splineFactors}.
 */
function splineSolve(a: Float64Array, o: number, s: number, n: number, m: Float64Array): void {
  if (n < 3) return;
  // Interior unknowns c1 … c(n−2): (c[k−1] + 4c[k] + c[k+1]) = 6 f[k].
  let prev = a[o]!; // c0 = f0, known
  const last = a[o + (n - 1) * s]!; // c(n−1) = f(n−1), known
  // Forward sweep: d_k = (6 f_k − d_{k−1}) · m_k with the known ends folded in.
  for (let k = 1; k <= n - 2; k++) {
    let r = 6 * a[o + k * s]! - prev;
    if (k === n - 2) r -= last;
    prev = r * m[k]!;
    a[o + k * s] = prev;
  }
  // Back substitution: c_k = d_k − m_k c_{k+1}.
  let next = 0;
  for (let k = n - 2; k >= 1; k--) {
    const c = a[o + k * s]! - m[k]! * next;
    a[o + k * s] = c;
    next = c;
  }
}

/** Thomas factors of the (1, 4, 1) system of `n − 2` interior unknowns: m_k = 1/(4 − m_{k−1}). */
function splineFactors(n: number): Float64Array {
  const m = new Float64Array(Math.max(n, 1));
  let p = 0;
  for (let k = 1; k <= n - 2; k++) {
    p = 1 / (4 - p);
    m[k] = p;
  }
  return m;
}

/** Padded cubic B-spline coefficients of the natural interpolating spline, ghosts `c₋₁ = 2c₀ − c₁`. */
function splinePadded(g: Grid): Float64Array {
  const { width: W, height: H, data } = g;
  const PW = W + 2;
  const P = new Float64Array(PW * (H + 2));
  for (let j = 0; j < H; j++) for (let i = 0; i < W; i++) P[(j + 1) * PW + i + 1] = data[j * W + i]!;
  const mx = splineFactors(W), my = splineFactors(H);
  for (let j = 1; j <= H; j++) splineSolve(P, j * PW + 1, 1, W, mx);
  for (let i = 1; i <= W; i++) splineSolve(P, PW + i, PW, H, my);
  for (let j = 1; j <= H; j++) {
    const r = j * PW;
    P[r] = 2 * P[r + 1]! - P[r + 2]!;
    P[r + W + 1] = 2 * P[r + W]! - P[r + W - 1]!;
  }
  for (let i = 0; i < PW; i++) {
    P[i] = 2 * P[PW + i]! - P[2 * PW + i]!;
    P[(H + 1) * PW + i] = 2 * P[H * PW + i]! - P[(H - 1) * PW + i]!;
  }
  return P;
}

/** Cells up to which a cubic surface keeps power-basis coefficients (16 numbers a cell, 8 MiB at most). */
const POLY_CELLS = 65536;

// The 1-D weights of the samples at offsets −1, 0, 1, 2 as cubics in t: row k holds the
// coefficients of 1, t, t², t³ of weight k.
const KEYS_BASIS: readonly (readonly number[])[] = [
  [0, -0.5, 1, -0.5],
  [1, 0, -2.5, 1.5],
  [0, 0.5, 2, -1.5],
  [0, 0, -0.5, 0.5],
];
const BSPLINE_BASIS: readonly (readonly number[])[] = [
  [1 / 6, -0.5, 0.5, -1 / 6],
  [4 / 6, 0, -1, 0.5],
  [1 / 6, 0.5, 0.5, -0.5],
  [0, 0, 0, 1 / 6],
];

/**
 * Each cell's interpolant in the power basis: `h(t, s) = Σ c[16·cell + 4m + n] tᵐ sⁿ`
 * with `c[m][n] = Σₖ Σₗ M[k][m] M[l][n] P[j + l][i + k]` over the cell's 4 × 4 padded
 * values.
 */
function powerCoefficients(P: Float64Array, W: number, H: number, M: readonly (readonly number[])[]): Float64Array {
  const PW = W + 2;
  const NC = W - 1;
  const C = new Float64Array(16 * NC * (H - 1));
  // the basis in locals: mKM = M[k][m]
  const m00 = M[0]![0]!, m01 = M[0]![1]!, m02 = M[0]![2]!, m03 = M[0]![3]!;
  const m10 = M[1]![0]!, m11 = M[1]![1]!, m12 = M[1]![2]!, m13 = M[1]![3]!;
  const m20 = M[2]![0]!, m21 = M[2]![1]!, m22 = M[2]![2]!, m23 = M[2]![3]!;
  const m30 = M[3]![0]!, m31 = M[3]![1]!, m32 = M[3]![2]!, m33 = M[3]![3]!;
  // Separably: first along x for every padded row, R[r][i][m] = Σ_k M[k][m] P[r][i + k]
  // (shared by the four cell rows that use padded row r), then along y,
  // c[m][n] = Σ_l M[l][n] R[j + l][i][m]; the sums in the order of the formula above.
  const R = new Float64Array(4 * NC * (H + 2));
  for (let r = 0; r < H + 2; r++) {
    for (let i = 0, a = r * PW, o = 4 * NC * r; i < NC; i++, a++, o += 4) {
      const p0 = P[a]!, p1 = P[a + 1]!, p2 = P[a + 2]!, p3 = P[a + 3]!;
      R[o] = m00 * p0 + m10 * p1 + m20 * p2 + m30 * p3;
      R[o + 1] = m01 * p0 + m11 * p1 + m21 * p2 + m31 * p3;
      R[o + 2] = m02 * p0 + m12 * p1 + m22 * p2 + m32 * p3;
      R[o + 3] = m03 * p0 + m13 * p1 + m23 * p2 + m33 * p3;
    }
  }
  const rs = 4 * NC;
  for (let j = 0; j < H - 1; j++) {
    for (let i = 0; i < NC; i++) {
      const o = 16 * (j * NC + i);
      const r0 = rs * j + 4 * i, r1 = r0 + rs, r2 = r1 + rs, r3 = r2 + rs;
      for (let m = 0; m < 4; m++) {
        const t0 = R[r0 + m]!, t1 = R[r1 + m]!, t2 = R[r2 + m]!, t3 = R[r3 + m]!;
        const q = o + 4 * m;
        C[q] = m00 * t0 + m10 * t1 + m20 * t2 + m30 * t3;
        C[q + 1] = m01 * t0 + m11 * t1 + m21 * t2 + m31 * t3;
        C[q + 2] = m02 * t0 + m12 * t1 + m22 * t2 + m32 * t3;
        C[q + 3] = m03 * t0 + m13 * t1 + m23 * t2 + m33 * t3;
      }
    }
  }
  return C;
}

/**
 * The tensor-product cubic surface over padded values `P` (sample or coefficient
 * `(i − 1, j − 1)` at padded index `j·PW + i`): Keys weights on samples, or cubic
 * B-spline weights on spline coefficients.
 */
function cubicSurface(g: Grid, P: Float64Array, spline: boolean): Surface {
  const { width: W, height: H, dx, dy, x0, y0 } = g;
  const PW = W + 2;
  const PH = H + 2;
  const { lo, hi, ddx, ddy } = valueSpread(P, PW, PH);
  // Keys: h − c = Σ wᵢ wⱼ (f − c) with Σ w = 1 along each axis: |h − c| ≤ (Σ|w|)² (hi − lo)/2.
  // B-spline: weights ≥ 0 summing to 1, so h lies in the coefficients' range; its slope is
  // a quadratic B-spline of the coefficient differences, so |h_x| ≤ max |Δc| / dx.
  const mid = 0.5 * (lo + hi);
  const half = spline ? 0.5 * (hi - lo) : 0.5 * (hi - lo) * KEYS_BOUNDS.w * KEYS_BOUNDS.w;
  const idx = 1 / dx;
  const idy = 1 / dy;
  const slopeX = spline ? ddx * idx : KEYS_BOUNDS.b * KEYS_BOUNDS.w * ddx * idx;
  const slopeY = spline ? ddy * idy : KEYS_BOUNDS.b * KEYS_BOUNDS.w * ddy * idy;
  const uMax = W - 1;
  const vMax = H - 1;
  const S6 = 1 / 6;
  const coef = (W - 1) * (H - 1) <= POLY_CELLS ? powerCoefficients(P, W, H, spline ? BSPLINE_BASIS : KEYS_BASIS) : null;

  // The same interpolant from each cell's precomputed power-basis coefficients (about half
  // the arithmetic and one contiguous read); used when the table is small enough. The loop
  // over many points is the kernel; the one-point form goes through it.
  const manyPoly = (xy: Float64Array, n: number, out: Float64Array): void => {
    const c = coef!;
    for (let e = 0; e < n; e++) {
      let u = (xy[2 * e]! - x0) * idx;
      let v = (xy[2 * e + 1]! - y0) * idy;
      if (u < 0) u = 0;
      else if (u > uMax) u = uMax;
      if (v < 0) v = 0;
      else if (v > vMax) v = vMax;
      let i = Math.floor(u);
      let j = Math.floor(v);
      if (i > W - 2) i = W - 2;
      if (j > H - 2) j = H - 2;
      const t = u - i;
      const s = v - j;
      const k = 16 * (j * (W - 1) + i);
      // h = Σ_m t^m q_m(s), q_m(s) = Σ_n c[k + 4m + n] s^n.
      const c00 = c[k]!, c01 = c[k + 1]!, c02 = c[k + 2]!, c03 = c[k + 3]!;
      const c10 = c[k + 4]!, c11 = c[k + 5]!, c12 = c[k + 6]!, c13 = c[k + 7]!;
      const c20 = c[k + 8]!, c21 = c[k + 9]!, c22 = c[k + 10]!, c23 = c[k + 11]!;
      const c30 = c[k + 12]!, c31 = c[k + 13]!, c32 = c[k + 14]!, c33 = c[k + 15]!;
      const q0 = c00 + s * (c01 + s * (c02 + s * c03));
      const q1 = c10 + s * (c11 + s * (c12 + s * c13));
      const q2 = c20 + s * (c21 + s * (c22 + s * c23));
      const q3 = c30 + s * (c31 + s * (c32 + s * c33));
      const r0 = c01 + s * (2 * c02 + 3 * s * c03);
      const r1 = c11 + s * (2 * c12 + 3 * s * c13);
      const r2 = c21 + s * (2 * c22 + 3 * s * c23);
      const r3 = c31 + s * (2 * c32 + 3 * s * c33);
      out[3 * e] = q0 + t * (q1 + t * (q2 + t * q3));
      out[3 * e + 1] = (q1 + t * (2 * q2 + 3 * t * q3)) * idx;
      out[3 * e + 2] = (r0 + t * (r1 + t * (r2 + t * r3))) * idy;
    }
  };
  const oneXY = new Float64Array(2);
  const oneOut = new Float64Array(3);
  const heightGradientPoly = (x: number, y: number, out: Float64Array | number[]): number => {
    oneXY[0] = x;
    oneXY[1] = y;
    manyPoly(oneXY, 1, oneOut);
    out[0] = oneOut[1]!;
    out[1] = oneOut[2]!;
    return oneOut[0]!;
  };

  const heightGradientWeights = (x: number, y: number, out: Float64Array | number[]): number => {
    let u = (x - x0) * idx;
    let v = (y - y0) * idy;
    if (u < 0) u = 0;
    else if (u > uMax) u = uMax;
    if (v < 0) v = 0;
    else if (v > vMax) v = vMax;
    let i = Math.floor(u);
    let j = Math.floor(v);
    if (i > W - 2) i = W - 2;
    if (j > H - 2) j = H - 2;
    const t = u - i;
    const s = v - j;
    const t2 = t * t;
    const t3 = t2 * t;
    const s2 = s * s;
    const s3 = s2 * s;
    let a0: number, a1: number, a2: number, a3: number, da0: number, da1: number, da2: number, da3: number;
    let b0: number, b1: number, b2: number, b3: number, db0: number, db1: number, db2: number, db3: number;
    if (spline) {
      // Cubic B-spline basis and its derivative, offsets −1, 0, 1, 2.
      const mt = 1 - t, ms = 1 - s;
      a0 = S6 * mt * mt * mt;
      a1 = S6 * (3 * t3 - 6 * t2 + 4);
      a2 = S6 * (-3 * t3 + 3 * t2 + 3 * t + 1);
      a3 = S6 * t3;
      da0 = -0.5 * mt * mt;
      da1 = 0.5 * (3 * t2 - 4 * t);
      da2 = 0.5 * (-3 * t2 + 2 * t + 1);
      da3 = 0.5 * t2;
      b0 = S6 * ms * ms * ms;
      b1 = S6 * (3 * s3 - 6 * s2 + 4);
      b2 = S6 * (-3 * s3 + 3 * s2 + 3 * s + 1);
      b3 = S6 * s3;
      db0 = -0.5 * ms * ms;
      db1 = 0.5 * (3 * s2 - 4 * s);
      db2 = 0.5 * (-3 * s2 + 2 * s + 1);
      db3 = 0.5 * s2;
    } else {
      // Keys (a = −1/2) weights and their derivatives, offsets −1, 0, 1, 2.
      a0 = 0.5 * (-t3 + 2 * t2 - t);
      a1 = 0.5 * (3 * t3 - 5 * t2 + 2);
      a2 = 0.5 * (-3 * t3 + 4 * t2 + t);
      a3 = 0.5 * (t3 - t2);
      da0 = 0.5 * (-3 * t2 + 4 * t - 1);
      da1 = 0.5 * (9 * t2 - 10 * t);
      da2 = 0.5 * (-9 * t2 + 8 * t + 1);
      da3 = 0.5 * (3 * t2 - 2 * t);
      b0 = 0.5 * (-s3 + 2 * s2 - s);
      b1 = 0.5 * (3 * s3 - 5 * s2 + 2);
      b2 = 0.5 * (-3 * s3 + 4 * s2 + s);
      b3 = 0.5 * (s3 - s2);
      db0 = 0.5 * (-3 * s2 + 4 * s - 1);
      db1 = 0.5 * (9 * s2 - 10 * s);
      db2 = 0.5 * (-9 * s2 + 8 * s + 1);
      db3 = 0.5 * (3 * s2 - 2 * s);
    }
    // Padded index of sample (i − 1, j − 1) is (j)·PW + i.
    let k = j * PW + i;
    let f0 = P[k]!;
    let f1 = P[k + 1]!;
    let f2 = P[k + 2]!;
    let f3 = P[k + 3]!;
    let r = a0 * f0 + a1 * f1 + a2 * f2 + a3 * f3;
    let dr = da0 * f0 + da1 * f1 + da2 * f2 + da3 * f3;
    let h = b0 * r;
    let hx = b0 * dr;
    let hy = db0 * r;
    k += PW;
    f0 = P[k]!;
    f1 = P[k + 1]!;
    f2 = P[k + 2]!;
    f3 = P[k + 3]!;
    r = a0 * f0 + a1 * f1 + a2 * f2 + a3 * f3;
    dr = da0 * f0 + da1 * f1 + da2 * f2 + da3 * f3;
    h += b1 * r;
    hx += b1 * dr;
    hy += db1 * r;
    k += PW;
    f0 = P[k]!;
    f1 = P[k + 1]!;
    f2 = P[k + 2]!;
    f3 = P[k + 3]!;
    r = a0 * f0 + a1 * f1 + a2 * f2 + a3 * f3;
    dr = da0 * f0 + da1 * f1 + da2 * f2 + da3 * f3;
    h += b2 * r;
    hx += b2 * dr;
    hy += db2 * r;
    k += PW;
    f0 = P[k]!;
    f1 = P[k + 1]!;
    f2 = P[k + 2]!;
    f3 = P[k + 3]!;
    r = a0 * f0 + a1 * f1 + a2 * f2 + a3 * f3;
    dr = da0 * f0 + da1 * f1 + da2 * f2 + da3 * f3;
    h += b3 * r;
    hx += b3 * dr;
    hy += db3 * r;
    out[0] = hx * idx;
    out[1] = hy * idy;
    return h;
  };
  const heightGradient = coef !== null ? heightGradientPoly : heightGradientWeights;
  const tmp = new Float64Array(2);
  const bounds: SurfaceBounds = { ...domainOf(g), zMin: mid - half, zMax: mid + half };
  return {
    bounds,
    maxSlope: Math.hypot(slopeX, slopeY),
    lengthScale: Math.min(dx, dy),
    height: (x, y) => heightGradient(x, y, tmp),
    gradient(x, y, out) {
      heightGradient(x, y, out);
    },
    heightGradient,
    heightGradientMany(xy, n, out) {
      checkMany('Surface.heightGradientMany', xy, n, out);
      if (coef !== null) manyPoly(xy, n, out);
      else manyByPoint(heightGradientWeights, xy, n, out, tmp);
    },
  };
}
