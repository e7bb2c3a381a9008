/**
 * The forward model: for a surface and a guide light, the ray that refracts at the
 * surface and passes through each aperture, where it crossed the surface, and where its
 * spot falls on the detection plane.
 *
 * @module
 */
import { checkOptions, checkPositive, checkInteger, Status, typeError } from '../core/index.js';
import type { MutableVec3 } from '../core/index.js';
import { normalFromSlopes, refract } from '../optics/index.js';
import { checkSurface, createPlaneSurface, intersectSurface } from '../surface/index.js';
import type { Surface } from '../surface/index.js';
import type { GuideLight } from '../sun/index.js';
import type { SensorGeometry } from './geometry.js';
import type { SpotReference } from './match.js';

/** Options of {@link traceSpots} and {@link referenceSpots}. */
export interface TraceSpotsOptions {
  /** Largest accepted miss of the aperture by the traced ray, metres. @defaultValue 1e-11 */
  tolerance?: number;
  /** Newton iterations per aperture before `notConverged`. @defaultValue 60 */
  maxIterations?: number;
}

/** The traced path of the light through each aperture. Entries without light hold NaN. */
export interface SpotTrace {
  /** The aperture array traced. */
  readonly geometry: SensorGeometry;
  /** Spot x on the detection plane, metres (plane coordinates). */
  readonly x: Float64Array;
  /** Spot y on the detection plane, metres. */
  readonly y: Float64Array;
  /** Where each ray crossed the surface, packed xyz, world frame, metres. */
  readonly crossings: Float64Array;
  /** The in-water direction of each ray (unit, travelling down), packed xyz, world frame. */
  readonly directions: Float64Array;
  /** Path length in water from the aperture to the plane, metres. */
  readonly pathToPlane: Float64Array;
  /**
   * Per aperture: `Status.ok`; `Status.tir` (no refracted ray exists at the solution);
   * `Status.miss` (no crossing on the surface's domain); `Status.blocked` (the light runs
   * back up, meets the surface again on its way, or misses the detection plane);
   * `Status.notConverged`.
   */
  readonly status: Uint8Array;
}

interface Frame {
  ax: number;
  ay: number;
  az: number;
  m: MutableVec3;
  e1: MutableVec3;
  e2: MutableVec3;
}

const GRAD = new Float64Array(2);

/** Residual of a crossing guess (x, y): where its refracted ray meets the mask plane, minus the aperture, in mask axes. */
function residual(surface: Surface, light: GuideLight, nAir: number, nWater: number, f: Frame, x: number, y: number, out: Float64Array): number {
  const h = surface.heightGradient(x, y, GRAD);
  const n = normalFromSlopes(GRAD[0]!, GRAD[1]!);
  const L = light.toLight([x, y, h]);
  const t = refract([-L[0], -L[1], -L[2]], n, nAir, nWater);
  if (t === null) return Status.tir;
  const tm = t[0] * f.m[0] + t[1] * f.m[1] + t[2] * f.m[2];
  const dx = f.ax - x, dy = f.ay - y, dz = f.az - h;
  const above = dx * f.m[0] + dy * f.m[1] + dz * f.m[2];
  if (!(tm < 0) || !(above < 0)) return Status.blocked;
  const s = above / tm;
  const px = x + s * t[0] - f.ax, py = y + s * t[1] - f.ay, pz = h + s * t[2] - f.az;
  out[0] = px * f.e1[0] + py * f.e1[1] + pz * f.e1[2];
  out[1] = px * f.e2[0] + py * f.e2[1] + pz * f.e2[2];
  out[2] = t[0];
  out[3] = t[1];
  out[4] = t[2];
  out[5] = h;
  return Status.ok;
}

