/**
 * Frankot–Chellappa integration: the least-squares projection of a gradient field onto
 * the integrable fields of a periodic Fourier basis.
 *
 * @module
 */
import { checkAllocation, checkOptions, createGrid, typeError } from '../core/index.js';
import type { Grid, GridSpec } from '../core/index.js';
import { checkSlopes, checkSolverSpec, fullMask, outBuffer, pairRmsFull } from './common.js';
import { ComplexFft } from './fft.js';
import type { IntegrationResult } from './types.js';

/** Options of {@link integrateFrankotChellappa}. */
export interface FrankotChellappaOptions {
  /** Buffer (length `width × height`) to receive the heights; a new one when absent. */
  out?: Float64Array;
}

/** Per-frame options of a {@link PreparedFrankotChellappa}. */
export interface FrankotChellappaFrameOptions {
  /** Buffer (length `width × height`) to receive the heights; a new one when absent. */
  out?: Float64Array;
}

/**
 * A Frankot–Chellappa integrator set up once for a grid size and spacing (FFT plans,
 * frequency tables, one complex work array), to integrate frame after frame.
 * Create with {@link prepareFrankotChellappa}.
 */
export interface PreparedFrankotChellappa {
  /** Grid width the solver was prepared for. */
  readonly width: number;
  /** Grid height the solver was prepared for. */
  readonly height: number;
  /**
   * Integrate one frame; `p` and `q` must have the prepared size and spacing.
   *
   * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for bad grids.
   */
  solve(p: Grid, q: Grid, options?: FrankotChellappaFrameOptions): IntegrationResult;
}

/** Angular frequencies 2π·fftfreq(n, d): the spectral derivative is i·ω. */
function angularFrequencies(n: number, d: number): Float64Array {
  const w = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const kk = k <= (n - 1) >> 1 ? k : k - n;
    w[k] = (2 * Math.PI * kk) / (n * d);
  }
  return w;
}

class FcSolver implements PreparedFrankotChellappa {
  readonly width: number;
  readonly height: number;
  private readonly dx: number;
  private readonly dy: number;
  private readonly fftW: ComplexFft;
  private readonly fftH: ComplexFft;
  /** Derivative symbols (ω with the Nyquist term zeroed: an odd operator on a real field). */
  private readonly ax: Float64Array;
  private readonly ay: Float64Array;
  /** ω² including Nyquist, for the denominator. */
  private readonly wx2: Float64Array;
  private readonly wy2: Float64Array;
  /** Positions (in doubles) of element i in the row / column transforms' storage order. */
  private readonly posW: Int32Array;
  private readonly posH: Int32Array;
  private readonly spec: Float64Array;
  private readonly tA: Float64Array;
  /** Column tile: COL_BLOCK columns and their partners, 2·height doubles each. */
  private readonly tile: Float64Array;
  private readonly tileCols: Int32Array;

  constructor(w: number, h: number, dx: number, dy: number) {
    this.width = w;
    this.height = h;
    this.dx = dx;
    this.dy = dy;
    this.fftW = new ComplexFft(w);
    this.fftH = new ComplexFft(h);
    const wx = angularFrequencies(w, dx);
    const wy = angularFrequencies(h, dy);
    this.wx2 = wx.map((v) => v * v);
    this.wy2 = wy.map((v) => v * v);
    this.ax = wx.slice();
    this.ay = wy.slice();
    if (w % 2 === 0) this.ax[w / 2] = 0;
    if (h % 2 === 0) this.ay[h / 2] = 0;
    this.posW = this.fftW.order.map((v) => 2 * v);
    this.posH = this.fftH.order.map((v) => 2 * v);
    this.spec = new Float64Array(2 * w * h);
    this.tA = new Float64Array(2 * w);
    this.tile = new Float64Array(2 * COL_BLOCK * slotStride(h));
    this.tileCols = new Int32Array(2 * COL_BLOCK);
  }

