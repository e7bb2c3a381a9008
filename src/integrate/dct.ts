/**
 * Least-squares integration on a full rectangle by a fast cosine transform (the Neumann
 * Poisson solver of Simchony, Chellappa & Shao).
 *
 * @module
 */
import { checkOptions, createGrid, typeError } from '../core/index.js';
import type { Grid, GridSpec } from '../core/index.js';
import { checkSlopes, checkSolverSpec, fullMask, outBuffer } from './common.js';
import { FastDct } from './fft.js';
import type { IntegrationResult } from './types.js';

/** Options of {@link integrateDctPoisson}. */
export interface DctPoissonOptions {
  /** Buffer (length `width × height`) to receive the heights; a new one when absent. */
  out?: Float64Array;
}

/** Per-frame options of a {@link PreparedDctPoisson}. */
export interface DctPoissonFrameOptions {
  /** Buffer (length `width × height`) to receive the heights; a new one when absent. */
  out?: Float64Array;
}

/**
 * A DCT Poisson integrator set up once for a grid size and spacing (cosine-transform
 * plans, eigenvalues, one work buffer), to integrate frame after frame.
 * Create with {@link prepareDctPoisson}.
 */
export interface PreparedDctPoisson {
  /** Grid width the solver was prepared for. */
  readonly width: number;
  /** Grid height the solver was prepared for. */
  readonly height: number;
  /**
   * Integrate one frame; `p` and `q` must have the prepared size and spacing.
   *
   * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for bad grids.
   */
  solve(p: Grid, q: Grid, options?: DctPoissonFrameOptions): IntegrationResult;
}

class DctSolver implements PreparedDctPoisson {
  readonly width: number;
  readonly height: number;
  private readonly dx: number;
  private readonly dy: number;
  private readonly dctW: FastDct;
  private readonly dctH: FastDct;
  private readonly lamX: Float64Array;
  private readonly lamY: Float64Array;
  private readonly block: Float64Array;

  constructor(w: number, h: number, dx: number, dy: number) {
    this.width = w;
    this.height = h;
    this.dx = dx;
    this.dy = dy;
    this.dctW = new FastDct(w);
    this.dctH = new FastDct(h);
    // eigenvalues of DᵀD (forward differences, Neumann ends) in the DCT-II basis
    this.lamX = new Float64Array(w);
    for (let k = 0; k < w; k++) this.lamX[k] = (2 - 2 * Math.cos((Math.PI * k) / w)) / (dx * dx);
    this.lamY = new Float64Array(h);
    for (let k = 0; k < h; k++) this.lamY[k] = (2 - 2 * Math.cos((Math.PI * k) / h)) / (dy * dy);
    this.block = new Float64Array(COL_BLOCK * h);
  }

  solve(p: Grid, q: Grid, options?: DctPoissonFrameOptions): IntegrationResult {
    const fn = 'PreparedDctPoisson.solve';
    const o = checkOptions(fn, options);
    const s = checkSlopes(fn, p, q, undefined);
    if (s.p.width !== this.width || s.p.height !== this.height) {
      typeError(fn, 'p', `${s.p.width}×${s.p.height}`, `a grid of ${this.width}×${this.height} samples (the prepared size)`);
    }
    if (s.p.dx !== this.dx || s.p.dy !== this.dy) {
      typeError(fn, 'p', `dx ${s.p.dx}, dy ${s.p.dy}`, `the prepared spacing dx ${this.dx}, dy ${this.dy}`);
    }
    const out = outBuffer(fn, o.out, this.width * this.height);
    return this.#run(s.p, s.q, out);
  }

  /** Unchecked solve, for the checked entry points of this module only. */
  static unchecked(solver: DctSolver, p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    return solver.#run(p, q, out);
  }

