/**
 * Sampling an {@link Image} at real-valued pixel positions: bilinear and bicubic (Keys
 * cubic convolution, a = −1/2), single positions and packed batches.
 *
 * Positions follow the library's pixel convention: pixel centres at integer
 * coordinates, `(0, 0)` at the centre of the top-left pixel, u to the right, v down.
 * A position is inside the image when `−0.5 ≤ u ≤ width − 0.5` and
 * `−0.5 ≤ v ≤ height − 0.5` (the pixels' footprint); between the outermost centres and
 * the footprint's edge the edge pixels are repeated.
 *
 * @module
 */
import { checkFloat64Array, checkImage, checkOneOf, checkOptions, rangeError, Status, typeError, checkFinite } from '../core/index.js';
import type { Image } from '../core/index.js';

// Status codes as local constants (read once, not through the module namespace in loops).
const S_OK = Status.ok;
const S_OUTSIDE = Status.outside;

/** How an image is interpolated between pixel centres. */
export type ImageInterpolation = 'bilinear' | 'bicubic' | 'nearest';

/** What happens to a position outside the image's footprint. */
export type ImageEdge = 'mask' | 'clamp';

/** Options of {@link sampleImage}. */
export interface SampleImageOptions {
  /** Interpolation. @defaultValue 'bilinear' */
  interpolation?: ImageInterpolation;
  /**
   * `'mask'`: positions outside the footprint get `Status.outside` (and zeros);
   * `'clamp'`: they take the value at the nearest point of the image.
   * @defaultValue 'mask'
   */
  edge?: ImageEdge;
}

/** Options of {@link sampleImageBatch}. */
export interface SampleImageBatchOptions extends SampleImageOptions {
  /** Output values, `N × channels` (channels interleaved), reused when given. */
  out?: Float32Array;
  /** Output status codes, length N, reused when given. */
  status?: Uint8Array;
}

/** The result of {@link sampleImageBatch}. */
export interface SampleImageBatchResult {
  /** Values, `N × channels`, channels interleaved; zeros where `status` is not ok. */
  readonly values: Float32Array;
  /** One {@link Status} code a position: `ok` or `outside`. */
  readonly status: Uint8Array;
}

/** @internal Resolved interpolation code: 0 nearest, 1 bilinear, 2 bicubic. */
export function interpolationCode(fn: string, parameter: string, v: unknown): 0 | 1 | 2 {
  if (v === undefined) return 1;
  const s = checkOneOf(fn, parameter, v, ['bilinear', 'bicubic', 'nearest'] as const);
  return s === 'nearest' ? 0 : s === 'bilinear' ? 1 : 2;
}

/**
 * @internal Sample channel values at (u, v) into out[o..o+C); the position is assumed
 * inside the footprint or clamping is wanted. Inner kernel: no checks.
 */
export function sampleInto(data: Float32Array, W: number, H: number, C: number, u: number, v: number, mode: 0 | 1 | 2, out: Float32Array, o: number): void {
  if (u < 0) u = 0;
  else if (u > W - 1) u = W - 1;
  if (v < 0) v = 0;
  else if (v > H - 1) v = H - 1;
  if (mode === 0) {
    const k = (Math.round(v) * W + Math.round(u)) * C;
    for (let c = 0; c < C; c++) out[o + c] = data[k + c]!;
    return;
  }
  let i = Math.floor(u);
  let j = Math.floor(v);
  if (i > W - 2) i = W - 2;
  if (j > H - 2) j = H - 2;
  if (i < 0) i = 0;
  if (j < 0) j = 0;
  const t = u - i;
  const s = v - j;
  if (mode === 1 || W < 2 || H < 2) {
    const i1 = W > 1 ? 1 : 0;
    const j1 = H > 1 ? W : 0;
    const k = (j * W + i) * C;
    const w00 = (1 - t) * (1 - s);
    const w10 = t * (1 - s);
    const w01 = (1 - t) * s;
    const w11 = t * s;
    for (let c = 0; c < C; c++) {
      out[o + c] = w00 * data[k + c]! + w10 * data[k + i1 * C + c]! + w01 * data[k + j1 * C + c]! + w11 * data[k + (j1 + i1) * C + c]!;
    }
    return;
  }
  // Keys (a = −1/2) weights at offsets −1, 0, 1, 2; edge samples repeated.
  const t2 = t * t, t3 = t2 * t, s2 = s * s, s3 = s2 * s;
  const a0 = 0.5 * (-t3 + 2 * t2 - t), a1 = 0.5 * (3 * t3 - 5 * t2 + 2), a2 = 0.5 * (-3 * t3 + 4 * t2 + t), a3 = 0.5 * (t3 - t2);
  const b0 = 0.5 * (-s3 + 2 * s2 - s), b1 = 0.5 * (3 * s3 - 5 * s2 + 2), b2 = 0.5 * (-3 * s3 + 4 * s2 + s), b3 = 0.5 * (s3 - s2);
  const im = i > 0 ? i - 1 : 0, ip = i + 1, ip2 = i + 2 < W ? i + 2 : W - 1;
  const jm = j > 0 ? j - 1 : 0, jp = j + 1, jp2 = j + 2 < H ? j + 2 : H - 1;
  const r0 = jm * W, r1 = j * W, r2 = jp * W, r3 = jp2 * W;
  for (let c = 0; c < C; c++) {
    const q0 = a0 * data[(r0 + im) * C + c]! + a1 * data[(r0 + i) * C + c]! + a2 * data[(r0 + ip) * C + c]! + a3 * data[(r0 + ip2) * C + c]!;
    const q1 = a0 * data[(r1 + im) * C + c]! + a1 * data[(r1 + i) * C + c]! + a2 * data[(r1 + ip) * C + c]! + a3 * data[(r1 + ip2) * C + c]!;
    const q2 = a0 * data[(r2 + im) * C + c]! + a1 * data[(r2 + i) * C + c]! + a2 * data[(r2 + ip) * C + c]! + a3 * data[(r2 + ip2) * C + c]!;
    const q3 = a0 * data[(r3 + im) * C + c]! + a1 * data[(r3 + i) * C + c]! + a2 * data[(r3 + ip) * C + c]! + a3 * data[(r3 + ip2) * C + c]!;
    out[o + c] = b0 * q0 + b1 * q1 + b2 * q2 + b3 * q3;
  }
}

