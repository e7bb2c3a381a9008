/**
 * PNG reading and writing of the library's `Image` (Node only; built on pngjs).
 *
 * Encoding, in both directions:
 * - An `Image` holds linear intensities. By default a value `v` is written as the code
 *   `round(clamp(v, 0, 1) · max)` with `max` = 255 (8-bit) or 65535 (16-bit), and read
 *   back as `code / max`: the file holds the numbers as given.
 * - With `transfer: 'srgb'` the colour channels are passed through the sRGB transfer
 *   function before quantising (and its inverse after reading), so that a viewer shows
 *   the intensities as light. Alpha is never transformed.
 * - Values outside [0, 1] are clamped; the write report counts them.
 * - Channels: 1 grey, 2 grey + alpha, 3 RGB, 4 RGBA, mapped to PNG colour types 0, 4,
 *   2 and 6. Reading returns the channels the file has (palette images as RGB or RGBA;
 *   1-, 2- and 4-bit grey scaled by their own maximum).
 *
 * @module
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { PNG } from 'pngjs';
import { LIMITS, checkImage, checkOneOf, checkOptions, createImage, rangeError, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';
import { srgbDecode, srgbEncode } from '../viz/srgb.js';

/** How stored codes relate to the image's values. */
export type PngTransfer = 'linear' | 'srgb';

/** Options for {@link encodePng} and {@link writePng}. */
export interface PngWriteOptions {
  /** Bits per channel. @defaultValue 8 */
  bitDepth?: 8 | 16;
  /** Transfer function applied to colour channels on write. @defaultValue 'linear' */
  transfer?: PngTransfer;
}

/** Options for {@link decodePng} and {@link readPng}. */
export interface PngReadOptions {
  /**
   * Inverse transfer applied to colour channels on read: `'srgb'` turns display codes
   * into linear intensity. @defaultValue 'linear'
   */
  transfer?: PngTransfer;
}

/** What was written: sizes and how many values had to be clamped. */
export interface PngWriteReport {
  /** Pixels per row. */
  readonly width: number;
  /** Rows. */
  readonly height: number;
  /** Channels written. */
  readonly channels: number;
  /** Bits per channel. */
  readonly bitDepth: 8 | 16;
  /** Size of the encoded file, bytes. */
  readonly bytes: number;
  /** Values below 0 that were written as 0. */
  readonly clippedLow: number;
  /** Values above 1 that were written as full scale. */
  readonly clippedHigh: number;
}

/** The header facts of a PNG file. */
export interface PngInfo {
  /** Pixels per row. */
  readonly width: number;
  /** Rows. */
  readonly height: number;
  /** Bits per sample as stored (1, 2, 4, 8 or 16). */
  readonly bitDepth: number;
  /** PNG colour type (0 grey, 2 RGB, 3 palette, 4 grey + alpha, 6 RGBA). */
  readonly colorType: number;
}

const COLOR_TYPE_OF_CHANNELS = [0, 0, 4, 2, 6] as const;
const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * Read the size, bit depth and colour type from a PNG's header without decoding it.
 *
 * @param bytes - The file (at least its first 29 bytes).
 * @returns The header facts.
 * @throws {@link core!MeniscusRangeError} when the bytes do not start with a PNG signature and
 *   an IHDR chunk.
 * @see ISO/IEC 15948:2004 (PNG), sections 5.2 (signature) and 11.2.2 (IHDR).
 * @example
 * ```ts
 * pngInfo(readFileSync('frame.png')).bitDepth; // 16
 * ```
 */
export function pngInfo(bytes: Uint8Array): PngInfo {
  const fn = 'pngInfo';
  if (!(bytes instanceof Uint8Array)) typeError(fn, 'bytes', bytes, 'a Uint8Array');
  for (let k = 0; k < 8; k++) {
    if (bytes[k] !== SIGNATURE[k]) rangeError(fn, 'bytes', bytes, 'a PNG file (it must start with the 8-byte PNG signature)');
  }
  if (bytes.length < 29 || String.fromCharCode(bytes[12]!, bytes[13]!, bytes[14]!, bytes[15]!) !== 'IHDR') {
    rangeError(fn, 'bytes', bytes, 'a PNG file whose first chunk is IHDR');
  }
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  return { width: dv.getUint32(16), height: dv.getUint32(20), bitDepth: bytes[24]!, colorType: bytes[25]! };
}