  #run(p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    const w = this.width;
    const h = this.height;
    const pd = p.data;
    const qd = q.data;
    const dW = this.dctW;
    const dH = this.dctH;
    // rows: right-hand side and DCT-II, two rows at a time while they are in cache
    const hx = 0.5 / this.dx;
    const hy = 0.5 / this.dy;
    for (let j = 0; j < h; j += 2) {
      rhsRow(pd, qd, w, h, j, hx, hy, out);
      if (j + 1 < h) rhsRow(pd, qd, w, h, j + 1, hx, hy, out);
      dW.forwardPair(out, j * w, j + 1 < h ? (j + 1) * w : -1, 1);
    }
    // columns: DCT-II, divide by the eigenvalues, inverse, through a tiled transpose
    columnSolve(out, w, h, dH, this.block, this.lamX, this.lamY);
    // rows: inverse, with the pair residual summed as each row becomes final
    let sum = 0;
    for (let j = 0; j < h; j += 2) {
      dW.inversePair(out, j * w, j + 1 < h ? (j + 1) * w : -1, 1);
      sum += residualRows(out, pd, qd, w, j, Math.min(h, j + 2), 2 * hx, 2 * hy);
    }
    const pairs = (w - 1) * h + w * (h - 1);
    const rms = pairs > 0 ? Math.sqrt(sum / pairs) : 0;
    const height = createGrid(p, out);
    return {
      height,
      mask: fullMask(w * h),
      rmsResidual: rms,
      iterations: 0,
      converged: true,
      relativeResidual: 0,
      // the zero-frequency term is set to zero, which is the zero-mean piston
      pieces: [{ label: 1, samples: w * h, piston: 0 }],
    };
  }
}

/**
 * Row j of the right-hand side of the normal equations,
 * `f = Dxᵀ sx / dx + Dyᵀ sy / dy`, the pair slopes sx, sy being the means of the two
 * end samples (`hx = 1/(2dx)`, `hy = 1/(2dy)`).
 */
function rhsRow(pd: Float64Array, qd: Float64Array, w: number, h: number, j: number, hx: number, hy: number, out: Float64Array): void {
  const row = j * w;
  const up = j > 0;
  const down = j + 1 < h;
  if (up && down && w > 2) {
    // interior row: the ends with their one x pair each, the middle branch-free; there
    // the sample's own slopes cancel, (p₋ + p)/2 − (p + p₊)/2 = (p₋ − p₊)/2
    rhsAt(pd, qd, w, row, 0, true, true, hx, hy, out);
    for (let k = row + 1, end = row + w - 1; k < end; k++) {
      out[k] = (pd[k - 1]! - pd[k + 1]!) * hx + (qd[k - w]! - qd[k + w]!) * hy;
    }
    rhsAt(pd, qd, w, row, w - 1, true, true, hx, hy, out);
    return;
  }
  for (let i = 0; i < w; i++) rhsAt(pd, qd, w, row, i, up, down, hx, hy, out);
}

/** One sample of {@link rhsRow}: the pairs that exist at column i of the row. */
function rhsAt(
  pd: Float64Array,
  qd: Float64Array,
  w: number,
  row: number,
  i: number,
  up: boolean,
  down: boolean,
  hx: number,
  hy: number,
  out: Float64Array,
): void {
  const k = row + i;
  let f = 0;
  if (i > 0) f += (pd[k - 1]! + pd[k]!) * hx;
  if (i + 1 < w) f -= (pd[k]! + pd[k + 1]!) * hx;
  if (up) f += (qd[k - w]! + qd[k]!) * hy;
  if (down) f -= (qd[k]! + qd[k + w]!) * hy;
  out[k] = f;
}

/**
 * Sum of squared pair misfits of rows j0 … j1−1 (x pairs) and of the y pairs that end
 * in those rows (`ix = 1/dx`, `iy = 1/dy`).
 */
function residualRows(z: Float64Array, pd: Float64Array, qd: Float64Array, w: number, j0: number, j1: number, ix: number, iy: number): number {
  // Rows after the first: each sample's x pair (to its right) and y pair (from above) in
  // one loop, in two sums to shorten the chain of dependent additions.
  let s0 = 0, s1 = 0;
  for (let j = j0; j < j1; j++) {
    const row = j * w;
    const end = row + w - 1;
    if (j > 0) {
      for (let k = row; k < end; k++) {
        const ex = (z[k + 1]! - z[k]!) * ix - 0.5 * (pd[k]! + pd[k + 1]!);
        const ey = (z[k]! - z[k - w]!) * iy - 0.5 * (qd[k - w]! + qd[k]!);
        s0 += ex * ex;
        s1 += ey * ey;
      }
      const ey = (z[end]! - z[end - w]!) * iy - 0.5 * (qd[end - w]! + qd[end]!);
      s1 += ey * ey;
    } else {
      for (let k = row; k < end; k++) {
        const ex = (z[k + 1]! - z[k]!) * ix - 0.5 * (pd[k]! + pd[k + 1]!);
        s0 += ex * ex;
      }
    }
  }
  return s0 + s1;
}

/** Columns per strip of the column pass. */
const COL_BLOCK = 32;