  solve(p: Grid, q: Grid, options?: FrankotChellappaFrameOptions): IntegrationResult {
    const fn = 'PreparedFrankotChellappa.solve';
    const o = checkOptions(fn, options);
    const s = checkSlopes(fn, p, q, undefined);
    if (s.p.width !== this.width || s.p.height !== this.height) {
      typeError(fn, 'p', `${s.p.width}×${s.p.height}`, `a grid of ${this.width}×${this.height} samples (the prepared size)`);
    }
    if (s.p.dx !== this.dx || s.p.dy !== this.dy) {
      typeError(fn, 'p', `dx ${s.p.dx}, dy ${s.p.dy}`, `the prepared spacing dx ${this.dx}, dy ${this.dy}`);
    }
    return this.#run(s.p, s.q, outBuffer(fn, o.out, this.width * this.height));
  }

  /** Unchecked solve, for the checked entry points of this module only. */
  static unchecked(solver: FcSolver, p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    return solver.#run(p, q, out);
  }

  #run(p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    const w = this.width;
    const h = this.height;
    const pd = p.data;
    const qd = q.data;
    const S = this.spec;
    // 1. rows of Z = FFT(p + i q): both real fields in one complex transform
    forwardRows(pd, qd, w, h, this.fftW, this.posW, S);
    // 2. per tile of columns 0 … ⌊w/2⌋ and their partners: FFT along y, project onto
    //    the integrable fields, inverse along y of the tile's own columns (H is
    //    Hermitian, so the other half is never formed)
    for (let a = 0; a <= w >> 1; a += COL_BLOCK) {
      const b = Math.min((w >> 1) + 1, a + COL_BLOCK);
      columnTile(S, w, h, a, b, this.fftH, this.posH, this.tile, this.tileCols, this.ax, this.ay, this.wx2, this.wy2);
    }
    // 3. inverse along x, two real rows at a time
    inverseRows(S, w, h, this.fftW, this.posW, this.tA, out);
    const height = createGrid(p, out);
    return {
      height,
      mask: fullMask(w * h),
      rmsResidual: pairRmsFull(out, pd, qd, w, h, this.dx, this.dy),
      iterations: 0,
      converged: true,
      relativeResidual: 0,
      // the zero-frequency term is set to zero, which is the zero-mean piston
      pieces: [{ label: 1, samples: w * h, piston: 0 }],
    };
  }
}

/** Rows of S = FFT_x(p + i q), each written in the transform's storage order and transformed in place. */
function forwardRows(pd: Float64Array, qd: Float64Array, w: number, h: number, fft: ComplexFft, pos: Int32Array, S: Float64Array): void {
  for (let j = 0; j < h; j++) {
    const row = j * w;
    const base = 2 * row;
    // the storage order is an involution: position i holds element order[i]
    for (let i = 0, d = base; i < w; i++, d += 2) {
      const e = row + (pos[i]! >> 1);
      S[d] = pd[e]!;
      S[d + 1] = qd[e]!;
    }
    fft.fromOrder(S, base, false);
  }
}

/** Columns per tile of the column pass (each tile also holds the partner columns). */
const COL_BLOCK = 16;

/**
 * Doubles per column slot of the tile: 2·height plus one cache line, so that slots a
 * power of two apart do not fall in the same cache sets.
 */
function slotStride(h: number): number {
  return 2 * h + 8;
}

/**
 * Columns a … b−1 (within 0 … ⌊w/2⌋) of S: gather them and their partner columns
 * (w − kx) mod w into the tile (a tiled transpose, in the transform's storage order),
 * FFT along y, form
 * P = (Z(k) + conj Z(−k))/2, Q = (Z(k) − conj Z(−k))/(2i),
 * H = −i (ωx P + ωy Q)/(ωx² + ωy²) / (w·h) (the inverse's scale folded in),
 * inverse-FFT the tile's own columns and scatter them back. A column that is its own
 * partner (0 and w/2) is processed pairwise in ky so nothing is read after it is
 * overwritten.
 */
