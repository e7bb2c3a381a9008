/**
 * The ray kernels shared by rendering and correction: a camera ray → the surface → the
 * refracted ray → the scene. Internal; the public entry points validate their inputs and
 * call these on plain numbers.
 *
 * @module
 */
import { checkOptions, checkPositive, rangeError, Status, typeError } from '../core/index.js';
import type { Surface } from '../surface/index.js';
import { checkSurface, intersectSurface } from '../surface/index.js';
import { heightGradientMany } from '../surface/types.js';
import type { CameraModel, CameraPose } from '../camera/index.js';
import { checkRotation } from '../camera/index.js';
import type { ResolvedScene } from './scene.js';

// Status codes as local constants (read once, not through the module namespace in loops).
const S_MISS = Status.miss;
const S_NOTCONVERGED = Status.notConverged;
const S_OK = Status.ok;
const S_OUTSIDE = Status.outside;
const S_TIR = Status.tir;

/** Refractive indices and intersection settings shared by the imaging functions. */
export interface MediumOptions {
  /** Refractive index of the water. @defaultValue 1.333 */
  nWater?: number;
  /** Refractive index of the air. @defaultValue 1.000293 */
  nAir?: number;
  /** Largest accepted `|z − h(x, y)|` at a surface hit, metres. @defaultValue 1e-9 */
  tolerance?: number;
}

/** @internal Everything a trace needs, resolved once. */
export interface TraceContext {
  readonly surface: Surface | null;
  /** True when the camera is below the surface (looking up). */
  readonly below: boolean;
  /** n(camera side) / n(scene side). */
  readonly eta: number;
  readonly n1: number;
  readonly n2: number;
  readonly tol: number;
  readonly scene: ResolvedScene;
  /** Scratch. */
  readonly grad: Float64Array;
}

/** @internal Validate a camera model (duck-typed). */
export function checkCamera(fn: string, parameter: string, value: unknown): CameraModel {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'a CameraModel (PinholeCamera, FisheyeCamera, OrthographicCamera)');
  const c = value as Partial<CameraModel>;
  for (const m of ['project', 'unproject', 'projectBatch', 'unprojectBatch'] as const) {
    if (typeof c[m] !== 'function') typeError(fn, `${parameter}.${m}`, c[m], 'a function');
  }
  if (typeof c.central !== 'boolean') typeError(fn, `${parameter}.central`, c.central, 'a boolean');
  return c as CameraModel;
}

/** @internal Validate a camera pose. */
export function checkPoseValue(fn: string, parameter: string, value: unknown): CameraPose {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'a CameraPose { rotation, position }');
  const p = value as CameraPose;
  checkRotation(fn, `${parameter}.rotation`, p.rotation, 1e-6, true);
  const c = p.position;
  if (!Array.isArray(c) && !(c instanceof Float64Array)) typeError(fn, `${parameter}.position`, c, 'a point [x, y, z]');
  if (c.length !== 3 || !c.every((x) => Number.isFinite(x))) rangeError(fn, `${parameter}.position`, c, 'a finite point [x, y, z]');
  return p;
}

/**
 * @internal Resolve the medium and which side the camera is on.
 * The camera is below when its centre is under the surface's lowest height, above when
 * over its highest; a scene must lie on the other side.
 */
export function traceContext(
  fn: string,
  surface: Surface | null,
  pose: CameraPose,
  scene: ResolvedScene,
  options: MediumOptions,
  surfaceParameter = 'surface',
): TraceContext {
  const o = checkOptions(fn, options);
  const nWater = o.nWater === undefined ? 1.333 : checkPositive(fn, 'options.nWater', o.nWater);
  const nAir = o.nAir === undefined ? 1.000293 : checkPositive(fn, 'options.nAir', o.nAir);
  const tol = o.tolerance === undefined ? 1e-9 : checkPositive(fn, 'options.tolerance', o.tolerance);
  let s: Surface | null = null;
  let zMin = 0, zMax = 0;
  if (surface !== null) {
    s = checkSurface(fn, surfaceParameter, surface);
    zMin = s.bounds.zMin;
    zMax = s.bounds.zMax;
  }
  const cz = pose.position[2];
  let below: boolean;
  if (cz < zMin) below = true;
  else if (cz > zMax) below = false;
  else {
    rangeError(fn, 'pose.position[2]', cz, `a camera height clear of the surface's height range [${zMin}, ${zMax}] m (below it looking up, or above it looking down)`);
  }
  if (scene.kind === 0 && !below) {
    rangeError(fn, 'scene.type', 'sky', 'a plane scene (a bottom) for a camera above the water; a sky needs a camera below it');
  }
  if (scene.kind === 1) {
    if (below && !(scene.z > zMax)) rangeError(fn, 'scene.z', scene.z, `a plane above the surface (> ${zMax} m) for a camera below it`);
    if (!below && !(scene.z < zMin)) rangeError(fn, 'scene.z', scene.z, `a bottom below the surface (< ${zMin} m) for a camera above it`);
  }
  const n1 = below ? nWater : nAir;
  const n2 = below ? nAir : nWater;
  return { surface: s, below, eta: n1 / n2, n1, n2, tol, scene, grad: new Float64Array(2) };
}