/**
 * Along y, per strip of columns: DCT-II, divide by the eigenvalues of the Neumann
 * Laplacian (the zero frequency, the piston, set to 0: its eigenvalue is 0) and
 * transform back, all in the strip's work tile ({@link FastDct.solveStrip}), so each
 * strip stays in cache for the three steps.
 */
function columnSolve(out: Float64Array, w: number, h: number, dct: FastDct, blk: Float64Array, lx: Float64Array, ly: Float64Array): void {
  for (let i0 = 0; i0 < w; i0 += COL_BLOCK) dct.solveStrip(out, w, i0, Math.min(COL_BLOCK, w - i0), lx, ly, blk);
}

/**
 * Prepare a DCT Poisson integrator for one grid size and spacing.
 *
 * @param spec - Grid geometry (`width`, `height`, `dx`, `dy`; the origin is taken from
 *   each frame's slopes).
 * @returns The prepared solver; its `solve` allocates only the output (none with `out`).
 * @throws {@link core!MeniscusRangeError} for sizes or spacings out of range.
 * @see Simchony, T., Chellappa, R. & Shao, M. (1990), "Direct analytical methods for
 *   solving Poisson equations in computer vision problems", IEEE TPAMI 12(5), 435–446.
 * @example
 * ```ts
 * const solver = prepareDctPoisson({ width: 640, height: 480, dx: 1e-3 });
 * for (const frame of frames) {
 *   const { height } = solver.solve(frame.p, frame.q);
 * }
 * ```
 */
export function prepareDctPoisson(spec: GridSpec): PreparedDctPoisson {
  const { w, h, dx, dy } = checkSolverSpec('prepareDctPoisson', spec, 1);
  return new DctSolver(w, h, dx, dy);
}

/**
 * Integrate slopes on a full rectangle by the exact least-squares solution of the
 * forward-difference model, computed with fast cosine transforms.
 *
 * The model: for every pair of horizontally adjacent samples
 * `(h[i+1,j] − h[i,j]) / dx ≈ (p[i,j] + p[i+1,j]) / 2`, likewise along y with `q` and
 * `dy`; the heights minimise the sum of squared misfits. Its normal equations are a
 * Poisson equation with a Neumann (no-flux) boundary whose operator is diagonal in the
 * DCT-II basis, so the solution costs two 2-D cosine transforms: O(N log N) for
 * N = width × height, any width and height (powers of two are fastest; other lengths go
 * through Bluestein's algorithm). Memory: the output array only (transforms run in place), plus O(width + height)
 * work space.
 *
 * Boundary: none is imposed beyond the data (natural boundary of least squares); the
 * surface need not be periodic. The error of a smooth surface falls as O(dx²).
 * Needs a full rectangle: for holes, weights or known heights use
 * {@link integrateLeastSquares}, which on a full rectangle gives the same heights.
 * Piston: zero mean over the grid.
 *
 * @param p - Slopes ∂h/∂x at the samples (unitless), finite everywhere.
 * @param q - Slopes ∂h/∂y at the samples, same size and geometry as `p`.
 * @param options - See {@link DctPoissonOptions}.
 * @returns Heights in metres on the slopes' grid; `rmsResidual` is the RMS misfit of
 *   the forward-difference pairs; `iterations` 0.
 * @throws {@link core!MeniscusTypeError} when a grid is malformed or the sizes differ.
 * @throws {@link core!MeniscusRangeError} for non-finite slopes or a mismatched geometry.
 * @see Simchony, T., Chellappa, R. & Shao, M. (1990), "Direct analytical methods for
 *   solving Poisson equations in computer vision problems", IEEE TPAMI 12(5), 435–446.
 * @see Makhoul, J. (1980), "A fast cosine transform in one and two dimensions", IEEE
 *   Trans. ASSP 28(1), 27–34.
 * @example
 * ```ts
 * const p = gridFromFunction({ width: 64, height: 48, dx: 0.01 }, (x) => 0.1);
 * const q = gridFromFunction({ width: 64, height: 48, dx: 0.01 }, () => 0);
 * const { height } = integrateDctPoisson(p, q); // a plane rising 0.1 m per metre in x
 * ```
 */
export function integrateDctPoisson(p: Grid, q: Grid, options?: DctPoissonOptions): IntegrationResult {
  const fn = 'integrateDctPoisson';
  const o = checkOptions(fn, options);
  const s = checkSlopes(fn, p, q, undefined);
  const out = outBuffer(fn, o.out, s.p.width * s.p.height);
  return DctSolver.unchecked(new DctSolver(s.p.width, s.p.height, s.p.dx, s.p.dy), s.p, s.q, out);
}
