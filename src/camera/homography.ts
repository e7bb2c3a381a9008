/**
 * Plane-to-image homographies: fitting by the normalised direct linear transform with
 * an optional RANSAC outlier search and a Levenberg–Marquardt refinement of the transfer
 * error, applying and inverting. This is how camera pixels are mapped to metric
 * coordinates on a screen or diffuser plane.
 *
 * A homography is a {@link Mat3} `H` (row-major) acting on homogeneous 2-D points:
 * `[u, v, w]ᵀ = H [x, y, 1]ᵀ`, image point `(u/w, v/w)`.
 *
 * @module
 */
import { SingularValueDecomposition } from 'ml-matrix';
import {
  checkAllFinite,
  checkBoolean,
  checkFloat64Array,
  checkInteger,
  checkOptions,
  checkPositive,
  createRng,
  LIMITS,
  rangeError,
  Status,
  typeError,
} from '../core/index.js';
import type { Mat3 } from '../core/index.js';
import type { MutablePixel, Pixel } from './model.js';
import { checkPixel } from './model.js';

/** Options of the RANSAC outlier search in {@link fitHomography}. */
export interface RansacOptions {
  /** Largest transfer error of an inlier, in destination units (e.g. pixels). @defaultValue 3 */
  threshold?: number;
  /** Cap on the number of random minimal samples, at most `LIMITS.maxIterations`. @defaultValue 2000 */
  maxIterations?: number;
  /** Wanted probability that one sample is outlier-free; sets the adaptive sample count. @defaultValue 0.995 */
  confidence?: number;
  /** Seed of the library's random generator. @defaultValue 0 */
  seed?: number;
}

/** Options of {@link fitHomography}. */
export interface FitHomographyOptions {
  /** Search for outliers by RANSAC: `true` for the defaults or the options. @defaultValue false */
  ransac?: boolean | RansacOptions;
  /**
   * Refine the DLT estimate by Levenberg–Marquardt on the transfer error in the
   * destination plane (the maximum-likelihood estimate for noise in the destination only).
   * @defaultValue true
   */
  refine?: boolean;
}

/** The result of {@link fitHomography}. */
export interface HomographyFit {
  /** The homography from source to destination, scaled so that `H[8] = 1` (or to unit Frobenius norm when `H[8]` is 0). */
  readonly matrix: Mat3;
  /** 1 for each correspondence used in the final fit, 0 for an outlier. */
  readonly inliers: Uint8Array;
  /** Number of inliers. */
  readonly inlierCount: number;
  /** Per correspondence, the transfer error |H(src) − dst| in destination units (Infinity where H(src) is at infinity). */
  readonly errors: Float64Array;
  /** RMS transfer error over the inliers, destination units. */
  readonly rmsError: number;
  /** Largest transfer error over the inliers, destination units. */
  readonly maxError: number;
  /** Number of RANSAC samples drawn (0 without RANSAC). */
  readonly ransacIterations: number;
}

interface Norm {
  cx: number;
  cy: number;
  s: number;
}

function normalisation(p: Float64Array, idx: ArrayLike<number>, count: number): Norm {
  let cx = 0, cy = 0;
  for (let k = 0; k < count; k++) {
    const i = idx[k]!;
    cx += p[2 * i]!;
    cy += p[2 * i + 1]!;
  }
  cx /= count;
  cy /= count;
  let d = 0;
  for (let k = 0; k < count; k++) {
    const i = idx[k]!;
    d += Math.hypot(p[2 * i]! - cx, p[2 * i + 1]! - cy);
  }
  d /= count;
  return { cx, cy, s: d > 0 ? Math.SQRT2 / d : 1 };
}

/** Smallest/largest eigenvalue ratio of the 2 × 2 scatter of the normalised points (0 = collinear). */
function spread(p: Float64Array, idx: ArrayLike<number>, count: number, nm: Norm): number {
  let a = 0, b = 0, c = 0;
  for (let k = 0; k < count; k++) {
    const i = idx[k]!;
    const x = (p[2 * i]! - nm.cx) * nm.s, y = (p[2 * i + 1]! - nm.cy) * nm.s;
    a += x * x;
    b += x * y;
    c += y * y;
  }
  const tr = a + c, det = a * c - b * b;
  const disc = Math.sqrt(Math.max(0, (tr * tr) / 4 - det));
  const hi = tr / 2 + disc, lo = tr / 2 - disc;
  return hi > 0 ? lo / hi : 0;
}