function quantiser(bitDepth: 8 | 16, transfer: PngTransfer, channels: number) {
  const max = bitDepth === 8 ? 255 : 65535;
  const hasAlpha = channels === 2 || channels === 4;
  return { max, hasAlpha, srgb: transfer === 'srgb' };
}

/**
 * Encode an image as PNG bytes.
 *
 * @param image - A linear-intensity image, 1 to 4 channels, finite values.
 * @param options - See {@link PngWriteOptions}.
 * @returns The file bytes and a {@link PngWriteReport}.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for an invalid image
 *   (non-finite values included) or options.
 * @see ISO/IEC 15948:2004 (PNG); IEC 61966-2-1:1999 (sRGB) for `transfer: 'srgb'`.
 * @example
 * ```ts
 * const { png, report } = encodePng(image, { bitDepth: 16 });
 * ```
 */
export function encodePng(image: Image, options?: PngWriteOptions): { png: Uint8Array; report: PngWriteReport } {
  const fn = 'encodePng';
  checkImage(fn, 'image', image);
  const o = checkOptions(fn, options);
  const bitDepth = o.bitDepth === undefined ? 8 : (o.bitDepth as unknown);
  if (bitDepth !== 8 && bitDepth !== 16) rangeError(fn, 'options.bitDepth', bitDepth, '8 or 16');
  const transfer = o.transfer === undefined ? 'linear' : checkOneOf(fn, 'options.transfer', o.transfer, ['linear', 'srgb'] as const);
  const { width, height, channels, data } = image;
  const q = quantiser(bitDepth, transfer, channels);
  const n = data.length;
  const codes = bitDepth === 8 ? new Uint8Array(n) : new Uint16Array(n);
  let low = 0;
  let high = 0;
  for (let k = 0; k < n; k++) {
    let v = data[k]!;
    if (v < 0) {
      low++;
      v = 0;
    } else if (v > 1) {
      high++;
      v = 1;
    }
    const c = k % channels;
    const isAlpha = q.hasAlpha && c === channels - 1;
    if (q.srgb && !isAlpha) v = srgbEncode(v);
    codes[k] = Math.round(v * q.max);
  }
  const colorType = COLOR_TYPE_OF_CHANNELS[channels]!;
  const buffer = Buffer.from(codes.buffer, codes.byteOffset, codes.byteLength);
  const png = PNG.sync.write({ width, height, data: buffer } as PNG, {
    colorType,
    inputColorType: colorType,
    bitDepth,
    inputHasAlpha: q.hasAlpha,
  });
  return {
    png,
    report: { width, height, channels, bitDepth, bytes: png.length, clippedLow: low, clippedHigh: high },
  };
}

/**
 * Write an image as a PNG file.
 *
 * @param path - File path (overwritten).
 * @param image - A linear-intensity image, 1 to 4 channels.
 * @param options - See {@link PngWriteOptions}.
 * @returns What was written, with clipping counts.
 * @throws Everything {@link encodePng} throws; the file system's error on failure.
 * @see ISO/IEC 15948:2004 (PNG).
 * @example
 * ```ts
 * import { writePng } from 'meniscus/node';
 * const r = writePng('corrected.png', image, { transfer: 'srgb' });
 * if (r.clippedHigh > 0) console.warn(`${r.clippedHigh} values saturated`);
 * ```
 */
export function writePng(path: string, image: Image, options?: PngWriteOptions): PngWriteReport {
  if (typeof path !== 'string' || path.length === 0) typeError('writePng', 'path', path, 'a non-empty file path string');
  const { png, report } = encodePng(image, options);
  writeFileSync(path, png);
  return report;
}