/**
 * @internal The first hit of a unit ray with the surface. Writes t, x, y, z, p, q into
 * res[0..5] and returns a status code; on a warm-started hit res[0] is the distance
 * refined by one more Newton step (see `finish`), the point and slopes are at the
 * distance that met the tolerance.
 *
 * When `|dz| > maxSlope·|d_xy|` the clearance `g(t) = z(t) − h(x(t), y(t))` is strictly
 * monotone along the ray (its derivative `dz − p·dx − q·dy` cannot vanish), so there is
 * at most one crossing inside the bounds box and a safeguarded Newton iteration finds it
 * from the crossing of the mean level (or from `guess`, tried first on its own: a root it
 * reaches in front of the ray's origin over the domain is that only crossing).
 * Otherwise the general marching intersector of the surface area is used. With `warm`
 * false the warm start is skipped (its steps were already taken, by {@link traceBatch})
 * and `guess` only seeds the bracketed search.
 */
export function hitSurface(ctx: TraceContext, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, res: Float64Array, guess = NaN, warm = true): number {
  const s = ctx.surface!;
  const b = s.bounds;
  if (!monotone(s, dx, dy, dz)) {
    const h = intersectSurface(s, [ox, oy, oz], [dx, dy, dz], { tolerance: ctx.tol });
    if (h.status !== 'ok') return Status[h.status];
    res[0] = h.t;
    res[1] = h.point[0];
    res[2] = h.point[1];
    res[3] = h.point[2];
    res[4] = -h.normal[0] / h.normal[2];
    res[5] = -h.normal[1] / h.normal[2];
    return S_OK;
  }
  const grad = ctx.grad;
  const tol = ctx.tol;
  if (warm && guess === guess) {
    // Warm start: with g monotone along the ray, a root in front of the camera whose
    // point lies over the domain is the only crossing, so a few Newton steps from a good
    // guess settle it without the bounds box.
    let t = guess;
    for (let it = 0; it < 3; it++) {
      const x = ox + t * dx, y = oy + t * dy;
      const g = oz + t * dz - s.heightGradient(x, y, grad);
      const step = g / (dz - (grad[0]! * dx + grad[1]! * dy));
      if (Math.abs(g) <= tol) {
        if (t >= 0 && x >= b.xMin && x <= b.xMax && y >= b.yMin && y <= b.yMax) return finish(ox, oy, oz, dx, dy, dz, t, grad, res, t - step);
        break;
      }
      t -= step;
    }
  }
  // Clip to the bounds box (slab method), t ≥ 0.
  let t0 = 0, t1 = Infinity;
  if (dx !== 0) {
    let a = (b.xMin - ox) / dx, c = (b.xMax - ox) / dx;
    if (a > c) { const w = a; a = c; c = w; }
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  } else if (ox < b.xMin || ox > b.xMax) return S_MISS;
  if (dy !== 0) {
    let a = (b.yMin - oy) / dy, c = (b.yMax - oy) / dy;
    if (a > c) { const w = a; a = c; c = w; }
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  } else if (oy < b.yMin || oy > b.yMax) return S_MISS;
  {
    let a = (b.zMin - oz) / dz, c = (b.zMax - oz) / dz;
    if (a > c) { const w = a; a = c; c = w; }
    if (a > t0) t0 = a;
    if (c < t1) t1 = c;
  }
  if (!(t0 <= t1)) return S_MISS;
  // Newton from the crossing of the mean level, kept inside [t0, t1]. With g monotone, a
  // root found inside the interval is the only crossing.
  let t = guess >= t0 && guess <= t1 ? guess : (0.5 * (b.zMin + b.zMax) - oz) / dz;
  if (!(t >= t0 && t <= t1)) t = 0.5 * (t0 + t1);
  for (let it = 0; it < 8; it++) {
    const g = oz + t * dz - s.heightGradient(ox + t * dx, oy + t * dy, grad);
    if (Math.abs(g) <= tol) return finish(ox, oy, oz, dx, dy, dz, t, grad, res);
    let tn = t - g / (dz - (grad[0]! * dx + grad[1]! * dy));
    if (tn < t0) tn = t0;
    else if (tn > t1) tn = t1;
    if (tn === t) break;
    t = tn;
  }
  // Not settled: bracket the root and bisect-safeguard the Newton steps.
  let ta = t0, tb = t1;
  const ga = oz + ta * dz - s.heightGradient(ox + ta * dx, oy + ta * dy, grad);
  if (Math.abs(ga) <= tol) return finish(ox, oy, oz, dx, dy, dz, ta, grad, res);
  const gb = oz + tb * dz - s.heightGradient(ox + tb * dx, oy + tb * dy, grad);
  if (Math.abs(gb) <= tol) return finish(ox, oy, oz, dx, dy, dz, tb, grad, res);
  if (ga * gb > 0) return S_MISS; // left the domain sideways before crossing
  const side = ga > 0 ? 1 : -1;
  t = 0.5 * (ta + tb);
  for (let it = 0; it < 200; it++) {
    const g = oz + t * dz - s.heightGradient(ox + t * dx, oy + t * dy, grad);
    if (Math.abs(g) <= tol) return finish(ox, oy, oz, dx, dy, dz, t, grad, res);
    if (g * side > 0) ta = t;
    else tb = t;
    const dg = dz - (grad[0]! * dx + grad[1]! * dy);
    let tn = t - g / dg;
    if (!(tn > ta && tn < tb)) tn = 0.5 * (ta + tb);
    if (tn === t || !(tb > ta)) break;
    t = tn;
  }
  return S_NOTCONVERGED;
}

