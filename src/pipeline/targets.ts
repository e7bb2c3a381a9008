/**
 * Procedural scene textures for simulated scenarios: a printed checkerboard with its true
 * corners, and a smooth random pattern for image-similarity scores.
 *
 * @module
 */
import { checkInteger, checkOptions, checkPositive, createImage, createRng } from '../core/index.js';
import type { Image } from '../core/index.js';

/** A texture placed on a plane (see the imaging area's `PlaneScene`). */
export interface PlaneTexture {
  /** The texture, one channel, linear intensity. */
  readonly image: Image;
  /** World x of texture column 0, metres. */
  readonly x0: number;
  /** World y of texture row 0, metres. */
  readonly y0: number;
  /** Texture pixel size, metres. */
  readonly dx: number;
}

/** Options of {@link checkerboardTexture}. */
export interface CheckerboardTextureOptions {
  /** Side of one square, metres (> 0). */
  squareSize: number;
  /** Squares along x (≥ 2). */
  columns: number;
  /** Squares along y (≥ 2). */
  rows: number;
  /** Texture pixels per square side. @defaultValue 16 */
  pixelsPerSquare?: number;
  /** White border around the board, in squares. @defaultValue 1 */
  margin?: number;
  /** Intensity of the dark squares. @defaultValue 0.05 */
  dark?: number;
  /** Intensity of the light squares and the border. @defaultValue 0.9 */
  light?: number;
}

/** A checkerboard texture and its inner corners. */
export interface CheckerboardTexture extends PlaneTexture {
  /** Inner corners along x (`columns − 1`). */
  readonly cornerColumns: number;
  /** Inner corners along y (`rows − 1`). */
  readonly cornerRows: number;
  /** World `x y` of the inner corners, row by row, metres (the board centred on x = y = 0). */
  readonly corners: Float64Array;
}

/**
 * A checkerboard centred on `x = y = 0`, each texture pixel the exact area average of the
 * board over it (so the edges are anti-aliased and the corners exact).
 *
 * @param options - Square size and count, resolution, margin, intensities.
 * @returns The texture, its placement and its inner corners.
 * @throws {@link core!MeniscusRangeError} for sizes out of range.
 * @see Common practice: the planar checkerboard target of camera calibration.
 * @example
 * ```ts
 * const board = checkerboardTexture({ squareSize: 0.025, columns: 16, rows: 16 });
 * const scene = { type: 'plane', z: 0.6, image: board.image, x0: board.x0, y0: board.y0, dx: board.dx };
 * ```
 */
export function checkerboardTexture(options: CheckerboardTextureOptions): CheckerboardTexture {
  const fn = 'checkerboardTexture';
  const o = checkOptions(fn, options);
  const sq = checkPositive(fn, 'options.squareSize', o.squareSize);
  const cols = checkInteger(fn, 'options.columns', o.columns, 2, 1000);
  const rows = checkInteger(fn, 'options.rows', o.rows, 2, 1000);
  const pps = o.pixelsPerSquare === undefined ? 16 : checkInteger(fn, 'options.pixelsPerSquare', o.pixelsPerSquare, 2, 1024);
  const margin = o.margin === undefined ? 1 : checkInteger(fn, 'options.margin', o.margin, 0, 100);
  const dark = o.dark === undefined ? 0.05 : checkPositive(fn, 'options.dark', o.dark);
  const light = o.light === undefined ? 0.9 : checkPositive(fn, 'options.light', o.light);
  const W = (cols + 2 * margin) * pps, H = (rows + 2 * margin) * pps;
  const image = createImage(W, H, 1);
  const dx = sq / pps;
  // Pixel (u, v) covers [u − ½, u + ½]·dx from x0; the board starts at x = −cols·sq/2.
  const x0 = -((cols + 2 * margin) * sq) / 2 + dx / 2;
  const y0 = -((rows + 2 * margin) * sq) / 2 + dx / 2;
  // With pps an integer and the board aligned to pixel edges, every pixel is one colour.
  for (let v = 0; v < H; v++) {
    const j = Math.floor(v / pps) - margin;
    for (let u = 0; u < W; u++) {
      const i = Math.floor(u / pps) - margin;
      const inBoard = i >= 0 && i < cols && j >= 0 && j < rows;
      image.data[v * W + u] = inBoard && (i + j) % 2 === 0 ? dark : light;
    }
  }
  const cc = cols - 1, cr = rows - 1;
  const corners = new Float64Array(2 * cc * cr);
  for (let j = 0; j < cr; j++) {
    for (let i = 0; i < cc; i++) {
      corners[2 * (j * cc + i)] = (-cols / 2 + i + 1) * sq;
      corners[2 * (j * cc + i) + 1] = (-rows / 2 + j + 1) * sq;
    }
  }
  return { image, x0, y0, dx, cornerColumns: cc, cornerRows: cr, corners };
}

