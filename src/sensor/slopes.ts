/**
 * Slopes from spots: each matched spot and its aperture give the in-water ray; with the
 * guide light's in-air direction at the crossing point they give the surface normal
 * (Snell's law inverted) and so the slopes `(p, q)` where the ray crossed the surface.
 *
 * @module
 */
import { checkFloat64Array, checkOptions, Status, typeError } from '../core/index.js';
import { checkSurface, intersectSurface } from '../surface/index.js';
import type { Surface } from '../surface/index.js';
import type { GuideLight } from '../sun/index.js';
import { flatSurface } from './forward.js';
import { planeToWorld } from './geometry.js';
import type { SensorGeometry } from './geometry.js';

/** Slope samples at the points where the rays crossed the surface. */
export interface SlopeSamples {
  /** Number of samples (one per aperture of the array; check `status`). */
  readonly count: number;
  /** Crossing x, metres, world frame. */
  readonly x: Float64Array;
  /** Crossing y, metres. */
  readonly y: Float64Array;
  /** Crossing height used, metres. */
  readonly z: Float64Array;
  /** Slope `∂h/∂x`. */
  readonly p: Float64Array;
  /** Slope `∂h/∂y`. */
  readonly q: Float64Array;
  /** Variance of `p` from the spot covariance. */
  readonly cpp: Float64Array;
  /** Covariance of `p` and `q`. */
  readonly cpq: Float64Array;
  /** Variance of `q`. */
  readonly cqq: Float64Array;
  /** The in-water ray direction (unit, down), packed xyz. */
  readonly directions: Float64Array;
  /**
   * Per aperture: `Status.ok`; `Status.unmatched` (no spot); `Status.blocked` (the ray
   * from spot to aperture runs upward); `Status.miss` (the ray misses the surface used for
   * the crossing); `Status.inconsistent` (no interface refracts the light into that ray).
   */
  readonly status: Uint8Array;
}

/** Options of {@link slopesFromSpots}. */
export interface SlopesFromSpotsOptions {
  /**
   * The surface on which the crossing points are found: the mean level `z = 0` for the
   * first pass, a reconstructed surface for refinement. @defaultValue the mean level
   */
  surface?: Surface;
}

/** Spot positions on the plane for each aperture (NaN where none), with covariances. */
export interface ApertureSpots {
  /** Plane x per aperture, metres (NaN: no spot). */
  readonly x: Float64Array;
  /** Plane y per aperture, metres. */
  readonly y: Float64Array;
  /** Covariance `xx` per aperture, m² (optional). */
  readonly cxx?: Float64Array;
  /** Covariance `xy` per aperture, m². */
  readonly cxy?: Float64Array;
  /** Covariance `yy` per aperture, m². */
  readonly cyy?: Float64Array;
}

/**
 * Slopes of the interface that refracts the light travelling along `(ix, iy, iz)` (unit)
 * into the in-water direction `(tx, ty, tz)` (unit): the inverse Snell law `n ∥ n_air·i −
 * n_water·t`, oriented against the incident light, as `normalFromRays` and
 * `slopesFromNormal` give it, without allocating. False where no interface does it or
 * its normal does not point up.
 */
function slopeOf(nAir: number, nWater: number, ix: number, iy: number, iz: number, tx: number, ty: number, tz: number, out: Float64Array): boolean {
  const mx = nAir * ix - nWater * tx;
  const my = nAir * iy - nWater * ty;
  const mz = nAir * iz - nWater * tz;
  const im = ix * mx + iy * my + iz * mz;
  const tm = tx * mx + ty * my + tz * mz;
  if (!(im * tm > 0)) return false;
  // The unit normal is ±m/|m| with the sign that opposes the incident light; its z must be > 0.
  const nz = im > 0 ? -mz : mz;
  if (!(nz > 0)) return false;
  out[0] = -mx / mz;
  out[1] = -my / mz;
  return true;
}

/**
 * Where the ray from `(ox, oy, oz)` along the unit direction `(dx, dy, dz)` (dz > 0)
 * crosses the surface, by safeguarded Newton steps on `g(t) = oz + t·dz − h(x(t), y(t))`,
 * for the case where the surface's slope bound makes `g` strictly increasing (so the
 * crossing is unique and the first one along the ray). Writes t into `res[0]` and
 * returns true; returns false where that case does not hold or the steps leave the
 * surface's domain, and the caller then uses the general intersection.
 */
function crossUp(surface: Surface, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, grad: Float64Array, res: Float64Array): boolean {
  const horiz = Math.sqrt(dx * dx + dy * dy);
  if (!(dz > 0) || !(surface.maxSlope * horiz < 0.5 * dz)) return false;
  const b = surface.bounds;
  let ta = Math.max(0, (b.zMin - oz) / dz);
  let tb = (b.zMax - oz) / dz;
  if (!(tb >= ta)) return false;
  // From the mean level (inside the bracket).
  let t = Math.min(Math.max(-oz / dz, ta), tb);
  for (let it = 0; it < 40; it++) {
    const x = ox + t * dx, y = oy + t * dy;
    if (!(x >= b.xMin && x <= b.xMax && y >= b.yMin && y <= b.yMax)) return false;
    const g = oz + t * dz - surface.heightGradient(x, y, grad);
    if (Math.abs(g) <= 1e-9) {
      res[0] = t;
      return true;
    }
    if (g < 0) ta = t;
    else tb = t;
    const dg = dz - (grad[0]! * dx + grad[1]! * dy);
    let tn = t - g / dg;
    if (!(tn >= ta && tn <= tb)) tn = 0.5 * (ta + tb);
    if (tn === t) return false;
    t = tn;
  }
  return false;
}