/** Whether the clearance along the ray is strictly monotone: `|dz| > maxSlope·|d_xy|` (see {@link hitSurface}). */
function monotone(s: Surface, dx: number, dy: number, dz: number): boolean {
  const m = s.maxSlope * (1 + 1e-9);
  return dz * dz > m * m * (dx * dx + dy * dy);
}

/**
 * The hit at distance t (point and slopes there) into res[1..5]; res[0] gets `tNext`,
 * the distance one more Newton step would give (t itself when unknown or not finite),
 * which is what a neighbouring ray's warm start should extrapolate from: t is only
 * settled to the tolerance, the step's result to about its square.
 */
function finish(ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, t: number, grad: Float64Array, res: Float64Array, tNext = t): number {
  res[0] = Number.isFinite(tNext) ? tNext : t;
  res[1] = ox + t * dx;
  res[2] = oy + t * dy;
  res[3] = oz + t * dz;
  res[4] = grad[0]!;
  res[5] = grad[1]!;
  return S_OK;
}

/**
 * @internal Trace one unit ray from the camera through the surface to the scene. Writes
 * the scene point (plane: world x, y, z) or the direction of travel (sky: unit vector)
 * into res[0..2] and the surface hit into res[3..5] (its distance, refined as `hitSurface`
 * says, stays in hit[0]);
 * `guess` is an optional starting distance for the surface search. Returns a status code (`ok`, `tir`,
 * `miss`, `notConverged`, or `outside` when the refracted ray never reaches the plane).
 *
 * Refraction is the vector form of Snell's law, `t = η i + (η c1 − √k) n` with the
 * normal facing the ray, `c1 = −n·i`, `k = 1 − η²(1 − c1²)` (total internal reflection
 * when `k < 0`) — the same law as `refract` of the optics area, inlined for the loop.
 */