/** Options of {@link patternTexture}. */
export interface PatternTextureOptions {
  /** Side of the square texture, metres (> 0). */
  size: number;
  /** Pixels per side. @defaultValue 1024 */
  pixels?: number;
  /** Seed of the pattern. @defaultValue 1 */
  seed?: number;
  /** Largest feature, in texture pixels (the coarsest octave's cell). @defaultValue 128 */
  featureSize?: number;
}

/**
 * A smooth random pattern centred on `x = y = 0`: the sum of octaves of value noise
 * (random values on coarse lattices, interpolated with a smoothstep), each octave half the
 * cell and 0.6 of the amplitude of the one before, scaled to intensities in [0.05, 0.95].
 * Rich in detail at every scale, so geometric errors show in image-similarity scores.
 *
 * @param options - Size, resolution, seed, largest feature.
 * @returns The texture and its placement.
 * @throws {@link core!MeniscusRangeError} for sizes out of range.
 * @see Perlin, K. (1985), "An image synthesizer", SIGGRAPH Computer Graphics 19(3),
 *   287–296 (sums of band-limited noise octaves).
 * @example
 * ```ts
 * const tex = patternTexture({ size: 2.4, pixels: 1024, seed: 3 });
 * ```
 */
export function patternTexture(options: PatternTextureOptions): PlaneTexture {
  const fn = 'patternTexture';
  const o = checkOptions(fn, options);
  const size = checkPositive(fn, 'options.size', o.size);
  const N = o.pixels === undefined ? 1024 : checkInteger(fn, 'options.pixels', o.pixels, 8, 8192);
  const seed = o.seed === undefined ? 1 : checkInteger(fn, 'options.seed', o.seed, 0, 2 ** 31);
  const feature = o.featureSize === undefined ? 128 : checkInteger(fn, 'options.featureSize', o.featureSize, 2, 8192);
  const rng = createRng(seed);
  const acc = new Float64Array(N * N);
  let amp = 1;
  for (let cell = feature; cell >= 2; cell = Math.floor(cell / 2)) {
    const L = Math.ceil(N / cell) + 2;
    const lat = new Float64Array(L * L);
    for (let k = 0; k < lat.length; k++) lat[k] = rng.uniform() - 0.5;
    for (let v = 0; v < N; v++) {
      const fy = v / cell, j = Math.floor(fy);
      let ty = fy - j;
      ty = ty * ty * (3 - 2 * ty);
      for (let u = 0; u < N; u++) {
        const fx = u / cell, i = Math.floor(fx);
        let tx = fx - i;
        tx = tx * tx * (3 - 2 * tx);
        const a = lat[j * L + i]! + (lat[j * L + i + 1]! - lat[j * L + i]!) * tx;
        const b = lat[(j + 1) * L + i]! + (lat[(j + 1) * L + i + 1]! - lat[(j + 1) * L + i]!) * tx;
        acc[v * N + u]! += amp * (a + (b - a) * ty);
      }
    }
    amp *= 0.6;
  }
  let lo = Infinity, hi = -Infinity;
  for (let k = 0; k < acc.length; k++) {
    if (acc[k]! < lo) lo = acc[k]!;
    if (acc[k]! > hi) hi = acc[k]!;
  }
  const image = createImage(N, N, 1);
  const sc = hi > lo ? 0.9 / (hi - lo) : 0;
  for (let k = 0; k < acc.length; k++) image.data[k] = 0.05 + (acc[k]! - lo) * sc;
  const dx = size / N;
  return { image, x0: -size / 2 + dx / 2, y0: -size / 2 + dx / 2, dx };
}
