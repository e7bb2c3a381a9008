/**
 * The `Image`: linear intensities, row-major, channels interleaved. Pixel centres sit at
 * integer coordinates with the origin at the centre of the top-left pixel.
 *
 * @module
 */
import { checkAllocation, checkInteger, rangeError, typeError } from './checks.js';
import { LIMITS } from './limits.js';

/** A raster image in linear intensity (not sRGB-encoded). */
export interface Image {
  /** Pixels per row. */
  readonly width: number;
  /** Rows. */
  readonly height: number;
  /** Channels per pixel (1 grey, 3 RGB, 4 RGBA). */
  readonly channels: number;
  /** `width × height × channels` values; pixel `(u, v)` channel `c` is `data[(v * width + u) * channels + c]`. */
  readonly data: Float32Array;
}

/**
 * Create an image, validating its size and guarding the allocation.
 *
 * @param width - Pixels per row (≥ 1).
 * @param height - Rows (≥ 1).
 * @param channels - 1 to 4. @defaultValue 1
 * @param data - Optional pixel data of length `width × height × channels` (used as given).
 * @returns The image, zero-filled when `data` is absent.
 * @throws {@link MeniscusRangeError} for bad sizes or sizes above {@link LIMITS}.
 * @example
 * ```ts
 * const img = createImage(640, 480, 3);
 * ```
 */
export function createImage(width: number, height: number, channels = 1, data?: Float32Array): Image {
  const fn = 'createImage';
  checkInteger(fn, 'width', width, 1, LIMITS.maxSide);
  checkInteger(fn, 'height', height, 1, LIMITS.maxSide);
  checkInteger(fn, 'channels', channels, 1, 4);
  checkAllocation(fn, 'width × height', width * height);
  const n = width * height * channels;
  if (data === undefined) return { width, height, channels, data: new Float32Array(n) };
  if (!(data instanceof Float32Array)) typeError(fn, 'data', data, 'a Float32Array');
  if (data.length !== n) typeError(fn, 'data', data, `a Float32Array of length ${n}`);
  return { width, height, channels, data };
}

/**
 * Validate an image given by a user.
 *
 * @param fn - The calling public function's name.
 * @param parameter - The parameter's name.
 * @param value - The candidate image.
 * @param allowNonFinite - Skip the finiteness scan. @defaultValue false
 * @returns The image.
 * @example
 * ```ts
 * checkImage('detectSpots', 'frame', frame);
 * ```
 */
export function checkImage(fn: string, parameter: string, value: unknown, allowNonFinite = false): Image {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'an Image {width, height, channels, data}');
  const im = value as Partial<Image>;
  checkInteger(fn, `${parameter}.width`, im.width, 1, LIMITS.maxSide);
  checkInteger(fn, `${parameter}.height`, im.height, 1, LIMITS.maxSide);
  checkInteger(fn, `${parameter}.channels`, im.channels, 1, 4);
  checkAllocation(fn, `${parameter}.width × ${parameter}.height`, im.width! * im.height!);
  const n = im.width! * im.height! * im.channels!;
  if (!(im.data instanceof Float32Array)) typeError(fn, `${parameter}.data`, im.data, 'a Float32Array');
  if (im.data.length !== n) typeError(fn, `${parameter}.data`, im.data, `a Float32Array of length ${n}`);
  if (!allowNonFinite) {
    const d = im.data;
    for (let k = 0; k < d.length; k++) {
      if (!Number.isFinite(d[k]!)) rangeError(fn, `${parameter}.data[${k}]`, d[k], 'a finite intensity');
    }
  }
  return im as Image;
}
