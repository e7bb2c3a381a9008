/**
 * The common camera-model interface and the types shared by every model.
 *
 * **Frames.** The camera frame has x to the right, y down and z forward (along the
 * optical axis), metres. Pixel coordinates `(u, v)` have u to the right and v down,
 * with pixel centres at integer coordinates and `(0, 0)` at the centre of the top-left
 * pixel (the common computer-vision convention).
 *
 * @module
 */
import { checkFloat64Array, rangeError, typeError } from '../core/index.js';
import type { MutableVec3 } from '../core/index.js';

/** A pixel position `[u, v]`: u right, v down, pixel centres at integers. */
export type Pixel = readonly [number, number];

/** A mutable pixel position, as returned by `project`. */
export type MutablePixel = [number, number];

/** A ray in the camera frame: where it starts and its unit direction. */
export interface CameraRay {
  /** Start of the ray, camera frame, metres (the origin for a central camera). */
  readonly origin: MutableVec3;
  /** Unit direction, camera frame. */
  readonly direction: MutableVec3;
}

/** Options of {@link CameraModel.projectBatch}. */
export interface ProjectBatchOptions {
  /** Output pixels, packed `uv uv …` (length 2N). */
  out?: Float64Array;
  /** Output status codes ({@link core!Status}), length N. */
  status?: Uint8Array;
}

/** Result of {@link CameraModel.projectBatch}. */
export interface ProjectBatchResult {
  /** Packed pixels `uv uv …`; NaN where `status` is not `Status.ok`. */
  readonly pixels: Float64Array;
  /** One {@link core!Status} code a point: `ok`, or `outside` (behind the camera or beyond the model's valid field). */
  readonly status: Uint8Array;
}

/** Options of {@link CameraModel.unprojectBatch}. */
export interface UnprojectBatchOptions {
  /** Output ray origins, packed `xyz …` (length 3N). */
  origins?: Float64Array;
  /** Output unit directions, packed `xyz …` (length 3N). */
  directions?: Float64Array;
  /** Output status codes, length N. */
  status?: Uint8Array;
}

/** Result of {@link CameraModel.unprojectBatch}. */
export interface UnprojectBatchResult {
  /** Packed ray origins, camera frame, metres; NaN where `status` is not ok. */
  readonly origins: Float64Array;
  /** Packed unit directions, camera frame; NaN where `status` is not ok. */
  readonly directions: Float64Array;
  /** One {@link core!Status} code a pixel: `ok`, `outside` (beyond the valid field) or `notConverged`. */
  readonly status: Uint8Array;
}

/** Pinhole parameters with Brown–Conrady distortion, in the common open names and order. */
export interface PinholeParameters {
  /** Model tag. */
  model: 'pinhole';
  /** Focal length along u, pixels. */
  fx: number;
  /** Focal length along v, pixels. */
  fy: number;
  /** Principal point u, pixels. */
  cx: number;
  /** Principal point v, pixels. */
  cy: number;
  /** Radial coefficient of r². @defaultValue 0 */
  k1?: number;
  /** Radial coefficient of r⁴. @defaultValue 0 */
  k2?: number;
  /** First tangential coefficient. @defaultValue 0 */
  p1?: number;
  /** Second tangential coefficient. @defaultValue 0 */
  p2?: number;
  /** Radial coefficient of r⁶. @defaultValue 0 */
  k3?: number;
  /** Rational-model denominator coefficient of r². @defaultValue 0 */
  k4?: number;
  /** Rational-model denominator coefficient of r⁴. @defaultValue 0 */
  k5?: number;
  /** Rational-model denominator coefficient of r⁶. @defaultValue 0 */
  k6?: number;
  /** Image width, pixels (informative). */
  width?: number;
  /** Image height, pixels (informative). */
  height?: number;
}

/** Equidistant fisheye (Kannala–Brandt) parameters in the common open names. */
export interface FisheyeParameters {
  /** Model tag. */
  model: 'fisheye';
  /** Focal length along u, pixels per radian. */
  fx: number;
  /** Focal length along v, pixels per radian. */
  fy: number;
  /** Principal point u, pixels. */
  cx: number;
  /** Principal point v, pixels. */
  cy: number;
  /** Coefficient of θ³. @defaultValue 0 */
  k1?: number;
  /** Coefficient of θ⁵. @defaultValue 0 */
  k2?: number;
  /** Coefficient of θ⁷. @defaultValue 0 */
  k3?: number;
  /** Coefficient of θ⁹. @defaultValue 0 */
  k4?: number;
  /** Image width, pixels (informative). */
  width?: number;
  /** Image height, pixels (informative). */
  height?: number;
}

/** Orthographic (telecentric) parameters. */
export interface OrthographicParameters {
  /** Model tag. */
  model: 'orthographic';
  /** Scale along u, pixels per metre. */
  fx: number;
  /** Scale along v, pixels per metre. */
  fy: number;
  /** Pixel u of the optical axis. */
  cx: number;
  /** Pixel v of the optical axis. */
  cy: number;
  /** Image width, pixels (informative). */
  width?: number;
  /** Image height, pixels (informative). */
  height?: number;
}

/** The plain-JSON parameters of any camera model. */
export type CameraParameters = PinholeParameters | FisheyeParameters | OrthographicParameters;

/**
 * What imaging code may use of any camera model.
 */
