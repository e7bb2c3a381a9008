/**
 * The pinhole camera with Brown–Conrady radial and tangential distortion, in the common
 * open coefficient order (k1, k2, p1, p2, k3, and the rational k4, k5, k6).
 *
 * @module
 */
import { checkOptions, checkVec3, Status } from '../core/index.js';
import type { Vec3 } from '../core/index.js';
import {
  checkImageSize,
  checkPixel,
  coefficient,
  projectBuffers,
  required,
  unprojectBuffers,
} from './model.js';
import type {
  CameraModel,
  CameraRay,
  MutablePixel,
  PinholeParameters,
  Pixel,
  ProjectBatchOptions,
  ProjectBatchResult,
  UnprojectBatchOptions,
  UnprojectBatchResult,
} from './model.js';

/** Tolerance of the inverse distortion, in normalised image coordinates (|Δ| of x″, y″). */
export const UNDISTORT_TOLERANCE = 1e-12;

// Status codes as local constants (read once, not through the module namespace in loops).
const S_OK = Status.ok;
const S_OUTSIDE = Status.outside;

/** Iteration cap of the inverse distortion. */
export const UNDISTORT_MAX_ITERATIONS = 50;

/** The largest normalised radius r = |(x/z, y/z)| searched for the valid field (about 89.4°). */
export const PINHOLE_FIELD_SEARCH_RADIUS = 100;

/**
 * A pinhole camera with Brown–Conrady distortion.
 *
 * Forward model, for a camera-frame point (x, y, z) with z > 0: x′ = x/z, y′ = y/z,
 * r² = x′² + y′², radial = (1 + k1 r² + k2 r⁴ + k3 r⁶)/(1 + k4 r² + k5 r⁴ + k6 r⁶),
 * x″ = x′·radial + 2 p1 x′y′ + p2 (r² + 2x′²), y″ = y′·radial + p1 (r² + 2y′²) + 2 p2 x′y′,
 * u = fx x″ + cx, v = fy y″ + cy.
 *
 * **Valid field.** The radial map r ↦ r·radial(r) is monotonic only up to a radius
 * (`fieldRadius`, found once at construction as its first turning point, or a pole of
 * the rational denominator); beyond it the distortion folds back and the model means
 * nothing. Points beyond are `outside`. With no turning point up to r = 100 the field is
 * unlimited when all coefficients are zero and r ≤ 100 otherwise.
 *
 * **Unprojection** solves the forward model for (x′, y′) by Newton's method with the
 * analytic Jacobian (started at the distorted coordinates, steps halved to stay inside
 * the field), until the residual is below {@link UNDISTORT_TOLERANCE} in normalised units
 * (about 1e-9 px for a 1000 px focal length) within {@link UNDISTORT_MAX_ITERATIONS}; a
 * pixel whose solution lies beyond the field (or, without tangential terms, whose
 * distorted radius exceeds `maxDistortedRadius`) is `outside`; one that does not
 * converge is `notConverged`.
 *
 * @see Brown, D. C. (1966), "Decentering distortion of lenses", Photogrammetric
 *   Engineering 32(3), 444–462; Conrady, A. E. (1919), "Decentred lens-systems",
 *   Monthly Notices of the Royal Astronomical Society 79, 384–390.
 * @example
 * ```ts
 * const cam = new PinholeCamera({ model: 'pinhole', fx: 800, fy: 800, cx: 319.5, cy: 239.5, k1: -0.1 });
 * const px = cam.project([0.1, 0.05, 1]);   // [u, v]
 * const ray = cam.unproject(px!);           // direction ∥ [0.1, 0.05, 1]
 * ```
 */
export class PinholeCamera implements CameraModel {
  readonly model = 'pinhole' as const;
  readonly central = true;
  readonly width: number | undefined;
  readonly height: number | undefined;
  /** Focal length along u, pixels. */
  readonly fx: number;
  /** Focal length along v, pixels. */
  readonly fy: number;
  /** Principal point u, pixels. */
  readonly cx: number;
  /** Principal point v, pixels. */
  readonly cy: number;
  /** Radial coefficient of r². */
  readonly k1: number;
  /** Radial coefficient of r⁴. */
  readonly k2: number;
  /** First tangential coefficient. */
  readonly p1: number;
  /** Second tangential coefficient. */
  readonly p2: number;
  /** Radial coefficient of r⁶. */
  readonly k3: number;
  /** Rational denominator coefficient of r². */
  readonly k4: number;
  /** Rational denominator coefficient of r⁴. */
  readonly k5: number;
  /** Rational denominator coefficient of r⁶. */
  readonly k6: number;
  /** The valid field's limit on the normalised undistorted radius r (may be Infinity). */
  readonly fieldRadius: number;
  /**
   * The largest distorted normalised radius |(x″, y″)| of the valid field without
   * tangential terms (Infinity for an unlimited field); pixels beyond it are `outside`
   * when p1 = p2 = 0.
   */
  readonly maxDistortedRadius: number;
  private readonly fieldRadius2: number;
  private readonly distorted: boolean;
  private readonly tangential: boolean;

