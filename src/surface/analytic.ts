/**
 * Analytic surfaces with exact heights and gradients: planes, sums of travelling
 * sinusoids and sums of Gaussian bumps. Each is defined on a finite horizontal domain;
 * outside it the formula is simply evaluated (there is no clamping for analytic
 * surfaces), but the intersector never asks there.
 *
 * @module
 */
import { checkFinite, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import { checkDomain } from './types.js';
import type { Surface, SurfaceBounds, SurfaceDomain } from './types.js';

/** Options of {@link createPlaneSurface}. */
export interface PlaneSurfaceOptions {
  /** Height at `x = y = 0`, m. @defaultValue 0 */
  height?: number;
  /** Slope along x, `∂h/∂x` (unitless). @defaultValue 0 */
  slopeX?: number;
  /** Slope along y, `∂h/∂y` (unitless). @defaultValue 0 */
  slopeY?: number;
  /** The horizontal domain, m (required). */
  domain: SurfaceDomain;
}

/**
 * A flat or tilted plane `h(x, y) = height + slopeX·x + slopeY·y`.
 *
 * @param options - Height, slopes and domain.
 * @returns The surface.
 * @throws {@link core!MeniscusRangeError} for non-finite values or an empty domain.
 * @example
 * ```ts
 * const flat = createPlaneSurface({ domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } });
 * flat.height(0.3, 0.2); // 0
 * ```
 */
export function createPlaneSurface(options: PlaneSurfaceOptions): Surface {
  const fn = 'createPlaneSurface';
  const o = checkOptions(fn, options);
  const h0 = o.height === undefined ? 0 : checkFinite(fn, 'options.height', o.height);
  const p = o.slopeX === undefined ? 0 : checkFinite(fn, 'options.slopeX', o.slopeX);
  const q = o.slopeY === undefined ? 0 : checkFinite(fn, 'options.slopeY', o.slopeY);
  const d = checkDomain(fn, 'options.domain', o.domain);
  const corners = [
    h0 + p * d.xMin + q * d.yMin,
    h0 + p * d.xMax + q * d.yMin,
    h0 + p * d.xMin + q * d.yMax,
    h0 + p * d.xMax + q * d.yMax,
  ];
  const bounds: SurfaceBounds = { ...d, zMin: Math.min(...corners), zMax: Math.max(...corners) };
  return {
    bounds,
    maxSlope: Math.hypot(p, q),
    lengthScale: Infinity,
    height: (x, y) => h0 + p * x + q * y,
    gradient(_x, _y, out) {
      out[0] = p;
      out[1] = q;
    },
    heightGradient(x, y, out) {
      out[0] = p;
      out[1] = q;
      return h0 + p * x + q * y;
    },
  };
}

/** One travelling sinusoid `a·cos(kx·x + ky·y − ω·t + φ)`. */
export interface SinusoidComponent {
  /** Amplitude `a`, m (may be negative). */
  amplitude: number;
  /** Wavenumber along x, rad/m. */
  kx: number;
  /** Wavenumber along y, rad/m. @defaultValue 0 */
  ky?: number;
  /** Phase `φ`, rad. @defaultValue 0 */
  phase?: number;
  /** Angular frequency `ω`, rad/s (a standing pattern when 0). @defaultValue 0 */
  omega?: number;
}

/** Options of {@link createSinusoidSurface}. */
export interface SinusoidSurfaceOptions {
  /** The components (at least one). */
  components: readonly SinusoidComponent[];
  /** Mean height, m. @defaultValue 0 */
  height?: number;
  /** Time `t` at which the surface is frozen, s. @defaultValue 0 */
  time?: number;
  /** The horizontal domain, m (required). */
  domain: SurfaceDomain;
}

/**
 * A sum of travelling sinusoids frozen at time `t`:
 * `h(x, y) = height + Σ aᵢ cos(kxᵢ x + kyᵢ y − ωᵢ t + φᵢ)`, with the exact gradient
 * `p = −Σ aᵢ kxᵢ sin(…)`, `q = −Σ aᵢ kyᵢ sin(…)`.
 *
 * Bounds: `|h − height| ≤ Σ|aᵢ|`, `|∇h| ≤ Σ|aᵢ|·|kᵢ|`; length scale `1/max|kᵢ|`.
 *
 * @param options - Components, mean height, time and domain.
 * @returns The surface.
 * @throws {@link core!MeniscusTypeError} when `components` is not a non-empty array.
 * @throws {@link core!MeniscusRangeError} for non-finite values or an empty domain.
 * @see Airy, G. B. (1845), "Tides and waves", Encyclopaedia Metropolitana: the linear
 *   progressive wave `a cos(k·x − ωt)` of which this surface is a superposition.
 * @example
 * ```ts
 * const s = createSinusoidSurface({
 *   components: [{ amplitude: 0.002, kx: 2 * Math.PI / 0.05, omega: 35 }],
 *   time: 0.1,
 *   domain: { xMin: 0, xMax: 0.5, yMin: 0, yMax: 0.5 },
 * });
 * ```
 */
export function createSinusoidSurface(options: SinusoidSurfaceOptions): Surface {
  const fn = 'createSinusoidSurface';
  const o = checkOptions(fn, options);
  if (!Array.isArray(o.components) || o.components.length === 0) {
    typeError(fn, 'options.components', o.components, 'a non-empty array of {amplitude, kx, ky?, phase?, omega?}');
  }
  const n = o.components.length;
  const base = o.height === undefined ? 0 : checkFinite(fn, 'options.height', o.height);
  const time = o.time === undefined ? 0 : checkFinite(fn, 'options.time', o.time);
  const d = checkDomain(fn, 'options.domain', o.domain);
  const A = new Float64Array(n);
  const KX = new Float64Array(n);
  const KY = new Float64Array(n);
  const PH = new Float64Array(n);
  let amp = 0;
  let slope = 0;
  let kMax = 0;
  for (let i = 0; i < n; i++) {
    const c = checkOptions(fn, o.components[i], `options.components[${i}]`);
    A[i] = checkFinite(fn, `options.components[${i}].amplitude`, c.amplitude);
    KX[i] = checkFinite(fn, `options.components[${i}].kx`, c.kx);
    KY[i] = c.ky === undefined ? 0 : checkFinite(fn, `options.components[${i}].ky`, c.ky);
    const phase = c.phase === undefined ? 0 : checkFinite(fn, `options.components[${i}].phase`, c.phase);
    const omega = c.omega === undefined ? 0 : checkFinite(fn, `options.components[${i}].omega`, c.omega);
    PH[i] = phase - omega * time;
    const k = Math.hypot(KX[i]!, KY[i]!);
    amp += Math.abs(A[i]!);
    slope += Math.abs(A[i]!) * k;
    if (k > kMax) kMax = k;
  }
  const bounds: SurfaceBounds = { ...d, zMin: base - amp, zMax: base + amp };
  const heightGradient = (x: number, y: number, out: Float64Array | number[]): number => {
    let h = base;
    let p = 0;
    let q = 0;
    for (let i = 0; i < n; i++) {
      const arg = KX[i]! * x + KY[i]! * y + PH[i]!;
      const a = A[i]!;
      h += a * Math.cos(arg);
      const s = -a * Math.sin(arg);
      p += s * KX[i]!;
      q += s * KY[i]!;
    }
    out[0] = p;
    out[1] = q;
    return h;
  };
  return {
    bounds,
    maxSlope: slope,
    lengthScale: kMax > 0 ? 1 / kMax : Infinity,
    height(x, y) {
      let h = base;
      for (let i = 0; i < n; i++) h += A[i]! * Math.cos(KX[i]! * x + KY[i]! * y + PH[i]!);
      return h;
    },
    gradient(x, y, out) {
      heightGradient(x, y, out);
    },
    heightGradient,
  };
}

/** One Gaussian bump `A·exp(−½((x − x₀)²/σx² + (y − y₀)²/σy²))`. */
export interface GaussianBump {
  /** Peak height `A` above the base, m (negative for a dip). */
  amplitude: number;
  /** Centre x, m. */
  x: number;
  /** Centre y, m. */
  y: number;
  /** Width along x (standard deviation), m. */
  sigmaX: number;
  /** Width along y, m. @defaultValue `sigmaX` */
  sigmaY?: number;
}

/** Options of {@link createGaussianSurface}. */
export interface GaussianSurfaceOptions {
  /** The bumps (at least one). */
  bumps: readonly GaussianBump[];
  /** Base height, m. @defaultValue 0 */
  height?: number;
  /** The horizontal domain, m (required). */
  domain: SurfaceDomain;
}

/**
 * A base plane with Gaussian bumps (or dips):
 * `h(x, y) = height + Σ Aᵢ exp(−½((x − xᵢ)²/σxᵢ² + (y − yᵢ)²/σyᵢ²))`, exact gradient.
 *
 * Bounds: heights within `height + Σ min(Aᵢ, 0)` … `height + Σ max(Aᵢ, 0)`; slope
 * `|∇h| ≤ Σ |Aᵢ| e^(−1/2) / min(σxᵢ, σyᵢ)` (the maximum of `r·e^(−r²/2)` is at `r = 1`);
 * length scale `min σ`.
 *
 * @param options - Bumps, base height and domain.
 * @returns The surface.
 * @throws {@link core!MeniscusTypeError} when `bumps` is not a non-empty array.
 * @throws {@link core!MeniscusRangeError} for non-finite values, non-positive widths or an empty domain.
 * @example
 * ```ts
 * const s = createGaussianSurface({
 *   bumps: [{ amplitude: 0.01, x: 0, y: 0, sigmaX: 0.05 }],
 *   domain: { xMin: -0.2, xMax: 0.2, yMin: -0.2, yMax: 0.2 },
 * });
 * s.height(0, 0); // 0.01
 * ```
 */
export function createGaussianSurface(options: GaussianSurfaceOptions): Surface {
  const fn = 'createGaussianSurface';
  const o = checkOptions(fn, options);
  if (!Array.isArray(o.bumps) || o.bumps.length === 0) {
    typeError(fn, 'options.bumps', o.bumps, 'a non-empty array of {amplitude, x, y, sigmaX, sigmaY?}');
  }
  const n = o.bumps.length;
  const base = o.height === undefined ? 0 : checkFinite(fn, 'options.height', o.height);
  const d = checkDomain(fn, 'options.domain', o.domain);
  const A = new Float64Array(n);
  const X = new Float64Array(n);
  const Y = new Float64Array(n);
  const IX = new Float64Array(n); // 1/σx²
  const IY = new Float64Array(n);
  let lo = base;
  let hi = base;
  let slope = 0;
  let len = Infinity;
  for (let i = 0; i < n; i++) {
    const b = checkOptions(fn, o.bumps[i], `options.bumps[${i}]`);
    A[i] = checkFinite(fn, `options.bumps[${i}].amplitude`, b.amplitude);
    X[i] = checkFinite(fn, `options.bumps[${i}].x`, b.x);
    Y[i] = checkFinite(fn, `options.bumps[${i}].y`, b.y);
    const sx = checkPositive(fn, `options.bumps[${i}].sigmaX`, b.sigmaX);
    const sy = b.sigmaY === undefined ? sx : checkPositive(fn, `options.bumps[${i}].sigmaY`, b.sigmaY);
    IX[i] = 1 / (sx * sx);
    IY[i] = 1 / (sy * sy);
    const a = A[i]!;
    if (a > 0) hi += a;
    else lo += a;
    const sMin = Math.min(sx, sy);
    slope += (Math.abs(a) * Math.exp(-0.5)) / sMin;
    if (sMin < len) len = sMin;
  }
  // Guard the bound against the last-ulp rounding of the sum.
  slope *= 1 + 1e-12;
  if (!Number.isFinite(slope)) rangeError(fn, 'options.bumps', o.bumps, 'bumps whose slopes are finite');
  const bounds: SurfaceBounds = { ...d, zMin: lo, zMax: hi };
  const heightGradient = (x: number, y: number, out: Float64Array | number[]): number => {
    let h = base;
    let p = 0;
    let q = 0;
    for (let i = 0; i < n; i++) {
      const u = x - X[i]!;
      const v = y - Y[i]!;
      const e = A[i]! * Math.exp(-0.5 * (u * u * IX[i]! + v * v * IY[i]!));
      h += e;
      p -= e * u * IX[i]!;
      q -= e * v * IY[i]!;
    }
    out[0] = p;
    out[1] = q;
    return h;
  };
  return {
    bounds,
    maxSlope: slope,
    lengthScale: len,
    height(x, y) {
      let h = base;
      for (let i = 0; i < n; i++) {
        const u = x - X[i]!;
        const v = y - Y[i]!;
        h += A[i]! * Math.exp(-0.5 * (u * u * IX[i]! + v * v * IY[i]!));
      }
      return h;
    },
    gradient(x, y, out) {
      heightGradient(x, y, out);
    },
    heightGradient,
  };
}