function triangleCollinear(p: Float64Array, i: number, j: number, k: number, scale: number): boolean {
  const ax = p[2 * j]! - p[2 * i]!, ay = p[2 * j + 1]! - p[2 * i + 1]!;
  const bx = p[2 * k]! - p[2 * i]!, by = p[2 * k + 1]! - p[2 * i + 1]!;
  return Math.abs(ax * by - ay * bx) <= 1e-10 * scale * scale;
}

/** True when some three of the four points are collinear (to rounding). */
function minimalDegenerate(p: Float64Array, idx: ArrayLike<number>): boolean {
  const nm = normalisation(p, idx, 4);
  const scale = 1 / nm.s;
  const [a, b, c, d] = [idx[0]!, idx[1]!, idx[2]!, idx[3]!];
  return (
    triangleCollinear(p, a, b, c, scale) ||
    triangleCollinear(p, a, b, d, scale) ||
    triangleCollinear(p, a, c, d, scale) ||
    triangleCollinear(p, b, c, d, scale)
  );
}

/** Normalised DLT on the given correspondences; returns Ĥ in normalised coordinates and the σ8/σ1 ratio. */
function dltNormalised(
  src: Float64Array,
  dst: Float64Array,
  idx: ArrayLike<number>,
  count: number,
  ns: Norm,
  nd: Norm,
): { h: number[]; conditioning: number } {
  const rows = Math.max(9, 2 * count);
  const a: number[][] = [];
  for (let k = 0; k < count; k++) {
    const i = idx[k]!;
    const x = (src[2 * i]! - ns.cx) * ns.s, y = (src[2 * i + 1]! - ns.cy) * ns.s;
    const u = (dst[2 * i]! - nd.cx) * nd.s, v = (dst[2 * i + 1]! - nd.cy) * nd.s;
    a.push([-x, -y, -1, 0, 0, 0, u * x, u * y, u]);
    a.push([0, 0, 0, -x, -y, -1, v * x, v * y, v]);
  }
  while (a.length < rows) a.push([0, 0, 0, 0, 0, 0, 0, 0, 0]);
  const svd = new SingularValueDecomposition(a, {
    computeLeftSingularVectors: false,
    computeRightSingularVectors: true,
    autoTranspose: false,
  });
  const sv = svd.diagonal;
  // Singular values come sorted, largest first.
  const V = svd.rightSingularVectors;
  const h: number[] = [];
  for (let r = 0; r < 9; r++) h.push(V.get(r, 8));
  return { h, conditioning: sv[0]! > 0 ? sv[7]! / sv[0]! : 0 };
}

function denormalise(h: ArrayLike<number>, ns: Norm, nd: Norm): number[] {
  // H = Td⁻¹ Ĥ Ts with Ts = [[s, 0, −s cx], [0, s, −s cy], [0, 0, 1]].
  const ts = [ns.s, 0, -ns.s * ns.cx, 0, ns.s, -ns.s * ns.cy, 0, 0, 1];
  const tdi = [1 / nd.s, 0, nd.cx, 0, 1 / nd.s, nd.cy, 0, 0, 1];
  return mul(tdi, mul(Array.from(h), ts));
}

function mul(a: ArrayLike<number>, b: ArrayLike<number>): number[] {
  const r: number[] = new Array(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) r[i * 3 + j] = a[i * 3]! * b[j]! + a[i * 3 + 1]! * b[3 + j]! + a[i * 3 + 2]! * b[6 + j]!;
  return r;
}

function scaleHomography(h: number[]): Mat3 {
  const f = Math.hypot(...h);
  let s: number;
  if (Math.abs(h[8]!) > 1e-12 * f) s = 1 / h[8]!;
  else {
    // Unit norm, sign fixed by the largest entry.
    let big = 0;
    for (let k = 1; k < 9; k++) if (Math.abs(h[k]!) > Math.abs(h[big]!)) big = k;
    s = (h[big]! < 0 ? -1 : 1) / f;
  }
  return h.map((x) => x * s) as unknown as Mat3;
}

function transferError(h: ArrayLike<number>, src: Float64Array, dst: Float64Array, i: number): number {
  const x = src[2 * i]!, y = src[2 * i + 1]!;
  const w = h[6]! * x + h[7]! * y + h[8]!;
  if (w === 0) return Infinity;
  const u = (h[0]! * x + h[1]! * y + h[2]!) / w, v = (h[3]! * x + h[4]! * y + h[5]!) / w;
  const e = Math.hypot(u - dst[2 * i]!, v - dst[2 * i + 1]!);
  return Number.isFinite(e) ? e : Infinity;
}

