/**
 * Random-sea synthesis on a grid: a linear random sea drawn from a directional spectrum
 * with seeded random phases and Rayleigh amplitudes, its height and both slopes computed
 * by inverse FFT with exact spectral derivatives, and advanced in time through the
 * dispersion relation.
 *
 * @module
 */
import {
  checkAllocation,
  checkBoolean,
  checkFinite,
  checkInteger,
  checkOneOf,
  checkOptions,
  checkPositive,
  createGrid,
  createRng,
  LIMITS,
  rangeError,
  typeError,
} from '../core/index.js';
import type { Grid, GridSpec } from '../core/index.js';
import { Pow2Fft } from '../core/fft-kernel.js';
import { createGridSurface } from '../surface/index.js';
import type { GridInterpolation, Surface } from '../surface/index.js';
import { groupSpeedOf, omegaOf } from './dispersion.js';
import { prepareSea } from './sea.js';
import type { SeaSpectrum } from './sea.js';
import { wrapAngle } from './spreading.js';

/** Options of {@link prepareRandomSea} and {@link synthesizeSea}. */
export interface RandomSeaOptions {
  /** Seed of the random draws (core `createRng`); equal seeds and seas give equal surfaces. @defaultValue 1 */
  seed?: number;
  /**
   * `'rayleigh'`: each Fourier component gets a complex Gaussian coefficient (Rayleigh
   * amplitude, uniform phase), the linear random sea of Longuet-Higgins (1957).
   * `'fixed'`: amplitudes fixed at the spectrum's mean, only the phases random (less
   * sampling noise in the variance, but not Gaussian at the largest scales).
   * @defaultValue 'rayleigh'
   */
  amplitudes?: 'rayleigh' | 'fixed';
  /**
   * Refuse a grid whose domain is shorter than the peak wavelength (along either axis).
   * Set false to synthesise a window onto a longer sea (for local slope statistics);
   * the peak wavenumber above the grid's Nyquist wavenumber is always refused.
   * @defaultValue true
   */
  requirePeakResolved?: boolean;
}

/** One synthesised instant: height and exact slopes on the same grid. */
export interface SeaFrame {
  /** Time of the frame, s. */
  time: number;
  /** Surface elevation `h`, m. */
  height: Grid;
  /** Slope `p = ∂h/∂x` (exact spectral derivative). */
  slopeX: Grid;
  /** Slope `q = ∂h/∂y` (exact spectral derivative). */
  slopeY: Grid;
}

/**
 * What the realisation is expected to show, computed from the discrete spectrum on the
 * grid (the resolved band only): ensemble means and the standard deviations of the
 * realised spatial averages about them.
 */
export interface RandomSeaExpectation {
  /** Expected elevation variance over the grid, m². */
  readonly m0: number;
  /** Expected significant height `4√m0`, m. */
  readonly significantHeight: number;
  /** Expected mean-square slope `⟨p² + q²⟩`. */
  readonly meanSquareSlope: number;
  /** Expected mean-square slope along the mean direction. */
  readonly meanSquareSlopeAlong: number;
  /** Expected mean-square slope across the mean direction. */
  readonly meanSquareSlopeAcross: number;
  /** Standard deviation of one realisation's variance about `m0`, m². */
  readonly m0StandardDeviation: number;
  /** Standard deviation of one realisation's mean-square slope about `meanSquareSlope`. */
  readonly meanSquareSlopeStandardDeviation: number;
}

/** A prepared random sea: the spectrum drawn once, each frame just the inverse FFTs. */
export interface RandomSea {
  /** The grid's geometry (every field of a frame has it). */
  readonly grid: Readonly<Required<GridSpec>>;
  /** The spectrum's peak wavenumber, rad/m. */
  readonly peakWavenumber: number;
  /** Expected statistics of the realisation. */
  readonly expected: RandomSeaExpectation;
  /**
   * The sea at time `t`: every component advanced by its phase `−ω(k) t`.
   *
   * @param time - Time, s. @defaultValue 0
   * @param out - A frame (from an earlier call) whose grids are overwritten.
   * @returns The frame.
   */
  frame(time?: number, out?: SeaFrame): SeaFrame;
}