/**
 * The image's value at a real-valued pixel position.
 *
 * Bilinear interpolation weights the four surrounding pixel centres; bicubic uses the
 * Keys cubic-convolution kernel with a = −1/2 (exact for quadratics, continuous slopes),
 * repeating the edge pixels beyond the image.
 *
 * @param image - The image.
 * @param u - Column position, pixels (centres at integers).
 * @param v - Row position, pixels.
 * @param options - Interpolation and edge policy.
 * @returns One value a channel, or `null` when the position lies outside the image's
 *   footprint and `edge` is `'mask'`.
 * @throws {@link core!MeniscusTypeError} for a malformed image.
 * @throws {@link core!MeniscusRangeError} for a non-finite position or unknown options.
 * @see Keys, R. G. (1981), "Cubic convolution interpolation for digital image
 *   processing", IEEE Transactions on Acoustics, Speech, and Signal Processing 29(6),
 *   1153–1160, eq. (15).
 * @example
 * ```ts
 * const img = createImage(2, 1, 1, new Float32Array([0, 1]));
 * sampleImage(img, 0.25, 0); // [0.25]
 * ```
 */
export function sampleImage(image: Image, u: number, v: number, options?: SampleImageOptions): number[] | null {
  const fn = 'sampleImage';
  const im = checkImage(fn, 'image', image, true);
  checkFinite(fn, 'u', u);
  checkFinite(fn, 'v', v);
  const o = checkOptions(fn, options);
  const mode = interpolationCode(fn, 'options.interpolation', o.interpolation);
  const edge = o.edge === undefined ? 'mask' : checkOneOf(fn, 'options.edge', o.edge, ['mask', 'clamp'] as const);
  if (edge === 'mask' && !(u >= -0.5 && u <= im.width - 0.5 && v >= -0.5 && v <= im.height - 0.5)) return null;
  const out = new Float32Array(im.channels);
  sampleInto(im.data, im.width, im.height, im.channels, u, v, mode, out, 0);
  return Array.from(out);
}

/**
 * {@link sampleImage} at packed positions `u v u v …`.
 *
 * @param image - The image.
 * @param positions - Packed pixel positions (length 2N), finite.
 * @param options - Interpolation, edge policy and optional output buffers.
 * @returns Values (`N × channels`) and a status a position.
 * @throws {@link core!MeniscusTypeError} for a malformed image, positions or buffers.
 * @throws {@link core!MeniscusRangeError} for a non-finite position (naming its index).
 * @see Keys (1981), as in {@link sampleImage}.
 * @example
 * ```ts
 * const { values, status } = sampleImageBatch(img, new Float64Array([0.5, 0, 9, 9]));
 * ```
 */
export function sampleImageBatch(image: Image, positions: Float64Array, options?: SampleImageBatchOptions): SampleImageBatchResult {
  const fn = 'sampleImageBatch';
  const im = checkImage(fn, 'image', image, true);
  checkFloat64Array(fn, 'positions', positions, 2);
  const o = checkOptions(fn, options);
  const mode = interpolationCode(fn, 'options.interpolation', o.interpolation);
  const edge = o.edge === undefined ? 'mask' : checkOneOf(fn, 'options.edge', o.edge, ['mask', 'clamp'] as const);
  const n = positions.length / 2;
  const C = im.channels;
  let values: Float32Array;
  if (o.out === undefined) values = new Float32Array(n * C);
  else {
    if (!(o.out instanceof Float32Array) || o.out.length !== n * C) typeError(fn, 'options.out', o.out, `a Float32Array of length ${n * C}`);
    values = o.out;
  }
  let status: Uint8Array;
  if (o.status === undefined) status = new Uint8Array(n);
  else {
    if (!(o.status instanceof Uint8Array) || o.status.length !== n) typeError(fn, 'options.status', o.status, `a Uint8Array of length ${n}`);
    status = o.status;
  }
  const W = im.width, H = im.height;
  for (let k = 0; k < n; k++) {
    const u = positions[2 * k]!, v = positions[2 * k + 1]!;
    if (!Number.isFinite(u) || !Number.isFinite(v)) rangeError(fn, `positions[${2 * k}..${2 * k + 1}]`, [u, v], 'a finite position');
    if (edge === 'mask' && !(u >= -0.5 && u <= W - 0.5 && v >= -0.5 && v <= H - 0.5)) {
      for (let c = 0; c < C; c++) values[k * C + c] = 0;
      status[k] = S_OUTSIDE;
      continue;
    }
    sampleInto(im.data, W, H, C, u, v, mode, values, k * C);
    status[k] = S_OK;
  }
  return { values, status };
}