/**
 * Decode PNG bytes into a linear-intensity image (values in [0, 1]).
 *
 * @param bytes - The file.
 * @param options - See {@link PngReadOptions}.
 * @returns The image, with the file's channels (1 grey, 2 grey + alpha, 3 RGB, 4 RGBA).
 * @throws {@link core!MeniscusRangeError} for bytes that are not a valid PNG, or an image
 *   larger than {@link core!LIMITS} (checked from the header before decoding).
 * @see ISO/IEC 15948:2004 (PNG); IEC 61966-2-1:1999 (sRGB) for `transfer: 'srgb'`.
 * @example
 * ```ts
 * const img = decodePng(readFileSync('scene.png'), { transfer: 'srgb' });
 * ```
 */
export function decodePng(bytes: Uint8Array, options?: PngReadOptions): Image {
  const fn = 'decodePng';
  const info = pngInfo(bytes);
  const o = checkOptions(fn, options);
  const transfer = o.transfer === undefined ? 'linear' : checkOneOf(fn, 'options.transfer', o.transfer, ['linear', 'srgb'] as const);
  if (!(info.width >= 1 && info.height >= 1 && info.width <= LIMITS.maxSide && info.height <= LIMITS.maxSide)) {
    rangeError(fn, 'bytes', `${info.width}×${info.height}`, `a PNG of 1 to ${LIMITS.maxSide} pixels a side (LIMITS.maxSide)`);
  }
  if (info.width * info.height > LIMITS.maxSamples) {
    rangeError(fn, 'bytes', `${info.width}×${info.height}`, `a PNG of at most ${LIMITS.maxSamples} pixels (LIMITS.maxSamples)`);
  }
  let decoded: ReturnType<typeof PNG.sync.read>;
  try {
    const buf = Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
    decoded = PNG.sync.read(buf, { skipRescale: true });
  } catch (e) {
    rangeError(fn, 'bytes', bytes, `a valid PNG file (the decoder said: ${(e as Error).message})`);
  }
  const { width, height } = decoded;
  const rgba = decoded.data as unknown as ArrayLike<number>; // always 4 samples a pixel
  const color = (decoded as unknown as { color: boolean }).color;
  const alpha = (decoded as unknown as { alpha: boolean }).alpha;
  const depth = info.colorType === 3 ? 8 : info.bitDepth;
  const max = 2 ** depth - 1;
  const channels = (color ? 3 : 1) + (alpha ? 1 : 0);
  const img = createImage(width, height, channels);
  const out = img.data;
  // One lookup table per code value: exact and fast for 8 and 16 bit alike.
  const lut = new Float32Array(max + 1);
  for (let c = 0; c <= max; c++) lut[c] = transfer === 'srgb' ? srgbDecode(c / max) : c / max;
  const n = width * height;
  for (let p = 0; p < n; p++) {
    const s = p * 4;
    const d = p * channels;
    if (color) {
      out[d] = lut[rgba[s]!]!;
      out[d + 1] = lut[rgba[s + 1]!]!;
      out[d + 2] = lut[rgba[s + 2]!]!;
      if (alpha) out[d + 3] = rgba[s + 3]! / max;
    } else {
      out[d] = lut[rgba[s]!]!;
      if (alpha) out[d + 1] = rgba[s + 3]! / max;
    }
  }
  return img;
}

/**
 * Read a PNG file into a linear-intensity image.
 *
 * @param path - File path.
 * @param options - See {@link PngReadOptions}.
 * @returns The image.
 * @throws Everything {@link decodePng} throws; the file system's error on failure.
 * @see ISO/IEC 15948:2004 (PNG).
 * @example
 * ```ts
 * import { readPng } from 'meniscus/node';
 * const frame = readPng('frame_0001.png');
 * ```
 */
export function readPng(path: string, options?: PngReadOptions): Image {
  if (typeof path !== 'string' || path.length === 0) typeError('readPng', 'path', path, 'a non-empty file path string');
  return decodePng(readFileSync(path), options);
}