function checkPowerOfTwo(fn: string, parameter: string, value: unknown): number {
  const n = checkInteger(fn, parameter, value, 4, LIMITS.maxSide);
  if ((n & (n - 1)) !== 0) rangeError(fn, parameter, n, 'a power of two >= 4 (the FFT sizes)');
  return n;
}

/** Columns per strip of the column transforms. */
const STRIP = 16;

/**
 * Scratch buffers and FFT plans for one grid size. The spectra are row-major with each
 * row padded by one cache line (so that the rows of a column strip do not share cache
 * sets); in `z` the columns are stored in the row transform's bit-reversed order.
 */
interface Workspace {
  W: number;
  H: number;
  fftW: Pow2Fft;
  fftH: Pow2Fft;
  /** Rows of `z`: 2W + 8 doubles. */
  zs: number;
  /** Rows of `qt`: 2(W/2 + 1) + 8 doubles. */
  qs: number;
  z: Float64Array;
  qt: Float64Array;
  row: Float64Array;
}

// The workspace of the last grid size used, shared by every prepared sea of that size
// (frames are synchronous, so they never overlap), like an FFT library's plan cache.
let lastWorkspace: Workspace | null = null;

function workspace(W: number, H: number): Workspace {
  const c = lastWorkspace;
  if (c !== null && c.W === W && c.H === H) return c;
  const zs = 2 * W + 8;
  const qs = 2 * (W / 2 + 1) + 8;
  const ws: Workspace = {
    W,
    H,
    fftW: new Pow2Fft(W),
    fftH: new Pow2Fft(H),
    zs,
    qs,
    z: new Float64Array(zs * H),
    qt: new Float64Array(qs * H),
    row: new Float64Array(2 * W),
  };
  lastWorkspace = ws;
  return ws;
}

/**
 * Prepare a linear random sea on a grid. Each Fourier component `k` of the periodic
 * grid gets a random complex coefficient `c_k` with `E|c_k|² = 2 Ψ(k) Δkx Δky` from the
 * sea's directional wavenumber spectrum Ψ; the surface is
 * `h(x, t) = Re Σ c_k exp(i(k·(x − x₀) − ω(k) t))`, its slopes
 * `p = Re Σ i kx c_k …`, `q = Re Σ i ky c_k …` (exact derivatives of the same sum), all by
 * two complex inverse FFTs a frame (height and p packed as one Hermitian pair). The
 * mean (k = 0) and the Nyquist row and column are left empty.
 *
 * Memory: the sea holds its coefficients (16 bytes a sample); frames share one scratch
 * workspace (about 24 bytes a sample) kept for the last grid size used.
 *
 * @param grid - Geometry: width and height powers of two (≥ 4), spacing dx (dy = dx by
 *   default), origin.
 * @param sea - The directional sea.
 * @param options - Seed, amplitude law, resolution check.
 * @returns The prepared sea; call `frame(t)`.
 * @throws {@link core!MeniscusRangeError} for sizes that are not powers of two or exceed
 *   {@link core!LIMITS}, a non-positive spacing, a peak wavenumber above the grid's Nyquist
 *   wavenumber (the peak would alias), a domain shorter than the peak wavelength (unless
 *   `requirePeakResolved` is false), or a bad sea.
 * @see Longuet-Higgins, M. S. (1957), "The statistical analysis of a random, moving
 *   surface", Phil. Trans. R. Soc. A 249, 321–387 (the sea as a sum of components with
 *   random phases); Tessendorf, J. (2001), "Simulating ocean water", SIGGRAPH course
 *   notes (FFT synthesis with Gaussian coefficients and dispersion-driven time steps).
 * @example
 * ```ts
 * const p = jonswapFromPeak({ peakPeriod: 0.4, significantHeight: 0.01 });
 * const sea = prepareRandomSea({ width: 256, height: 256, dx: 0.002 }, { frequencySpectrum: (w) => jonswapSpectrum(w, p) }, { seed: 7 });
 * const f0 = sea.frame(0);
 * const f1 = sea.frame(0.04, f0); // reuse the buffers
 * ```
 */
