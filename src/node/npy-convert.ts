/**
 * Conversions between the library's `Grid`, mask and `Image` and the arrays of the
 * `.npy` codec. Platform-neutral (no file system).
 *
 * Axis conventions follow NumPy's for pictures: a grid or mask is a 2-D array of shape
 * `(height, width)` indexed `[row j, column i]`; an image is `(height, width)` for one
 * channel or `(height, width, channels)` otherwise.
 *
 * @module
 */
import {
  checkGrid,
  checkInteger,
  checkImage,
  checkMask,
  checkOneOf,
  checkOptions,
  createGrid,
  createImage,
  rangeError,
  typeError,
  LIMITS,
} from '../core/index.js';
import type { Grid, GridSpec, Image, Mask } from '../core/index.js';
import { npyToCOrder } from './npy-codec.js';
import type { NpyArray, NpyArrayInput, NpyDtype } from './npy-codec.js';

/** Options for {@link gridToNpy}. */
export interface GridToNpyOptions {
  /** Element type to store. @defaultValue 'float64' */
  dtype?: 'float64' | 'float32';
}

/**
 * A grid as a 2-D `.npy` array of shape `(height, width)`, C order: NumPy's
 * `a[j, i]` is sample `(i, j)`. The geometry (`dx`, `dy`, `x0`, `y0`) is not part of an
 * `.npy` file; keep it beside (see `writeFrameResult`).
 *
 * @param grid - The grid (non-finite samples are written as they are).
 * @param options - See {@link GridToNpyOptions}.
 * @returns An array for `encodeNpy` / `writeNpy`.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for an invalid grid.
 * @example
 * ```ts
 * writeNpy('height.npy', gridToNpy(height));
 * ```
 */
export function gridToNpy(grid: Grid, options?: GridToNpyOptions): NpyArrayInput {
  const fn = 'gridToNpy';
  checkGrid(fn, 'grid', grid, true);
  const o = checkOptions(fn, options);
  const dtype = o.dtype === undefined ? 'float64' : checkOneOf(fn, 'options.dtype', o.dtype, ['float64', 'float32'] as const);
  const data = dtype === 'float64' ? grid.data : Float32Array.from(grid.data);
  return { shape: [grid.height, grid.width], data };
}

function check2d(fn: string, array: NpyArray): [number, number] {
  if (array === null || typeof array !== 'object' || !Array.isArray(array.shape)) {
    typeError(fn, 'array', array, 'a decoded .npy array { dtype, shape, fortranOrder, data }');
  }
  if (array.shape.length !== 2) rangeError(fn, 'array.shape', array.shape, 'a 2-D shape (height, width)');
  const [h, w] = array.shape as [number, number];
  if (!(h >= 1 && w >= 1 && h <= LIMITS.maxSide && w <= LIMITS.maxSide)) {
    rangeError(fn, 'array.shape', array.shape, `a shape with 1 to ${LIMITS.maxSide} rows and columns`);
  }
  return [h, w];
}

/**
 * A grid from a 2-D `.npy` array of shape `(height, width)`, in either element order
 * and any numeric element type (converted to `Float64Array`).
 *
 * @param array - A decoded array (from `decodeNpy` / `readNpy`).
 * @param spec - Spacing and origin, metres. @defaultValue dx = dy = 1, x0 = y0 = 0
 * @returns A new grid (samples copied; NaN stays NaN: pass a mask to functions that
 *   take one).
 * @throws {@link core!MeniscusRangeError} when the array is not 2-D or too large.
 * @example
 * ```ts
 * const h = npyToGrid(readNpy('height.npy'), { dx: 0.002 });
 * ```
 */
export function npyToGrid(array: NpyArray, spec?: Omit<GridSpec, 'width' | 'height'>): Grid {
  const fn = 'npyToGrid';
  const [h, w] = check2d(fn, array);
  const s = checkOptions(fn, spec, 'spec');
  const c = npyToCOrder(array);
  const data = Float64Array.from(c.data as ArrayLike<number>);
  return createGrid({ ...s, width: w, height: h }, data);
}

/** Options for {@link maskToNpy}. */
export interface MaskToNpyOptions {
  /** Store as NumPy `bool` (`|b1`) instead of `uint8` (`|u1`). @defaultValue 'uint8' */
  dtype?: 'uint8' | 'bool';
}

/**
 * A mask as a 2-D `.npy` array of shape `(height, width)`.
 *
 * @param mask - `1` valid, `0` hole.
 * @param width - Columns.
 * @param height - Rows.
 * @param options - See {@link MaskToNpyOptions}.
 * @returns An array for `encodeNpy` / `writeNpy`.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a mask of the wrong
 *   length or with values other than 0 and 1.
 * @example
 * ```ts
 * writeNpy('mask.npy', maskToNpy(mask, grid.width, grid.height, { dtype: 'bool' }));
 * ```
 */
export function maskToNpy(mask: Mask, width: number, height: number, options?: MaskToNpyOptions): NpyArrayInput {
  const fn = 'maskToNpy';
  checkInteger(fn, 'width', width, 1, LIMITS.maxSide);
  checkInteger(fn, 'height', height, 1, LIMITS.maxSide);
  checkMask(fn, 'mask', mask, width, height);
  const o = checkOptions(fn, options);
  const dtype = o.dtype === undefined ? 'uint8' : checkOneOf(fn, 'options.dtype', o.dtype, ['uint8', 'bool'] as const);
  return { dtype, shape: [height, width], data: mask };
}

