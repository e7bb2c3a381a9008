/**
 * The one surface interface every surface of the library implements, and the small
 * helpers that go with it.
 *
 * A surface is a height field `z = h(x, y)` in the world frame (east-north-up, metres,
 * mean water level `z = 0`), with slopes `p = ∂h/∂x`, `q = ∂h/∂y` and the upward normal
 * `n = (−p, −q, 1) / √(1 + p² + q²)` (pointing from water into air).
 *
 * @module
 */
import { checkFinite, checkInteger, checkOptions, rangeError, typeError } from '../core/index.js';
import type { MutableVec3 } from '../core/index.js';
import { checkSurface } from './intersect.js';

/**
 * The box that holds a surface: its horizontal domain and the range of its heights.
 * `zMin ≤ h(x, y) ≤ zMax` holds everywhere on the domain (a guaranteed bound, not
 * necessarily the tightest one). Metres, world frame.
 */
export interface SurfaceBounds {
  /** Smallest x of the domain, m. */
  readonly xMin: number;
  /** Largest x of the domain, m. */
  readonly xMax: number;
  /** Smallest y of the domain, m. */
  readonly yMin: number;
  /** Largest y of the domain, m. */
  readonly yMax: number;
  /** A lower bound of the height over the domain, m. */
  readonly zMin: number;
  /** An upper bound of the height over the domain, m. */
  readonly zMax: number;
}

/** A horizontal rectangle, metres, world frame. */
export interface SurfaceDomain {
  /** Smallest x, m. */
  xMin: number;
  /** Largest x, m. */
  xMax: number;
  /** Smallest y, m. */
  yMin: number;
  /** Largest y, m. */
  yMax: number;
}

/**
 * A height field `z = h(x, y)`: what the ray intersector, the imaging code and the sensor
 * models accept. Implement it to bring your own surface.
 *
 * Contract: `height`, `gradient` and `heightGradient` agree with each other; the
 * gradient is the exact derivative of the height (not a finite difference);
 * `|∇h| ≤ maxSlope` and `zMin ≤ h ≤ zMax` hold on the whole domain. Outside the domain
 * a surface may return anything finite (each implementation documents its policy); the
 * intersector never asks there.
 *
 * @example
 * ```ts
 * const s = createPlaneSurface({ height: -0.01, slopeX: 0.05, domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } });
 * const g = new Float64Array(2);
 * const h = s.heightGradient(0.2, 0, g); // h = -0.0, g = [0.05, 0]
 * ```
 */
export interface Surface {
  /** Domain and height range. */
  readonly bounds: SurfaceBounds;
  /** An upper bound of the slope magnitude `|∇h| = √(p² + q²)` over the domain (unitless). */
  readonly maxSlope: number;
  /**
   * The shortest horizontal length, in metres, over which the surface can turn from
   * rising to falling (a grid's spacing, a sinusoid's wavelength over 2π, a bump's
   * width; `Infinity` for a plane). The intersector uses a fraction of it as its default
   * resolution.
   */
  readonly lengthScale: number;
  /** Height `h(x, y)`, m. */
  height(x: number, y: number): number;
  /** Write the slopes `p = ∂h/∂x` into `out[0]` and `q = ∂h/∂y` into `out[1]`. */
  gradient(x: number, y: number, out: Float64Array | number[]): void;
  /** Height and slopes in one call: writes `p`, `q` into `out[0]`, `out[1]` and returns `h`. */
  heightGradient(x: number, y: number, out: Float64Array | number[]): number;
  /**
   * Optional: height and slopes at many points in one call, for the kernels that trace
   * whole images (a loop inside one call is several times faster in JavaScript than a call
   * a point). Reads the point `(xy[2k], xy[2k + 1])` for `k < n` and writes `h`, `p`, `q`
   * into `out[3k]`, `out[3k + 1]`, `out[3k + 2]`; it must give exactly what
   * `heightGradient` gives. Where it is absent, the library calls `heightGradient` point
   * by point. The grid surfaces have it (and check their arguments once a call).
   */
  heightGradientMany?(xy: Float64Array, n: number, out: Float64Array): void;
}