/** Solve the n × n system A x = b in place by Gaussian elimination with partial pivoting. */
function solveSmall(a: number[], b: number[], n: number): boolean {
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r * n + c]!) > Math.abs(a[piv * n + c]!)) piv = r;
    if (!(Math.abs(a[piv * n + c]!) > 1e-300)) return false;
    if (piv !== c) {
      for (let k = 0; k < n; k++) [a[c * n + k], a[piv * n + k]] = [a[piv * n + k]!, a[c * n + k]!];
      [b[c], b[piv]] = [b[piv]!, b[c]!];
    }
    for (let r = c + 1; r < n; r++) {
      const f = a[r * n + c]! / a[c * n + c]!;
      if (f === 0) continue;
      for (let k = c; k < n; k++) a[r * n + k]! -= f * a[c * n + k]!;
      b[r]! -= f * b[c]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r]!;
    for (let k = r + 1; k < n; k++) s -= a[r * n + k]! * b[k]!;
    b[r] = s / a[r * n + r]!;
  }
  return true;
}

/**
 * Levenberg–Marquardt on Ĥ (normalised coordinates, ĥ8 = 1) minimising the sum of
 * squared transfer errors of the chosen correspondences.
 */
function refineNormalised(h0: number[], src: Float64Array, dst: Float64Array, idx: ArrayLike<number>, count: number, ns: Norm, nd: Norm): number[] {
  if (!(Math.abs(h0[8]!) > 1e-12)) return h0;
  let h = h0.map((x) => x / h0[8]!);
  const xs = new Float64Array(count), ys = new Float64Array(count), us = new Float64Array(count), vs = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    const i = idx[k]!;
    xs[k] = (src[2 * i]! - ns.cx) * ns.s;
    ys[k] = (src[2 * i + 1]! - ns.cy) * ns.s;
    us[k] = (dst[2 * i]! - nd.cx) * nd.s;
    vs[k] = (dst[2 * i + 1]! - nd.cy) * nd.s;
  }
  const cost = (g: number[]): number => {
    let c = 0;
    for (let k = 0; k < count; k++) {
      const w = g[6]! * xs[k]! + g[7]! * ys[k]! + 1;
      const du = (g[0]! * xs[k]! + g[1]! * ys[k]! + g[2]!) / w - us[k]!;
      const dv = (g[3]! * xs[k]! + g[4]! * ys[k]! + g[5]!) / w - vs[k]!;
      c += du * du + dv * dv;
    }
    return Number.isFinite(c) ? c : Infinity;
  };
  let c = cost(h);
  let lambda = 1e-3;
  const J = new Float64Array(8);
  for (let it = 0; it < 100 && c > 0; it++) {
    const A = new Array(64).fill(0);
    const g = new Array(8).fill(0);
    for (let k = 0; k < count; k++) {
      const x = xs[k]!, y = ys[k]!;
      const w = h[6]! * x + h[7]! * y + 1;
      const pu = (h[0]! * x + h[1]! * y + h[2]!) / w, pv = (h[3]! * x + h[4]! * y + h[5]!) / w;
      for (let comp = 0; comp < 2; comp++) {
        J.fill(0);
        const p = comp === 0 ? pu : pv;
        const off = comp === 0 ? 0 : 3;
        J[off] = x / w;
        J[off + 1] = y / w;
        J[off + 2] = 1 / w;
        J[6] = (-x * p) / w;
        J[7] = (-y * p) / w;
        const r = p - (comp === 0 ? us[k]! : vs[k]!);
        for (let a = 0; a < 8; a++) {
          if (J[a] === 0) continue;
          g[a] += J[a]! * r;
          for (let b = 0; b < 8; b++) A[a * 8 + b] += J[a]! * J[b]!;
        }
      }
    }
    let improved = false;
    for (let tries = 0; tries < 20; tries++) {
      const M = A.slice();
      for (let a = 0; a < 8; a++) M[a * 8 + a] += lambda * (A[a * 8 + a] + 1e-12);
      const step = g.map((x) => -x);
      if (!solveSmall(M, step, 8)) {
        lambda *= 10;
        continue;
      }
      const trial = [h[0]! + step[0]!, h[1]! + step[1]!, h[2]! + step[2]!, h[3]! + step[3]!, h[4]! + step[4]!, h[5]! + step[5]!, h[6]! + step[6]!, h[7]! + step[7]!, 1];
      const ct = cost(trial);
      if (ct < c) {
        const rel = (c - ct) / c;
        h = trial;
        c = ct;
        lambda = Math.max(lambda / 10, 1e-12);
        improved = true;
        if (rel < 1e-15) return h;
        break;
      }
      lambda *= 10;
    }
    if (!improved) break;
  }
  return h;
}

