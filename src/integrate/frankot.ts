/**
 * Frankot–Chellappa integration: the least-squares projection of a gradient field onto
 * the integrable fields of a periodic Fourier basis.
 *
 * @module
 */
import { checkAllocation, checkFinite, checkInteger, checkOptions, checkPositive, createGrid, typeError, LIMITS } from '../core/index.js';
import type { Grid, GridSpec } from '../core/index.js';
import { checkSlopes, fullMask, outBuffer, pairRmsFull } from './common.js';
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
  private readonly spec: Float64Array;
  private readonly rowViews: Float64Array[];
  private readonly tA: Float64Array;
  private readonly tB: Float64Array;
  private readonly blkIn: Float64Array[];
  private readonly blkOut: Float64Array[];

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
    this.spec = new Float64Array(2 * w * h);
    this.rowViews = [];
    for (let j = 0; j < h; j++) this.rowViews.push(this.spec.subarray(2 * j * w, 2 * (j + 1) * w));
    const m = Math.max(w, h);
    this.tA = new Float64Array(2 * m);
    this.tB = new Float64Array(2 * m);
    const bi = new Float64Array(2 * h * COL_BLOCK);
    const bo = new Float64Array(2 * h * COL_BLOCK);
    this.blkIn = [];
    this.blkOut = [];
    for (let c = 0; c < COL_BLOCK; c++) {
      this.blkIn.push(bi.subarray(2 * h * c, 2 * h * (c + 1)));
      this.blkOut.push(bo.subarray(2 * h * c, 2 * h * (c + 1)));
    }
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
    return this.run(s.p, s.q, outBuffer(fn, o.out, this.width * this.height));
  }

  run(p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    const w = this.width;
    const h = this.height;
    const pd = p.data;
    const qd = q.data;
    const S = this.spec;
    const half = w >> 1;
    // 1. rows of Z = FFT(p + i q): both real fields in one complex transform
    forwardRows(pd, qd, w, h, this.fftW, this.rowViews, this.tA);
    // 2. columns (strided gather / scatter)
    columns(S, w, h, w, this.fftH, this.blkIn, this.blkOut, false);
    // 3. project onto the integrable fields (columns 0 … ⌊w/2⌋; H is Hermitian)
    project(S, w, h, this.ax, this.ay, this.wx2, this.wy2);
    // 4. inverse along y for columns 0 … ⌊w/2⌋
    columns(S, w, h, half + 1, this.fftH, this.blkIn, this.blkOut, true);
    // 5. inverse along x, two real rows at a time
    inverseRows(S, w, h, this.fftW, this.tA, this.tB, out);
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

function forwardRows(
  pd: Float64Array,
  qd: Float64Array,
  w: number,
  h: number,
  fft: ComplexFft,
  views: Float64Array[],
  tA: Float64Array,
): void {
  for (let j = 0; j < h; j++) {
    const row = j * w;
    for (let i = 0; i < w; i++) {
      tA[2 * i] = pd[row + i]!;
      tA[2 * i + 1] = qd[row + i]!;
    }
    fft.forward(views[j]!, tA);
  }
}

/** Columns per block of the column passes (a tile of the implicit transpose). */
const COL_BLOCK = 8;

/**
 * FFT along y of columns 0 … count−1, in place. Columns are gathered a block at a time
 * into contiguous sequences (a tiled transpose), which keeps the strided reads within a
 * few pages at a time.
 */
function columns(
  S: Float64Array,
  w: number,
  h: number,
  count: number,
  fft: ComplexFft,
  blkIn: Float64Array[],
  blkOut: Float64Array[],
  inverse: boolean,
): void {
  const w2 = 2 * w;
  for (let i0 = 0; i0 < count; i0 += COL_BLOCK) {
    const nb = Math.min(COL_BLOCK, count - i0);
    for (let j = 0; j < h; j++) {
      let s = j * w2 + 2 * i0;
      for (let c = 0; c < nb; c++, s += 2) {
        const b = blkIn[c]!;
        b[2 * j] = S[s]!;
        b[2 * j + 1] = S[s + 1]!;
      }
    }
    for (let c = 0; c < nb; c++) {
      if (inverse) fft.inverse(blkOut[c]!, blkIn[c]!);
      else fft.forward(blkOut[c]!, blkIn[c]!);
    }
    for (let j = 0; j < h; j++) {
      let s = j * w2 + 2 * i0;
      for (let c = 0; c < nb; c++, s += 2) {
        const b = blkOut[c]!;
        S[s] = b[2 * j]!;
        S[s + 1] = b[2 * j + 1]!;
      }
    }
  }
}

/**
 * P = (Z(k) + conj Z(−k))/2, Q = (Z(k) − conj Z(−k))/(2i), H = −i (ωx P + ωy Q)/(ωx² + ωy²),
 * for columns 0 … ⌊w/2⌋, in place; a column that is its own partner (0 and w/2) is
 * processed pairwise so nothing is read after it is overwritten.
 */
function project(
  S: Float64Array,
  w: number,
  h: number,
  ax: Float64Array,
  ay: Float64Array,
  wx2: Float64Array,
  wy2: Float64Array,
): void {
  const half = w >> 1;
  for (let kx = 0; kx <= half; kx++) {
    const pc = (w - kx) % w;
    const self = pc === kx;
    const a = ax[kx]!;
    const ax2 = wx2[kx]!;
    for (let ky = 0; ky < h; ky++) {
      const pr = ky === 0 ? 0 : h - ky;
      if (self && pr < ky) continue;
      const id = 2 * (ky * w + kx);
      const ip = 2 * (pr * w + pc);
      const Zr = S[id]!;
      const Zi = S[id + 1]!;
      const Mr = S[ip]!;
      const Mi = S[ip + 1]!;
      const b = ay[ky]!;
      const den = ax2 + wy2[ky]!;
      let Hr = 0;
      let Hi = 0;
      if (den > 0) {
        // S = a P + b Q with P = ((Zr+Mr)/2, (Zi−Mi)/2), Q = ((Zi+Mi)/2, −(Zr−Mr)/2)
        const Sr = 0.5 * (a * (Zr + Mr) + b * (Zi + Mi));
        const Si = 0.5 * (a * (Zi - Mi) - b * (Zr - Mr));
        Hr = Si / den;
        Hi = -Sr / den;
      }
      S[id] = Hr;
      S[id + 1] = Hi;
      if (self && pr !== ky) {
        S[ip] = Hr;
        S[ip + 1] = -Hi;
      }
    }
  }
}

/** Inverse along x of two Hermitian rows at a time: IFFT(G_a + i G_b) = g_a + i g_b. */
function inverseRows(
  S: Float64Array,
  w: number,
  h: number,
  fft: ComplexFft,
  tA: Float64Array,
  tB: Float64Array,
  out: Float64Array,
): void {
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
      tA[2 * kx] = ar - bi;
      tA[2 * kx + 1] = ai + br;
      const m = w - kx;
      if (kx > 0 && m > half) {
        // G(−kx) = conj G(kx): conj(a) + i conj(b)
        tA[2 * m] = ar + bi;
        tA[2 * m + 1] = br - ai;
      }
    }
    fft.inverse(tB, tA);
    const row = j * w;
    for (let i = 0; i < w; i++) out[row + i] = tB[2 * i]!;
    if (two) for (let i = 0; i < w; i++) out[row + w + i] = tB[2 * i + 1]!;
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
  const fn = 'prepareFrankotChellappa';
  checkOptions(fn, spec, 'spec');
  const w = checkInteger(fn, 'spec.width', spec.width, 1, LIMITS.maxSide);
  const h = checkInteger(fn, 'spec.height', spec.height, 1, LIMITS.maxSide);
  checkAllocation(fn, 'spec.width × spec.height', 2 * w * h);
  const dx = spec.dx === undefined ? 1 : checkPositive(fn, 'spec.dx', spec.dx);
  const dy = spec.dy === undefined ? dx : checkPositive(fn, 'spec.dy', spec.dy);
  if (spec.x0 !== undefined) checkFinite(fn, 'spec.x0', spec.x0);
  if (spec.y0 !== undefined) checkFinite(fn, 'spec.y0', spec.y0);
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
  return new FcSolver(s.p.width, s.p.height, s.p.dx, s.p.dy).run(s.p, s.q, out);
}