  /**
   * @param params - Focal lengths, principal point and distortion coefficients.
   * @throws {@link core!MeniscusRangeError} for a focal length ≤ 0 or a non-finite parameter;
   *   {@link core!MeniscusTypeError} for a parameter of the wrong type.
   */
  constructor(params: PinholeParameters) {
    const fn = 'PinholeCamera';
    const p = checkOptions(fn, params, 'params');
    this.fx = required(fn, 'fx', p.fx, true);
    this.fy = required(fn, 'fy', p.fy, true);
    this.cx = required(fn, 'cx', p.cx, false);
    this.cy = required(fn, 'cy', p.cy, false);
    this.k1 = coefficient(fn, 'k1', p.k1);
    this.k2 = coefficient(fn, 'k2', p.k2);
    this.p1 = coefficient(fn, 'p1', p.p1);
    this.p2 = coefficient(fn, 'p2', p.p2);
    this.k3 = coefficient(fn, 'k3', p.k3);
    this.k4 = coefficient(fn, 'k4', p.k4);
    this.k5 = coefficient(fn, 'k5', p.k5);
    this.k6 = coefficient(fn, 'k6', p.k6);
    [this.width, this.height] = checkImageSize(fn, p.width, p.height);
    this.distorted = [this.k1, this.k2, this.p1, this.p2, this.k3, this.k4, this.k5, this.k6].some((c) => c !== 0);
    this.fieldRadius = this.distorted ? this.findFieldRadius() : Infinity;
    this.fieldRadius2 = this.fieldRadius * this.fieldRadius;
    this.tangential = this.p1 !== 0 || this.p2 !== 0;
    const s = this.fieldRadius2;
    this.maxDistortedRadius = Number.isFinite(s)
      ? (this.fieldRadius * (1 + s * (this.k1 + s * (this.k2 + s * this.k3)))) / (1 + s * (this.k4 + s * (this.k5 + s * this.k6)))
      : Infinity;
  }

  /** d/dr of r·radial(r), and the denominator, at r. */
  private radialSlope(r: number): [number, number] {
    const s = r * r;
    const N = 1 + s * (this.k1 + s * (this.k2 + s * this.k3));
    const D = 1 + s * (this.k4 + s * (this.k5 + s * this.k6));
    const Np = this.k1 + s * (2 * this.k2 + 3 * s * this.k3);
    const Dp = this.k4 + s * (2 * this.k5 + 3 * s * this.k6);
    return [N / D + (2 * s * (Np * D - N * Dp)) / (D * D), D];
  }

  private findFieldRadius(): number {
    const steps = 20000;
    let prev = 0;
    for (let i = 1; i <= steps; i++) {
      // Quadratic spacing: fine near the centre where real lenses turn.
      const r = PINHOLE_FIELD_SEARCH_RADIUS * (i / steps) ** 2;
      const [slope, den] = this.radialSlope(r);
      if (!(slope > 0) || !(den > 0)) {
        let lo = prev, hi = r;
        for (let k = 0; k < 100; k++) {
          const mid = 0.5 * (lo + hi);
          const [sm, dm] = this.radialSlope(mid);
          if (sm > 0 && dm > 0) lo = mid;
          else hi = mid;
        }
        return lo;
      }
      prev = r;
    }
    return PINHOLE_FIELD_SEARCH_RADIUS;
  }

  /**
   * The pixel of a camera-frame point (see the class notes for the model).
   *
   * @param point - `[x, y, z]`, camera frame, metres.
   * @returns `[u, v]`, or `null` when z ≤ 0 or the point is beyond the valid field.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad point.
   */
  project(point: Vec3): MutablePixel | null {
    const q = checkVec3('PinholeCamera.project', 'point', point);
    const out = new Float64Array(2);
    const st = new Uint8Array(1);
    this.projectBatch(new Float64Array([q[0], q[1], q[2]]), { out, status: st });
    return st[0] === Status.ok ? [out[0]!, out[1]!] : null;
  }