function fitOn(
  src: Float64Array,
  dst: Float64Array,
  idx: ArrayLike<number>,
  count: number,
  refine: boolean,
): { h: number[]; conditioning: number; collinear: boolean } {
  const ns = normalisation(src, idx, count), nd = normalisation(dst, idx, count);
  const collinear = spread(src, idx, count, ns) < 1e-12 || spread(dst, idx, count, nd) < 1e-12;
  const { h, conditioning } = dltNormalised(src, dst, idx, count, ns, nd);
  const hr = refine ? refineNormalised(h, src, dst, idx, count, ns, nd) : h;
  return { h: denormalise(hr, ns, nd), conditioning, collinear };
}

/**
 * Fit the homography that maps `src` points to `dst` points (at least 4 pairs) by the
 * normalised direct linear transform: both point sets are moved to their centroid and
 * scaled to a mean distance of √2, the 2N × 9 system is solved by singular value
 * decomposition (ml-matrix), and the result is mapped back. Optionally, RANSAC first
 * separates outliers (random minimal samples of 4 from the library's seeded generator,
 * adaptive sample count), and Levenberg–Marquardt refines the estimate on the inliers.
 *
 * @param src - Source points, packed `xy xy …` (e.g. metres on a plane).
 * @param dst - Destination points, packed `uv uv …` (e.g. pixels), same length.
 * @param options - RANSAC and refinement.
 * @returns The homography, the inlier mask and the transfer-error report.
 * @throws {@link core!MeniscusTypeError} for wrong array types or lengths;
 *   {@link core!MeniscusRangeError} for fewer than 4 pairs, non-finite coordinates, or a
 *   degenerate configuration: all points collinear, three of four collinear, or any set
 *   whose DLT system has rank below 8 (the homography is not determined), or when RANSAC
 *   finds no non-degenerate sample with at least 4 inliers.
 * @see Hartley, R. I. (1997), "In defense of the eight-point algorithm", IEEE TPAMI
 *   19(6), 580–593 (the normalisation).
 * @see Hartley, R. & Zisserman, A. (2003), Multiple View Geometry in Computer Vision,
 *   2nd ed., algorithm 4.2 (normalised DLT), §4.2.2 eq. 4.6 (transfer error) and
 *   algorithm 4.5 (adaptive RANSAC).
 * @see Fischler, M. A. & Bolles, R. C. (1981), "Random sample consensus", Communications
 *   of the ACM 24(6), 381–395.
 * @example
 * ```ts
 * const plane = new Float64Array([0, 0, 1, 0, 1, 1, 0, 1]);
 * const image = new Float64Array([100, 100, 300, 110, 290, 320, 95, 300]);
 * const fit = fitHomography(plane, image);
 * applyHomography(fit.matrix, [0.5, 0.5]);
 * ```
 */