function traceInto(
  geometry: SensorGeometry,
  surface: Surface,
  light: GuideLight,
  tol: number,
  maxIt: number,
): SpotTrace {
  const a = geometry.apertures;
  const n = a.count;
  const X = new Float64Array(n).fill(NaN), Y = new Float64Array(n).fill(NaN);
  const crossings = new Float64Array(3 * n).fill(NaN), directions = new Float64Array(3 * n).fill(NaN);
  const pathToPlane = new Float64Array(n).fill(NaN);
  const status = new Uint8Array(n);
  const R = geometry.rotation;
  const m: MutableVec3 = [R[2], R[5], R[8]];
  const e1: MutableVec3 = [R[0], R[3], R[6]];
  const e2: MutableVec3 = [R[1], R[4], R[7]];
  const c = geometry.centre;
  const P0: MutableVec3 = [c[0] - geometry.planeDistance * m[0], c[1] - geometry.planeDistance * m[1], c[2] - geometry.planeDistance * m[2]];
  const { nAir, nWater } = geometry;
  const b = surface.bounds;
  const scale = Math.max(a.pitch, geometry.maskDepth);
  const r0 = new Float64Array(6), r1 = new Float64Array(6), r2 = new Float64Array(6), rt = new Float64Array(6);
  const flatN: MutableVec3 = [0, 0, 1];
  for (let k = 0; k < n; k++) {
    const f: Frame = { ax: geometry.apertureWorld[3 * k]!, ay: geometry.apertureWorld[3 * k + 1]!, az: geometry.apertureWorld[3 * k + 2]!, m, e1, e2 };
    // Start: the flat-water ray through the aperture, followed up to the surface.
    const L0 = light.toLight([f.ax, f.ay, f.az]);
    const t0 = refract([-L0[0], -L0[1], -L0[2]], flatN, nAir, nWater);
    if (t0 === null) {
      status[k] = Status.tir;
      continue;
    }
    const hit0 = intersectSurface(surface, [f.ax, f.ay, f.az], [-t0[0], -t0[1], -t0[2]]);
    if (hit0.status !== 'ok') {
      status[k] = hit0.status === 'miss' ? Status.miss : Status.notConverged;
      continue;
    }
    let x = hit0.point[0], y = hit0.point[1];
    let st = residual(surface, light, nAir, nWater, f, x, y, r0);
    if (st !== Status.ok) {
      status[k] = st;
      continue;
    }
    let norm = Math.hypot(r0[0]!, r0[1]!);
    let it = 0;
    let ok = norm <= tol;
    while (!ok && it++ < maxIt) {
      // Central-difference Jacobian of the residual with respect to (x, y).
      const h = 1e-6 * scale;
      if (residual(surface, light, nAir, nWater, f, x + h, y, r1) !== Status.ok || residual(surface, light, nAir, nWater, f, x - h, y, r2) !== Status.ok) break;
      const j00 = (r1[0]! - r2[0]!) / (2 * h), j10 = (r1[1]! - r2[1]!) / (2 * h);
      if (residual(surface, light, nAir, nWater, f, x, y + h, r1) !== Status.ok || residual(surface, light, nAir, nWater, f, x, y - h, r2) !== Status.ok) break;
      const j01 = (r1[0]! - r2[0]!) / (2 * h), j11 = (r1[1]! - r2[1]!) / (2 * h);
      const det = j00 * j11 - j01 * j10;
      if (!(Math.abs(det) > 0)) break;
      let sx = -(j11 * r0[0]! - j01 * r0[1]!) / det;
      let sy = -(-j10 * r0[0]! + j00 * r0[1]!) / det;
      // Safeguard: halve the step until the residual falls.
      let accepted = false;
      for (let half = 0; half < 30; half++) {
        const nx = x + sx, ny = y + sy;
        if (nx >= b.xMin && nx <= b.xMax && ny >= b.yMin && ny <= b.yMax && residual(surface, light, nAir, nWater, f, nx, ny, rt) === Status.ok) {
          const nn = Math.hypot(rt[0]!, rt[1]!);
          if (nn < norm) {
            x = nx;
            y = ny;
            r0.set(rt);
            norm = nn;
            accepted = true;
            break;
          }
        }
        sx *= 0.5;
        sy *= 0.5;
      }
      if (!accepted) break;
      ok = norm <= tol;
    }
    if (!ok) {
      status[k] = Status.notConverged;
      continue;
    }
    st = residual(surface, light, nAir, nWater, f, x, y, r0);
    const tx = r0[2]!, ty = r0[3]!, tz = r0[4]!, hz = r0[5]!;
    // The light must reach the aperture without meeting the surface again.
    const hit = intersectSurface(surface, [f.ax, f.ay, f.az], [-tx, -ty, -tz]);
    if (hit.status === 'ok' && Math.hypot(hit.point[0] - x, hit.point[1] - y, hit.point[2] - hz) > 1e-6 * scale) {
      status[k] = Status.blocked;
      continue;
    }
    crossings[3 * k] = x;
    crossings[3 * k + 1] = y;
    crossings[3 * k + 2] = hz;
    directions[3 * k] = tx;
    directions[3 * k + 1] = ty;
    directions[3 * k + 2] = tz;
    // On to the detection plane.
    const tm = tx * m[0] + ty * m[1] + tz * m[2];
    const s = ((P0[0] - f.ax) * m[0] + (P0[1] - f.ay) * m[1] + (P0[2] - f.az) * m[2]) / tm;
    const sx = f.ax + s * tx - P0[0], sy = f.ay + s * ty - P0[1], sz = f.az + s * tz - P0[2];
    const u = sx * e1[0] + sy * e1[1] + sz * e1[2], v = sx * e2[0] + sy * e2[1] + sz * e2[2];
    pathToPlane[k] = s;
    if (!(Math.abs(u) <= geometry.planeHalfSize[0] && Math.abs(v) <= geometry.planeHalfSize[1])) {
      status[k] = Status.blocked;
      continue;
    }
    X[k] = u;
    Y[k] = v;
    status[k] = Status.ok;
  }
  return { geometry, x: X, y: Y, crossings, directions, pathToPlane, status };
}

