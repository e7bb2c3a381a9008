/**
 * A height field sampled on a `Grid`, interpolated bilinearly or by bicubic cubic
 * convolution (Keys 1981, a = −1/2: C¹, third-order accurate), with the analytic
 * gradient of the interpolant.
 *
 * @module
 */
import { checkGrid, checkOneOf, checkOptions, rangeError } from '../core/index.js';
import type { Grid } from '../core/index.js';
import type { Surface, SurfaceBounds } from './types.js';

/** How a grid surface is interpolated between samples. */
export type GridInterpolation = 'bicubic' | 'bilinear';

/** Options of {@link createGridSurface}. */
export interface GridSurfaceOptions {
  /**
   * `'bicubic'`: Keys cubic convolution with a = −1/2 (continuous height and slopes).
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
  const interpolation = o.interpolation === undefined ? 'bicubic' : checkOneOf(fn, 'options.interpolation', o.interpolation, ['bicubic', 'bilinear'] as const);
  if (g.width < 2) rangeError(fn, 'grid.width', g.width, 'at least 2 samples');
  if (g.height < 2) rangeError(fn, 'grid.height', g.height, 'at least 2 samples');
  return interpolation === 'bicubic' ? bicubicSurface(g) : bilinearSurface(g);
}

function domainOf(g: Grid): { xMin: number; xMax: number; yMin: number; yMax: number } {
  return { xMin: g.x0, xMax: g.x0 + (g.width - 1) * g.dx, yMin: g.y0, yMax: g.y0 + (g.height - 1) * g.dy };
}

function bilinearSurface(g: Grid): Surface {
  const { width: W, height: H, dx, dy, x0, y0 } = g;
  const f = g.data.slice();
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < f.length; k++) {
    const v = f[k]!;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  let ddx = 0;
  let ddy = 0;
  for (let j = 0; j < H; j++) {
    for (let i = 0; i < W; i++) {
      const v = f[j * W + i]!;
      if (i + 1 < W) ddx = Math.max(ddx, Math.abs(f[j * W + i + 1]! - v));
      if (j + 1 < H) ddy = Math.max(ddy, Math.abs(f[(j + 1) * W + i]! - v));
    }
  }
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
  };
}

function bicubicSurface(g: Grid): Surface {
  const { width: W, height: H, dx, dy, x0, y0, data } = g;
  const PW = W + 2;
  const PH = H + 2;
  const P = new Float64Array(PW * PH);
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
  let lo = Infinity;
  let hi = -Infinity;
  let ddx = 0;
  let ddy = 0;
  for (let j = 0; j < PH; j++) {
    for (let i = 0; i < PW; i++) {
      const v = P[j * PW + i]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      if (i + 1 < PW) ddx = Math.max(ddx, Math.abs(P[j * PW + i + 1]! - v));
      if (j + 1 < PH) ddy = Math.max(ddy, Math.abs(P[(j + 1) * PW + i]! - v));
    }
  }
  // h − c = Σ wᵢ wⱼ (f − c) with Σ w = 1 along each axis: |h − c| ≤ (Σ|w|)² (hi − lo)/2.
  const mid = 0.5 * (lo + hi);
  const half = 0.5 * (hi - lo) * KEYS_BOUNDS.w * KEYS_BOUNDS.w;
  const idx = 1 / dx;
  const idy = 1 / dy;
  const slopeX = KEYS_BOUNDS.b * KEYS_BOUNDS.w * ddx * idx;
  const slopeY = KEYS_BOUNDS.b * KEYS_BOUNDS.w * ddy * idy;
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
    const t = u - i;
    const s = v - j;
    const t2 = t * t;
    const t3 = t2 * t;
    const s2 = s * s;
    const s3 = s2 * s;
    // Keys (a = −1/2) weights and their derivatives, offsets −1, 0, 1, 2.
    const a0 = 0.5 * (-t3 + 2 * t2 - t);
    const a1 = 0.5 * (3 * t3 - 5 * t2 + 2);
    const a2 = 0.5 * (-3 * t3 + 4 * t2 + t);
    const a3 = 0.5 * (t3 - t2);
    const da0 = 0.5 * (-3 * t2 + 4 * t - 1);
    const da1 = 0.5 * (9 * t2 - 10 * t);
    const da2 = 0.5 * (-9 * t2 + 8 * t + 1);
    const da3 = 0.5 * (3 * t2 - 2 * t);
    const b0 = 0.5 * (-s3 + 2 * s2 - s);
    const b1 = 0.5 * (3 * s3 - 5 * s2 + 2);
    const b2 = 0.5 * (-3 * s3 + 4 * s2 + s);
    const b3 = 0.5 * (s3 - s2);
    const db0 = 0.5 * (-3 * s2 + 4 * s - 1);
    const db1 = 0.5 * (9 * s2 - 10 * s);
    const db2 = 0.5 * (-9 * s2 + 8 * s + 1);
    const db3 = 0.5 * (3 * s2 - 2 * s);
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
  };
}