export function fitHomography(src: Float64Array, dst: Float64Array, options?: FitHomographyOptions): HomographyFit {
  const fn = 'fitHomography';
  checkFloat64Array(fn, 'src', src, 2);
  checkFloat64Array(fn, 'dst', dst, 2, src.length);
  checkAllFinite(fn, 'src', src);
  checkAllFinite(fn, 'dst', dst);
  const n = src.length / 2;
  if (n < 4) rangeError(fn, 'src', src, 'at least 4 point pairs');
  const o = checkOptions(fn, options);
  const refine = o.refine === undefined ? true : checkBoolean(fn, 'options.refine', o.refine);
  let ransac: Required<RansacOptions> | null = null;
  if (o.ransac !== undefined && o.ransac !== false) {
    const r = o.ransac === true ? {} : checkOptions(fn, o.ransac, 'options.ransac');
    ransac = {
      threshold: r.threshold === undefined ? 3 : checkPositive(fn, 'options.ransac.threshold', r.threshold),
      maxIterations: r.maxIterations === undefined ? 2000 : checkInteger(fn, 'options.ransac.maxIterations', r.maxIterations, 1, LIMITS.maxIterations),
      confidence: r.confidence === undefined ? 0.995 : r.confidence,
      seed: r.seed === undefined ? 0 : r.seed,
    };
    if (!(ransac.confidence > 0 && ransac.confidence < 1)) rangeError(fn, 'options.ransac.confidence', ransac.confidence, 'a number in (0, 1)');
    if (typeof ransac.seed !== 'number' || !Number.isFinite(ransac.seed)) typeError(fn, 'options.ransac.seed', ransac.seed, 'a finite number');
  }

  const all = new Uint32Array(n);
  for (let i = 0; i < n; i++) all[i] = i;
  const inliers = new Uint8Array(n);
  let iterations = 0;
  let chosen: Uint32Array = all;
  if (ransac) {
    const rng = createRng(ransac.seed);
    const th = ransac.threshold;
    let bestCount = 0, bestSum = Infinity;
    let bestMask = new Uint8Array(n);
    let needed = ransac.maxIterations;
    const sample = new Uint32Array(4);
    const mask = new Uint8Array(n);
    while (iterations < Math.min(needed, ransac.maxIterations)) {
      iterations++;
      for (let k = 0; k < 4; k++) {
        let c: number;
        do c = rng.integer(n);
        while (sample.subarray(0, k).includes(c));
        sample[k] = c;
      }
      if (minimalDegenerate(src, sample) || minimalDegenerate(dst, sample)) continue;
      const ns = normalisation(src, sample, 4), nd = normalisation(dst, sample, 4);
      const { h } = dltNormalised(src, dst, sample, 4, ns, nd);
      const H = denormalise(h, ns, nd);
      let count = 0, sum = 0;
      for (let i = 0; i < n; i++) {
        const e = transferError(H, src, dst, i);
        mask[i] = e <= th ? 1 : 0;
        if (mask[i]) {
          count++;
          sum += e * e;
        }
      }
      if (count > bestCount || (count === bestCount && sum < bestSum)) {
        bestCount = count;
        bestSum = sum;
        bestMask = mask.slice();
        const w = count / n;
        const pOut = 1 - w ** 4;
        needed = pOut <= 0 ? iterations : Math.ceil(Math.log(1 - ransac.confidence) / Math.log(pOut));
      }
    }
    if (bestCount < 4) rangeError(fn, 'src', src, 'a configuration where RANSAC finds at least 4 consistent, non-degenerate pairs');
    inliers.set(bestMask);
    chosen = all.filter((i) => inliers[i] === 1);
  } else {
    inliers.fill(1);
  }

  const count = chosen.length;
  if (count === 4 && (minimalDegenerate(src, chosen) || minimalDegenerate(dst, chosen))) {
    rangeError(fn, 'src', src, 'four points of which no three are collinear (in src and in dst)');
  }
  const fit = fitOn(src, dst, chosen, count, refine);
  if (fit.collinear) rangeError(fn, 'src', src, 'points that are not all collinear (in src and in dst)');
  if (!(fit.conditioning > 1e-10)) {
    rangeError(fn, 'src', src, 'a configuration that determines the homography (the DLT system has rank < 8)');
  }
  const matrix = scaleHomography(fit.h);
  const errors = new Float64Array(n);
  let sum = 0, max = 0;
  for (let i = 0; i < n; i++) {
    errors[i] = transferError(matrix, src, dst, i);
    if (inliers[i]) {
      sum += errors[i]! * errors[i]!;
      max = Math.max(max, errors[i]!);
    }
  }
  return { matrix, inliers, inlierCount: count, errors, rmsError: Math.sqrt(sum / count), maxError: max, ransacIterations: iterations };
}

function checkHomography(fn: string, h: unknown): Mat3 {
  const isArr = Array.isArray(h) || h instanceof Float64Array;
  if (!isArr || (h as ArrayLike<number>).length !== 9) typeError(fn, 'h', h, 'a 3 × 3 matrix as 9 numbers, row-major');
  for (let k = 0; k < 9; k++) {
    const v = (h as ArrayLike<unknown>)[k];
    if (typeof v !== 'number') typeError(fn, 'h', h, 'a matrix of numbers');
    if (!Number.isFinite(v)) rangeError(fn, 'h', h, 'a matrix of finite numbers');
  }
  return h as unknown as Mat3;
}