export function traceRay(ctx: TraceContext, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, hit: Float64Array, res: Float64Array, guess = NaN, warm = true): number {
  if (ctx.surface === null) {
    res[3] = ox;
    res[4] = oy;
    res[5] = oz;
    return toScene(ctx, ox, oy, oz, dx, dy, dz, 1, res, 0);
  }
  const st = hitSurface(ctx, ox, oy, oz, dx, dy, dz, hit, guess, warm);
  if (st !== S_OK) return st;
  res[3] = hit[1]!;
  res[4] = hit[2]!;
  res[5] = hit[3]!;
  return refractToScene(ctx, dx, dy, dz, hit[1]!, hit[2]!, hit[3]!, hit[4]!, hit[5]!, res, 0);
}

/**
 * The unit ray `d` refracted at the surface point `P` of slopes `(p, q)` and carried to
 * the scene: the scene point or direction into out[o..o+2] (see {@link traceRay}).
 *
 * The vector Snell law written on the unnormalised normal `N = ±(−p, −q, 1)` (facing the
 * ray, `N·N = w = 1 + p² + q²`, `cN = N·d ≤ 0`): with the unit normal `N/√w` and
 * `c1 = −cN/√w`, `t = η d + (η c1 − √k)·N/√w` and `k = K/w`, `K = w − η²(w − cN²)`, so
 * `w·t = η w d − (η cN + √K)·N` (total internal reflection when `K < 0`). One square
 * root and no division on the way to the plane; {@link toScene} divides once.
 * Small on purpose, so that the compiler inlines it into the loops that call it.
 */
function refractToScene(ctx: TraceContext, dx: number, dy: number, dz: number, px: number, py: number, pz: number, p: number, q: number, out: Float64Array, o: number): number {
  const w = 1 + p * p + q * q;
  let nx = -p, ny = -q, nz = 1;
  let cn = dz - p * dx - q * dy;
  if (cn > 0) {
    nx = p;
    ny = q;
    nz = -1;
    cn = -cn;
  }
  const eta = ctx.eta;
  const K = w - eta * eta * (w - cn * cn);
  if (K < 0) return S_TIR;
  const f = -eta * cn - Math.sqrt(K);
  const ew = eta * w;
  return toScene(ctx, px, py, pz, ew * dx + f * nx, ew * dy + f * ny, ew * dz + f * nz, w, out, o);
}

/**
 * The ray from P along `t = (tx, ty, tz)/w` (`w` > 0, a scale of the direction's
 * components) to the scene: its point on the plane, or the unit t itself for the sky,
 * into out[o..o+2].
 */
function toScene(ctx: TraceContext, px: number, py: number, pz: number, tx: number, ty: number, tz: number, w: number, out: Float64Array, o: number): number {
  const sc = ctx.scene;
  if (sc.kind === 0) {
    if (!(tz > 0)) return S_OUTSIDE;
    const iw = 1 / w;
    out[o] = tx * iw;
    out[o + 1] = ty * iw;
    out[o + 2] = tz * iw;
    return S_OK;
  }
  const sp = (sc.z - pz) / tz;
  if (!(sp > 0) || !Number.isFinite(sp)) return S_OUTSIDE;
  out[o] = px + sp * tx;
  out[o + 1] = py + sp * ty;
  out[o + 2] = sc.z;
  return S_OK;
}

/** @internal Buffers of {@link traceBatch} for up to `n` rays a call, reused call after call. */
export interface TraceBatchScratch {
  readonly n: number;
  /** Points asked of the surface, packed x, y. */
  readonly xy: Float64Array;
  /** The surface's answers, packed h, p, q. */
  readonly hpq: Float64Array;
  /** Each pending ray's current distance. */
  readonly t: Float64Array;
  /** Pending rays (index into the batch). */
  readonly list: Int32Array;
  readonly hit: Float64Array;
  readonly res: Float64Array;
  readonly grad: Float64Array;
}

/** @internal */
export function traceBatchScratch(n: number): TraceBatchScratch {
  return {
    n,
    xy: new Float64Array(2 * n),
    hpq: new Float64Array(3 * n),
    t: new Float64Array(n),
    list: new Int32Array(n),
    hit: new Float64Array(6),
    res: new Float64Array(6),
    grad: new Float64Array(2),
  };
}

