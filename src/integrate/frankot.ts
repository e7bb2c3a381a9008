/**
 * Frankot–Chellappa integration: the least-squares projection of a gradient field onto
 * the integrable fields of a periodic Fourier basis.
 *
 * @module
 */
import { checkAllocation, checkOptions, createGrid, typeError } from '../core/index.js';
import type { Grid, GridSpec } from '../core/index.js';
import { checkSlopes, checkSolverSpec, fullMask, outBuffer } from './common.js';
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
 * frequency tables; one complex work array made on the first frame and kept), to
 * integrate frame after frame.
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

/** Columns per strip of the column transforms. */
const STRIP = 16;

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
  /** `negW[c]`: the storage position of −kx when position c holds kx (rows of the spectrum). */
  private readonly negW: Int32Array;
  /** Doubles per row of the spectrum: 2·width plus one cache line (see {@link FcSolver.run}). */
  private readonly rs: number;
  private spec: Float64Array | null = null;
  /** Work rows for the odd-width case, where the packed pairs need one column more than `out` has. */
  private pack: Float64Array | null = null;

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
    const oW = this.fftW.order;
    this.negW = new Int32Array(w);
    for (let c = 0; c < w; c++) this.negW[c] = oW[(w - oW[c]!) % w]!;
    this.rs = 2 * w + 8;
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

  /**
   * The transform, transpose-free: the spectrum S (rows padded by one cache line so that
   * the rows of a column strip do not share cache sets) is
   * 1. S = p + i q, transformed along y in strips of columns (rows left in the y
   *    transform's storage order);
   * 2. per pair of rows {ky, −ky}: both transformed along x, projected onto the
   *    integrable fields (row ky ≤ h/2 only, the rest follows by Hermitian symmetry) and
   *    row ky inverse-transformed along x while it is in cache;
   * 3. the inverse along y of two real output columns at a time, g(·, 2c) + i g(·, 2c+1),
   *    packed straight into `out` (each packed row is one output row) and transformed
   *    there in strips.
   */
  #run(p: Grid, q: Grid, out: Float64Array): IntegrationResult {
    const w = this.width;
    const h = this.height;
    const rs = this.rs;
    const pd = p.data;
    const qd = q.data;
    const S = (this.spec ??= new Float64Array(h * rs));
    const fW = this.fftW;
    const fH = this.fftH;
    // 1. S = p + i q, then along y
    loadSpectrum(pd, qd, w, h, rs, S);
    for (let c0 = 0; c0 < w; c0 += STRIP) fH.stripToOrder(S, 2 * c0, rs, Math.min(STRIP, w - c0), false);
    // 2. rows: ky at storage row oH[ky]
    const oH = fH.order;
    const scale = 1 / (w * h);
    for (let ky = 0; 2 * ky <= h; ky++) {
      const r = oH[ky]! * rs;
      const rm = oH[(h - ky) % h]! * rs;
      fW.toOrder(S, r, false);
      if (rm !== r) fW.toOrder(S, rm, false);
      project(S, r, rm, w, this.negW, fW.order, this.ax, this.wx2, this.ay[ky]!, this.wy2[ky]!, scale);
      fW.fromOrder(S, r, true);
    }
    // 3. pack two output columns per complex value, row ky at storage row oH[ky], then
    //    along y; an odd width needs one column more than `out` has, so a work array
    const pw = (w + 1) >> 1;
    const ps = 2 * pw;
    const T = ps === w ? out : (this.pack ??= new Float64Array(h * ps));
    packColumns(S, rs, w, h, oH, T, ps);
    for (let c0 = 0; c0 < pw; c0 += STRIP) fH.stripFromOrder(T, 2 * c0, ps, Math.min(STRIP, pw - c0), true);
    if (T !== out) unpack(T, ps, w, h, out);
    const height = createGrid(p, out);
    return {
      height,
      mask: fullMask(w * h),
      rmsResidual: pairRms(out, pd, qd, w, h, this.dx, this.dy),
      iterations: 0,
      converged: true,
      relativeResidual: 0,
      // the zero-frequency term is set to zero, which is the zero-mean piston
      pieces: [{ label: 1, samples: w * h, piston: 0 }],
    };
  }
}

/** Row j of S (row stride rs doubles) = row j of p + i·(row j of q). */
function loadSpectrum(pd: Float64Array, qd: Float64Array, w: number, h: number, rs: number, S: Float64Array): void {
  for (let j = 0; j < h; j++) {
    const row = j * w;
    const base = j * rs;
    for (let i = 0; i < w; i++) {
      S[base + 2 * i] = pd[row + i]!;
      S[base + 2 * i + 1] = qd[row + i]!;
    }
  }
}

/**
 * Pack the x-inverse rows g(ky, ·) (ky ≤ h/2 at S row oH[ky]; the others by
 * g(−ky, x) = conj g(ky, x)) two output columns to a complex value,
 * T(ky, c) = g(ky, 2c) + i g(ky, 2c+1), row ky at T row oH[ky] (row stride ps).
 */