function columnTile(
  S: Float64Array,
  w: number,
  h: number,
  a: number,
  b: number,
  fft: ComplexFft,
  pos: Int32Array,
  tile: Float64Array,
  cols: Int32Array,
  ax: Float64Array,
  ay: Float64Array,
  wx2: Float64Array,
  wy2: Float64Array,
): void {
  const nb = b - a;
  const h2 = slotStride(h);
  // slots 0 … nb−1: columns a … b−1; slot nb + c: the partner of column a + c unless
  // the partner is itself in the tile (then it is not gathered twice)
  let ns = nb;
  for (let c = 0; c < nb; c++) cols[c] = a + c;
  for (let c = 0; c < nb; c++) {
    const pc = (w - a - c) % w;
    if (pc >= a && pc < b) continue;
    cols[ns++] = pc;
  }
  const w2 = 2 * w;
  for (let j = 0; j < h; j++) {
    const row = j * w2;
    const d = pos[j]!;
    for (let c = 0, t = d; c < ns; c++, t += h2) {
      const s = row + 2 * cols[c]!;
      tile[t] = S[s]!;
      tile[t + 1] = S[s + 1]!;
    }
  }
  for (let c = 0; c < ns; c++) fft.fromOrder(tile, c * h2, false);
  const scale = 1 / (w * h);
  let next = nb;
  for (let c = 0; c < nb; c++) {
    const kx = a + c;
    const pc = (w - kx) % w;
    const self = pc === kx;
    let pslot: number;
    if (pc >= a && pc < b) pslot = pc - a;
    else pslot = next++;
    const zo = c * h2;
    const mo = pslot * h2;
    const ak = ax[kx]!;
    const ax2 = wx2[kx]!;
    for (let ky = 0; ky < h; ky++) {
      const pr = ky === 0 ? 0 : h - ky;
      if (self && pr < ky) continue;
      const id = zo + 2 * ky;
      const ip = mo + 2 * pr;
      const Zr = tile[id]!;
      const Zi = tile[id + 1]!;
      const Mr = tile[ip]!;
      const Mi = tile[ip + 1]!;
      const bk = ay[ky]!;
      const den = ax2 + wy2[ky]!;
      let Hr = 0;
      let Hi = 0;
      if (den > 0) {
        // S = a P + b Q with P = ((Zr+Mr)/2, (Zi−Mi)/2), Q = ((Zi+Mi)/2, −(Zr−Mr)/2)
        const f = (0.5 * scale) / den;
        Hr = f * (ak * (Zi - Mi) - bk * (Zr - Mr));
        Hi = -f * (ak * (Zr + Mr) + bk * (Zi + Mi));
      }
      tile[id] = Hr;
      tile[id + 1] = Hi;
      if (self && pr !== ky) {
        tile[ip] = Hr;
        tile[ip + 1] = -Hi;
      }
    }
  }
  for (let c = 0; c < nb; c++) fft.toOrder(tile, c * h2, true);
  for (let j = 0; j < h; j++) {
    const row = j * w2 + 2 * a;
    const d = pos[j]!;
    for (let c = 0, t = d; c < nb; c++, t += h2) {
      const s = row + 2 * c;
      S[s] = tile[t]!;
      S[s + 1] = tile[t + 1]!;
    }
  }
}

/**
 * Inverse along x of two Hermitian rows at a time: IFFT(G_a + i G_b) = g_a + i g_b
 * (unscaled: the 1/(w·h) is already in the spectrum).
 */
function inverseRows(S: Float64Array, w: number, h: number, fft: ComplexFft, pos: Int32Array, tA: Float64Array, out: Float64Array): void {
  const half = w >> 1;
  const w2 = 2 * w;
  for (let j = 0; j < h; j += 2) {
    const ra = 2 * j * w;
    const two = j + 1 < h;
    const rb = two ? ra + w2 : ra;
    for (let kx = 0; kx <= half; kx++) {
      const ar = S[ra + 2 * kx]!;
      const ai = S[ra + 2 * kx + 1]!;
      const br = two ? S[rb + 2 * kx]! : 0;
      const bi = two ? S[rb + 2 * kx + 1]! : 0;
      const d = pos[kx]!;
      tA[d] = ar - bi;
      tA[d + 1] = ai + br;
      const m = w - kx;
      if (kx > 0 && m > half) {
        // G(−kx) = conj G(kx): conj(a) + i conj(b)
        const e = pos[m]!;
        tA[e] = ar + bi;
        tA[e + 1] = br - ai;
      }
    }
    fft.fromOrder(tA, 0, true);
    const row = j * w;
    for (let i = 0; i < w; i++) out[row + i] = tA[2 * i]!;
    if (two) for (let i = 0; i < w; i++) out[row + w + i] = tA[2 * i + 1]!;
  }
}

