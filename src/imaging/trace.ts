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
 * Otherwise the general marching intersector of the surface area is used.
 */
export function hitSurface(ctx: TraceContext, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, res: Float64Array, guess = NaN): number {
  const s = ctx.surface!;
  const b = s.bounds;
  const horiz = Math.sqrt(dx * dx + dy * dy);
  if (!(Math.abs(dz) > s.maxSlope * horiz * (1 + 1e-9))) {
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
  if (guess === guess) {
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
export function traceRay(ctx: TraceContext, ox: number, oy: number, oz: number, dx: number, dy: number, dz: number, hit: Float64Array, res: Float64Array, guess = NaN): number {
  let tx = dx, ty = dy, tz = dz;
  let px = ox, py = oy, pz = oz;
  if (ctx.surface !== null) {
    const st = hitSurface(ctx, ox, oy, oz, dx, dy, dz, hit, guess);
    if (st !== S_OK) return st;
    px = hit[1]!;
    py = hit[2]!;
    pz = hit[3]!;
    const p = hit[4]!, q = hit[5]!;
    const inv = 1 / Math.sqrt(1 + p * p + q * q);
    let nx = -p * inv, ny = -q * inv, nz = inv;
    let c = nx * dx + ny * dy + nz * dz;
    if (c > 0) {
      nx = -nx;
      ny = -ny;
      nz = -nz;
      c = -c;
    }
    const eta = ctx.eta;
    const k = 1 - eta * eta * (1 - c * c);
    if (k < 0) return S_TIR;
    const f = -eta * c - Math.sqrt(k);
    tx = eta * dx + f * nx;
    ty = eta * dy + f * ny;
    tz = eta * dz + f * nz;
  }
  res[3] = px;
  res[4] = py;
  res[5] = pz;
  const sc = ctx.scene;
  if (sc.kind === 0) {
    if (!(tz > 0)) return S_OUTSIDE;
    res[0] = tx;
    res[1] = ty;
    res[2] = tz;
    return S_OK;
  }
  const sp = (sc.z - pz) / tz;
  if (!(sp > 0) || !Number.isFinite(sp)) return S_OUTSIDE;
  res[0] = px + sp * tx;
  res[1] = py + sp * ty;
  res[2] = sc.z;
  return S_OK;
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