/**
 * Apply a homography to one point.
 *
 * @param h - The homography, row-major.
 * @param point - `[x, y]`.
 * @returns `[u/w, v/w]`, or `null` when the point maps to infinity (w = 0).
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for bad input.
 * @see Hartley, R. & Zisserman, A. (2003), Multiple View Geometry in Computer Vision, §2.3.
 * @example
 * ```ts
 * applyHomography([2, 0, 1, 0, 2, 1, 0, 0, 1], [1, 1]); // [3, 3]
 * ```
 */
export function applyHomography(h: Mat3, point: Pixel): MutablePixel | null {
  const m = checkHomography('applyHomography', h);
  const p = checkPixel('applyHomography', 'point', point);
  const w = m[6] * p[0] + m[7] * p[1] + m[8];
  if (w === 0) return null;
  const u = (m[0] * p[0] + m[1] * p[1] + m[2]) / w, v = (m[3] * p[0] + m[4] * p[1] + m[5]) / w;
  return Number.isFinite(u) && Number.isFinite(v) ? [u, v] : null;
}

/** Options of {@link applyHomographyBatch}. */
export interface ApplyHomographyOptions {
  /** Output points, same length as the input. */
  out?: Float64Array;
  /** Output status codes, one a point (`ok` or `outside` for a point mapped to infinity). */
  status?: Uint8Array;
}

/**
 * Apply a homography to packed points `xy xy …`.
 *
 * @param h - The homography, row-major.
 * @param points - Packed points.
 * @param options - Output buffers.
 * @returns Mapped points (NaN where the status is `outside`) and status codes.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for bad input.
 * @example
 * ```ts
 * applyHomographyBatch(fit.matrix, new Float64Array([0, 0, 1, 1])).points;
 * ```
 */
export function applyHomographyBatch(h: Mat3, points: Float64Array, options?: ApplyHomographyOptions): { points: Float64Array; status: Uint8Array } {
  const fn = 'applyHomographyBatch';
  const m = checkHomography(fn, h);
  checkFloat64Array(fn, 'points', points, 2);
  const o = checkOptions(fn, options);
  const n = points.length / 2;
  const out = o.out === undefined ? new Float64Array(2 * n) : checkFloat64Array(fn, 'options.out', o.out, 1, 2 * n);
  if (o.status !== undefined && (!(o.status instanceof Uint8Array) || o.status.length !== n)) typeError(fn, 'options.status', o.status, `a Uint8Array of length ${n}`);
  const st = o.status ?? new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const x = points[2 * i]!, y = points[2 * i + 1]!;
    const w = m[6] * x + m[7] * y + m[8];
    const u = (m[0] * x + m[1] * y + m[2]) / w, v = (m[3] * x + m[4] * y + m[5]) / w;
    if (w !== 0 && Number.isFinite(u) && Number.isFinite(v)) {
      out[2 * i] = u;
      out[2 * i + 1] = v;
      st[i] = Status.ok;
    } else {
      out[2 * i] = NaN;
      out[2 * i + 1] = NaN;
      st[i] = Status.outside;
    }
  }
  return { points: out, status: st };
}

/**
 * The inverse homography (destination → source), scaled like {@link fitHomography}'s result.
 *
 * @param h - The homography, row-major.
 * @returns `H⁻¹` (the adjugate, rescaled).
 * @throws {@link core!MeniscusRangeError} when `h` is singular (|det| ≤ 1e-14 ‖H‖³) or not finite.
 * @example
 * ```ts
 * invertHomography([2, 0, 1, 0, 2, 1, 0, 0, 1]); // [0.5, 0, -0.5, 0, 0.5, -0.5, 0, 0, 1]
 * ```
 */
export function invertHomography(h: Mat3): Mat3 {
  const fn = 'invertHomography';
  const m = checkHomography(fn, h);
  const adj = [
    m[4] * m[8] - m[5] * m[7],
    m[2] * m[7] - m[1] * m[8],
    m[1] * m[5] - m[2] * m[4],
    m[5] * m[6] - m[3] * m[8],
    m[0] * m[8] - m[2] * m[6],
    m[2] * m[3] - m[0] * m[5],
    m[3] * m[7] - m[4] * m[6],
    m[1] * m[6] - m[0] * m[7],
    m[0] * m[4] - m[1] * m[3],
  ];
  const det = m[0] * adj[0]! + m[1] * adj[3]! + m[2] * adj[6]!;
  const f = Math.hypot(...m);
  if (!(Math.abs(det) > 1e-14 * f * f * f)) rangeError(fn, 'h', h, 'a non-singular homography');
  return scaleHomography(adj.map((x) => x / det));
}