function settings(fn: string, options: TraceSpotsOptions | undefined): { tol: number; maxIt: number } {
  const o = checkOptions(fn, options);
  return {
    tol: o.tolerance === undefined ? 1e-11 : checkPositive(fn, 'options.tolerance', o.tolerance),
    maxIt: o.maxIterations === undefined ? 60 : checkInteger(fn, 'options.maxIterations', o.maxIterations, 1, 100000),
  };
}

function checkLight(fn: string, light: unknown): GuideLight {
  const l = light as Partial<GuideLight> | null;
  if (l === null || typeof l !== 'object' || typeof l.toLight !== 'function' || typeof l.angularRadius !== 'function') {
    typeError(fn, 'light', light, 'a GuideLight (createSunLight, createCollimatedLight, createPointLight)');
  }
  return l as GuideLight;
}

function checkGeometry(fn: string, geometry: unknown): SensorGeometry {
  const g = geometry as Partial<SensorGeometry> | null;
  if (g === null || typeof g !== 'object' || !(g.apertureWorld instanceof Float64Array) || g.apertures === undefined) {
    typeError(fn, 'geometry', geometry, 'a SensorGeometry from createSensorGeometry');
  }
  return g as SensorGeometry;
}

/**
 * Trace the light of a guide light through a surface and each aperture onto the
 * detection plane.
 *
 * For each aperture the crossing point `(x, y)` on the surface is solved so that the
 * light refracted there (vector Snell law at the surface's true normal, the light's
 * direction at that point) passes through the aperture: a 2-D Newton iteration on the
 * ray's miss of the aperture in the mask plane, started from the flat-water ray followed
 * up to the surface, with a central-difference Jacobian and step halving. No small-slope
 * approximation is made. The chief ray through the aperture's centre defines the spot;
 * with lenslets it is undeviated by the lens.
 *
 * @param geometry - The sensor.
 * @param surface - Any surface of the surface interface.
 * @param light - The guide light.
 * @param options - Tolerance and iteration cap.
 * @returns Spots, crossings, in-water directions and a status per aperture.
 * @throws {@link core!MeniscusTypeError} for a malformed geometry, surface or light;
 *   {@link core!MeniscusRangeError} for bad options.
 * @see Snell's law in vector form: Glassner, A. (1989), An Introduction to Ray Tracing;
 *   Moisy, F., Rabaud, M. & Salsac, K. (2009), "A synthetic Schlieren method for the
 *   measurement of the topography of a liquid interface", Experiments in Fluids 46, 1021
 *   (the refraction geometry of a slope sensor through a free surface).
 * @example
 * ```ts
 * const tr = traceSpots(geometry, sea, createCollimatedLight([0, 0, 1]));
 * tr.x[0], tr.y[0], tr.status[0];
 * ```
 */
export function traceSpots(geometry: SensorGeometry, surface: Surface, light: GuideLight, options?: TraceSpotsOptions): SpotTrace {
  const fn = 'traceSpots';
  const g = checkGeometry(fn, geometry);
  const s = checkSurface(fn, 'surface', surface);
  const l = checkLight(fn, light);
  const { tol, maxIt } = settings(fn, options);
  return traceInto(g, s, l, tol, maxIt);
}

/**
 * The flat-water reference: where each aperture's spot falls when the water is at rest
 * (`z = 0`), for a guide light. These are the positions spot shifts are measured from.
 *
 * @param geometry - The sensor.
 * @param light - The guide light.
 * @param options - Tolerance and iteration cap.
 * @returns The reference (plane coordinates, metres) with a status per aperture, as
 *   {@link matchSpots} takes it.
 * @throws As {@link traceSpots}.
 * @example
 * ```ts
 * const ref = referenceSpots(geometry, createCollimatedLight([0.2, 0, 1]));
 * ```
 */
export function referenceSpots(geometry: SensorGeometry, light: GuideLight, options?: TraceSpotsOptions): SpotReference & { readonly trace: SpotTrace } {
  const fn = 'referenceSpots';
  const g = checkGeometry(fn, geometry);
  const l = checkLight(fn, light);
  const { tol, maxIt } = settings(fn, options);
  const flat = flatSurface(g);
  const trace = traceInto(g, flat, l, tol, maxIt);
  return { apertures: g.apertures, x: trace.x, y: trace.y, status: trace.status, trace };
}

/** @internal The mean level as a surface, with a domain wide enough for any ray of the sensor. */
export function flatSurface(g: SensorGeometry): Surface {
  const a = g.apertures;
  let r = 0;
  for (let k = 0; k < a.count; k++) r = Math.max(r, Math.hypot(a.positions[2 * k]!, a.positions[2 * k + 1]!));
  const span = r + 1000 * (g.maskDepth + g.planeDistance) + a.pitch;
  const c = g.centre;
  return createPlaneSurface({ domain: { xMin: c[0] - span, xMax: c[0] + span, yMin: c[1] - span, yMax: c[1] + span } });
}