  /**
   * {@link PinholeCamera.project} for packed points `xyz xyz …`.
   *
   * @param points - Packed camera-frame points, metres.
   * @param options - Optional output buffers.
   * @returns Packed pixels and a status a point (`ok` or `outside`).
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  projectBatch(points: Float64Array, options?: ProjectBatchOptions): ProjectBatchResult {
    const res = projectBuffers('PinholeCamera.projectBatch', points, options);
    const out = res.pixels, st = res.status;
    const { fx, fy, cx, cy, k1, k2, k3, k4, k5, k6, p1, p2 } = this;
    const lim = this.fieldRadius2;
    const n = st.length;
    const OK = S_OK, OUTSIDE = S_OUTSIDE;
    if (!this.distorted) {
      // The same numbers without the distortion terms (all zero): u = fx·x′ + cx. A loop of
      // its own: one loop with a per-point branch between the two forms measured slower.
      for (let i = 0, j = 0, k = 0; i < n; i++, j += 2, k += 3) {
        const z = points[k + 2]!;
        const iz = 1 / z;
        const x = points[k]! * iz, y = points[k + 1]! * iz;
        const s = x * x + y * y;
        const u = fx * x + cx, v = fy * y + cy;
        // s overflowing is outside, as in the general form (whose terms then give NaN)
        if (!(z > 0 && s <= lim && s < Infinity) || !Number.isFinite(u) || !Number.isFinite(v)) {
          out[j] = NaN;
          out[j + 1] = NaN;
          st[i] = OUTSIDE;
          continue;
        }
        out[j] = u;
        out[j + 1] = v;
        st[i] = OK;
      }
      return res;
    }
    const rational = k4 !== 0 || k5 !== 0 || k6 !== 0;
    const tp1 = 2 * p1, tp2 = 2 * p2;
    for (let i = 0, j = 0, k = 0; i < n; i++, j += 2, k += 3) {
      const z = points[k + 2]!;
      const iz = 1 / z;
      const x = points[k]! * iz, y = points[k + 1]! * iz;
      const s = x * x + y * y;
      if (!(z > 0 && s <= lim)) {
        out[j] = NaN;
        out[j + 1] = NaN;
        st[i] = OUTSIDE;
        continue;
      }
      let radial = 1 + s * (k1 + s * (k2 + s * k3));
      if (rational) radial /= 1 + s * (k4 + s * (k5 + s * k6));
      const xy = x * y;
      const u = fx * (x * radial + tp1 * xy + p2 * (s + 2 * x * x)) + cx;
      const v = fy * (y * radial + p1 * (s + 2 * y * y) + tp2 * xy) + cy;
      if (!Number.isFinite(u) || !Number.isFinite(v)) {
        // so far off axis that the pixel overflows (no field limit without distortion)
        out[j] = NaN;
        out[j + 1] = NaN;
        st[i] = OUTSIDE;
        continue;
      }
      out[j] = u;
      out[j + 1] = v;
      st[i] = OK;
    }
    return res;
  }

  /**
   * Undistort normalised coordinates in place: `io = [x″, y″]` → `[x′, y′]`.
   * @returns A status code.
   */
  private undistort(io: [number, number]): number {
    const xd = io[0], yd = io[1];
    if (!this.distorted) return Status.ok;
    const { k1, k2, k3, k4, k5, k6, p1, p2 } = this;
    const lim = this.fieldRadius2;
    if (!this.tangential && !(Math.hypot(xd, yd) <= this.maxDistortedRadius)) return Status.outside;
    let x = xd, y = yd;
    if (!(x * x + y * y < lim)) {
      const sc = Math.sqrt((0.5 * lim) / (x * x + y * y));
      x *= sc;
      y *= sc;
    }
    for (let it = 0; it < UNDISTORT_MAX_ITERATIONS; it++) {
      const s = x * x + y * y;
      const N = 1 + s * (k1 + s * (k2 + s * k3));
      const D = 1 + s * (k4 + s * (k5 + s * k6));
      const R = N / D;
      const Rs = ((k1 + s * (2 * k2 + 3 * s * k3)) * D - N * (k4 + s * (2 * k5 + 3 * s * k6))) / (D * D);
      const xy = x * y;
      const fxv = x * R + 2 * p1 * xy + p2 * (s + 2 * x * x) - xd;
      const fyv = y * R + p1 * (s + 2 * y * y) + 2 * p2 * xy - yd;
      if (Math.abs(fxv) <= UNDISTORT_TOLERANCE && Math.abs(fyv) <= UNDISTORT_TOLERANCE) {
        io[0] = x;
        io[1] = y;
        return s <= lim ? Status.ok : Status.outside;
      }
      const a = R + 2 * x * x * Rs + 2 * p1 * y + 6 * p2 * x;
      const b = 2 * xy * Rs + 2 * p1 * x + 2 * p2 * y;
      const d = R + 2 * y * y * Rs + 6 * p1 * y + 2 * p2 * x;
      const det = a * d - b * b;
      if (!(Math.abs(det) > 1e-300)) return Status.notConverged;
      let dx = -(d * fxv - b * fyv) / det;
      let dy = -(a * fyv - b * fxv) / det;
      // Keep the iterate inside the field: halve the step until it is.
      for (let h = 0; h < 60 && !((x + dx) * (x + dx) + (y + dy) * (y + dy) < lim); h++) {
        dx *= 0.5;
        dy *= 0.5;
      }
      x += dx;
      y += dy;
      if (!Number.isFinite(x) || !Number.isFinite(y)) return Status.notConverged;
    }
    return Status.notConverged;
  }