/**
 * @internal {@link traceRay} for the rays `k0 ≤ k < k0 + n` of packed origins `ro`,
 * directions `rd` and camera statuses `rs`, each from the starting distance `guess[e]`
 * (`e = k − k0`; NaN: none). Writes its status into `stat[e]`, the scene point or
 * direction into `pts[3e..3e+2]` and the refined hit distance into `tHit[e]` (NaN when the
 * ray never reached the surface); the results are those of `traceRay` with the same
 * guess.
 *
 * The warm-started Newton steps of {@link hitSurface} are taken for all the rays together,
 * the surface evaluated once a step for all rays still pending
 * ({@link Surface.heightGradientMany}); rays without a guess, whose clearance need not be
 * monotone, or not settled in three steps, go through `traceRay` one by one.
 */
export function traceBatch(
  ctx: TraceContext,
  ro: Float64Array,
  rd: Float64Array,
  rs: Uint8Array,
  k0: number,
  n: number,
  guess: Float64Array,
  stat: Uint8Array,
  pts: Float64Array,
  tHit: Float64Array,
  scr: TraceBatchScratch,
): void {
  const s = ctx.surface;
  const { xy, hpq, t: tt, list, hit, res, grad } = scr;
  if (n > scr.n) rangeError('traceBatch', 'n', n, `at most the scratch size ${scr.n}`);
  // Rays with a guess and a monotone clearance take the warm start together; each pending
  // ray's point xy is written where its distance is set.
  let m = 0;
  for (let e = 0; e < n; e++) {
    const st = rs[k0 + e]!;
    stat[e] = st === S_OK ? S_NOTCONVERGED : st; // S_NOTCONVERGED: pending
    tHit[e] = NaN;
    if (s === null || st !== S_OK) continue;
    const a = 3 * (k0 + e);
    const g = guess[e]!;
    const dx = rd[a]!, dy = rd[a + 1]!;
    if (g === g && monotone(s, dx, dy, rd[a + 2]!)) {
      list[m] = e;
      tt[m] = g;
      xy[2 * m] = ro[a]! + g * dx;
      xy[2 * m + 1] = ro[a + 1]! + g * dy;
      m++;
    }
  }
  if (s !== null) {
    const b = s.bounds;
    // The warm start, three steps at most (as in hitSurface).
    for (let it = 0; it < 3 && m > 0; it++) {
      heightGradientMany(s, xy, m, hpq, grad);
      let m2 = 0;
      for (let l = 0; l < m; l++) {
        const e = list[l]!, a = 3 * (k0 + e), t = tt[l]!;
        const dx = rd[a]!, dy = rd[a + 1]!, dz = rd[a + 2]!;
        const p = hpq[3 * l + 1]!, q = hpq[3 * l + 2]!;
        const g = ro[a + 2]! + t * dz - hpq[3 * l]!;
        const step = g / (dz - (p * dx + q * dy));
        if (Math.abs(g) <= ctx.tol) {
          const x = xy[2 * l]!, y = xy[2 * l + 1]!;
          // Settled; in front of the camera and over the domain it is the only crossing,
          // else the bracketed search decides (left pending).
          if (t >= 0 && x >= b.xMin && x <= b.xMax && y >= b.yMin && y <= b.yMax) {
            const tn = t - step;
            tHit[e] = Number.isFinite(tn) ? tn : t;
            stat[e] = refractToScene(ctx, dx, dy, dz, x, y, ro[a + 2]! + t * dz, p, q, pts, 3 * e);
          }
          continue;
        }
        // still pending (m2 ≤ l: the entries moved down have been read)
        const tn = t - step;
        list[m2] = e;
        tt[m2] = tn;
        xy[2 * m2] = ro[a]! + tn * dx;
        xy[2 * m2 + 1] = ro[a + 1]! + tn * dy;
        m2++;
      }
      m = m2;
    }
  }
  // Everything still pending, one ray at a time; the warm start is not repeated for rays
  // that took it.
  for (let e = 0; e < n; e++) {
    if (stat[e] !== S_NOTCONVERGED) continue;
    const a = 3 * (k0 + e);
    const dx = rd[a]!, dy = rd[a + 1]!, dz = rd[a + 2]!;
    const g = guess[e]!;
    const tookWarm = s !== null && g === g && monotone(s, dx, dy, dz);
    const st = traceRay(ctx, ro[a]!, ro[a + 1]!, ro[a + 2]!, dx, dy, dz, hit, res, g, !tookWarm);
    stat[e] = st;
    if (s !== null && (st === S_OK || st === S_TIR || st === S_OUTSIDE)) tHit[e] = hit[0]!;
    if (st === S_OK) {
      pts[3 * e] = res[0]!;
      pts[3 * e + 1] = res[1]!;
      pts[3 * e + 2] = res[2]!;
    }
  }
}

