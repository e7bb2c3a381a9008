/**
 * The equidistant fisheye camera of Kannala and Brandt with four coefficients, as in
 * the common open fisheye model.
 *
 * @module
 */
import { checkOptions, checkVec3, Status } from '../core/index.js';
import type { Vec3 } from '../core/index.js';
import { checkImageSize, checkPixel, coefficient, projectBuffers, required, unprojectBuffers } from './model.js';
import type {
  CameraModel,
  CameraRay,
  FisheyeParameters,
  MutablePixel,
  Pixel,
  ProjectBatchOptions,
  ProjectBatchResult,
  UnprojectBatchOptions,
  UnprojectBatchResult,
} from './model.js';

/** Tolerance of the fisheye inverse, radians of θd. */
export const FISHEYE_TOLERANCE = 1e-13;

/**
 * An equidistant fisheye camera (Kannala–Brandt).
 *
 * Forward model, for a camera-frame point (x, y, z): θ = atan2(√(x² + y²), z) (the angle
 * from the optical axis, so fields beyond 90° are allowed), θd = θ (1 + k1 θ² + k2 θ⁴ +
 * k3 θ⁶ + k4 θ⁸), x″ = θd x/√(x² + y²), y″ = θd y/√(x² + y²), u = fx x″ + cx,
 * v = fy y″ + cy. For z > 0 this is exactly the common open fisheye model (θ = atan r
 * with r = |(x/z, y/z)|). There is no skew term.
 *
 * **Valid field.** θ ≤ `maxTheta`: the first turning point of θd(θ), capped just below π.
 * Unprojection solves θd(θ) = |(x″, y″)| on [0, maxTheta] by safeguarded Newton
 * (bisection fallback) to {@link FISHEYE_TOLERANCE}; it always converges inside the field
 * because θd is monotonic there, and pixels beyond θd(maxTheta) are `outside`.
 *
 * @see Kannala, J. & Brandt, S. S. (2006), "A generic camera model and calibration method
 *   for conventional, wide-angle, and fish-eye lenses", IEEE TPAMI 28(8), 1335–1340, eq. 6.
 * @example
 * ```ts
 * const cam = new FisheyeCamera({ model: 'fisheye', fx: 300, fy: 300, cx: 640, cy: 480, k1: 0.02 });
 * cam.project([1, 0, 0.2]); // a point 79° off axis
 * ```
 */
export class FisheyeCamera implements CameraModel {
  readonly model = 'fisheye' as const;
  readonly central = true;
  readonly width: number | undefined;
  readonly height: number | undefined;
  /** Focal length along u, pixels per radian. */
  readonly fx: number;
  /** Focal length along v, pixels per radian. */
  readonly fy: number;
  /** Principal point u, pixels. */
  readonly cx: number;
  /** Principal point v, pixels. */
  readonly cy: number;
  /** Coefficient of θ³. */
  readonly k1: number;
  /** Coefficient of θ⁵. */
  readonly k2: number;
  /** Coefficient of θ⁷. */
  readonly k3: number;
  /** Coefficient of θ⁹. */
  readonly k4: number;
  /** The largest angle from the optical axis in the valid field, radians. */
  readonly maxTheta: number;
  private readonly maxThetaD: number;

  /**
   * @param params - Focal lengths, principal point and coefficients.
   * @throws {@link core!MeniscusRangeError} for a focal length ≤ 0 or a non-finite parameter;
   *   {@link core!MeniscusTypeError} for a parameter of the wrong type.
   */
  constructor(params: FisheyeParameters) {
    const fn = 'FisheyeCamera';
    const p = checkOptions(fn, params, 'params');
    this.fx = required(fn, 'fx', p.fx, true);
    this.fy = required(fn, 'fy', p.fy, true);
    this.cx = required(fn, 'cx', p.cx, false);
    this.cy = required(fn, 'cy', p.cy, false);
    this.k1 = coefficient(fn, 'k1', p.k1);
    this.k2 = coefficient(fn, 'k2', p.k2);
    this.k3 = coefficient(fn, 'k3', p.k3);
    this.k4 = coefficient(fn, 'k4', p.k4);
    [this.width, this.height] = checkImageSize(fn, p.width, p.height);
    this.maxTheta = this.findMaxTheta();
    this.maxThetaD = this.thetaD(this.maxTheta);
  }

  private thetaD(t: number): number {
    const t2 = t * t;
    return t * (1 + t2 * (this.k1 + t2 * (this.k2 + t2 * (this.k3 + t2 * this.k4))));
  }

  private thetaDSlope(t: number): number {
    const t2 = t * t;
    return 1 + t2 * (3 * this.k1 + t2 * (5 * this.k2 + t2 * (7 * this.k3 + t2 * 9 * this.k4)));
  }

  private findMaxTheta(): number {
    const cap = Math.PI * (1 - 1e-9);
    const steps = 4000;
    let prev = 0;
    for (let i = 1; i <= steps; i++) {
      const t = (cap * i) / steps;
      if (!(this.thetaDSlope(t) > 0)) {
        let lo = prev, hi = t;
        for (let k = 0; k < 100; k++) {
          const mid = 0.5 * (lo + hi);
          if (this.thetaDSlope(mid) > 0) lo = mid;
          else hi = mid;
        }
        return lo;
      }
      prev = t;
    }
    return cap;
  }

