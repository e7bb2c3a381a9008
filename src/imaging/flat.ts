/**
 * The reference view: where a scene point appears to a camera looking through flat water
 * (a horizontal interface at a given level) or through no water at all.
 *
 * @module
 */
import { checkFinite, Status } from '../core/index.js';
import type { CameraModel, CameraPose } from '../camera/index.js';

// Status codes as local constants (read once, not through the module namespace in loops).
const S_OK = Status.ok;
const S_TIR = Status.tir;

/** Through what the corrected image is seen. */
export type CorrectionReference = 'flat' | 'none';

/** @internal Resolved reference geometry. */
export interface FlatContext {
  readonly camera: CameraModel;
  readonly pose: CameraPose;
  readonly flat: boolean;
  readonly level: number;
  /** Index on the camera's side and on the scene's side. */
  readonly n1: number;
  readonly n2: number;
  /** 0 sky, 1 plane. */
  readonly kind: 0 | 1;
  /** Orthographic: the refracted common direction of the camera's rays (flat water). */
  readonly tx: number;
  readonly ty: number;
  readonly tz: number;
  /** Central camera, plane, flat water: r(ρ) and dr/dρ at ρ = k·tableStep, interleaved (Fermat's condition). */
  readonly table: Float64Array | null;
  readonly planeZ: number;
  readonly tableStep: number;
}

const TABLE_SIZE = 16384;

/** Solve n1·r/√(r² + a²) = n2·(ρ − r)/√((ρ − r)² + b²) for r ∈ [0, ρ] from a start value. */
function solveCrossing(n1: number, n2: number, aa: number, bb: number, rho: number, r: number, tol: number, maxIter = 60): number {
  let lo = 0, hi = rho;
  if (!(r > lo && r < hi)) r = (rho * aa) / (aa + bb);
  for (let it = 0; it < maxIter; it++) {
    const s1 = Math.sqrt(r * r + aa * aa);
    const w = rho - r;
    const s2 = Math.sqrt(w * w + bb * bb);
    const g = (n1 * r) / s1 - (n2 * w) / s2;
    if (g > 0) hi = r;
    else lo = r;
    const dg = (n1 * aa * aa) / (s1 * s1 * s1) + (n2 * bb * bb) / (s2 * s2 * s2);
    let rn = r - g / dg;
    if (!(rn > lo && rn < hi)) rn = 0.5 * (lo + hi);
    const done = Math.abs(rn - r) <= tol;
    r = rn;
    if (done || !(hi > lo)) break;
  }
  return r;
}

/** @internal */
export function flatContext(fn: string, camera: CameraModel, pose: CameraPose, flat: boolean, level: number, n1: number, n2: number, kind: 0 | 1, planeZ: number): FlatContext {
  checkFinite(fn, 'options.level', level);
  const m = pose.rotation;
  // The camera's forward axis in the world (third column of camera → world); an
  // orthographic camera's rays all travel along it, and through flat water along its
  // refraction t = η d + (−η c − √k) n, n facing the ray, c = n·d < 0.
  const dx = m[2], dy = m[5], dz = m[8];
  let tx = dx, ty = dy, tz = dz;
  if (flat) {
    const eta = n1 / n2;
    const nz = dz > 0 ? -1 : 1;
    const c = nz * dz;
    const k = 1 - eta * eta * (1 - c * c);
    if (k >= 0) {
      const g = -eta * c - Math.sqrt(k);
      tx = eta * dx;
      ty = eta * dy;
      tz = eta * dz + g * nz;
    } else {
      tx = ty = tz = NaN;
    }
  }
  let table: Float64Array | null = null;
  let tableStep = 0;
  if (flat && kind === 1 && camera.central) {
    const aa = Math.abs(level - pose.position[2]), bb = Math.abs(planeZ - level);
    tableStep = (20 * (aa + bb)) / (TABLE_SIZE - 1);
    table = new Float64Array(2 * TABLE_SIZE);
    let r = 0;
    for (let k = 0; k < TABLE_SIZE; k++) {
      const rho = k * tableStep;
      if (k > 0) r = solveCrossing(n1, n2, aa, bb, rho, r, 1e-14 * (aa + bb));
      // Implicit derivative of g(r, ρ) = 0: dr/dρ = −g_ρ / g_r.
      const s1 = Math.sqrt(r * r + aa * aa);
      const w = rho - r;
      const s2 = Math.sqrt(w * w + bb * bb);
      const gr = (n1 * aa * aa) / (s1 * s1 * s1) + (n2 * bb * bb) / (s2 * s2 * s2);
      const grho = -(n2 * bb * bb) / (s2 * s2 * s2);
      table[2 * k] = r;
      table[2 * k + 1] = -grho / gr;
    }
  }
  return { camera, pose, flat, level, n1, n2, kind, tx, ty, tz, table, tableStep, planeZ };
}