/**
 * @internal Traces rows of rays that lie one above the other (a camera's pixel rows, a
 * mesh's rows): each ray starts its surface search from the distance extrapolated from
 * the hits of up to four previous rows at the same index (up to cubic: its error is the
 * distance's fourth difference, far below the tolerance on a smooth surface, so most rays
 * settle at their first evaluation), through {@link traceBatch}. A ray that misses the
 * surface breaks its column's history. `reset()` forgets all rows (a new frame).
 */
export interface RowTracer {
  /** Largest row length. */
  readonly n: number;
  reset(): void;
  /**
   * Trace the row of rays `k0 … k0 + n − 1` (`n` ≤ the tracer's size): statuses into
   * `stat[0 … n−1]`, scene points into `pts`, as {@link traceBatch}. Returns the row's hit
   * distances (NaN: no hit), valid until the next call.
   */
  traceRow(ctx: TraceContext, ro: Float64Array, rd: Float64Array, rs: Uint8Array, k0: number, n: number, stat: Uint8Array, pts: Float64Array): Float64Array;
}

/** @internal */
export function createRowTracer(n: number): RowTracer {
  // the last four rows' hit distances by index, newest first (NaN: none)
  let t1 = new Float64Array(n).fill(NaN), t2 = new Float64Array(n).fill(NaN);
  let t3 = new Float64Array(n).fill(NaN), t4 = new Float64Array(n).fill(NaN);
  const guess = new Float64Array(n);
  const batch = traceBatchScratch(n);
  return {
    n,
    reset() {
      t1.fill(NaN);
      t2.fill(NaN);
      t3.fill(NaN);
      t4.fill(NaN);
    },
    traceRow(ctx, ro, rd, rs, k0, m, stat, pts) {
      if (m > n) rangeError('RowTracer.traceRow', 'n', m, `at most the tracer's row length ${n}`);
      for (let i = 0; i < m; i++) {
        const a1 = t1[i]!, a2 = t2[i]!, a3 = t3[i]!, a4 = t4[i]!;
        guess[i] = a4 === a4 ? 4 * a1 - 6 * a2 + 4 * a3 - a4 : a3 === a3 ? 3 * a1 - 3 * a2 + a3 : a2 === a2 ? 2 * a1 - a2 : a1;
      }
      // the oldest row's buffer takes this row's hits
      const tn = t4;
      t4 = t3;
      t3 = t2;
      t2 = t1;
      t1 = tn;
      traceBatch(ctx, ro, rd, rs, k0, m, guess, stat, pts, t1, batch);
      for (let i = 0; i < m; i++) {
        if (!(t1[i]! === t1[i]!)) t2[i] = t3[i] = t4[i] = NaN;
      }
      // indices beyond this row's length have no hit in it
      if (m < n) t1.fill(NaN, m);
      return t1;
    },
  };
}

/** @internal World rays of packed pixels for a camera at a pose. */
export function worldRays(camera: CameraModel, pose: CameraPose, pixels: Float64Array): { origins: Float64Array; directions: Float64Array; status: Uint8Array } {
  const r = camera.unprojectBatch(pixels);
  const n = r.status.length;
  const m = pose.rotation, c = pose.position;
  const o = r.origins, d = r.directions;
  for (let k = 0; k < n; k++) {
    const a = 3 * k;
    if (r.status[k] !== S_OK) continue;
    const x = o[a]!, y = o[a + 1]!, z = o[a + 2]!;
    o[a] = m[0] * x + m[1] * y + m[2] * z + c[0];
    o[a + 1] = m[3] * x + m[4] * y + m[5] * z + c[1];
    o[a + 2] = m[6] * x + m[7] * y + m[8] * z + c[2];
    const u = d[a]!, v = d[a + 1]!, w = d[a + 2]!;
    d[a] = m[0] * u + m[1] * v + m[2] * w;
    d[a + 1] = m[3] * u + m[4] * v + m[5] * w;
    d[a + 2] = m[6] * u + m[7] * v + m[8] * w;
  }
  return { origins: o, directions: d, status: r.status };
}