  /**
   * The ray of a pixel: undistort by Newton's method (see the class notes), then
   * normalise `(x′, y′, 1)`.
   *
   * @param pixel - `[u, v]`.
   * @returns The ray from the camera centre, or `null` when the pixel maps beyond the
   *   valid field or the iteration does not converge.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad pixel.
   */
  unproject(pixel: Pixel): CameraRay | null {
    const p = checkPixel('PinholeCamera.unproject', 'pixel', pixel);
    const io: [number, number] = [(p[0] - this.cx) / this.fx, (p[1] - this.cy) / this.fy];
    if (this.undistort(io) !== Status.ok) return null;
    const n = Math.hypot(io[0], io[1], 1);
    return { origin: [0, 0, 0], direction: [io[0] / n, io[1] / n, 1 / n] };
  }

  /**
   * {@link PinholeCamera.unproject} for packed pixels `uv uv …`.
   *
   * @param pixels - Packed pixels.
   * @param options - Optional output buffers.
   * @returns Origins (all zero), unit directions and a status a pixel.
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  unprojectBatch(pixels: Float64Array, options?: UnprojectBatchOptions): UnprojectBatchResult {
    const res = unprojectBuffers('PinholeCamera.unprojectBatch', pixels, options);
    const o = res.origins, d = res.directions, st = res.status;
    const io: [number, number] = [0, 0];
    for (let i = 0; i < st.length; i++) {
      io[0] = (pixels[2 * i]! - this.cx) / this.fx;
      io[1] = (pixels[2 * i + 1]! - this.cy) / this.fy;
      const s = Number.isFinite(io[0]) && Number.isFinite(io[1]) ? this.undistort(io) : Status.outside;
      st[i] = s;
      if (s !== Status.ok) {
        o.fill(NaN, 3 * i, 3 * i + 3);
        d.fill(NaN, 3 * i, 3 * i + 3);
        continue;
      }
      const n = Math.hypot(io[0], io[1], 1);
      o[3 * i] = 0;
      o[3 * i + 1] = 0;
      o[3 * i + 2] = 0;
      d[3 * i] = io[0] / n;
      d[3 * i + 1] = io[1] / n;
      d[3 * i + 2] = 1 / n;
    }
    return res;
  }

  /**
   * The parameters as a plain JSON object (common open names; k4–k6 only when non-zero).
   *
   * @returns The parameters.
   */
  toJSON(): PinholeParameters {
    const j: PinholeParameters = {
      model: 'pinhole',
      fx: this.fx,
      fy: this.fy,
      cx: this.cx,
      cy: this.cy,
      k1: this.k1,
      k2: this.k2,
      p1: this.p1,
      p2: this.p2,
      k3: this.k3,
    };
    if (this.k4 !== 0 || this.k5 !== 0 || this.k6 !== 0) Object.assign(j, { k4: this.k4, k5: this.k5, k6: this.k6 });
    if (this.width !== undefined) j.width = this.width;
    if (this.height !== undefined) j.height = this.height;
    return j;
  }
}
