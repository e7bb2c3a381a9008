/**
 * Image similarity: mean squared error, PSNR and SSIM over a mask, for one-channel and
 * multi-channel images.
 *
 * @module
 */
import { checkImage, checkMask, checkOneOf, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import type { Image, Mask } from '../core/index.js';
import { gaussianKernel1d } from './filter.js';

/**
 * How a multi-channel image is scored: each channel on its own and the scores
 * averaged (`'mean'`), or only its luminance (`'luminance'`: ITU-R BT.709 weights
 * `0.2126 R + 0.7152 G + 0.0722 B` on linear RGB for 3 or 4 channels, the alpha channel
 * ignored; the first channel for 1 or 2 channels).
 */
export type ChannelMode = 'mean' | 'luminance';

/** Options shared by {@link meanSquaredError} and {@link psnr}. */
export interface PsnrOptions {
  /**
   * Which pixels count (`1` = valid), one byte a pixel (not a channel). Pixels outside
   * the mask may hold any value, NaN included.
   * @defaultValue every pixel
   */
  mask?: Mask;
  /** The dynamic range `L` of the intensities (the largest value minus the smallest possible). @defaultValue 1 */
  dynamicRange?: number;
  /**
   * Multi-channel rule: `'mean'` pools the squared errors of every channel (the MSE over
   * all values), `'luminance'` scores the BT.709 luminance only.
   * @defaultValue `'mean'`
   */
  channelMode?: ChannelMode;
}

/**
 * Mean squared error between two images over the valid pixels (and every channel, or
 * the luminance).
 *
 * @param a - First image.
 * @param b - Second image, same width, height and channels.
 * @param options - Mask and channel rule (`dynamicRange` is not used).
 * @returns The MSE, in squared intensity units.
 * @throws {@link core!MeniscusTypeError} for malformed or mismatched images or a mask of the wrong length.
 * @throws {@link core!MeniscusRangeError} for non-finite pixels or an empty mask.
 * @see Common practice: the mean of the squared differences.
 * @example
 * ```ts
 * meanSquaredError(corrected, truth, { mask });
 * ```
 */
export function meanSquaredError(a: Image, b: Image, options?: PsnrOptions): number {
  return mseKernel('meanSquaredError', a, b, options);
}

/**
 * Peak signal-to-noise ratio in decibels: `10 · log10(L² / MSE)`.
 *
 * @param a - First image.
 * @param b - Second image, same width, height and channels.
 * @param options - Mask, dynamic range, channel rule.
 * @returns PSNR in dB; `Infinity` when the images are identical over the mask (MSE 0),
 *   as the definition gives.
 * @throws {@link core!MeniscusTypeError} for malformed or mismatched images or a mask of the wrong length.
 * @throws {@link core!MeniscusRangeError} for non-finite pixels, an empty mask, or a dynamic range that is not > 0.
 * @see Common practice; the definition as recalled in Wang, Bovik, Sheikh & Simoncelli
 *   (2004), "Image quality assessment: from error visibility to structural similarity",
 *   IEEE TIP 13(4), 600 (introduction).
 * @example
 * ```ts
 * psnr(corrected, truth, { dynamicRange: 1 }); // e.g. 31.4
 * ```
 */
export function psnr(a: Image, b: Image, options?: PsnrOptions): number {
  const fn = 'psnr';
  const o = checkOptions(fn, options);
  const L = o.dynamicRange === undefined ? 1 : checkPositive(fn, 'options.dynamicRange', o.dynamicRange);
  const mse = mseKernel(fn, a, b, o);
  if (mse === 0) return Infinity;
  return 10 * Math.log10((L * L) / mse);
}

/** Options of {@link ssim}. */
export interface SsimOptions {
  /**
   * Which pixels count (`1` = valid), one byte a pixel. Window statistics use only
   * valid pixels (each window's Gaussian weights are renormalised over its valid
   * pixels), and the score is the mean of the SSIM map over valid window centres whose
   * 11 × 11 window lies inside the image. A window that reaches past the mask's edge
   * thus still counts, with statistics of its valid part only. Pixels outside the mask
   * may hold any value, NaN included. With every pixel valid this is exactly the
   * reference definition.
   * @defaultValue every pixel
   */
  mask?: Mask;
  /** The dynamic range `L` of the intensities. @defaultValue 1 */
  dynamicRange?: number;
  /** `K1` of the luminance constant `C1 = (K1·L)²`. @defaultValue 0.01 */
  k1?: number;
  /** `K2` of the contrast constant `C2 = (K2·L)²`. @defaultValue 0.03 */
  k2?: number;
  /** Standard deviation of the Gaussian window, pixels. @defaultValue 1.5 */
  sigma?: number;
  /** Half-width of the window, pixels (the window is `2·radius + 1` wide). @defaultValue 5 */
  radius?: number;
  /**
   * Multi-channel rule: `'mean'` averages the per-channel SSIM scores, `'luminance'`
   * scores the BT.709 luminance only.
   * @defaultValue `'mean'`
   */
  channelMode?: ChannelMode;
  /** Return the SSIM map as well. @defaultValue false */
  map?: boolean;
}

/** The result of {@link ssim}. */
export interface SsimResult {
  /** Mean SSIM over the scored window centres (channels averaged in `'mean'` mode), in [−1, 1]. */
  readonly ssim: number;
  /** Mean SSIM of each channel (one entry in `'luminance'` mode or for a 1-channel image). */
  readonly perChannel: readonly number[];
  /** Number of window centres scored. */
  readonly count: number;
  /**
   * With `options.map`, the SSIM map (`width × height`, channels averaged), 0 where no
   * score is defined; otherwise `undefined`.
   */
  readonly map: Float64Array | undefined;
  /** With `options.map`, where `map` is defined (`1`); otherwise `undefined`. */
  readonly mapMask: Uint8Array | undefined;
}

/**
 * Structural similarity (SSIM) of two images: the mean over window centres of
 * `(2 μx μy + C1)(2 σxy + C2) / ((μx² + μy² + C1)(σx² + σy² + C2))`, with local means,
 * variances and covariance taken under a normalised Gaussian window (11 × 11, σ = 1.5),
 * `C1 = (K1 L)²`, `C2 = (K2 L)²`, `K1 = 0.01`, `K2 = 0.03`.
 *
 * Only window centres whose whole window lies inside the image are scored (the
 * reference implementation's 'valid' filtering); images are not downsampled first.
 * The separable window makes the cost about 100 multiply-adds a pixel a channel.
 *
 * @param a - First image (e.g. the corrected image).
 * @param b - Second image (e.g. the truth), same width, height and channels.
 * @param options - Mask, dynamic range, constants, window, channel rule, map.
 * @returns The mean SSIM, per-channel means, the count and optionally the map.
 * @throws {@link core!MeniscusTypeError} for malformed or mismatched images or a mask of the wrong length.
 * @throws {@link core!MeniscusRangeError} for non-finite pixels, non-positive `dynamicRange`,
 *   `sigma`, `k1` or `k2`, an image smaller than the window, or a mask with no valid
 *   window centre.
 * @see Wang, Bovik, Sheikh & Simoncelli (2004), "Image quality assessment: from error
 *   visibility to structural similarity", IEEE Transactions on Image Processing 13(4),
 *   600–612: equation (13) (the index), (14)–(16) (local statistics under a normalised
 *   Gaussian window) and (17) (the mean over the image); equation numbers from memory.
 * @example
 * ```ts
 * const { ssim: score } = ssim(corrected, truth, { mask });
 * ```
 */
export function ssim(a: Image, b: Image, options?: SsimOptions): SsimResult {
  const fn = 'ssim';
  const o = checkOptions(fn, options);
  const mask = checkPair(fn, a, b, o.mask);
  const { width, height, channels } = a;
  const L = o.dynamicRange === undefined ? 1 : checkPositive(fn, 'options.dynamicRange', o.dynamicRange);
  const k1 = o.k1 === undefined ? 0.01 : checkPositive(fn, 'options.k1', o.k1);
  const k2 = o.k2 === undefined ? 0.03 : checkPositive(fn, 'options.k2', o.k2);
  const sigma = o.sigma === undefined ? 1.5 : checkPositive(fn, 'options.sigma', o.sigma);
  let radius = 5;
  if (o.radius !== undefined) {
    if (typeof o.radius !== 'number') typeError(fn, 'options.radius', o.radius, 'an integer in [1, 64]');
    if (!(Number.isInteger(o.radius) && o.radius >= 1 && o.radius <= 64)) {
      rangeError(fn, 'options.radius', o.radius, 'an integer in [1, 64]');
    }
    radius = o.radius;
  }
  const mode = o.channelMode === undefined ? 'mean' : checkOneOf(fn, 'options.channelMode', o.channelMode, ['mean', 'luminance'] as const);
  if (o.map !== undefined && typeof o.map !== 'boolean') typeError(fn, 'options.map', o.map, 'true or false');
  if (width < 2 * radius + 1 || height < 2 * radius + 1) {
    rangeError(fn, 'a', `${width}×${height}`, `an image at least ${2 * radius + 1}×${2 * radius + 1} pixels (the window size)`);
  }
  const C1 = (k1 * L) ** 2;
  const C2 = (k2 * L) ** 2;
  const g = gaussianKernel1d(sigma, radius);
  const planes = mode === 'luminance' || channels === 1 ? 1 : channels;
  const wantMap = o.map === true;
  const map = wantMap ? new Float64Array(width * height) : undefined;
  const ws = new SsimWorkspace(width, height, radius, mask !== undefined);
  const pa = new Float32Array(width * height);
  const pb = new Float32Array(width * height);
  const perChannel: number[] = [];
  let count = 0;
  for (let c = 0; c < planes; c++) {
    let xa: Float32Array;
    let xb: Float32Array;
    if (mode === 'luminance' && channels >= 3) {
      luminancePlane(a, mask, pa);
      luminancePlane(b, mask, pb);
      xa = pa;
      xb = pb;
    } else if (channels === 1 && mask === undefined) {
      xa = a.data;
      xb = b.data;
    } else {
      channelPlane(a, c, mask, pa);
      channelPlane(b, c, mask, pb);
      xa = pa;
      xb = pb;
    }
    const r = ssimPlane(xa, xb, width, height, mask, g, C1, C2, ws, map, planes);
    count = r.count;
    perChannel.push(r.sum / r.count);
  }
  if (count === 0) {
    rangeError(fn, 'options.mask', mask, `a mask with at least one valid pixel at least ${radius} pixels inside the image border`);
  }
  let mapMask: Uint8Array | undefined;
  if (wantMap) {
    mapMask = new Uint8Array(width * height);
    for (let j = radius; j < height - radius; j++) {
      for (let i = radius; i < width - radius; i++) {
        const k = j * width + i;
        if (mask === undefined || mask[k] === 1) mapMask[k] = 1;
      }
    }
  }
  const mean = perChannel.reduce((s, v) => s + v, 0) / perChannel.length;
  return { ssim: mean, perChannel, count, map, mapMask };
}

/** Scratch buffers of one SSIM evaluation (Float32 storage, Float64 arithmetic). */
class SsimWorkspace {
  readonly ha: Float32Array;
  readonly hb: Float32Array;
  readonly hsq: Float32Array;
  readonly hab: Float32Array;
  readonly hw: Float32Array | undefined;
  constructor(width: number, height: number, radius: number, masked: boolean) {
    const nv = (width - 2 * radius) * height;
    this.ha = new Float32Array(nv);
    this.hb = new Float32Array(nv);
    this.hsq = new Float32Array(nv);
    this.hab = new Float32Array(nv);
    this.hw = masked ? new Float32Array(nv) : undefined;
  }
}

/**
 * Fused horizontal pass: the four windowed sums (a, b, a² + b², ab) of every 'valid'
 * output column of every row, reading each input sample once a tap, the kernel folded
 * about its centre. (SSIM needs the variances only as the sum σa² + σb², so a² and b²
 * are filtered together.)
 */
function horizontalPass(a: Float32Array, b: Float32Array, width: number, height: number, g: Float64Array, ws: SsimWorkspace): void {
  const r = (g.length - 1) >> 1;
  const wv = width - 2 * r;
  const g0 = g[r]!;
  const { ha, hb, hsq, hab } = ws;
  if (r === 5) {
    horizontalPass5(a, b, width, height, g, ws);
    return;
  }
  for (let j = 0; j < height; j++) {
    const row = j * width + r;
    const orow = j * wv;
    for (let i = 0; i < wv; i++) {
      const c = row + i;
      const xa = a[c]!;
      const xb = b[c]!;
      let sa = g0 * xa;
      let sb = g0 * xb;
      let ssq = g0 * (xa * xa + xb * xb);
      let sab = g0 * xa * xb;
      for (let k = 1; k <= r; k++) {
        const gk = g[r + k]!;
        const a1 = a[c - k]!;
        const a2 = a[c + k]!;
        const b1 = b[c - k]!;
        const b2 = b[c + k]!;
        sa += gk * (a1 + a2);
        sb += gk * (b1 + b2);
        ssq += gk * (a1 * a1 + a2 * a2 + b1 * b1 + b2 * b2);
        sab += gk * (a1 * b1 + a2 * b2);
      }
      ha[orow + i] = sa;
      hb[orow + i] = sb;
      hsq[orow + i] = ssq;
      hab[orow + i] = sab;
    }
  }
}

/** {@link horizontalPass} unrolled for the standard 11-tap window. */
function horizontalPass5(a: Float32Array, b: Float32Array, width: number, height: number, g: Float64Array, ws: SsimWorkspace): void {
  const wv = width - 10;
  const g0 = g[5]!;
  const g1 = g[6]!;
  const g2 = g[7]!;
  const g3 = g[8]!;
  const g4 = g[9]!;
  const g5 = g[10]!;
  const { ha, hb, hsq, hab } = ws;
  for (let j = 0; j < height; j++) {
    const row = j * width + 5;
    const orow = j * wv;
    for (let i = 0; i < wv; i++) {
      const c = row + i;
      const a0 = a[c]!;
      const b0 = b[c]!;
      const am1 = a[c - 1]!;
      const ap1 = a[c + 1]!;
      const am2 = a[c - 2]!;
      const ap2 = a[c + 2]!;
      const am3 = a[c - 3]!;
      const ap3 = a[c + 3]!;
      const am4 = a[c - 4]!;
      const ap4 = a[c + 4]!;
      const am5 = a[c - 5]!;
      const ap5 = a[c + 5]!;
      const bm1 = b[c - 1]!;
      const bp1 = b[c + 1]!;
      const bm2 = b[c - 2]!;
      const bp2 = b[c + 2]!;
      const bm3 = b[c - 3]!;
      const bp3 = b[c + 3]!;
      const bm4 = b[c - 4]!;
      const bp4 = b[c + 4]!;
      const bm5 = b[c - 5]!;
      const bp5 = b[c + 5]!;
      const o = orow + i;
      ha[o] = g0 * a0 + g1 * (am1 + ap1) + g2 * (am2 + ap2) + g3 * (am3 + ap3) + g4 * (am4 + ap4) + g5 * (am5 + ap5);
      hb[o] = g0 * b0 + g1 * (bm1 + bp1) + g2 * (bm2 + bp2) + g3 * (bm3 + bp3) + g4 * (bm4 + bp4) + g5 * (bm5 + bp5);
      hsq[o] =
        g0 * (a0 * a0 + b0 * b0) +
        g1 * (am1 * am1 + ap1 * ap1 + bm1 * bm1 + bp1 * bp1) +
        g2 * (am2 * am2 + ap2 * ap2 + bm2 * bm2 + bp2 * bp2) +
        g3 * (am3 * am3 + ap3 * ap3 + bm3 * bm3 + bp3 * bp3) +
        g4 * (am4 * am4 + ap4 * ap4 + bm4 * bm4 + bp4 * bp4) +
        g5 * (am5 * am5 + ap5 * ap5 + bm5 * bm5 + bp5 * bp5);
      hab[o] =
        g0 * a0 * b0 +
        g1 * (am1 * bm1 + ap1 * bp1) +
        g2 * (am2 * bm2 + ap2 * bp2) +
        g3 * (am3 * bm3 + ap3 * bp3) +
        g4 * (am4 * bm4 + ap4 * bp4) +
        g5 * (am5 * bm5 + ap5 * bp5);
    }
  }
}

/** Horizontal pass of the mask (the window weight actually present). */
function horizontalMaskPass(mask: Mask, width: number, height: number, g: Float64Array, out: Float32Array): void {
  const r = (g.length - 1) >> 1;
  const wv = width - 2 * r;
  const g0 = g[r]!;
  for (let j = 0; j < height; j++) {
    const row = j * width + r;
    const orow = j * wv;
    for (let i = 0; i < wv; i++) {
      const c = row + i;
      let s = g0 * mask[c]!;
      for (let k = 1; k <= r; k++) s += g[r + k]! * (mask[c - k]! + mask[c + k]!);
      out[orow + i] = s;
    }
  }
}

/**
 * Vertical pass of one windowed-sum array for output row `jv`, streaming whole rows
 * (each tap reads two rows in order), into `acc`.
 */
function verticalRow(src: Float32Array, wv: number, jv: number, g: Float64Array, acc: Float64Array): void {
  const r = (g.length - 1) >> 1;
  const c = (jv + r) * wv;
  const g0 = g[r]!;
  for (let i = 0; i < wv; i++) acc[i] = g0 * src[c + i]!;
  for (let k = 1; k <= r; k++) {
    const gk = g[r + k]!;
    const u = c - k * wv;
    const d = c + k * wv;
    for (let i = 0; i < wv; i++) acc[i] = acc[i]! + gk * (src[u + i]! + src[d + i]!);
  }
}

/** SSIM of one plane: the sum of the map over scored centres and their count. */
function ssimPlane(
  a: Float32Array,
  b: Float32Array,
  width: number,
  height: number,
  mask: Mask | undefined,
  g: Float64Array,
  C1: number,
  C2: number,
  ws: SsimWorkspace,
  map: Float64Array | undefined,
  planes: number,
): { sum: number; count: number } {
  const r = (g.length - 1) >> 1;
  horizontalPass(a, b, width, height, g, ws);
  const { ha, hb, hsq, hab, hw } = ws;
  if (hw !== undefined) horizontalMaskPass(mask!, width, height, g, hw);
  const wv = width - 2 * r;
  const hv = height - 2 * r;
  const va = new Float64Array(wv);
  const vb = new Float64Array(wv);
  const vsq = new Float64Array(wv);
  const vab = new Float64Array(wv);
  const vw = hw === undefined ? undefined : new Float64Array(wv);
  let sum = 0;
  let count = 0;
  for (let jv = 0; jv < hv; jv++) {
    verticalRow(ha, wv, jv, g, va);
    verticalRow(hb, wv, jv, g, vb);
    verticalRow(hsq, wv, jv, g, vsq);
    verticalRow(hab, wv, jv, g, vab);
    if (vw !== undefined) verticalRow(hw!, wv, jv, g, vw);
    const row = (jv + r) * width + r;
    for (let i = 0; i < wv; i++) {
      let sa = va[i]!;
      let sb = vb[i]!;
      let ssq = vsq[i]!;
      let sab = vab[i]!;
      if (vw !== undefined) {
        if (mask![row + i] !== 1) continue;
        const inv = 1 / vw[i]!;
        sa *= inv;
        sb *= inv;
        ssq *= inv;
        sab *= inv;
      }
      const mu2 = sa * sa + sb * sb;
      const muab = sa * sb;
      // σa² + σb² = E[a² + b²] − μa² − μb²; σab = E[ab] − μa μb.
      const s = ((2 * muab + C1) * (2 * (sab - muab) + C2)) / ((mu2 + C1) * (ssq - mu2 + C2));
      sum += s;
      count++;
      if (map !== undefined) map[row + i] = map[row + i]! + s / planes;
    }
  }
  return { sum, count };
}

/**
 * Check two images for shape agreement, then the mask, then finiteness of every valid
 * pixel (pixels outside the mask may hold anything, NaN included).
 */
function checkPair(fn: string, a: Image, b: Image, mask: unknown): Mask | undefined {
  checkImage(fn, 'a', a, true);
  checkImage(fn, 'b', b, true);
  if (a.width !== b.width || a.height !== b.height || a.channels !== b.channels) {
    typeError(fn, 'b', `${b.width}×${b.height}×${b.channels}`, `an image of the same size as a (${a.width}×${a.height}×${a.channels})`);
  }
  const m = mask === undefined ? undefined : checkMask(fn, 'options.mask', mask, a.width, a.height);
  const ch = a.channels;
  for (const [name, im] of [
    ['a', a],
    ['b', b],
  ] as const) {
    const d = im.data;
    for (let k = 0; k < d.length; k++) {
      if (!Number.isFinite(d[k]!) && (m === undefined || m[Math.floor(k / ch)] === 1)) {
        rangeError(fn, `${name}.data[${k}]`, d[k], m === undefined ? 'a finite intensity' : 'a finite intensity where the mask is valid');
      }
    }
  }
  return m;
}

function mseKernel(fn: string, a: Image, b: Image, options: PsnrOptions | undefined): number {
  const o = checkOptions(fn, options);
  const mask = checkPair(fn, a, b, o.mask);
  const { width, height, channels } = a;
  if (o.dynamicRange !== undefined) checkPositive(fn, 'options.dynamicRange', o.dynamicRange);
  const mode = o.channelMode === undefined ? 'mean' : checkOneOf(fn, 'options.channelMode', o.channelMode, ['mean', 'luminance'] as const);
  const n = width * height;
  const ad = a.data;
  const bd = b.data;
  let ss = 0;
  let count = 0;
  if (mode === 'luminance' && channels >= 3) {
    for (let k = 0; k < n; k++) {
      if (mask !== undefined && mask[k] !== 1) continue;
      const o3 = k * channels;
      const d =
        LUMA_R * (ad[o3]! - bd[o3]!) + LUMA_G * (ad[o3 + 1]! - bd[o3 + 1]!) + LUMA_B * (ad[o3 + 2]! - bd[o3 + 2]!);
      ss += d * d;
      count++;
    }
  } else if (mode === 'luminance') {
    for (let k = 0; k < n; k++) {
      if (mask !== undefined && mask[k] !== 1) continue;
      const d = ad[k * channels]! - bd[k * channels]!;
      ss += d * d;
      count++;
    }
  } else {
    for (let k = 0; k < n; k++) {
      if (mask !== undefined && mask[k] !== 1) continue;
      for (let c = 0; c < channels; c++) {
        const d = ad[k * channels + c]! - bd[k * channels + c]!;
        ss += d * d;
      }
      count += channels;
    }
  }
  if (count === 0) rangeError(fn, 'options.mask', mask, 'a mask with at least one valid pixel');
  return ss / count;
}

/** ITU-R BT.709 luminance weights for linear RGB. */
const LUMA_R = 0.2126;
const LUMA_G = 0.7152;
const LUMA_B = 0.0722;

/** Channel `c` of an image, zero where the mask is 0 (so masked pixels add nothing to a window). */
function channelPlane(im: Image, c: number, mask: Mask | undefined, out: Float32Array): void {
  const { data, channels } = im;
  const n = im.width * im.height;
  for (let k = 0; k < n; k++) out[k] = mask === undefined || mask[k] === 1 ? data[k * channels + c]! : 0;
}

/** BT.709 luminance of an RGB(A) image, zero where the mask is 0. */
function luminancePlane(im: Image, mask: Mask | undefined, out: Float32Array): void {
  const { data, channels } = im;
  const n = im.width * im.height;
  for (let k = 0; k < n; k++) {
    const o = k * channels;
    out[k] = mask === undefined || mask[k] === 1 ? LUMA_R * data[o]! + LUMA_G * data[o + 1]! + LUMA_B * data[o + 2]! : 0;
  }
}
