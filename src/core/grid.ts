/**
 * The `Grid` (a sampled 2-D field: heights, slopes, weights) and its mask.
 *
 * Sample `(i, j)` (column `i`, row `j`) is stored at `data[j * width + i]` and sits at
 * world position `x = x0 + i·dx`, `y = y0 + j·dy`, in metres.
 *
 * @module
 */
import { checkAllocation, checkFinite, checkInteger, checkOptions, checkPositive, rangeError, typeError } from './checks.js';
import { LIMITS } from './limits.js';

/** A regularly sampled 2-D field, row-major. */
export interface Grid {
  /** Number of columns (samples along x). */
  readonly width: number;
  /** Number of rows (samples along y). */
  readonly height: number;
  /** `width × height` samples, row-major: sample `(i, j)` is `data[j * width + i]`. */
  readonly data: Float64Array;
  /** Sample spacing along x, metres (> 0). */
  readonly dx: number;
  /** Sample spacing along y, metres (> 0). */
  readonly dy: number;
  /** World x of column 0, metres. */
  readonly x0: number;
  /** World y of row 0, metres. */
  readonly y0: number;
}

/** The geometry of a grid without its data. */
export interface GridSpec {
  /** Number of columns. */
  width: number;
  /** Number of rows. */
  height: number;
  /** Spacing along x, metres. @defaultValue 1 */
  dx?: number;
  /** Spacing along y, metres. @defaultValue `dx` */
  dy?: number;
  /** World x of column 0, metres. @defaultValue 0 */
  x0?: number;
  /** World y of row 0, metres. @defaultValue 0 */
  y0?: number;
}

/**
 * A validity mask beside a grid or image: one byte a sample, `1` = valid, `0` = hole.
 */
export type Mask = Uint8Array;

/**
 * Create a grid, validating its geometry and guarding the allocation.
 *
 * @param spec - Size and geometry.
 * @param data - Optional samples (`width × height`, copied only if `copy` is true;
 *   otherwise used as given). When absent the grid is zero-filled.
 * @param copy - Copy `data` instead of referencing it. @defaultValue false
 * @returns The grid.
 * @throws {@link MeniscusRangeError} for non-integer or non-positive sizes, sizes above
 *   {@link LIMITS}, non-positive spacing or non-finite origin.
 * @throws {@link MeniscusTypeError} when `data` is not a `Float64Array` of the right length.
 * @example
 * ```ts
 * const g = createGrid({ width: 64, height: 32, dx: 0.001 });
 * g.data.length; // 2048
 * ```
 */
export function createGrid(spec: GridSpec, data?: Float64Array, copy = false): Grid {
  const fn = 'createGrid';
  if (spec === undefined) typeError(fn, 'spec', spec, 'a grid spec { width, height, dx?, dy?, x0?, y0? }');
  checkOptions(fn, spec, 'spec');
  const width = checkInteger(fn, 'spec.width', spec.width, 1, LIMITS.maxSide);
  const height = checkInteger(fn, 'spec.height', spec.height, 1, LIMITS.maxSide);
  checkAllocation(fn, 'spec.width × spec.height', width * height);
  const dx = spec.dx === undefined ? 1 : checkPositive(fn, 'spec.dx', spec.dx);
  const dy = spec.dy === undefined ? dx : checkPositive(fn, 'spec.dy', spec.dy);
  const x0 = spec.x0 === undefined ? 0 : checkFinite(fn, 'spec.x0', spec.x0);
  const y0 = spec.y0 === undefined ? 0 : checkFinite(fn, 'spec.y0', spec.y0);
  let d: Float64Array;
  if (data === undefined) d = new Float64Array(width * height);
  else {
    if (!(data instanceof Float64Array)) typeError(fn, 'data', data, 'a Float64Array');
    if (data.length !== width * height) typeError(fn, 'data', data, `a Float64Array of length ${width * height}`);
    d = copy ? data.slice() : data;
  }
  return { width, height, data: d, dx, dy, x0, y0 };
}

/**
 * Create a grid by evaluating `f(x, y)` at every sample position.
 *
 * @param spec - Size and geometry.
 * @param f - The field, given world coordinates in metres.
 * @returns The sampled grid.
 * @example
 * ```ts
 * const g = gridFromFunction({ width: 8, height: 8, dx: 0.1 }, (x, y) => x * y);
 * ```
 */
export function gridFromFunction(spec: GridSpec, f: (x: number, y: number) => number): Grid {
  if (typeof f !== 'function') typeError('gridFromFunction', 'f', f, 'a function (x, y) => number');
  const g = createGrid(spec);
  const { width, height, dx, dy, x0, y0, data } = g;
  for (let j = 0; j < height; j++) {
    const y = y0 + j * dy;
    for (let i = 0; i < width; i++) data[j * width + i] = f(x0 + i * dx, y);
  }
  return g;
}

/**
 * A new grid with the same geometry as `like`, zero-filled or holding `data`.
 *
 * @returns The new grid.
 * @example
 * ```ts
 * const p = gridLike(heights);
 * ```
 */
export function gridLike(like: Grid, data?: Float64Array): Grid {
  return createGrid(like, data);
}

