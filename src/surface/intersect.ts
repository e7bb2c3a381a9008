/**
 * Ray–surface intersection: the first crossing of a ray with any {@link Surface}.
 *
 * @module
 */
import {
  checkDirection,
  checkFloat64Array,
  checkOptions,
  checkPositive,
  checkVec3,
  checkInteger,
  rangeError,
  typeError,
  Status,
  LIMITS,
} from '../core/index.js';
import type { MutableVec3, StatusName, Vec3 } from '../core/index.js';
import type { Surface } from './types.js';

/** Options of {@link intersectSurface} and {@link intersectSurfaceBatch}. */
export interface IntersectOptions {
  /** Largest accepted `|z − h(x, y)|` at a reported hit, m. @defaultValue 1e-9 */
  tolerance?: number;
  /**
   * Horizontal resolution of the search, m: two crossings of one ray whose horizontal
   * positions differ by more than this are never confused (see {@link intersectSurface}).
   * @defaultValue `surface.lengthScale / 4` (no floor for a plane)
   */
  resolution?: number;
  /** Largest number of marching steps per ray before `notConverged`. @defaultValue 1000000 */
  maxSteps?: number;
}

/** A ray's hit: the point on the surface, the surface normal there and the distance. */
export interface SurfaceHitOk {
  /** `'ok'`. */
  readonly status: 'ok';
  /** Distance from the ray's origin to the hit along its (normalised) direction, m. */
  readonly t: number;
  /** The hit point `origin + t·direction`, world frame, m; `|z − h(x, y)| ≤ tolerance`. */
  readonly point: MutableVec3;
  /** The unit surface normal at the hit, `(−p, −q, 1)/√(1 + p² + q²)` (water to air). */
  readonly normal: MutableVec3;
}

/** A ray without a hit. */
export interface SurfaceHitNone {
  /**
   * `'miss'`: the ray leaves the surface's bounds (or starts beyond them, pointing away)
   * without meeting it. `'notConverged'`: the step cap was reached, or the root solve
   * could not reach the tolerance (a surface far steeper than its bounds claim).
   */
  readonly status: Extract<StatusName, 'miss' | 'notConverged'>;
}

/** The result of {@link intersectSurface}. */
export type SurfaceHit = SurfaceHitOk | SurfaceHitNone;

/** The outputs of {@link intersectSurfaceBatch}. Entries without a hit hold NaN. */
export interface SurfaceHitBatch {
  /** Hit points, packed xyz, m. */
  points: Float64Array;
  /** Unit normals at the hits, packed xyz. */
  normals: Float64Array;
  /** Distances along the normalised directions, m. */
  t: Float64Array;
  /** One {@link core!Status} code a ray: `ok`, `miss` or `notConverged`. */
  status: Uint8Array;
}

/** Options of {@link intersectSurfaceBatch}. */
export interface IntersectBatchOptions extends IntersectOptions {
  /** Buffers to write into (each of the documented length), created when absent. */
  out?: Partial<SurfaceHitBatch>;
}

/**
 * Validate a value given as a {@link Surface}: the three methods, finite ordered bounds,
 * a finite non-negative slope bound and a positive length scale.
 *
 * @param fn - The calling function's name.
 * @param parameter - The parameter's name.
 * @param value - The candidate.
 * @returns The surface.
 * @throws {@link core!MeniscusTypeError} when a method or field is missing.
 * @throws {@link core!MeniscusRangeError} for non-finite or unordered bounds.
 * @example
 * ```ts
 * checkSurface('myRenderer', 'surface', surface);
 * ```
 */
export function checkSurface(fn: string, parameter: string, value: unknown): Surface {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'a Surface');
  const s = value as Partial<Surface>;
  for (const m of ['height', 'gradient', 'heightGradient'] as const) {
    if (typeof s[m] !== 'function') typeError(fn, `${parameter}.${m}`, s[m], 'a function');
  }
  if (s.heightGradientMany !== undefined && typeof s.heightGradientMany !== 'function') {
    typeError(fn, `${parameter}.heightGradientMany`, s.heightGradientMany, 'a function or undefined');
  }
  const b = s.bounds;
  if (b === null || typeof b !== 'object') typeError(fn, `${parameter}.bounds`, b, 'a SurfaceBounds object');
  for (const k of ['xMin', 'xMax', 'yMin', 'yMax', 'zMin', 'zMax'] as const) {
    if (typeof b[k] !== 'number' || !Number.isFinite(b[k])) rangeError(fn, `${parameter}.bounds.${k}`, b[k], 'a finite number');
  }
  if (!(b.xMax >= b.xMin && b.yMax >= b.yMin && b.zMax >= b.zMin)) {
    rangeError(fn, `${parameter}.bounds`, b, 'bounds with xMin ≤ xMax, yMin ≤ yMax, zMin ≤ zMax');
  }
  if (typeof s.maxSlope !== 'number' || !(s.maxSlope >= 0) || s.maxSlope === Infinity) {
    rangeError(fn, `${parameter}.maxSlope`, s.maxSlope, 'a finite number >= 0');
  }
  if (typeof s.lengthScale !== 'number' || !(s.lengthScale > 0)) {
    rangeError(fn, `${parameter}.lengthScale`, s.lengthScale, 'a number > 0 (Infinity for a plane)');
  }
  return s as Surface;
}