export function prepareRandomSea(grid: GridSpec, sea: SeaSpectrum, options?: RandomSeaOptions): RandomSea {
  const fn = 'prepareRandomSea';
  const spec = checkOptions(fn, grid, 'grid');
  const W = checkPowerOfTwo(fn, 'grid.width', spec.width);
  const H = checkPowerOfTwo(fn, 'grid.height', spec.height);
  checkAllocation(fn, 'grid.width × grid.height', W * H);
  const dx = spec.dx === undefined ? 1 : checkPositive(fn, 'grid.dx', spec.dx);
  const dy = spec.dy === undefined ? dx : checkPositive(fn, 'grid.dy', spec.dy);
  const x0 = spec.x0 === undefined ? 0 : checkFinite(fn, 'grid.x0', spec.x0);
  const y0 = spec.y0 === undefined ? 0 : checkFinite(fn, 'grid.y0', spec.y0);
  const o = checkOptions(fn, options);
  const seed = o.seed === undefined ? 1 : checkFinite(fn, 'options.seed', o.seed);
  const law = o.amplitudes === undefined ? 'rayleigh' : checkOneOf(fn, 'options.amplitudes', o.amplitudes, ['rayleigh', 'fixed'] as const);
  const requirePeak = o.requirePeakResolved === undefined ? true : checkBoolean(fn, 'options.requirePeakResolved', o.requirePeakResolved);
  const ps = prepareSea(fn, sea);
  const kp = ps.peakK;
  const lp = (2 * Math.PI) / kp;
  if (!(kp < Math.PI / dx)) {
    rangeError(fn, 'grid.dx', dx, `a spacing < π/k_p = ${Math.PI / kp} m (the spectral peak, k_p = ${kp} rad/m, is above the Nyquist wavenumber and would alias)`);
  }
  if (!(kp < Math.PI / dy)) {
    rangeError(fn, 'grid.dy', dy, `a spacing < π/k_p = ${Math.PI / kp} m (the spectral peak, k_p = ${kp} rad/m, is above the Nyquist wavenumber and would alias)`);
  }
  if (requirePeak && !(W * dx >= lp)) {
    rangeError(fn, 'grid.width × grid.dx', W * dx, `a domain at least the peak wavelength ${lp} m long (or options.requirePeakResolved: false)`);
  }
  if (requirePeak && !(H * dy >= lp)) {
    rangeError(fn, 'grid.height × grid.dy', H * dy, `a domain at least the peak wavelength ${lp} m long (or options.requirePeakResolved: false)`);
  }

  const N = W * H;
  const dkx = (2 * Math.PI) / (W * dx);
  const dky = (2 * Math.PI) / (H * dy);
  const kxs = new Float64Array(W);
  const kys = new Float64Array(H);
  for (let i = 0; i < W; i++) kxs[i] = (i < W / 2 ? i : i - W) * dkx;
  for (let j = 0; j < H; j++) kys[j] = (j < H / 2 ? j : j - H) * dky;
  // Spectral arrays are row-major: wavenumber (i, j) (column i, row j) is at j·W + i.
  const cre = new Float64Array(N);
  const cim = new Float64Array(N);
  // ω(k) per wavenumber, filled on the first frame at a non-zero time.
  let omega: Float64Array | null = null;
  const rng = createRng(seed);
  const { S, D, theta0, disp, kSat, fSat } = ps;
  const cos0 = Math.cos(theta0);
  const sin0 = Math.sin(theta0);
  const cell = dkx * dky;
  const scale = 1; // the transforms below are unnormalised sums
  const rayleigh = law === 'rayleigh';
  let m0 = 0;
  let mss = 0;
  let along = 0;
  let varM0 = 0;
  let varMss = 0;
  const vIdx = new Int32Array(4);
  const vKx = new Float64Array(4);
  const vKy = new Float64Array(4);
  const vVar = new Float64Array(4);
  const vTh = new Float64Array(4);
  // The radial part F(k)/k depends on |kx|, |ky| only: one quadrant, up to four sign
  // variants: (+kx, +ky) and its mirror (−kx, −ky), (−kx, +ky) and its mirror (+kx, −ky).
  for (let i = 0; i < W / 2; i++) {
    const kx = i * dkx;
    const in_ = i === 0 ? 0 : W - i;
    for (let j = 0; j < H / 2; j++) {
      if (i === 0 && j === 0) continue;
      const ky = j * dky;
      const jn = j === 0 ? 0 : H - j;
      const k2 = kx * kx + ky * ky;
      const k = Math.sqrt(k2);
      const w = omegaOf(k, disp);
      const nv = i !== 0 && j !== 0 ? 4 : 2;
      vIdx[0] = j * W + i;
      vKx[0] = kx;
      vKy[0] = ky;
      vIdx[1] = jn * W + in_;
      vKx[1] = -kx;
      vKy[1] = -ky;
      vIdx[2] = j * W + in_;
      vKx[2] = -kx;
      vKy[2] = ky;
      vIdx[3] = jn * W + i;
      vKx[3] = kx;
      vKy[3] = -ky;
      let F: number;
      if (k > kSat) {
        const r = kSat / k;
        F = fSat * r * r * r;
      } else F = S(w) * groupSpeedOf(k, disp);
      if (!(F >= 0) || F === Infinity) rangeError(fn, 'sea.frequencySpectrum', F, `finite spectral densities >= 0 (at k = ${k} rad/m)`);
      if (F === 0) continue;
      const radial = (F / k) * cell;
      // Directions of the variants relative to the mean: θ, θ + π, π − θ − 2θ₀, −θ − 2θ₀.
      const th = Math.atan2(ky, kx) - theta0;
      const tb = 2 * theta0;
      vTh[0] = th;
      vTh[1] = th + Math.PI;
      vTh[2] = Math.PI - th - tb;
      vTh[3] = -th - tb;
      for (let m = 0; m < nv; m++) {
        const vx = vKx[m]!;
        const vy = vKy[m]!;
        const v = radial * D(wrapAngle(vTh[m]!), w);
        if (!(v >= 0) || v === Infinity) {
          rangeError(fn, 'sea', v, `finite spectral densities and spreading values >= 0 (at k = [${vx}, ${vy}] rad/m)`);
        }
        vVar[m] = v;
        if (v === 0) continue;
        // A uniform point (u, v) in the unit disc (by rejection): its direction is a
        // uniform phase, and √(−2 ln r²/r²)·(u, v) a pair of independent standard normals
        // (Marsaglia's polar method).
        let u: number;
        let t: number;
        let r2: number;
        do {
          // 32-bit uniforms on (−1, 1): ample resolution for a phase and an amplitude.
          u = (rng.nextUint32() + 0.5) * 4.656612873077393e-10 - 1;
          t = (rng.nextUint32() + 0.5) * 4.656612873077393e-10 - 1;
          r2 = u * u + t * t;
        } while (!(r2 < 1));
        const idx = vIdx[m]!;
        const amp = rayleigh ? Math.sqrt((-2 * Math.log(r2) * v) / r2) * scale : Math.sqrt((2 * v) / r2) * scale;
        cre[idx] = amp * u;
        cim[idx] = amp * t;
        const ka = vx * cos0 + vy * sin0;
        along += ka * ka * v;
      }
      // Components k and −k combine into one cosine, whose mean square
      // (|c_k + conj c_−k|²/2) has standard deviation v_k + v_−k (Rayleigh) or
      // √(2 v_k v_−k) (fixed amplitudes).
      for (let m = 0; m < nv; m += 2) {
        const va = vVar[m]!;
        const vb = vVar[m + 1]!;
        const sd = rayleigh ? va + vb : Math.sqrt(2 * va * vb);
        m0 += va + vb;
        mss += k2 * (va + vb);
        varM0 += sd * sd;
        varMss += k2 * k2 * sd * sd;
      }
    }
  }

  const geometry = { width: W, height: H, dx, dy, x0, y0 };

  let ws = workspace(W, H);
  const frame = (time = 0, out?: SeaFrame): SeaFrame => {
    const ffn = 'RandomSea.frame';
    checkFinite(ffn, 'time', time);
    let f: SeaFrame;
    if (out === undefined) {
      f = { time, height: createGrid(geometry), slopeX: createGrid(geometry), slopeY: createGrid(geometry) };
    } else {
      for (const key of ['height', 'slopeX', 'slopeY'] as const) {
        const g = out[key] as Grid | undefined;
        if (!g || !(g.data instanceof Float64Array) || g.width !== W || g.height !== H) {
          typeError(ffn, `out.${key}`, g, `a ${W}×${H} grid`);
        }
      }
      f = out;
      f.time = time;
    }
    if (time !== 0 && omega === null) omega = frequencies();
    ws = workspace(W, H);
    fillSpectra(time);
    // h + i p: one complex inverse FFT.
    inverseFft2(f.height.data, f.slopeX.data);
    // q: a real-output inverse FFT of its Hermitian spectrum (half the work).
    realInverseFft2(f.slopeY.data);
    return f;
  };

  // z = Ĥ + i·(i kx Ĥ) (all wavenumbers, column kx at the row transform's position of
  // kx) and qt = i ky Ĥ (kx ≥ 0), with Ĥ the Hermitian part of c·e^(−iωt): IFFT(z) =
  // h + i p and IFFT(qt, completed Hermitian) = q. Ĥ(−k) = conj Ĥ(k), so each pair
  // {k, −k} is computed once: rows j and −j together, the self-mirrored rows (ky = 0
  // and Nyquist) over half their columns.
  function fillSpectra(time: number): void {
    const { z, qt, zs, qs } = ws;
    const posW = ws.fftW.rev;
    const hW = W / 2;
    for (let j = 0; j <= H / 2; j++) {
      const jm = j === 0 ? 0 : H - j;
      const edge = j === 0 || j === H / 2;
      const ky = kys[j]!;
      const kym = kys[jm]!;
      const ra = j * W;
      const rb = jm * W;
      const za = j * zs;
      const zb = jm * zs;
      const qa = j * qs;
      const qb = jm * qs;
      const iEnd = edge ? hW : W - 1;
      for (let i = 0; i <= iEnd; i++) {
        const im = i === 0 ? 0 : W - i;
        const a = ra + i;
        const b = rb + im;
        const ar = cre[a]!;
        const ai = cim[a]!;
        const br = cre[b]!;
        const bi = cim[b]!;
        let hr: number;
        let hi: number;
        if (time === 0) {
          hr = 0.5 * (ar + br);
          hi = 0.5 * (ai - bi);
        } else {
          const ph = omega![a]! * time;
          const C = Math.cos(ph);
          const Sn = Math.sin(ph);
          hr = 0.5 * ((ar + br) * C + (ai + bi) * Sn);
          hi = 0.5 * ((ai - bi) * C + (br - ar) * Sn);
        }
        const kx = kxs[i]!;
        const kxm = kxs[im]!;
        // Z(k) = (1 − kx) Ĥ(k); Z(−k) = (1 − kxm) conj Ĥ(k)
        const pa = za + 2 * posW[i]!;
        const pb = zb + 2 * posW[im]!;
        z[pa] = hr - kx * hr;
        z[pa + 1] = hi - kx * hi;
        z[pb] = hr - kxm * hr;
        z[pb + 1] = kxm * hi - hi;
        // i ky Ĥ(k) and i kym conj Ĥ(k), where the column is in kx ≥ 0
        if (i <= hW) {
          qt[qa + 2 * i] = -ky * hi;
          qt[qa + 2 * i + 1] = ky * hr;
        }
        if (im <= hW) {
          qt[qb + 2 * im] = kym * hi;
          qt[qb + 2 * im + 1] = kym * hr;
        }
      }
    }
  }

  // ω(k), row-major.
  function frequencies(): Float64Array {
    const w = new Float64Array(N);
    for (let j = 0; j < H; j++) {
      const ky = kys[j]!;
      for (let i = 0; i < W; i++) {
        const kx = kxs[i]!;
        const k = Math.sqrt(kx * kx + ky * ky);
        w[j * W + i] = k > 0 ? omegaOf(k, disp) : 0;
      }
    }
    return w;
  }

  // Unscaled inverse 2-D FFT of z: along y in strips of columns (decimation in
  // frequency: row y left at storage row rev[y]), then along x row by row (decimation
  // in time: the columns are already in bit-reversed order), real and imaginary parts
  // to `re` and `im`.
  function inverseFft2(re: Float64Array, im: Float64Array): void {
    const { fftH, fftW, z, zs } = ws;
    for (let c0 = 0; c0 < W; c0 += STRIP) fftH.stripToOrder(z, 2 * c0, zs, Math.min(STRIP, W - c0), true);
    const revH = fftH.rev;
    for (let y = 0; y < H; y++) {
      const o = revH[y]! * zs;
      fftW.fromOrder(z, o, true);
      const r = y * W;
      for (let i = 0; i < W; i++) {
        re[r + i] = z[o + 2 * i]!;
        im[r + i] = z[o + 2 * i + 1]!;
      }
    }
  }

  // q from its half spectrum qt (kx ≥ 0): inverse along y in strips of the W/2 + 1
  // columns, then along x two rows at a time: with G_a, G_b the Hermitian rows of y and
  // y + 1 (G(−kx) = conj G(kx)), IFFT(G_a + i G_b) = q_a + i q_b.
  function realInverseFft2(q: Float64Array): void {
    const { fftH, fftW, qt, qs, row } = ws;
    const qc = W / 2 + 1;
    for (let c0 = 0; c0 < qc; c0 += STRIP) fftH.stripToOrder(qt, 2 * c0, qs, Math.min(STRIP, qc - c0), true);
    const revH = fftH.rev;
    const posW = fftW.rev;
    const hW = W / 2;
    for (let y = 0; y < H; y += 2) {
      const ra = revH[y]! * qs;
      const rb = revH[y + 1]! * qs;
      for (let kx = 0; kx <= hW; kx++) {
        const ar = qt[ra + 2 * kx]!;
        const ai = qt[ra + 2 * kx + 1]!;
        const br = qt[rb + 2 * kx]!;
        const bi = qt[rb + 2 * kx + 1]!;
        const d = 2 * posW[kx]!;
        row[d] = ar - bi;
        row[d + 1] = ai + br;
        if (kx > 0 && kx < hW) {
          // conj(a) + i conj(b) at −kx
          const e = 2 * posW[W - kx]!;
          row[e] = ar + bi;
          row[e + 1] = br - ai;
        }
      }
      fftW.fromOrder(row, 0, true);
      const r = y * W;
      for (let i = 0; i < W; i++) {
        q[r + i] = row[2 * i]!;
        q[r + W + i] = row[2 * i + 1]!;
      }
    }
  }

  return {
    grid: geometry,
    peakWavenumber: kp,
    expected: {
      m0,
      significantHeight: 4 * Math.sqrt(m0),
      meanSquareSlope: mss,
      meanSquareSlopeAlong: along,
      meanSquareSlopeAcross: mss - along,
      m0StandardDeviation: Math.sqrt(varM0),
      meanSquareSlopeStandardDeviation: Math.sqrt(varMss),
    },
    frame,
  };
}