/**
 * Turn spot positions into surface slopes.
 *
 * For each aperture with a spot: the in-water ray runs from the aperture to the spot; it
 * is followed back up to `options.surface` (the mean level by default) to find where it
 * crossed; the guide light's direction there and the ray give the normal by the inverse
 * Snell law (`n ∥ n_air·i − n_water·t`), and the normal gives `p = −n_x/n_z`,
 * `q = −n_y/n_z`. The spot covariance is carried to `(p, q)` through the Jacobian of
 * this chain (central differences).
 *
 * @param geometry - The sensor.
 * @param light - The guide light.
 * @param spots - Spot positions per aperture (see {@link aperturePositions}).
 * @param options - The surface for the crossing points.
 * @returns One slope sample per aperture.
 * @throws {@link core!MeniscusTypeError} for arrays of the wrong length or a malformed light or surface.
 * @see Cox, C. & Munk, W. (1954), JOSA 44(11), 838 (slopes from refracted and reflected
 *   light); Born, M. & Wolf, E. (1999), Principles of Optics, §1.5.1 (Snell's law);
 *   Zhang, X. & Cox, C. S. (1994), "Measuring the two-dimensional structure of a wavy
 *   water surface optically: a surface gradient detector", Experiments in Fluids 17, 225.
 * @example
 * ```ts
 * const s = slopesFromSpots(geometry, light, aperturePositions(planeSpots, match));
 * s.p[0], s.q[0];
 * ```
 */
