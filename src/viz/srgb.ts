/**
 * The sRGB transfer function and its inverse (IEC 61966-2-1:1999), for turning the
 * library's linear intensities into display values and back.
 *
 * @module
 */
import { checkFinite, typeError } from '../core/index.js';

/** Linear value at which the encoding switches from the linear to the power segment. */
export const SRGB_LINEAR_THRESHOLD = 0.0031308;

/** Encoded value at which the decoding switches from the linear to the power segment. */
export const SRGB_ENCODED_THRESHOLD = 0.04045;

/**
 * Encode one linear intensity with the sRGB transfer function:
 * `12.92·L` for `L ≤ 0.0031308`, otherwise `1.055·L^(1/2.4) − 0.055`.
 *
 * Defined for `L` in [0, 1]; outside it each segment is simply continued (no clamping:
 * clamp first where a display value is wanted).
 *
 * @param linear - Linear intensity, 0 black to 1 white.
 * @returns The encoded value (0 to 1 for inputs in 0 to 1).
 * @see IEC 61966-2-1:1999, "Multimedia systems and equipment — Colour measurement and
 *   management — Part 2-1: Default RGB colour space — sRGB", section 5.2 (eq. for V′).
 * @example
 * ```ts
 * srgbEncode(0.5); // 0.735356…
 * ```
 */
export function srgbEncode(linear: number): number {
  return linear <= SRGB_LINEAR_THRESHOLD ? 12.92 * linear : 1.055 * Math.pow(linear, 1 / 2.4) - 0.055;
}

/**
 * Decode one sRGB-encoded value to linear intensity:
 * `V/12.92` for `V ≤ 0.04045`, otherwise `((V + 0.055)/1.055)^2.4`.
 *
 * @param encoded - Encoded value, 0 to 1.
 * @returns The linear intensity.
 * @see IEC 61966-2-1:1999, section 5.2 (inverse transfer function).
 * @example
 * ```ts
 * srgbDecode(0.735356); // ≈ 0.5
 * ```
 */
export function srgbDecode(encoded: number): number {
  return encoded <= SRGB_ENCODED_THRESHOLD ? encoded / 12.92 : Math.pow((encoded + 0.055) / 1.055, 2.4);
}

/** The arrays the array forms accept. */
export type SrgbArray = Float32Array | Float64Array;

function checkArrays(fn: string, values: unknown, out: unknown): void {
  if (!(values instanceof Float32Array || values instanceof Float64Array)) {
    typeError(fn, 'values', values, 'a Float32Array or Float64Array');
  }
  if (out !== undefined) {
    if (!(out instanceof Float32Array || out instanceof Float64Array)) typeError(fn, 'out', out, 'a Float32Array or Float64Array');
    if (out.length !== values.length) typeError(fn, 'out', out, `an array of length ${values.length}`);
  }
}

/**
 * {@link srgbEncode} over an array.
 *
 * @param values - Linear intensities.
 * @param out - Optional output of the same length (may be `values` itself).
 *   @defaultValue a new array of the same type
 * @returns `out`.
 * @throws {@link core!MeniscusTypeError} for a wrong array type or length.
 * @see IEC 61966-2-1:1999, section 5.2.
 * @example
 * ```ts
 * srgbEncodeArray(new Float32Array([0, 0.5, 1])); // [0, 0.7354, 1]
 * ```
 */
export function srgbEncodeArray<T extends SrgbArray>(values: T, out?: T): T {
  checkArrays('srgbEncodeArray', values, out);
  const o = out ?? (new (values.constructor as new (n: number) => T)(values.length));
  for (let k = 0; k < values.length; k++) o[k] = srgbEncode(values[k]!);
  return o;
}

/**
 * {@link srgbDecode} over an array.
 *
 * @param values - Encoded values.
 * @param out - Optional output of the same length (may be `values` itself).
 *   @defaultValue a new array of the same type
 * @returns `out`.
 * @throws {@link core!MeniscusTypeError} for a wrong array type or length.
 * @see IEC 61966-2-1:1999, section 5.2.
 * @example
 * ```ts
 * srgbDecodeArray(new Float64Array([0.5])); // [0.21404…]
 * ```
 */
export function srgbDecodeArray<T extends SrgbArray>(values: T, out?: T): T {
  checkArrays('srgbDecodeArray', values, out);
  const o = out ?? (new (values.constructor as new (n: number) => T)(values.length));
  for (let k = 0; k < values.length; k++) o[k] = srgbDecode(values[k]!);
  return o;
}

/**
 * The linear intensity of an 8-bit sRGB code value (0–255), e.g. a colour from a web
 * palette, ready to store in an `Image`.
 *
 * @param code - Integer-valued 0 to 255 (other finite numbers are used as given).
 * @returns `srgbDecode(code / 255)`.
 * @throws {@link core!MeniscusRangeError} for a non-finite code.
 * @see IEC 61966-2-1:1999, section 5.2.
 * @example
 * ```ts
 * srgbByteToLinear(188); // ≈ 0.5029
 * ```
 */
export function srgbByteToLinear(code: number): number {
  checkFinite('srgbByteToLinear', 'code', code);
  return srgbDecode(code / 255);
}
