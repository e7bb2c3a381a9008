/**
 * The orthographic (telecentric) camera: parallel rays along the optical axis.
 *
 * @module
 */
import { checkOptions, checkVec3, Status } from '../core/index.js';
import type { Vec3 } from '../core/index.js';
import { checkImageSize, checkPixel, projectBuffers, required, unprojectBuffers } from './model.js';
import type {
  CameraModel,
  CameraRay,
  MutablePixel,
  OrthographicParameters,
  Pixel,
  ProjectBatchOptions,
  ProjectBatchResult,
  UnprojectBatchOptions,
  UnprojectBatchResult,
} from './model.js';

/**
 * An orthographic (object-side telecentric) camera: u = fx x + cx, v = fy y + cy, with
 * fx, fy in pixels per metre; depth z does not change the image (every z is accepted).
 * A pixel's ray starts on the plane z = 0 at ((u − cx)/fx, (v − cy)/fy, 0) and runs
 * along +z.
 *
 * @see Hartley, R. & Zisserman, A. (2003), Multiple View Geometry in Computer Vision,
 *   2nd ed., §6.3.1 ("affine cameras": the orthographic projection).
 * @example
 * ```ts
 * const cam = new OrthographicCamera({ model: 'orthographic', fx: 2e4, fy: 2e4, cx: 511.5, cy: 511.5 });
 * cam.project([0.001, 0, 0.3]); // [531.5, 511.5]
 * ```
 */
export class OrthographicCamera implements CameraModel {
  readonly model = 'orthographic' as const;
  readonly central = false;
  readonly width: number | undefined;
  readonly height: number | undefined;
  /** Scale along u, pixels per metre. */
  readonly fx: number;
  /** Scale along v, pixels per metre. */
  readonly fy: number;
  /** Pixel u of the optical axis. */
  readonly cx: number;
  /** Pixel v of the optical axis. */
  readonly cy: number;

  /**
   * @param params - Scales and the axis pixel.
   * @throws {@link core!MeniscusRangeError} for a scale ≤ 0 or a non-finite parameter.
   */
  constructor(params: OrthographicParameters) {
    const fn = 'OrthographicCamera';
    const p = checkOptions(fn, params, 'params');
    this.fx = required(fn, 'fx', p.fx, true);
    this.fy = required(fn, 'fy', p.fy, true);
    this.cx = required(fn, 'cx', p.cx, false);
    this.cy = required(fn, 'cy', p.cy, false);
    [this.width, this.height] = checkImageSize(fn, p.width, p.height);
  }

  /**
   * @param point - `[x, y, z]`, camera frame, metres.
   * @returns `[u, v]` (never null).
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad point.
   */
  project(point: Vec3): MutablePixel | null {
    const q = checkVec3('OrthographicCamera.project', 'point', point);
    return [this.fx * q[0] + this.cx, this.fy * q[1] + this.cy];
  }

  /**
   * {@link OrthographicCamera.project} for packed points.
   *
   * @returns Packed pixels and a status a point (always ok for finite input).
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  projectBatch(points: Float64Array, options?: ProjectBatchOptions): ProjectBatchResult {
    const res = projectBuffers('OrthographicCamera.projectBatch', points, options);
    const { fx, fy, cx, cy } = this;
    for (let i = 0; i < res.status.length; i++) {
      const u = fx * points[3 * i]! + cx, v = fy * points[3 * i + 1]! + cy;
      const ok = Number.isFinite(u) && Number.isFinite(v);
      res.pixels[2 * i] = ok ? u : NaN;
      res.pixels[2 * i + 1] = ok ? v : NaN;
      res.status[i] = ok ? Status.ok : Status.outside;
    }
    return res;
  }

  /**
   * @param pixel - `[u, v]`.
   * @returns The ray from the plane z = 0 along +z (never null).
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad pixel.
   */
  unproject(pixel: Pixel): CameraRay | null {
    const p = checkPixel('OrthographicCamera.unproject', 'pixel', pixel);
    return { origin: [(p[0] - this.cx) / this.fx, (p[1] - this.cy) / this.fy, 0], direction: [0, 0, 1] };
  }

  /**
   * {@link OrthographicCamera.unproject} for packed pixels.
   *
   * @returns Origins on z = 0, directions +z, and a status a pixel.
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  unprojectBatch(pixels: Float64Array, options?: UnprojectBatchOptions): UnprojectBatchResult {
    const res = unprojectBuffers('OrthographicCamera.unprojectBatch', pixels, options);
    for (let i = 0; i < res.status.length; i++) {
      const x = (pixels[2 * i]! - this.cx) / this.fx, y = (pixels[2 * i + 1]! - this.cy) / this.fy;
      const ok = Number.isFinite(x) && Number.isFinite(y);
      res.status[i] = ok ? Status.ok : Status.outside;
      res.origins[3 * i] = ok ? x : NaN;
      res.origins[3 * i + 1] = ok ? y : NaN;
      res.origins[3 * i + 2] = ok ? 0 : NaN;
      res.directions[3 * i] = ok ? 0 : NaN;
      res.directions[3 * i + 1] = ok ? 0 : NaN;
      res.directions[3 * i + 2] = ok ? 1 : NaN;
    }
    return res;
  }

  /**
   * The parameters as a plain JSON object.
   *
   * @returns The parameters.
   */
  toJSON(): OrthographicParameters {
    const j: OrthographicParameters = { model: 'orthographic', fx: this.fx, fy: this.fy, cx: this.cx, cy: this.cy };
    if (this.width !== undefined) j.width = this.width;
    if (this.height !== undefined) j.height = this.height;
    return j;
  }
}