/**
 * @internal The checks of a `heightGradientMany` call (once a call, not a point): `xy` and
 * `out` Float64Arrays long enough for `n` points, `n` a whole number.
 */
export function checkMany(fn: string, xy: unknown, n: unknown, out: unknown): void {
  if (!(xy instanceof Float64Array)) typeError(fn, 'xy', xy, 'a Float64Array of packed x, y');
  if (!(out instanceof Float64Array)) typeError(fn, 'out', out, 'a Float64Array for packed h, p, q');
  const m = checkInteger(fn, 'n', n, 0, xy.length >> 1);
  if (out.length < 3 * m) rangeError(fn, 'out.length', out.length, `at least 3·n = ${3 * m}`);
}

/**
 * @internal Height and slopes of `surface` at `n` packed points (see
 * {@link Surface.heightGradientMany}), through the surface's own batch method where it has
 * one, else point by point.
 */
export function heightGradientMany(surface: Surface, xy: Float64Array, n: number, out: Float64Array, scratch: Float64Array): void {
  if (surface.heightGradientMany !== undefined) {
    surface.heightGradientMany(xy, n, out);
    return;
  }
  for (let k = 0; k < n; k++) {
    out[3 * k] = surface.heightGradient(xy[2 * k]!, xy[2 * k + 1]!, scratch);
    out[3 * k + 1] = scratch[0]!;
    out[3 * k + 2] = scratch[1]!;
  }
}

/**
 * The unit upward normal of a surface at a point: `n = (−p, −q, 1) / √(1 + p² + q²)`.
 *
 * @param surface - Any surface.
 * @param x - East coordinate, m.
 * @param y - North coordinate, m.
 * @returns The normal, pointing from water into air.
 * @example
 * ```ts
 * surfaceNormal(createPlaneSurface({ slopeX: 1, domain }), 0, 0); // [-0.7071, 0, 0.7071]
 * ```
 */
export function surfaceNormal(surface: Surface, x: number, y: number): MutableVec3 {
  checkSurface('surfaceNormal', 'surface', surface);
  checkFinite('surfaceNormal', 'x', x);
  checkFinite('surfaceNormal', 'y', y);
  const g = [0, 0];
  surface.gradient(x, y, g);
  return normalFromSlopes(g[0]!, g[1]!);
}

/** @internal The unit normal (−p, −q, 1)/√(1 + p² + q²), unchecked (the public, checked form is optics' `normalFromSlopes`). */
export function normalFromSlopes(p: number, q: number): MutableVec3 {
  const s = 1 / Math.sqrt(1 + p * p + q * q);
  return [-p * s, -q * s, s];
}

/** @internal Validate a domain given to an analytic surface constructor. */
export function checkDomain(fn: string, parameter: string, value: unknown): SurfaceDomain {
  const d = checkOptions(fn, value as SurfaceDomain | undefined, parameter);
  if (value === undefined) rangeError(fn, parameter, value, 'a domain {xMin, xMax, yMin, yMax} in metres');
  const xMin = checkFinite(fn, `${parameter}.xMin`, d.xMin);
  const xMax = checkFinite(fn, `${parameter}.xMax`, d.xMax);
  const yMin = checkFinite(fn, `${parameter}.yMin`, d.yMin);
  const yMax = checkFinite(fn, `${parameter}.yMax`, d.yMax);
  if (!(xMax > xMin)) rangeError(fn, `${parameter}.xMax`, xMax, `a number > xMin (${xMin})`);
  if (!(yMax > yMin)) rangeError(fn, `${parameter}.yMax`, yMax, `a number > yMin (${yMin})`);
  return { xMin, xMax, yMin, yMax };
}