/**
 * The crossing distance r from the table (values r and slopes dr/dρ at spacing `h`) at
 * ρ = (k + t)·h, by cubic Hermite interpolation of entries k and k + 1. Small enough for
 * V8 to inline into the per-point loops.
 */
function tableCrossing(tb: Float64Array, k: number, t: number, h: number): number {
  const t2 = t * t, t3 = t2 * t;
  const p0 = tb[2 * k]!, d0 = tb[2 * k + 1]!, p1 = tb[2 * k + 2]!, d1 = tb[2 * k + 3]!;
  return (2 * t3 - 3 * t2 + 1) * p0 + (t3 - 2 * t2 + t) * h * d0 + (-2 * t3 + 3 * t2) * p1 + (t3 - t2) * h * d1;
}

/**
 * @internal The camera-frame point whose projection is the reference pixel of a scene
 * point (plane: world point a, b, c) or direction (sky: unit direction towards the sky).
 * Writes it into out[o..o+2]; returns a status code.
 *
 * Through flat water and for a central camera, the refraction point P on the level is
 * the root of Fermat's condition along the horizontal line from the camera's nadir to
 * the scene point, `n1·r/√(r² + a²) = n2·(ρ − r)/√((ρ − r)² + b²)` (Snell's law at a
 * plane interface), increasing in r, solved by safeguarded Newton.
 */
export function referencePoint(f: FlatContext, a: number, b: number, c: number, out: Float64Array, o: number): number {
  const m = f.pose.rotation, C = f.pose.position;
  let wx: number, wy: number, wz: number; // world vector from camera centre (central) or world point (orthographic)
  if (f.kind === 0) {
    // Sky: a direction.
    let dx = a, dy = b, dz = c;
    if (f.flat) {
      // Light arrives travelling along −d, enters the water (n2 → n1) through the level.
      const eta = f.n2 / f.n1;
      const cc = dz; // c1 = −n·i with n = (0,0,1), i = −d: c1 = dz
      const k = 1 - eta * eta * (1 - cc * cc);
      if (k < 0) return S_TIR;
      const g = eta * cc - Math.sqrt(k);
      // refracted travel direction: eta·(−d) + g·n, and the camera looks back along it.
      dx = eta * a;
      dy = eta * b;
      dz = eta * c - g;
    }
    wx = dx;
    wy = dy;
    wz = dz;
  } else if (f.camera.central) {
    const cx = C[0], cy = C[1], cz = C[2];
    if (f.flat) {
      const aa = Math.abs(f.level - cz), bb = Math.abs(c - f.level);
      const ex = a - cx, ey = b - cy;
      const rho = Math.sqrt(ex * ex + ey * ey);
      let r = 0;
      if (rho > 0) {
        // Start from the table (linear interpolation), then Newton to ~1e-12 of the scale.
        // Cubic Hermite interpolation of the table (values and exact slopes): its error
        // is of order h⁴·r⁗/384, at rounding level for the table's spacing.
        const tb = f.table;
        let done = false;
        if (tb !== null && Math.abs(c - f.planeZ) <= 1e-12 * (1 + Math.abs(c))) {
          const x = rho * (1 / f.tableStep);
          const k = Math.floor(x);
          if (k < TABLE_SIZE - 1) {
            r = tableCrossing(tb, k, x - k, f.tableStep);
            done = true;
          }
        }
        if (!done) r = solveCrossing(f.n1, f.n2, aa, bb, rho, -1, 1e-12 * (aa + bb));
      }
      const s = rho > 0 ? r * (1 / rho) : 0;
      wx = s * ex;
      wy = s * ey;
      wz = f.level - cz;
    } else {
      wx = a - cx;
      wy = b - cy;
      wz = c - cz;
    }
  } else {
    // Orthographic: move the point back along the common (refracted) direction.
    let px = a, py = b, pz = c;
    if (f.flat) {
      if (!Number.isFinite(f.tz)) return S_TIR;
      const s = (c - f.level) / f.tz;
      px = a - s * f.tx;
      py = b - s * f.ty;
      pz = f.level;
    }
    wx = px - C[0];
    wy = py - C[1];
    wz = pz - C[2];
  }
  out[o] = m[0] * wx + m[3] * wy + m[6] * wz;
  out[o + 1] = m[1] * wx + m[4] * wy + m[7] * wz;
  out[o + 2] = m[2] * wx + m[5] * wy + m[8] * wz;
  return S_OK;
}