  /**
   * The pixel of a camera-frame point (see the class notes).
   *
   * @param point - `[x, y, z]`, camera frame, metres (not the origin).
   * @returns `[u, v]`, or `null` beyond the valid field (or on the backward axis).
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad point.
   */
  project(point: Vec3): MutablePixel | null {
    const q = checkVec3('FisheyeCamera.project', 'point', point);
    const out: MutablePixel = [0, 0];
    return this.projectKernel(q[0], q[1], q[2], out) === Status.ok ? out : null;
  }

  private projectKernel(x: number, y: number, z: number, out: MutablePixel | Float64Array, at = 0): number {
    const rho = Math.hypot(x, y);
    if (rho === 0) {
      if (!(z > 0)) return Status.outside;
      out[at] = this.cx;
      out[at + 1] = this.cy;
      return Status.ok;
    }
    const t = Math.atan2(rho, z);
    if (!(t <= this.maxTheta)) return Status.outside;
    // θd · (x/ρ): the unit direction first, so that a subnormal ρ cannot overflow to ∞ · 0
    const s = this.thetaD(t);
    out[at] = this.fx * s * (x / rho) + this.cx;
    out[at + 1] = this.fy * s * (y / rho) + this.cy;
    return Status.ok;
  }

  /**
   * {@link FisheyeCamera.project} for packed points `xyz xyz …`.
   *
   * @returns Packed pixels and a status a point.
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  projectBatch(points: Float64Array, options?: ProjectBatchOptions): ProjectBatchResult {
    const res = projectBuffers('FisheyeCamera.projectBatch', points, options);
    for (let i = 0; i < res.status.length; i++) {
      const s = this.projectKernel(points[3 * i]!, points[3 * i + 1]!, points[3 * i + 2]!, res.pixels, 2 * i);
      res.status[i] = s;
      if (s !== Status.ok) {
        res.pixels[2 * i] = NaN;
        res.pixels[2 * i + 1] = NaN;
      }
    }
    return res;
  }

  /** θ for a given θd in [0, maxThetaD]. */
  private solveTheta(td: number): number {
    let lo = 0, hi = this.maxTheta;
    let t = Math.min(td, hi);
    for (let it = 0; it < 100; it++) {
      const f = this.thetaD(t) - td;
      if (Math.abs(f) <= FISHEYE_TOLERANCE) return t;
      if (f > 0) hi = t;
      else lo = t;
      let next = t - f / this.thetaDSlope(t);
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      t = next;
      if (hi - lo <= 1e-16) return t;
    }
    return t;
  }

  private unprojectKernel(u: number, v: number, d: Float64Array | number[], at: number): number {
    const xd = (u - this.cx) / this.fx, yd = (v - this.cy) / this.fy;
    const td = Math.hypot(xd, yd);
    if (!(td <= this.maxThetaD)) return Status.outside;
    if (td === 0) {
      d[at] = 0;
      d[at + 1] = 0;
      d[at + 2] = 1;
      return Status.ok;
    }
    const t = this.solveTheta(td);
    const st = Math.sin(t) / td;
    d[at] = st * xd;
    d[at + 1] = st * yd;
    d[at + 2] = Math.cos(t);
    return Status.ok;
  }

  /**
   * The ray of a pixel (see the class notes).
   *
   * @param pixel - `[u, v]`.
   * @returns The ray from the camera centre, or `null` beyond the valid field.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad pixel.
   */
  unproject(pixel: Pixel): CameraRay | null {
    const p = checkPixel('FisheyeCamera.unproject', 'pixel', pixel);
    const d = [0, 0, 0];
    if (this.unprojectKernel(p[0], p[1], d, 0) !== Status.ok) return null;
    return { origin: [0, 0, 0], direction: [d[0]!, d[1]!, d[2]!] };
  }

  /**
   * {@link FisheyeCamera.unproject} for packed pixels `uv uv …`.
   *
   * @returns Origins (all zero), unit directions and a status a pixel.
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  unprojectBatch(pixels: Float64Array, options?: UnprojectBatchOptions): UnprojectBatchResult {
    const res = unprojectBuffers('FisheyeCamera.unprojectBatch', pixels, options);
    for (let i = 0; i < res.status.length; i++) {
      const s = this.unprojectKernel(pixels[2 * i]!, pixels[2 * i + 1]!, res.directions, 3 * i);
      res.status[i] = s;
      if (s === Status.ok) res.origins.fill(0, 3 * i, 3 * i + 3);
      else {
        res.origins.fill(NaN, 3 * i, 3 * i + 3);
        res.directions.fill(NaN, 3 * i, 3 * i + 3);
      }
    }
    return res;
  }

  /**
   * The parameters as a plain JSON object.
   *
   * @returns The parameters.
   */
  toJSON(): FisheyeParameters {
    const j: FisheyeParameters = { model: 'fisheye', fx: this.fx, fy: this.fy, cx: this.cx, cy: this.cy, k1: this.k1, k2: this.k2, k3: this.k3, k4: this.k4 };
    if (this.width !== undefined) j.width = this.width;
    if (this.height !== undefined) j.height = this.height;
    return j;
  }
}