export interface CameraModel {
  /** The model's tag, as in its parameters. */
  readonly model: CameraParameters['model'];
  /** True when every ray passes through the camera centre (pinhole, fisheye); false for orthographic. */
  readonly central: boolean;
  /** Image width, pixels, when known. */
  readonly width: number | undefined;
  /** Image height, pixels, when known. */
  readonly height: number | undefined;
  /**
   * The pixel of a camera-frame point.
   *
   * @param point - Camera-frame point `[x, y, z]`, metres.
   * @returns `[u, v]`, or `null` when the point is behind the camera or beyond the model's valid field.
   */
  project(point: readonly [number, number, number]): MutablePixel | null;
  /**
   * The ray of a pixel.
   *
   * @param pixel - `[u, v]`.
   * @returns The ray in the camera frame, or `null` when the pixel lies beyond the valid
   *   field or the inverse iteration did not converge.
   */
  unproject(pixel: Pixel): CameraRay | null;
  /**
   * {@link CameraModel.project} for packed points `xyz xyz …`.
   */
  projectBatch(points: Float64Array, options?: ProjectBatchOptions): ProjectBatchResult;
  /**
   * {@link CameraModel.unproject} for packed pixels `uv uv …`.
   */
  unprojectBatch(pixels: Float64Array, options?: UnprojectBatchOptions): UnprojectBatchResult;
  /** The parameters as a plain JSON object. */
  toJSON(): CameraParameters;
}

/**
 * Check a pixel at a public boundary.
 *
 * @returns The pixel.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a wrong shape or non-finite values.
 * @example
 * ```ts
 * checkPixel('fn', 'pixel', [10, 20]);
 * ```
 */
export function checkPixel(fn: string, parameter: string, value: unknown): Pixel {
  const isArr = Array.isArray(value) || value instanceof Float64Array || value instanceof Float32Array;
  if (!isArr || (value as ArrayLike<number>).length !== 2) typeError(fn, parameter, value, 'a pixel [u, v]');
  const v = value as ArrayLike<unknown>;
  for (let k = 0; k < 2; k++) {
    if (typeof v[k] !== 'number') typeError(fn, parameter, value, 'a pixel of numbers');
    if (!Number.isFinite(v[k])) rangeError(fn, parameter, value, 'a pixel of finite numbers');
  }
  return value as unknown as Pixel;
}

/** @internal Buffers for projectBatch, checked. */
export function projectBuffers(fn: string, points: Float64Array, options: ProjectBatchOptions | undefined): ProjectBatchResult {
  checkFloat64Array(fn, 'points', points, 3);
  const n = points.length / 3;
  if (options !== undefined && (options === null || typeof options !== 'object')) typeError(fn, 'options', options, 'an options object or undefined');
  const out = options?.out;
  const st = options?.status;
  if (out !== undefined) checkFloat64Array(fn, 'options.out', out, 1, 2 * n);
  if (st !== undefined && (!(st instanceof Uint8Array) || st.length !== n)) typeError(fn, 'options.status', st, `a Uint8Array of length ${n}`);
  return { pixels: out ?? new Float64Array(2 * n), status: st ?? new Uint8Array(n) };
}

/** @internal Buffers for unprojectBatch, checked. */
export function unprojectBuffers(fn: string, pixels: Float64Array, options: UnprojectBatchOptions | undefined): UnprojectBatchResult {
  checkFloat64Array(fn, 'pixels', pixels, 2);
  const n = pixels.length / 2;
  if (options !== undefined && (options === null || typeof options !== 'object')) typeError(fn, 'options', options, 'an options object or undefined');
  const o = options?.origins;
  const d = options?.directions;
  const st = options?.status;
  if (o !== undefined) checkFloat64Array(fn, 'options.origins', o, 1, 3 * n);
  if (d !== undefined) checkFloat64Array(fn, 'options.directions', d, 1, 3 * n);
  if (st !== undefined && (!(st instanceof Uint8Array) || st.length !== n)) typeError(fn, 'options.status', st, `a Uint8Array of length ${n}`);
  return { origins: o ?? new Float64Array(3 * n), directions: d ?? new Float64Array(3 * n), status: st ?? new Uint8Array(n) };
}

/** @internal Optional image size. */
export function checkImageSize(fn: string, width: unknown, height: unknown): [number | undefined, number | undefined] {
  const one = (name: string, v: unknown): number | undefined => {
    if (v === undefined) return undefined;
    if (typeof v !== 'number') typeError(fn, name, v, 'a positive integer or undefined');
    if (!Number.isInteger(v) || !(v >= 1 && v <= 65536)) rangeError(fn, name, v, 'an integer in [1, 65536]');
    return v;
  };
  return [one('params.width', width), one('params.height', height)];
}

/** @internal A finite coefficient, defaulting to 0. */
export function coefficient(fn: string, name: string, v: unknown): number {
  if (v === undefined) return 0;
  if (typeof v !== 'number') typeError(fn, `params.${name}`, v, 'a finite number');
  if (!Number.isFinite(v)) rangeError(fn, `params.${name}`, v, 'a finite number');
  return v;
}

/** @internal A required focal length (finite, non-zero) or principal point (finite). */
export function required(fn: string, name: string, v: unknown, nonZero: boolean): number {
  if (typeof v !== 'number') typeError(fn, `params.${name}`, v, nonZero ? 'a finite number > 0' : 'a finite number');
  if (!Number.isFinite(v) || (nonZero && !(v > 0))) rangeError(fn, `params.${name}`, v, nonZero ? 'a finite number > 0' : 'a finite number');
  return v;
}
