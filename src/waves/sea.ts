/**
 * A directional sea: a frequency spectrum, a spreading function, a mean direction, the
 * dispersion relation that maps frequency to wavenumber, and an optional saturation-range
 * tail for centimetre ripples. From it: the wavenumber spectrum and its moments,
 * including the mean-square slope.
 *
 * @module
 */
import { checkFinite, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import { dispersionParameters, groupSpeedOf, omegaOf, wavenumberOf } from './dispersion.js';
import type { DispersionOptions, DispersionParameters } from './dispersion.js';
import { cosSquaredSpreading } from './spreading.js';

/**
 * A directional sea, as accepted by {@link seaMoments} and {@link prepareRandomSea}.
 *
 * Its directional wavenumber spectrum is `Ψ(k, θ) = F(k) D(θ − θ₀, ω(k)) / k` per unit
 * area of the wavenumber plane, with the omnidirectional spectrum
 * `F(k) = S(ω(k)) · dω/dk` from the dispersion relation, continued above
 * `saturationFrom` by the saturation range `F(k) = F(k_s) (k_s/k)³`
 * (equivalently `Ψ ∝ k⁻⁴`).
 */
export interface SeaSpectrum {
  /** The frequency spectrum `S(ω)`, m²·s/rad (one-sided), e.g. `(w) => jonswapSpectrum(w, p)`. */
  frequencySpectrum: (omega: number) => number;
  /**
   * The spreading `D(θ, ω)`, 1/rad, `θ` relative to `meanDirection`, with
   * `∫ D dθ = 1` over `[−π, π]`.
   * @defaultValue the half-plane cos² spreading, {@link cosSquaredSpreading}
   */
  spreading?: (theta: number, omega: number) => number;
  /**
   * Direction the waves travel towards (the wind's downwind direction), rad,
   * counter-clockwise from +x (east).
   * @defaultValue 0
   */
  meanDirection?: number;
  /** The dispersion relation's medium. @defaultValue deep water, clean water at 20 °C */
  dispersion?: DispersionOptions;
  /**
   * Wavenumber, rad/m, above which the spectrum follows the saturation range
   * `F ∝ k⁻³` instead of the frequency spectrum (for capillary–gravity ripples, whose
   * frequency-derived spectrum would fall far too fast). Absent: no tail.
   */
  saturationFrom?: number;
}

/** @internal A validated sea, with its peak found. */
export interface PreparedSea {
  S: (omega: number) => number;
  D: (theta: number, omega: number) => number;
  theta0: number;
  disp: DispersionParameters;
  kSat: number;
  fSat: number;
  peakOmega: number;
  peakK: number;
}

/** @internal F(k), checked. */
export function omniAt(sea: PreparedSea, fn: string, k: number): number {
  let v: number;
  if (k > sea.kSat) {
    const r = sea.kSat / k;
    v = sea.fSat * r * r * r;
  } else {
    const w = omegaOf(k, sea.disp);
    v = sea.S(w) * groupSpeedOf(k, sea.disp);
  }
  if (!(v >= 0) || v === Infinity) rangeError(fn, 'sea.frequencySpectrum', v, 'finite spectral densities >= 0');
  return v;
}

/** @internal Validate a sea and find its spectral peak. */
export function prepareSea(fn: string, sea: SeaSpectrum, parameter = 'sea'): PreparedSea {
  const s = checkOptions(fn, sea, parameter);
  if (typeof s.frequencySpectrum !== 'function') {
    typeError(fn, `${parameter}.frequencySpectrum`, s.frequencySpectrum, 'a function S(omega)');
  }
  if (s.spreading !== undefined && typeof s.spreading !== 'function') {
    typeError(fn, `${parameter}.spreading`, s.spreading, 'a function D(theta, omega)');
  }
  const theta0 = s.meanDirection === undefined ? 0 : checkFinite(fn, `${parameter}.meanDirection`, s.meanDirection);
  const disp = dispersionParameters(fn, s.dispersion, `${parameter}.dispersion`);
  const kSat = s.saturationFrom === undefined ? Infinity : checkPositive(fn, `${parameter}.saturationFrom`, s.saturationFrom);
  const S = s.frequencySpectrum;
  // The peak of S on a fine logarithmic scan from 1e-3 to 1e4 rad/s (0.2 % steps).
  let best = -1;
  let peakOmega = NaN;
  const n = 8000;
  for (let i = 0; i <= n; i++) {
    const w = 1e-3 * Math.pow(1e7, i / n);
    const v = S(w);
    if (!(v >= 0) || v === Infinity) rangeError(fn, `${parameter}.frequencySpectrum(${w})`, v, 'a finite spectral density >= 0');
    if (v > best) {
      best = v;
      peakOmega = w;
    }
  }
  if (!(best > 0)) rangeError(fn, `${parameter}.frequencySpectrum`, 'zero everywhere', 'a spectrum with energy between 1e-3 and 1e4 rad/s');
  const peakK = wavenumberOf(peakOmega, disp);
  const prepared: PreparedSea = {
    S,
    D: s.spreading ?? ((t: number) => cosSquaredSpreading(t)),
    theta0,
    disp,
    kSat,
    fSat: 0,
    peakOmega,
    peakK,
  };
  if (kSat < Infinity) prepared.fSat = S(omegaOf(kSat, disp)) * groupSpeedOf(kSat, disp);
  return prepared;
}

/** Options of {@link seaMoments}. */
export interface SeaMomentsOptions {
  /** Lower end of the wavenumber band, rad/m. @defaultValue 0 (from 1/50 of the peak wavenumber, below which a wind-sea spectrum vanishes) */
  kMin?: number;
  /** Upper end of the wavenumber band, rad/m (required: the slope of a k⁻³ range grows with its logarithm). */
  kMax: number;
  /** Number of log-spaced wavenumber intervals (even). @defaultValue 2000 */
  intervals?: number;
  /** Number of directions for the angular integrals. @defaultValue 360 */
  directions?: number;
}

/** The moments of a directional sea over a wavenumber band. */
export interface SeaMoments {
  /** Elevation variance `m0 = ∫ F dk`, m². */
  readonly m0: number;
  /** `m2 = ∫ ω² F dk`, m²/s². */
  readonly m2: number;
  /** `m4 = ∫ ω⁴ F dk`, m²/s⁴. */
  readonly m4: number;
  /** Significant wave height `4√m0`, m. */
  readonly significantHeight: number;
  /** Mean-square slope `∫ k² F dk` (both components together). */
  readonly meanSquareSlope: number;
  /** Mean-square slope along the mean direction, `∫∫ k² cos²θ Ψ k dk dθ`. */
  readonly meanSquareSlopeAlong: number;
  /** Mean-square slope across the mean direction, `∫∫ k² sin²θ Ψ k dk dθ`. */
  readonly meanSquareSlopeAcross: number;
  /** Peak angular frequency of `S(ω)`, rad/s. */
  readonly peakOmega: number;
  /** Peak wavenumber `k(ω_p)`, rad/m. */
  readonly peakWavenumber: number;
}

/**
 * The moments of a directional sea over a wavenumber band `[kMin, kMax]`, integrated
 * numerically (Simpson's rule in ln k; the trapezoidal rule, spectrally accurate for
 * periodic integrands, in direction): variance, frequency moments, significant height
 * and mean-square slopes (total, along and across the mean direction).
 *
 * @param sea - The directional sea.
 * @param options - The band and the quadrature sizes.
 * @returns The moments.
 * @throws {@link core!MeniscusRangeError} for a bad band, a spectrum that is negative, not
 *   finite or zero everywhere, or bad dispersion options.
 * @throws {@link core!MeniscusTypeError} when the spectrum or spreading is not a function.
 * @see Longuet-Higgins, M. S. (1957), "The statistical analysis of a random, moving
 *   surface", Phil. Trans. R. Soc. A 249, 321–387 (moments of the directional spectrum,
 *   slope variances); Phillips, O. M. (1958), "The equilibrium range in the spectrum of
 *   wind-generated waves", Journal of Fluid Mechanics 4(4), 426–434 (the k⁻³ range).
 * @example
 * ```ts
 * const p = jonswapFromWind(8, 20_000);
 * const m = seaMoments({ frequencySpectrum: (w) => jonswapSpectrum(w, p) }, { kMax: 50 });
 * m.significantHeight; m.meanSquareSlope;
 * ```
 */
export function seaMoments(sea: SeaSpectrum, options: SeaMomentsOptions): SeaMoments {
  const fn = 'seaMoments';
  const ps = prepareSea(fn, sea);
  const o = checkOptions(fn, options);
  if (options === undefined) rangeError(fn, 'options', options, 'options with kMax (rad/m)');
  const kMax = checkPositive(fn, 'options.kMax', o.kMax);
  const kMin0 = o.kMin === undefined ? 0 : o.kMin;
  if (typeof kMin0 !== 'number' || !(kMin0 >= 0)) rangeError(fn, 'options.kMin', kMin0, 'a wavenumber >= 0 rad/m');
  const kMin = Math.max(kMin0, ps.peakK / 50);
  if (!(kMax > kMin)) rangeError(fn, 'options.kMax', kMax, `a wavenumber > ${kMin} rad/m (the lower end of the band)`);
  const n = o.intervals === undefined ? 2000 : o.intervals;
  if (!Number.isInteger(n) || n < 2 || n % 2 !== 0 || n > 1e6) rangeError(fn, 'options.intervals', n, 'an even integer in [2, 1e6]');
  const nd = o.directions === undefined ? 360 : o.directions;
  if (!Number.isInteger(nd) || nd < 8 || nd > 1e5) rangeError(fn, 'options.directions', nd, 'an integer in [8, 1e5]');
  const la = Math.log(kMin);
  const h = (Math.log(kMax) - la) / n;
  const dth = (2 * Math.PI) / nd;
  let m0 = 0;
  let m2 = 0;
  let m4 = 0;
  let mss = 0;
  let along = 0;
  for (let i = 0; i <= n; i++) {
    const k = Math.exp(la + i * h);
    const F = omniAt(ps, fn, k);
    const w = omegaOf(k, ps.disp);
    const c = ((i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2) * F * k * h) / 3;
    m0 += c;
    m2 += c * w * w;
    m4 += c * w * w * w * w;
    mss += c * k * k;
    if (F > 0) {
      // Share of the slope variance along the mean direction: ∫ cos²θ D dθ / ∫ D dθ.
      let sc = 0;
      let sd = 0;
      for (let j = 0; j < nd; j++) {
        const th = -Math.PI + j * dth;
        const d = ps.D(th, w);
        if (!(d >= 0) || d === Infinity) rangeError(fn, 'sea.spreading', d, 'finite spreading values >= 0');
        const ct = Math.cos(th);
        sc += d * ct * ct;
        sd += d;
      }
      if (sd > 0) along += (c * k * k * sc) / sd;
    }
  }
  return {
    m0,
    m2,
    m4,
    significantHeight: 4 * Math.sqrt(m0),
    meanSquareSlope: mss,
    meanSquareSlopeAlong: along,
    meanSquareSlopeAcross: mss - along,
    peakOmega: ps.peakOmega,
    peakWavenumber: ps.peakK,
  };
}