interface Settings {
  tol: number;
  resolution: number;
  maxSteps: number;
}

function settings(fn: string, surface: Surface, o: IntersectOptions): Settings {
  const tol = o.tolerance === undefined ? 1e-9 : checkPositive(fn, 'options.tolerance', o.tolerance);
  let resolution: number;
  if (o.resolution === undefined) resolution = surface.lengthScale / 4;
  else resolution = checkPositive(fn, 'options.resolution', o.resolution);
  const maxSteps = o.maxSteps === undefined ? 1_000_000 : checkInteger(fn, 'options.maxSteps', o.maxSteps, 1, LIMITS.maxIterations);
  return { tol, resolution, maxSteps };
}

/**
 * Trace one ray. Returns the status code and writes t, x, y, z, p, q into `res`.
 * The direction must be a unit vector.
 */
function traceRay(
  s: Surface,
  ox: number,
  oy: number,
  oz: number,
  dx: number,
  dy: number,
  dz: number,
  set: Settings,
  grad: Float64Array,
  res: Float64Array,
): number {
  const b = s.bounds;
  // Clip the ray to the bounds box (slab method), t ≥ 0.
  let t0 = 0;
  let t1 = Infinity;
  if (dx !== 0) {
    let a = (b.xMin - ox) / dx;
    let c = (b.xMax - ox) / dx;
    if (a > c) [a, c] = [c, a];
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  } else if (ox < b.xMin || ox > b.xMax) return Status.miss;
  if (dy !== 0) {
    let a = (b.yMin - oy) / dy;
    let c = (b.yMax - oy) / dy;
    if (a > c) [a, c] = [c, a];
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  } else if (oy < b.yMin || oy > b.yMax) return Status.miss;
  if (dz !== 0) {
    let a = (b.zMin - oz) / dz;
    let c = (b.zMax - oz) / dz;
    if (a > c) [a, c] = [c, a];
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  } else if (oz < b.zMin || oz > b.zMax) return Status.miss;
  if (!(t0 <= t1)) return Status.miss;

  const tol = set.tol;
  const horiz = Math.sqrt(dx * dx + dy * dy);
  // |dg/dt| ≤ L along the ray, g(t) = z(t) − h(x(t), y(t)).
  const L = Math.abs(dz) + s.maxSlope * horiz;
  const invL = L > 0 ? 1 / L : Infinity;
  // Smallest step, in t, where the Lipschitz step is shorter: `resolution` horizontally.
  const floor = horiz > 0 ? set.resolution / horiz : Infinity;

  let ta = t0;
  let ga = oz + ta * dz - s.heightGradient(ox + ta * dx, oy + ta * dy, grad);
  if (Math.abs(ga) <= tol) return finish(ox, oy, oz, dx, dy, dz, ta, grad, res);
  const side = ga > 0 ? 1 : -1;
  let tb = ta;
  let gb = ga;
  let found = false;
  for (let step = 0; step < set.maxSteps; step++) {
    let h = Math.abs(ga) * invL;
    if (h < floor) h = floor;
    tb = ta + h;
    if (tb > t1) tb = t1;
    gb = oz + tb * dz - s.heightGradient(ox + tb * dx, oy + tb * dy, grad);
    if (Math.abs(gb) <= tol) return finish(ox, oy, oz, dx, dy, dz, tb, grad, res);
    if (gb * side < 0) {
      found = true;
      break;
    }
    if (tb >= t1) return Status.miss;
    ta = tb;
    ga = gb;
  }
  if (!found) return Status.notConverged;

  // Safeguarded Newton on the bracket [ta, tb]: g(ta)·side > 0 > g(tb)·side.
  let t = ta + (tb - ta) * (ga / (ga - gb));
  let width = tb - ta;
  for (let it = 0; it < 200; it++) {
    if (!(t > ta && t < tb)) t = 0.5 * (ta + tb);
    const g = oz + t * dz - s.heightGradient(ox + t * dx, oy + t * dy, grad);
    if (Math.abs(g) <= tol) return finish(ox, oy, oz, dx, dy, dz, t, grad, res);
    if (g * side > 0) ta = t;
    else tb = t;
    const newWidth = tb - ta;
    if (!(newWidth > 0) || tb === ta) break;
    const dg = dz - (grad[0]! * dx + grad[1]! * dy);
    let tn = dg !== 0 ? t - g / dg : NaN;
    // Bisect when Newton leaves the bracket or the bracket is not shrinking fast enough.
    if (!(tn > ta && tn < tb) || newWidth > 0.5 * width) tn = 0.5 * (ta + tb);
    width = newWidth;
    if (tn === t) break;
    t = tn;
  }
  return Status.notConverged;
}