/**
 * One frame of a random sea: {@link prepareRandomSea} then `frame(time)`.
 *
 * @param grid - Geometry (power-of-two sizes).
 * @param sea - The directional sea.
 * @param options - Seed, amplitude law, resolution check, and the time in s (default 0).
 * @returns Height and slopes.
 * @throws {@link core!MeniscusRangeError} as {@link prepareRandomSea}.
 * @see Longuet-Higgins, M. S. (1957), Phil. Trans. R. Soc. A 249, 321–387.
 * @example
 * ```ts
 * const f = synthesizeSea({ width: 128, height: 128, dx: 0.25 }, harbourSeaPreset().sea, { seed: 3 });
 * significantWaveHeight(f.height);
 * ```
 */
export function synthesizeSea(grid: GridSpec, sea: SeaSpectrum, options?: RandomSeaOptions & { time?: number }): SeaFrame {
  const o = checkOptions('synthesizeSea', options);
  const time = o.time === undefined ? 0 : checkFinite('synthesizeSea', 'options.time', o.time);
  return prepareRandomSea(grid, sea, o).frame(time);
}

/**
 * A {@link surface!Surface} of a frame's height grid (bicubic by default), for the intersector
 * and the imaging code. Its slopes are those of the interpolant, which agree with the
 * frame's exact spectral slopes to the interpolation error.
 *
 * @param frame - A frame.
 * @param interpolation - `'bicubic'` or `'bilinear'`. @defaultValue 'bicubic'
 * @returns The surface.
 * @throws {@link core!MeniscusTypeError} when `frame.height` is not a grid.
 * @example
 * ```ts
 * const s = seaSurface(sea.frame(0.5));
 * intersectSurface(s, [0.1, 0.1, -0.3], [0, 0, 1]);
 * ```
 */
export function seaSurface(frame: SeaFrame, interpolation: GridInterpolation = 'bicubic'): Surface {
  if (frame === null || typeof frame !== 'object') typeError('seaSurface', 'frame', frame, 'a SeaFrame');
  return createGridSurface(frame.height, { interpolation });
}
