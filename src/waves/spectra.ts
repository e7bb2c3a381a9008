/**
 * Frequency spectra of wind seas: Pierson–Moskowitz and JONSWAP, with the JONSWAP
 * wind-and-fetch and peak-period parameterisations, and spectral moments.
 *
 * A frequency spectrum `S(ω)` is one-sided in angular frequency, m²·s/rad:
 * `∫₀^∞ S(ω) dω = m0`, the variance of the surface elevation, and the significant wave
 * height is `Hs = 4√m0`.
 *
 * @module
 */
import { checkFinite, checkInteger, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import { STANDARD_GRAVITY } from './dispersion.js';

/**
 * The Pierson–Moskowitz spectrum of a fully developed sea,
 * `S(ω) = α g² ω⁻⁵ exp(−β (g/(U ω))⁴)` with `α = 8.1·10⁻³`, `β = 0.74` and `U` the wind
 * speed at 19.5 m. Its peak is at `ω_p = 0.877 g/U` and its significant height is
 * `Hs = 2√(α/β) U²/g ≈ 0.21 U²/g`.
 *
 * @param omega - Angular frequency, rad/s (> 0).
 * @param windSpeed19_5 - Wind speed at 19.5 m above the sea, m/s (> 0).
 * @param gravity - Gravity, m/s². @defaultValue {@link STANDARD_GRAVITY}
 * @returns S(ω), m²·s/rad.
 * @throws {@link core!MeniscusRangeError} for non-positive arguments.
 * @see Pierson, W. J. & Moskowitz, L. (1964), "A proposed spectral form for fully
 *   developed wind seas based on the similarity theory of S. A. Kitaigorodskii",
 *   Journal of Geophysical Research 69(24), 5181–5190.
 * @example
 * ```ts
 * piersonMoskowitzSpectrum(0.5, 15); // m²·s/rad
 * ```
 */
export function piersonMoskowitzSpectrum(omega: number, windSpeed19_5: number, gravity: number = STANDARD_GRAVITY): number {
  const fn = 'piersonMoskowitzSpectrum';
  checkPositive(fn, 'omega', omega);
  checkPositive(fn, 'windSpeed19_5', windSpeed19_5);
  checkPositive(fn, 'gravity', gravity);
  const w0 = gravity / (windSpeed19_5 * omega);
  return ((8.1e-3 * gravity * gravity) / Math.pow(omega, 5)) * Math.exp(-0.74 * w0 * w0 * w0 * w0);
}

/** The parameters of a JONSWAP spectrum. */
export interface JonswapParameters {
  /** Peak angular frequency `ω_p`, rad/s (> 0). */
  peakOmega: number;
  /** Energy scale (Phillips constant) `α`. @defaultValue 0.0081 */
  alpha?: number;
  /** Peak enhancement factor `γ` (≥ 1; 1 gives Pierson–Moskowitz's shape). @defaultValue 3.3 */
  gamma?: number;
  /** Peak width below the peak, `σ_a`. @defaultValue 0.07 */
  sigmaA?: number;
  /** Peak width above the peak, `σ_b`. @defaultValue 0.09 */
  sigmaB?: number;
  /** Gravity, m/s². @defaultValue {@link STANDARD_GRAVITY} */
  gravity?: number;
}

interface Jonswap {
  wp: number;
  alpha: number;
  lnGamma: number;
  sa: number;
  sb: number;
  g: number;
}

function jonswapOf(fn: string, params: JonswapParameters, parameter = 'params'): Jonswap {
  const p = checkOptions(fn, params, parameter);
  if (params === undefined) typeError(fn, parameter, params, 'JONSWAP parameters {peakOmega, …}');
  const wp = checkPositive(fn, `${parameter}.peakOmega`, p.peakOmega);
  const alpha = p.alpha === undefined ? 0.0081 : checkPositive(fn, `${parameter}.alpha`, p.alpha);
  const gamma = p.gamma === undefined ? 3.3 : checkFinite(fn, `${parameter}.gamma`, p.gamma);
  if (!(gamma >= 1)) rangeError(fn, `${parameter}.gamma`, gamma, 'a number >= 1');
  const sa = p.sigmaA === undefined ? 0.07 : checkPositive(fn, `${parameter}.sigmaA`, p.sigmaA);
  const sb = p.sigmaB === undefined ? 0.09 : checkPositive(fn, `${parameter}.sigmaB`, p.sigmaB);
  const g = p.gravity === undefined ? STANDARD_GRAVITY : checkPositive(fn, `${parameter}.gravity`, p.gravity);
  return { wp, alpha, lnGamma: Math.log(gamma), sa, sb, g };
}

function jonswapValue(w: number, j: Jonswap): number {
  const s = w <= j.wp ? j.sa : j.sb;
  const d = (w - j.wp) / (s * j.wp);
  const r = Math.exp(-0.5 * d * d);
  const x = j.wp / w;
  const x2 = x * x;
  const w2 = w * w;
  return ((j.alpha * j.g * j.g) / (w2 * w2 * w)) * Math.exp(-1.25 * x2 * x2 + r * j.lnGamma);
}

/**
 * The JONSWAP spectrum of a fetch-limited wind sea,
 * `S(ω) = α g² ω⁻⁵ exp(−5/4 (ω_p/ω)⁴) γ^r`, `r = exp(−(ω − ω_p)²/(2 σ² ω_p²))`,
 * `σ = σ_a` for `ω ≤ ω_p` and `σ_b` above.
 *
 * @param omega - Angular frequency, rad/s (> 0).
 * @param params - Peak frequency, α, γ, σ_a, σ_b, gravity.
 * @returns S(ω), m²·s/rad.
 * @throws {@link core!MeniscusRangeError} for a non-positive frequency or bad parameters.
 * @see Hasselmann, K. et al. (1973), "Measurements of wind-wave growth and swell decay
 *   during the Joint North Sea Wave Project (JONSWAP)", Deutsche Hydrographische
 *   Zeitschrift A8(12), 1–95.
 * @example
 * ```ts
 * const params = jonswapFromWind(10, 50_000);
 * jonswapSpectrum(params.peakOmega, params);
 * ```
 */
export function jonswapSpectrum(omega: number, params: JonswapParameters): number {
  checkPositive('jonswapSpectrum', 'omega', omega);
  return jonswapValue(omega, jonswapOf('jonswapSpectrum', params));
}

/**
 * The JONSWAP spectrum as a function `ω ↦ S(ω)`, its parameters validated once: the fast
 * form to give {@link prepareRandomSea} or {@link seaMoments} (which call it for every
 * wavenumber of the grid). Frequencies ≤ 0 give 0.
 *
 * @param params - Peak frequency, α, γ, σ_a, σ_b, gravity.
 * @returns `S(ω)`, m²·s/rad.
 * @throws {@link core!MeniscusRangeError} for bad parameters.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12), 1–95.
 * @example
 * ```ts
 * const S = jonswapSpectrumFunction(jonswapFromWind(8, 20_000));
 * const sea = { frequencySpectrum: S };
 * ```
 */
export function jonswapSpectrumFunction(params: JonswapParameters): (omega: number) => number {
  const j = jonswapOf('jonswapSpectrumFunction', params);
  return (w: number) => (w > 0 ? jonswapValue(w, j) : 0);
}

/**
 * The JONSWAP peak enhancement `γ^r` alone (equal to `γ` at the peak, tending to 1 away
 * from it): the ratio of the JONSWAP spectrum to the Pierson–Moskowitz-shaped spectrum of
 * the same α and ω_p.
 *
 * @param omega - Angular frequency, rad/s (> 0).
 * @param params - The JONSWAP parameters.
 * @returns γ^r (unitless).
 * @throws {@link core!MeniscusRangeError} for a non-positive frequency or bad parameters.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12).
 * @example
 * ```ts
 * jonswapPeakEnhancement(1, { peakOmega: 1 }); // 3.3
 * ```
 */
export function jonswapPeakEnhancement(omega: number, params: JonswapParameters): number {
  checkPositive('jonswapPeakEnhancement', 'omega', omega);
  const j = jonswapOf('jonswapPeakEnhancement', params);
  const s = omega <= j.wp ? j.sa : j.sb;
  const d = (omega - j.wp) / (s * j.wp);
  return Math.exp(Math.exp(-0.5 * d * d) * j.lnGamma);
}

/** Shape options shared by the JONSWAP parameterisations. */
export interface JonswapShape {
  /** Peak enhancement γ. @defaultValue 3.3 */
  gamma?: number;
  /** σ_a. @defaultValue 0.07 */
  sigmaA?: number;
  /** σ_b. @defaultValue 0.09 */
  sigmaB?: number;
  /** Gravity, m/s². @defaultValue {@link STANDARD_GRAVITY} */
  gravity?: number;
}

/**
 * JONSWAP parameters from wind speed and fetch by the JONSWAP growth relations: with the
 * dimensionless fetch `x̃ = g F / U₁₀²`, `α = 0.076 x̃^−0.22` and
 * `ω_p = 2π · 3.5 (g/U₁₀) x̃^−0.33`.
 *
 * @param windSpeed10 - Wind speed at 10 m, m/s (> 0).
 * @param fetch - Fetch, m (> 0).
 * @param shape - γ, σ_a, σ_b, gravity.
 * @returns The parameters, for {@link jonswapSpectrum}.
 * @throws {@link core!MeniscusRangeError} for non-positive wind or fetch, or bad shape options.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12) (the fetch relations for α and the peak frequency).
 * @example
 * ```ts
 * const p = jonswapFromWind(10, 50_000); // ω_p ≈ 1.36 rad/s, α ≈ 0.0125
 * ```
 */
export function jonswapFromWind(windSpeed10: number, fetch: number, shape?: JonswapShape): JonswapParameters {
  const fn = 'jonswapFromWind';
  checkPositive(fn, 'windSpeed10', windSpeed10);
  checkPositive(fn, 'fetch', fetch);
  const s = checkOptions(fn, shape, 'shape');
  const g = s.gravity === undefined ? STANDARD_GRAVITY : checkPositive(fn, 'shape.gravity', s.gravity);
  const x = (g * fetch) / (windSpeed10 * windSpeed10);
  const params: JonswapParameters = {
    ...s,
    gravity: g,
    alpha: 0.076 * Math.pow(x, -0.22),
    peakOmega: 2 * Math.PI * 3.5 * (g / windSpeed10) * Math.pow(x, -0.33),
  };
  jonswapOf(fn, params, 'shape');
  return params;
}

/** Inputs of {@link jonswapFromPeak}. */
export interface JonswapPeakInputs extends JonswapShape {
  /** Peak period `T_p = 2π/ω_p`, s (> 0). */
  peakPeriod: number;
  /**
   * Significant wave height `Hs = 4√m0` to match, m; α is then chosen so that the
   * spectrum's m0 (integrated numerically) gives it. When absent α = 0.0081.
   */
  significantHeight?: number;
}

/**
 * JONSWAP parameters from the peak period, and optionally the significant height (α
 * scaled so that `4√m0 = Hs`, with m0 integrated numerically over (0, ∞)).
 *
 * @param inputs - Peak period, optional significant height, shape.
 * @returns The parameters, for {@link jonswapSpectrum}.
 * @throws {@link core!MeniscusRangeError} for non-positive period or height, or bad shape options.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12); Goda, Y. (2000), Random
 *   Seas and Design of Maritime Structures, 2nd ed. (spectra given by Hs and Tp).
 * @example
 * ```ts
 * const p = jonswapFromPeak({ peakPeriod: 1.2, significantHeight: 0.05 });
 * ```
 */
export function jonswapFromPeak(inputs: JonswapPeakInputs): JonswapParameters {
  const fn = 'jonswapFromPeak';
  const o = checkOptions(fn, inputs, 'inputs');
  const tp = checkPositive(fn, 'inputs.peakPeriod', o.peakPeriod);
  const { significantHeight, peakPeriod: _tp, ...shape } = o;
  const params: JonswapParameters = { ...shape, peakOmega: (2 * Math.PI) / tp };
  if (significantHeight === undefined) {
    jonswapOf(fn, params, 'inputs');
    return params;
  }
  const hs = checkPositive(fn, 'inputs.significantHeight', significantHeight);
  const unit = jonswapOf(fn, { ...params, alpha: 1 }, 'inputs');
  // m0 for α = 1 on a log-spaced grid: the integrand vanishes below ω_p/4 and falls as ω⁻⁵.
  const m0 = integrateLog((w) => jonswapValue(w, unit), unit.wp / 4, unit.wp * 400, 4000);
  params.alpha = (hs * hs) / 16 / m0;
  return params;
}

/** @internal ∫ f over [a, b] by Simpson's rule in ln ω (n even intervals). */
export function integrateLog(f: (w: number) => number, a: number, b: number, n: number): number {
  const la = Math.log(a);
  const h = (Math.log(b) - la) / n;
  let s = 0;
  for (let i = 0; i <= n; i++) {
    const w = Math.exp(la + i * h);
    const c = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
    s += c * f(w) * w;
  }
  return (s * h) / 3;
}

/** The moments of a frequency spectrum over a band. */
export interface SpectralMoments {
  /** `m0 = ∫ S dω`, m². */
  readonly m0: number;
  /** `m1 = ∫ ω S dω`, m²/s. */
  readonly m1: number;
  /** `m2 = ∫ ω² S dω`, m²/s². */
  readonly m2: number;
  /** `m4 = ∫ ω⁴ S dω`, m²/s⁴. */
  readonly m4: number;
  /** `Hs = 4√m0`, m. */
  readonly significantHeight: number;
  /** Mean zero-crossing period `Tz = 2π √(m0/m2)`, s. */
  readonly zeroCrossingPeriod: number;
}

/**
 * The moments `m_n = ∫ ωⁿ S(ω) dω` of a frequency spectrum over `[omegaMin, omegaMax]`,
 * by Simpson's rule on a logarithmic frequency grid.
 *
 * @param spectrum - `S(ω)`, m²·s/rad.
 * @param omegaMin - Lower end of the band, rad/s (> 0).
 * @param omegaMax - Upper end, rad/s (> omegaMin). The moments of a ω⁻⁵ tail depend on
 *   it: m4 grows as its logarithm.
 * @param intervals - Number of (log-spaced) intervals, even. @defaultValue 4000
 * @returns m0, m1, m2, m4, Hs and Tz.
 * @throws {@link core!MeniscusRangeError} for a bad band or a spectrum value that is negative or not finite.
 * @see Longuet-Higgins, M. S. (1957), "The statistical analysis of a random, moving
 *   surface", Philosophical Transactions of the Royal Society A 249, 321–387 (spectral
 *   moments); Rice, S. O. (1944), "Mathematical analysis of random noise", Bell System
 *   Technical Journal 23, 282–332 (zero-crossing period).
 * @example
 * ```ts
 * const p = jonswapFromWind(10, 50_000);
 * spectralMoments((w) => jonswapSpectrum(w, p), 0.1, 30).significantHeight;
 * ```
 */
export function spectralMoments(spectrum: (omega: number) => number, omegaMin: number, omegaMax: number, intervals = 4000): SpectralMoments {
  const fn = 'spectralMoments';
  if (typeof spectrum !== 'function') typeError(fn, 'spectrum', spectrum, 'a function S(omega)');
  checkPositive(fn, 'omegaMin', omegaMin);
  checkPositive(fn, 'omegaMax', omegaMax);
  if (!(omegaMax > omegaMin)) rangeError(fn, 'omegaMax', omegaMax, `a frequency > omegaMin (${omegaMin})`);
  checkInteger(fn, 'intervals', intervals, 2, 10_000_000);
  if (intervals % 2 !== 0) rangeError(fn, 'intervals', intervals, 'an even number');
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s4 = 0;
  const la = Math.log(omegaMin);
  const h = (Math.log(omegaMax) - la) / intervals;
  for (let i = 0; i <= intervals; i++) {
    const w = Math.exp(la + i * h);
    const v = spectrum(w);
    if (!(v >= 0) || v === Infinity) rangeError(fn, `spectrum(${w})`, v, 'a finite spectral density >= 0');
    const c = (i === 0 || i === intervals ? 1 : i % 2 === 1 ? 4 : 2) * v * w;
    s0 += c;
    s1 += c * w;
    s2 += c * w * w;
    s4 += c * w * w * w * w;
  }
  const m0 = (s0 * h) / 3;
  const m1 = (s1 * h) / 3;
  const m2 = (s2 * h) / 3;
  const m4 = (s4 * h) / 3;
  return { m0, m1, m2, m4, significantHeight: 4 * Math.sqrt(m0), zeroCrossingPeriod: m2 > 0 ? 2 * Math.PI * Math.sqrt(m0 / m2) : Infinity };
}