function finish(
  ox: number,
  oy: number,
  oz: number,
  dx: number,
  dy: number,
  dz: number,
  t: number,
  grad: Float64Array,
  res: Float64Array,
): number {
  const x = ox + t * dx;
  const y = oy + t * dy;
  // `grad` holds the slopes at (x, y): the caller's last evaluation was at this t.
  res[0] = t;
  res[1] = x;
  res[2] = y;
  res[3] = oz + t * dz;
  res[4] = grad[0]!;
  res[5] = grad[1]!;
  return Status.ok;
}

/**
 * The first point where a ray meets a surface, from below or from above.
 *
 * **Method.** The ray is clipped to the surface's bounds box (domain × height range);
 * outside it there can be no hit. Along the clipped ray the clearance
 * `g(t) = z(t) − h(x(t), y(t))` changes by at most `L = |dz| + maxSlope·|d_xy|` per metre,
 * so a step of `|g|/L` cannot pass a crossing: the search marches with steps
 * `max(|g|/L, resolution/|d_xy|)` until `g` changes sign (or `|g| ≤ tolerance`), then
 * solves `g = 0` on that bracket by Newton's method safeguarded with bisection (Newton's
 * derivative `g' = dz − p·dx − q·dy` comes from the surface's exact gradient).
 *
 * **Guarantee.** While the ray is farther than `L·resolution/|d_xy|` (in height) from the
 * surface, no crossing is stepped over, so the hit reported is the first crossing along
 * the ray, except that two crossings whose horizontal positions are within `resolution`
 * of each other (a ray grazing a crest) may both be passed, or the later one reported.
 * A tangent touch within `tolerance` counts as a hit. Vertical rays and planes are exact
 * (one crossing at most).
 *
 * @param surface - Any surface.
 * @param origin - Ray origin, world frame, m.
 * @param direction - Ray direction (normalised here; need not be unit).
 * @param options - Tolerance, resolution and step cap.
 * @returns `{ status: 'ok', t, point, normal }` with `|point.z − h(point.x, point.y)| ≤
 *   tolerance`, or `{ status: 'miss' }` / `{ status: 'notConverged' }`.
 * @throws {@link core!MeniscusRangeError} for a zero-length or non-finite direction, a
 *   non-finite origin, or bad options.
 * @throws {@link core!MeniscusTypeError} when `surface` is not a {@link Surface}.
 * @see Hart, J. C. (1996), "Sphere tracing: a geometric method for the antialiased ray
 *   tracing of implicit surfaces", The Visual Computer 12(10), 527–545 (steps bounded
 *   by a Lipschitz constant).
 * @example
 * ```ts
 * const sea = createGaussianSurface({ bumps: [{ amplitude: 0.01, x: 0, y: 0, sigmaX: 0.05 }], domain });
 * const hit = intersectSurface(sea, [0, 0, -1], [0, 0, 1]);
 * if (hit.status === 'ok') hit.point; // [0, 0, 0.01]
 * ```
 */
export function intersectSurface(surface: Surface, origin: Vec3, direction: Vec3, options?: IntersectOptions): SurfaceHit {
  const fn = 'intersectSurface';
  const s = checkSurface(fn, 'surface', surface);
  const o = checkVec3(fn, 'origin', origin);
  const d = checkDirection(fn, 'direction', direction);
  const set = settings(fn, s, checkOptions(fn, options));
  const res = new Float64Array(6);
  const code = traceRay(s, o[0], o[1], o[2], d[0], d[1], d[2], set, new Float64Array(2), res);
  if (code !== Status.ok) return { status: code === Status.miss ? 'miss' : 'notConverged' };
  const p = res[4]!;
  const q = res[5]!;
  const k = 1 / Math.sqrt(1 + p * p + q * q);
  return { status: 'ok', t: res[0]!, point: [res[1]!, res[2]!, res[3]!], normal: [-p * k, -q * k, k] };
}