/**
 * A mask from a 2-D `.npy` array of 0s and 1s (`bool` or any integer type).
 *
 * @param array - A decoded array of shape `(height, width)`.
 * @returns The mask and its size.
 * @throws {@link core!MeniscusRangeError} when the array is not 2-D or holds values other
 *   than 0 and 1.
 * @throws {@link core!MeniscusTypeError} for a floating-point array.
 * @example
 * ```ts
 * const { mask, width, height } = npyToMask(readNpy('mask.npy'));
 * ```
 */
export function npyToMask(array: NpyArray): { mask: Mask; width: number; height: number } {
  const fn = 'npyToMask';
  const [h, w] = check2d(fn, array);
  if (array.dtype === 'float32' || array.dtype === 'float64') {
    typeError(fn, 'array.dtype', array.dtype, 'a boolean or integer array of 0 and 1');
  }
  const c = npyToCOrder(array);
  const mask = new Uint8Array(w * h);
  const d = c.data;
  for (let k = 0; k < d.length; k++) {
    const v = d[k]!;
    if (v !== 0 && v !== 1) rangeError(fn, `array.data[${k}]`, v, '0 (hole) or 1 (valid)');
    mask[k] = v;
  }
  return { mask, width: w, height: h };
}

/** Options for {@link imageToNpy}. */
export interface ImageToNpyOptions {
  /**
   * Element type. `float32` stores the linear values as they are; `uint8` / `uint16`
   * store `round(clamp(v, 0, 1) · max)` with max 255 or 65535. @defaultValue 'float32'
   */
  dtype?: 'float32' | 'uint8' | 'uint16';
}

/**
 * An image as a `.npy` array: shape `(height, width)` for one channel,
 * `(height, width, channels)` otherwise, C order.
 *
 * @param image - A linear-intensity image.
 * @param options - See {@link ImageToNpyOptions}.
 * @returns An array for `encodeNpy` / `writeNpy`.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for an invalid image.
 * @example
 * ```ts
 * writeNpy('frame.npy', imageToNpy(frame, { dtype: 'uint16' }));
 * ```
 */
export function imageToNpy(image: Image, options?: ImageToNpyOptions): NpyArrayInput {
  const fn = 'imageToNpy';
  checkImage(fn, 'image', image, true);
  const o = checkOptions(fn, options);
  const dtype = o.dtype === undefined ? 'float32' : checkOneOf(fn, 'options.dtype', o.dtype, ['float32', 'uint8', 'uint16'] as const);
  const shape = image.channels === 1 ? [image.height, image.width] : [image.height, image.width, image.channels];
  if (dtype === 'float32') return { shape, data: image.data };
  const max = dtype === 'uint8' ? 255 : 65535;
  const src = image.data;
  const data = dtype === 'uint8' ? new Uint8Array(src.length) : new Uint16Array(src.length);
  for (let k = 0; k < src.length; k++) {
    const v = src[k]!;
    // NaN → 0; clamp to the range.
    data[k] = v > 0 ? (v < 1 ? Math.round(v * max) : max) : 0;
  }
  return { shape, data };
}

const INT_MAX: Partial<Record<NpyDtype, number>> = { uint8: 255, uint16: 65535, uint32: 4294967295, bool: 1 };

/**
 * An image from a `.npy` array of shape `(height, width)` or `(height, width, c)` with
 * `c` from 1 to 4. Floating-point values are taken as linear intensities; unsigned
 * integers are divided by their type's maximum (255, 65535, 2³²−1) and booleans give 0
 * or 1.
 *
 * @param array - A decoded array.
 * @returns A new image.
 * @throws {@link core!MeniscusRangeError} for another shape.
 * @throws {@link core!MeniscusTypeError} for signed integer arrays (no agreed scale).
 * @example
 * ```ts
 * const frame = npyToImage(readNpy('frame.npy'));
 * ```
 */
export function npyToImage(array: NpyArray): Image {
  const fn = 'npyToImage';
  if (array === null || typeof array !== 'object' || !Array.isArray(array.shape)) {
    typeError(fn, 'array', array, 'a decoded .npy array { dtype, shape, fortranOrder, data }');
  }
  const sh = array.shape;
  if (!(sh.length === 2 || (sh.length === 3 && sh[2]! >= 1 && sh[2]! <= 4))) {
    rangeError(fn, 'array.shape', sh, 'a shape (height, width) or (height, width, channels) with 1 to 4 channels');
  }
  const h = sh[0]!;
  const w = sh[1]!;
  const channels = sh.length === 3 ? sh[2]! : 1;
  if (!(h >= 1 && w >= 1 && h <= LIMITS.maxSide && w <= LIMITS.maxSide)) {
    rangeError(fn, 'array.shape', sh, `a shape with 1 to ${LIMITS.maxSide} rows and columns`);
  }
  const isFloat = array.dtype === 'float32' || array.dtype === 'float64';
  const max = INT_MAX[array.dtype];
  if (!isFloat && max === undefined) typeError(fn, 'array.dtype', array.dtype, 'a float, unsigned integer or boolean array');
  const c = npyToCOrder(array);
  const src = c.data;
  const data = new Float32Array(src.length);
  if (isFloat) data.set(src as ArrayLike<number>);
  else {
    const m = max!;
    for (let k = 0; k < src.length; k++) data[k] = src[k]! / m;
  }
  return createImage(w, h, channels, data);
}