function packColumns(S: Float64Array, rs: number, w: number, h: number, oH: Int32Array, T: Float64Array, ps: number): void {
  for (let ky = 0; ky < h; ky++) {
    const up = 2 * ky <= h;
    const src = oH[up ? ky : h - ky]! * rs;
    const dst = oH[ky]! * ps;
    if (up) {
      for (let c = 0; c < w >> 1; c++) {
        const s = src + 4 * c;
        T[dst + 2 * c] = S[s]! - S[s + 3]!;
        T[dst + 2 * c + 1] = S[s + 1]! + S[s + 2]!;
      }
    } else {
      for (let c = 0; c < w >> 1; c++) {
        const s = src + 4 * c;
        T[dst + 2 * c] = S[s]! + S[s + 3]!;
        T[dst + 2 * c + 1] = S[s + 2]! - S[s + 1]!;
      }
    }
    if (w & 1) {
      const s = src + 2 * (w - 1);
      T[dst + ps - 2] = S[s]!;
      T[dst + ps - 1] = up ? S[s + 1]! : -S[s + 1]!;
    }
  }
}

/** Copy the first w doubles of each T row (stride ps) into `out`. */
function unpack(T: Float64Array, ps: number, w: number, h: number, out: Float64Array): void {
  for (let j = 0; j < h; j++) {
    const s = j * ps;
    const d = j * w;
    for (let i = 0; i < w; i++) out[d + i] = T[s + i]!;
  }
}

/**
 * Project row ky (at double offset `ra`) of Z = FFT(p + i q) onto the integrable fields,
 * with row −ky at `rm` (the same offset when ky is its own partner). Within a row,
 * position c holds kx = `oW[c]` and `negW[c]` is the position of −kx. With
 * P = (Z(k) + conj Z(−k))/2 and Q = (Z(k) − conj Z(−k))/(2i),
 * H = −i (ωx P + ωy Q)/(ωx² + ωy²) · scale is written over row ky (the zero divisor,
 * the piston, gives 0). A self-partnered row is done pairwise in kx so nothing is read
 * after it is overwritten.
 */
function project(
  S: Float64Array,
  ra: number,
  rm: number,
  w: number,
  negW: Int32Array,
  oW: Int32Array,
  ax: Float64Array,
  wx2: Float64Array,
  bk: number,
  by2: number,
  scale: number,
): void {
  const self = ra === rm;
  const hs = 0.5 * scale;
  for (let c = 0; c < w; c++) {
    const cm = negW[c]!;
    if (self && cm < c) continue;
    const kx = oW[c]!;
    const id = ra + 2 * c;
    const ip = rm + 2 * cm;
    const Zr = S[id]!;
    const Zi = S[id + 1]!;
    const Mr = S[ip]!;
    const Mi = S[ip + 1]!;
    const ak = ax[kx]!;
    const den = wx2[kx]! + by2;
    let Hr = 0;
    let Hi = 0;
    if (den > 0) {
      // a P + b Q with P = ((Zr+Mr)/2, (Zi−Mi)/2), Q = ((Zi+Mi)/2, −(Zr−Mr)/2)
      const f = hs / den;
      Hr = f * (ak * (Zi - Mi) - bk * (Zr - Mr));
      Hi = -f * (ak * (Zr + Mr) + bk * (Zi + Mi));
    }
    S[id] = Hr;
    S[id + 1] = Hi;
    if (self && cm !== c) {
      S[ip] = Hr;
      S[ip + 1] = -Hi;
    }
  }
}

/**
 * RMS misfit of the forward-difference pairs, `(h[i+1] − h[i])/dx` against the mean of
 * the two end slopes (likewise along y), in one pass over the rows.
 */
function pairRms(z: Float64Array, pd: Float64Array, qd: Float64Array, w: number, h: number, dx: number, dy: number): number {
  const ix = 1 / dx;
  const iy = 1 / dy;
  let s = 0;
  for (let j = 0; j < h; j++) {
    const row = j * w;
    for (let k = row, end = row + w - 1; k < end; k++) {
      const e = (z[k + 1]! - z[k]!) * ix - 0.5 * (pd[k]! + pd[k + 1]!);
      s += e * e;
    }
    if (j + 1 < h) {
      for (let k = row, end = row + w; k < end; k++) {
        const e = (z[k + w]! - z[k]!) * iy - 0.5 * (qd[k]! + qd[k + w]!);
        s += e * e;
      }
    }
  }
  const count = (w - 1) * h + w * (h - 1);
  return count > 0 ? Math.sqrt(s / count) : 0;
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
 * output plus a complex array of 2N doubles (and, for an odd width, one real array of
 * N + height doubles). Piston: zero mean. Needs a full rectangle.
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