/**
 * Index of the first NaN or ±∞ in `d`, or −1. A sum of `x·0` stays 0 over
 * finite numbers and turns NaN at the first non-finite one, so the common all-finite
 * case is one branch-free pass (four sums, for the pipeline); only a failing array is
 * searched element by element.
 */
function firstNonFinite(d: Float64Array): number {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  const n = d.length, m = n & ~3;
  let k = 0;
  for (; k < m; k += 4) {
    s0 += d[k]! * 0;
    s1 += d[k + 1]! * 0;
    s2 += d[k + 2]! * 0;
    s3 += d[k + 3]! * 0;
  }
  for (; k < n; k++) s0 += d[k]! * 0;
  if (s0 + s1 + s2 + s3 === 0) return -1;
  for (k = 0; k < n; k++) if (!Number.isFinite(d[k]!)) return k;
  return -1;
}

/**
 * Validate a grid given by a user: a plain object with the documented fields, a data
 * array of the right length, and (unless `allowNonFinite`) finite samples.
 *
 * @param fn - The calling public function's name, for the message.
 * @param parameter - The parameter's name.
 * @param value - The candidate grid.
 * @param allowNonFinite - Skip the finiteness scan (when a mask will say which samples count). @defaultValue false
 * @returns The grid.
 * @example
 * ```ts
 * checkGrid('integrateDctPoisson', 'p', p);
 * ```
 */
export function checkGrid(fn: string, parameter: string, value: unknown, allowNonFinite = false): Grid {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, 'a Grid {width, height, data, dx, dy, x0, y0}');
  const g = value as Partial<Grid>;
  checkInteger(fn, `${parameter}.width`, g.width, 1, LIMITS.maxSide);
  checkInteger(fn, `${parameter}.height`, g.height, 1, LIMITS.maxSide);
  checkAllocation(fn, `${parameter}.width × ${parameter}.height`, g.width! * g.height!);
  if (!(g.data instanceof Float64Array)) typeError(fn, `${parameter}.data`, g.data, 'a Float64Array');
  if (g.data.length !== g.width! * g.height!) {
    typeError(fn, `${parameter}.data`, g.data, `a Float64Array of length width × height = ${g.width! * g.height!}`);
  }
  checkPositive(fn, `${parameter}.dx`, g.dx);
  checkPositive(fn, `${parameter}.dy`, g.dy);
  checkFinite(fn, `${parameter}.x0`, g.x0);
  checkFinite(fn, `${parameter}.y0`, g.y0);
  if (!allowNonFinite) {
    const k = firstNonFinite(g.data);
    if (k >= 0) rangeError(fn, `${parameter}.data[${k}]`, g.data[k], 'a finite number (pass a mask to mark holes)');
  }
  return g as Grid;
}

/**
 * Require two grids to share size (and, with `geometry`, spacing and origin).
 *
 * @example
 * ```ts
 * checkSameShape('integrate', 'q', q, p);
 * ```
 */
export function checkSameShape(fn: string, parameter: string, a: Grid, like: Grid, geometry = true): void {
  if (a.width !== like.width || a.height !== like.height) {
    typeError(fn, parameter, `${a.width}×${a.height}`, `a grid of ${like.width}×${like.height} samples`);
  }
  if (geometry && (a.dx !== like.dx || a.dy !== like.dy || a.x0 !== like.x0 || a.y0 !== like.y0)) {
    rangeError(
      fn,
      parameter,
      `dx ${a.dx}, dy ${a.dy}, x0 ${a.x0}, y0 ${a.y0}`,
      `the same spacing and origin as the first grid (dx ${like.dx}, dy ${like.dy}, x0 ${like.x0}, y0 ${like.y0})`,
    );
  }
}

/**
 * Create a mask, all valid (`1`) or all `fill`.
 *
 * @returns A `Uint8Array` of `width × height`.
 * @example
 * ```ts
 * const m = createMask(64, 64);
 * m[0] = 0; // a hole
 * ```
 */
export function createMask(width: number, height: number, fill: 0 | 1 = 1): Mask {
  const fn = 'createMask';
  checkInteger(fn, 'width', width, 1, LIMITS.maxSide);
  checkInteger(fn, 'height', height, 1, LIMITS.maxSide);
  checkAllocation(fn, 'width × height', width * height);
  const m = new Uint8Array(width * height);
  if (fill) m.fill(1);
  return m;
}

/**
 * Validate a mask: a `Uint8Array` of `width × height` holding only 0 and 1.
 *
 * @returns The mask.
 * @example
 * ```ts
 * checkMask('integrateMasked', 'options.mask', mask, 64, 64);
 * ```
 */
export function checkMask(fn: string, parameter: string, value: unknown, width: number, height: number): Mask {
  if (!(value instanceof Uint8Array)) typeError(fn, parameter, value, `a Uint8Array mask of length ${width * height}`);
  if (value.length !== width * height) typeError(fn, parameter, value, `a Uint8Array mask of length ${width * height}`);
  for (let k = 0; k < value.length; k++) {
    const v = value[k]!;
    if (v !== 0 && v !== 1) rangeError(fn, `${parameter}[${k}]`, v, '0 (hole) or 1 (valid)');
  }
  return value;
}