export function slopesFromSpots(geometry: SensorGeometry, light: GuideLight, spots: ApertureSpots, options?: SlopesFromSpotsOptions): SlopeSamples {
  const fn = 'slopesFromSpots';
  if (geometry === null || typeof geometry !== 'object' || !(geometry.apertureWorld instanceof Float64Array)) {
    typeError(fn, 'geometry', geometry, 'a SensorGeometry');
  }
  if (light === null || typeof light !== 'object' || typeof light.toLight !== 'function') typeError(fn, 'light', light, 'a GuideLight');
  const n = geometry.apertures.count;
  if (spots === null || typeof spots !== 'object') typeError(fn, 'spots', spots, 'an object { x, y } per aperture');
  checkFloat64Array(fn, 'spots.x', spots.x, 1, n);
  checkFloat64Array(fn, 'spots.y', spots.y, 1, n);
  for (const k of ['cxx', 'cxy', 'cyy'] as const) if (spots[k] !== undefined) checkFloat64Array(fn, `spots.${k}`, spots[k], 1, n);
  const o = checkOptions(fn, options);
  const surface = o.surface === undefined ? flatSurface(geometry) : checkSurface(fn, 'options.surface', o.surface);
  const X = new Float64Array(n).fill(NaN), Y = new Float64Array(n).fill(NaN), Z = new Float64Array(n).fill(NaN);
  const P = new Float64Array(n).fill(NaN), Q = new Float64Array(n).fill(NaN);
  const cpp = new Float64Array(n).fill(NaN), cpq = new Float64Array(n).fill(NaN), cqq = new Float64Array(n).fill(NaN);
  const dirs = new Float64Array(3 * n).fill(NaN);
  const status = new Uint8Array(n);
  const R = geometry.rotation;
  const e1 = [R[0], R[3], R[6]], e2 = [R[1], R[4], R[7]];
  const pq = new Float64Array(2), pa = new Float64Array(2), pb = new Float64Array(2);
  const grad = new Float64Array(2), res = new Float64Array(1);
  const { nAir, nWater } = geometry;
  const X3: [number, number, number] = [0, 0, 0];
  const h = 1e-6 * geometry.planeDistance;
  for (let k = 0; k < n; k++) {
    const sx = spots.x[k]!, sy = spots.y[k]!;
    if (!Number.isFinite(sx) || !Number.isFinite(sy)) {
      status[k] = Status.unmatched;
      continue;
    }
    const ax = geometry.apertureWorld[3 * k]!, ay = geometry.apertureWorld[3 * k + 1]!, az = geometry.apertureWorld[3 * k + 2]!;
    const S = planeToWorld(geometry, sx, sy);
    let t0 = S[0] - ax, t1 = S[1] - ay, t2 = S[2] - az;
    const tl = Math.hypot(t0, t1, t2);
    t0 /= tl;
    t1 /= tl;
    t2 /= tl;
    if (!(t2 < 0)) {
      status[k] = Status.blocked;
      continue;
    }
    // Back up the ray to the surface: Newton steps where the crossing is unique, else the
    // general intersection.
    let cx: number, cy: number, cz: number;
    if (crossUp(surface, ax, ay, az, -t0, -t1, -t2, grad, res)) {
      cx = ax - res[0]! * t0;
      cy = ay - res[0]! * t1;
      cz = az - res[0]! * t2;
    } else {
      const hit = intersectSurface(surface, [ax, ay, az], [-t0, -t1, -t2]);
      if (hit.status !== 'ok') {
        status[k] = Status.miss;
        continue;
      }
      [cx, cy, cz] = hit.point;
    }
    X3[0] = cx;
    X3[1] = cy;
    X3[2] = cz;
    const L = light.toLight(X3);
    const ll = Math.hypot(L[0], L[1], L[2]);
    const ix = -L[0] / ll, iy = -L[1] / ll, iz = -L[2] / ll;
    if (!slopeOf(nAir, nWater, ix, iy, iz, t0, t1, t2, pq)) {
      status[k] = Status.inconsistent;
      continue;
    }
    X[k] = cx;
    Y[k] = cy;
    Z[k] = cz;
    P[k] = pq[0]!;
    Q[k] = pq[1]!;
    dirs[3 * k] = t0;
    dirs[3 * k + 1] = t1;
    dirs[3 * k + 2] = t2;
    status[k] = Status.ok;
    // Jacobian of (p, q) with respect to the spot's plane coordinates.
    const cxx = spots.cxx?.[k] ?? 0, cxy = spots.cxy?.[k] ?? 0, cyy = spots.cyy?.[k] ?? 0;
    let j00 = 0, j01 = 0, j10 = 0, j11 = 0;
    let good = true;
    for (let axis = 0; axis < 2 && good; axis++) {
      const e = axis === 0 ? e1 : e2;
      const ua = S[0] + h * e[0]! - ax, va = S[1] + h * e[1]! - ay, wa = S[2] + h * e[2]! - az;
      const la = Math.hypot(ua, va, wa);
      const ub = S[0] - h * e[0]! - ax, vb = S[1] - h * e[1]! - ay, wb = S[2] - h * e[2]! - az;
      const lb = Math.hypot(ub, vb, wb);
      good =
        slopeOf(nAir, nWater, ix, iy, iz, ua / la, va / la, wa / la, pa) && slopeOf(nAir, nWater, ix, iy, iz, ub / lb, vb / lb, wb / lb, pb);
      if (!good) break;
      if (axis === 0) {
        j00 = (pa[0]! - pb[0]!) / (2 * h);
        j10 = (pa[1]! - pb[1]!) / (2 * h);
      } else {
        j01 = (pa[0]! - pb[0]!) / (2 * h);
        j11 = (pa[1]! - pb[1]!) / (2 * h);
      }
    }
    if (good) {
      cpp[k] = j00 * j00 * cxx + 2 * j00 * j01 * cxy + j01 * j01 * cyy;
      cpq[k] = j00 * j10 * cxx + (j00 * j11 + j01 * j10) * cxy + j01 * j11 * cyy;
      cqq[k] = j10 * j10 * cxx + 2 * j10 * j11 * cxy + j11 * j11 * cyy;
    }
  }
  return { count: n, x: X, y: Y, z: Z, p: P, q: Q, cpp, cpq, cqq, directions: dirs, status };
}

/**
 * Reorder spot positions (indexed by spot) into positions per aperture using a match.
 *
 * @param spots - Plane positions per spot, with optional covariances.
 * @param spotOfAperture - For each aperture, its spot index or −1 (from {@link matchSpots}).
 * @returns Positions per aperture; NaN where an aperture has no spot.
 * @throws {@link core!MeniscusTypeError} for mismatched arrays.
 * @example
 * ```ts
 * const per = aperturePositions(planeSpots, match.spotOfAperture);
 * ```
 */
export function aperturePositions(spots: ApertureSpots, spotOfAperture: Int32Array): ApertureSpots {
  const fn = 'aperturePositions';
  if (!(spotOfAperture instanceof Int32Array)) typeError(fn, 'spotOfAperture', spotOfAperture, 'an Int32Array');
  if (spots === null || typeof spots !== 'object') typeError(fn, 'spots', spots, 'spot positions { x, y }');
  const m = checkFloat64Array(fn, 'spots.x', spots.x).length;
  checkFloat64Array(fn, 'spots.y', spots.y, 1, m);
  const n = spotOfAperture.length;
  const x = new Float64Array(n).fill(NaN), y = new Float64Array(n).fill(NaN);
  const cxx = new Float64Array(n), cxy = new Float64Array(n), cyy = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const s = spotOfAperture[k]!;
    if (s < 0) continue;
    if (!(s < m)) typeError(fn, `spotOfAperture[${k}]`, s, `a spot index below ${m}`);
    x[k] = spots.x[s]!;
    y[k] = spots.y[s]!;
    cxx[k] = spots.cxx?.[s] ?? 0;
    cxy[k] = spots.cxy?.[s] ?? 0;
    cyy[k] = spots.cyy?.[s] ?? 0;
  }
  return { x, y, cxx, cxy, cyy };
}