/**
 * {@link intersectSurface} for many rays: packed origins and directions (xyz xyz …),
 * outputs in packed buffers with a status code a ray. Same method and guarantee.
 *
 * @param surface - Any surface.
 * @param origins - Ray origins, packed xyz, m.
 * @param directions - Ray directions, packed xyz (each normalised here, none zero).
 * @param options - Tolerance, resolution, step cap and optional output buffers.
 * @returns `{ points, normals, t, status }`; rays without a hit hold NaN in `points`,
 *   `normals` and `t`, and `Status.miss` or `Status.notConverged` in `status`.
 * @throws {@link core!MeniscusTypeError} when the arrays are not `Float64Array`s of matching
 *   length (a multiple of 3) or an output buffer has the wrong type or length.
 * @throws {@link core!MeniscusRangeError} for a non-finite origin, a zero-length or non-finite
 *   direction (naming the ray's index), or bad options.
 * @example
 * ```ts
 * const o = new Float64Array([0, 0, -1, 0.01, 0, -1]);
 * const d = new Float64Array([0, 0, 1, 0, 0, 1]);
 * const { points, status } = intersectSurfaceBatch(sea, o, d);
 * ```
 */
export function intersectSurfaceBatch(
  surface: Surface,
  origins: Float64Array,
  directions: Float64Array,
  options?: IntersectBatchOptions,
): SurfaceHitBatch {
  const fn = 'intersectSurfaceBatch';
  const s = checkSurface(fn, 'surface', surface);
  checkFloat64Array(fn, 'origins', origins, 3);
  checkFloat64Array(fn, 'directions', directions, 3, origins.length);
  const o = checkOptions(fn, options);
  const set = settings(fn, s, o);
  const n = origins.length / 3;
  const out = checkOptions(fn, o.out, 'options.out');
  const points = outBuffer(fn, 'options.out.points', out.points, 3 * n);
  const normals = outBuffer(fn, 'options.out.normals', out.normals, 3 * n);
  const tOut = outBuffer(fn, 'options.out.t', out.t, n);
  let status: Uint8Array;
  if (out.status === undefined) status = new Uint8Array(n);
  else {
    if (!(out.status instanceof Uint8Array) || out.status.length !== n) {
      typeError(fn, 'options.out.status', out.status, `a Uint8Array of length ${n}`);
    }
    status = out.status;
  }
  for (let k = 0; k < n; k++) {
    const a = 3 * k;
    if (!(Number.isFinite(origins[a]!) && Number.isFinite(origins[a + 1]!) && Number.isFinite(origins[a + 2]!))) {
      rangeError(fn, `origins[${a}..${a + 2}]`, [origins[a], origins[a + 1], origins[a + 2]], 'a finite point');
    }
    const len = Math.hypot(directions[a]!, directions[a + 1]!, directions[a + 2]!);
    if (!(len > 0) || !Number.isFinite(len)) {
      rangeError(fn, `directions[${a}..${a + 2}]`, [directions[a], directions[a + 1], directions[a + 2]], 'a direction of non-zero, finite length');
    }
  }
  const grad = new Float64Array(2);
  const res = new Float64Array(6);
  for (let k = 0; k < n; k++) {
    const a = 3 * k;
    const ex = directions[a]!;
    const ey = directions[a + 1]!;
    const ez = directions[a + 2]!;
    const inv = 1 / Math.sqrt(ex * ex + ey * ey + ez * ez);
    const code = traceRay(s, origins[a]!, origins[a + 1]!, origins[a + 2]!, ex * inv, ey * inv, ez * inv, set, grad, res);
    status[k] = code;
    if (code === Status.ok) {
      const p = res[4]!;
      const q = res[5]!;
      const c = 1 / Math.sqrt(1 + p * p + q * q);
      tOut[k] = res[0]!;
      points[a] = res[1]!;
      points[a + 1] = res[2]!;
      points[a + 2] = res[3]!;
      normals[a] = -p * c;
      normals[a + 1] = -q * c;
      normals[a + 2] = c;
    } else {
      tOut[k] = NaN;
      points[a] = points[a + 1] = points[a + 2] = NaN;
      normals[a] = normals[a + 1] = normals[a + 2] = NaN;
    }
  }
  return { points, normals, t: tOut, status };
}

function outBuffer(fn: string, parameter: string, value: unknown, length: number): Float64Array {
  if (value === undefined) return new Float64Array(length);
  return checkFloat64Array(fn, parameter, value, 1, length);
}