/**
 * @internal {@link referencePoint} for `n` scene points at once: the point of batch entry
 * `e` is `pts[3e..3e+2]`, taken where `stat[e]` is `ok`; its camera-frame point goes to
 * `out[3(k0 + e)..]` and a failure into `stat[e]`. The common case the table covers
 * (central camera, flat water, a plane scene at the table's height) has the same numbers
 * as `referencePoint` with the table's cubic Hermite interpolation inlined; everything
 * else, and points beyond the table, go through `referencePoint`.
 */
export function referencePoints(f: FlatContext, pts: Float64Array, stat: Uint8Array, n: number, out: Float64Array, k0: number): void {
  const tb = f.table;
  const tabulated = tb !== null && f.kind === 1;
  const C = f.pose.position, m = f.pose.rotation;
  const cx = C[0], cy = C[1], cz = C[2];
  const m0 = m[0], m1 = m[1], m2 = m[2], m3 = m[3], m4 = m[4], m5 = m[5], m6 = m[6], m7 = m[7], m8 = m[8];
  const h = f.tableStep, ih = 1 / h, wz = f.level - cz;
  for (let e = 0; e < n; e++) {
    if (stat[e] !== S_OK) continue;
    const a = pts[3 * e]!, b = pts[3 * e + 1]!, c = pts[3 * e + 2]!;
    const o = 3 * (k0 + e);
    if (!tabulated || !(Math.abs(c - f.planeZ) <= 1e-12 * (1 + Math.abs(c)))) {
      stat[e] = referencePoint(f, a, b, c, out, o);
      continue;
    }
    const ex = a - cx, ey = b - cy;
    const rho = Math.sqrt(ex * ex + ey * ey);
    let s = 0;
    if (rho > 0) {
      // the reciprocals are taken beside the table's chain, not at its end
      const x = rho * ih, irho = 1 / rho;
      const k = Math.floor(x);
      if (!(k < TABLE_SIZE - 1)) {
        stat[e] = referencePoint(f, a, b, c, out, o);
        continue;
      }
      s = tableCrossing(tb, k, x - k, h) * irho;
    }
    const wx = s * ex, wy = s * ey;
    out[o] = m0 * wx + m3 * wy + m6 * wz;
    out[o + 1] = m1 * wx + m4 * wy + m7 * wz;
    out[o + 2] = m2 * wx + m5 * wy + m8 * wz;
  }
}