/**
 * Prepare a Frankot–Chellappa integrator for one grid size and spacing.
 *
 * @param spec - Grid geometry (`width`, `height`, `dx`, `dy`).
 * @returns The prepared solver; its `solve` allocates only the output (none with `out`).
 * @throws {@link core!MeniscusRangeError} for sizes or spacings out of range.
 * @see Frankot, R. T. & Chellappa, R. (1988), "A method for enforcing integrability in
 *   shape from shading algorithms", IEEE TPAMI 10(4), 439–451.
 * @example
 * ```ts
 * const solver = prepareFrankotChellappa({ width: 512, height: 512, dx: 1e-3 });
 * const { height } = solver.solve(p, q);
 * ```
 */
export function prepareFrankotChellappa(spec: GridSpec): PreparedFrankotChellappa {
  const { w, h, dx, dy } = checkSolverSpec('prepareFrankotChellappa', spec, 2);
  return new FcSolver(w, h, dx, dy);
}

/**
 * Integrate slopes by Frankot–Chellappa: project the measured gradient onto the nearest
 * integrable field of the Fourier basis (least squares in the continuous sense) and
 * return its potential. Derivatives are spectral (`∂/∂x ↔ iωx`, the Nyquist term of the
 * odd operator set to zero so a real field stays real).
 *
 * Boundary: the field is assumed **periodic** across the grid (the grid is one period
 * of length `width·dx` by `height·dy`). A periodic band-limited surface is recovered to
 * rounding; on a non-periodic surface the method carries a bias near the edges that
 * noise-free data does not remove (use {@link integrateDctPoisson} there). A constant
 * slope (a tilt) is not periodic and is discarded with the zero frequency.
 * Cost: one complex 2-D FFT of `p + iq` forward and a Hermitian inverse, O(N log N);
 * powers of two are fastest, other sizes run through Bluestein's algorithm. Memory: the
 * output plus a complex array of 2N doubles. Piston: zero mean. Needs a full rectangle.
 *
 * @param p - Slopes ∂h/∂x at the samples (unitless), finite everywhere.
 * @param q - Slopes ∂h/∂y at the samples, same size and geometry as `p`.
 * @param options - See {@link FrankotChellappaOptions}.
 * @returns Heights in metres on the slopes' grid; `rmsResidual` is the RMS misfit of the
 *   forward-difference pairs (see the module conventions); `iterations` 0.
 * @throws {@link core!MeniscusTypeError} when a grid is malformed or the sizes differ.
 * @throws {@link core!MeniscusRangeError} for non-finite slopes or a mismatched geometry.
 * @see Frankot, R. T. & Chellappa, R. (1988), "A method for enforcing integrability in
 *   shape from shading algorithms", IEEE TPAMI 10(4), 439–451.
 * @see Bluestein, L. I. (1970), "A linear filtering approach to the computation of
 *   discrete Fourier transform", IEEE Trans. Audio and Electroacoustics 18(4), 451–455.
 * @example
 * ```ts
 * const spec = { width: 64, height: 64, dx: 1 / 64 };
 * const p = gridFromFunction(spec, (x) => 2 * Math.PI * Math.cos(2 * Math.PI * x));
 * const q = gridFromFunction(spec, () => 0);
 * const { height } = integrateFrankotChellappa(p, q); // sin(2πx)
 * ```
 */
export function integrateFrankotChellappa(p: Grid, q: Grid, options?: FrankotChellappaOptions): IntegrationResult {
  const fn = 'integrateFrankotChellappa';
  const o = checkOptions(fn, options);
  const s = checkSlopes(fn, p, q, undefined);
  checkAllocation(fn, 'p.width × p.height × 2', 2 * s.p.width * s.p.height);
  const out = outBuffer(fn, o.out, s.p.width * s.p.height);
  return FcSolver.unchecked(new FcSolver(s.p.width, s.p.height, s.p.dx, s.p.dy), s.p, s.q, out);
}
