/**
 * Directional spreading functions `D(θ)`: how the energy at one frequency is shared
 * between directions. Each is normalised so that `∫ D dθ = 1` over `[−π, π]`; `θ` is
 * measured from the mean direction of travel, in radians.
 *
 * @module
 */
import { checkFinite, checkNonNegative, checkPositive } from '../core/index.js';
import { STANDARD_GRAVITY } from './dispersion.js';

// ln Γ(x) for x > 0: Lanczos (g = 7, n = 9) with the reflection-free range used here.
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];
function lnGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - lnGamma(1 - x);
  const z = x - 1;
  let a = LANCZOS[0]!;
  const t = z + 7.5;
  for (let i = 1; i < 9; i++) a += LANCZOS[i]! / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(a);
}

/** @internal Wrap an angle to [−π, π]. */
export function wrapAngle(theta: number): number {
  if (theta >= -Math.PI && theta <= Math.PI) return theta;
  if (theta > Math.PI && theta <= 3 * Math.PI) return theta - 2 * Math.PI;
  if (theta < -Math.PI && theta >= -3 * Math.PI) return theta + 2 * Math.PI;
  return theta - 2 * Math.PI * Math.round(theta / (2 * Math.PI));
}

/**
 * The normalising constant of the cos-2s spreading, `G(s) = 2^(2s−1) Γ(s+1)² / (π Γ(2s+1))`.
 *
 * @param s - Spreading exponent (≥ 0).
 * @returns G(s), 1/rad.
 * @throws {@link core!MeniscusRangeError} for a negative or non-finite exponent.
 * @see Longuet-Higgins, M. S., Cartwright, D. E. & Smith, N. D. (1963), "Observations
 *   of the directional spectrum of sea waves using the motions of a floating buoy",
 *   Ocean Wave Spectra, Prentice-Hall, 111–136.
 * @example
 * ```ts
 * cos2sNormalization(1); // 1/π
 * ```
 */
export function cos2sNormalization(s: number): number {
  checkNonNegative('cos2sNormalization', 's', s);
  return Math.exp((2 * s - 1) * Math.LN2 + 2 * lnGamma(s + 1) - lnGamma(2 * s + 1)) / Math.PI;
}

/**
 * The cos-2s directional spreading `D(θ) = G(s) cos^(2s)(θ/2)`, `θ ∈ [−π, π]` from the
 * mean direction; larger `s` is narrower (s ≈ 1 wide, s ≈ 10–25 swell-like).
 *
 * @param theta - Direction relative to the mean direction of travel, rad (wrapped to [−π, π]).
 * @param s - Spreading exponent (≥ 0).
 * @returns D, 1/rad.
 * @throws {@link core!MeniscusRangeError} for a non-finite angle or a negative exponent.
 * @see Longuet-Higgins, M. S., Cartwright, D. E. & Smith, N. D. (1963), "Observations
 *   of the directional spectrum of sea waves using the motions of a floating buoy",
 *   Ocean Wave Spectra, Prentice-Hall, 111–136.
 * @example
 * ```ts
 * cos2sSpreading(0, 1); // 1/π
 * ```
 */
export function cos2sSpreading(theta: number, s: number): number {
  checkFinite('cos2sSpreading', 'theta', theta);
  const g = cos2sNormalization(s);
  const c = Math.abs(Math.cos(0.5 * wrapAngle(theta)));
  return g * Math.pow(c, 2 * s);
}

/**
 * The half-plane cos² spreading `D(θ) = (2/π) cos²θ` for `|θ| < π/2`, 0 behind (no
 * energy travelling against the mean direction). Common practice in engineering wave
 * models.
 *
 * @param theta - Direction relative to the mean direction of travel, rad.
 * @returns D, 1/rad.
 * @throws {@link core!MeniscusRangeError} for a non-finite angle.
 * @see Pierson, W. J., Neumann, G. & James, R. W. (1955), "Practical methods for
 *   observing and forecasting ocean waves by means of wave spectra and statistics",
 *   H.O. Pub. 603, U.S. Navy Hydrographic Office (the cos² spreading).
 * @example
 * ```ts
 * cosSquaredSpreading(0); // 2/π
 * ```
 */
export function cosSquaredSpreading(theta: number): number {
  checkFinite('cosSquaredSpreading', 'theta', theta);
  const t = wrapAngle(theta);
  if (!(Math.abs(t) < Math.PI / 2)) return 0;
  const c = Math.cos(t);
  return (2 / Math.PI) * c * c;
}

/**
 * Mitsuyasu's frequency-dependent exponent for the cos-2s spreading:
 * `s = s_max (ω/ω_p)^5` below the peak and `s_max (ω/ω_p)^−2.5` above it, with
 * `s_max = 11.5 (ω_p U₁₀ / g)^−2.5`. Narrowest at the peak.
 *
 * @param omega - Angular frequency, rad/s (> 0).
 * @param peakOmega - Peak angular frequency, rad/s (> 0).
 * @param windSpeed10 - Wind speed at 10 m, m/s (> 0).
 * @param gravity - Gravity, m/s². @defaultValue {@link STANDARD_GRAVITY}
 * @returns s (unitless).
 * @throws {@link core!MeniscusRangeError} for non-positive arguments.
 * @see Mitsuyasu, H. et al. (1975), "Observations of the directional spectrum of ocean
 *   waves using a cloverleaf buoy", Journal of Physical Oceanography 5(4), 750–760;
 *   in the form given by Goda, Y. (2000), Random Seas and Design of
 *   Maritime Structures, 2nd ed., World Scientific.
 * @example
 * ```ts
 * const wp = 2 * Math.PI / 4;
 * cos2sSpreading(0.3, mitsuyasuExponent(wp, wp, 10)); // D at the peak, 0.3 rad off the wind
 * ```
 */
export function mitsuyasuExponent(omega: number, peakOmega: number, windSpeed10: number, gravity: number = STANDARD_GRAVITY): number {
  const fn = 'mitsuyasuExponent';
  checkPositive(fn, 'omega', omega);
  checkPositive(fn, 'peakOmega', peakOmega);
  checkPositive(fn, 'windSpeed10', windSpeed10);
  checkPositive(fn, 'gravity', gravity);
  const sMax = 11.5 * Math.pow((peakOmega * windSpeed10) / gravity, -2.5);
  const r = omega / peakOmega;
  return r <= 1 ? sMax * Math.pow(r, 5) : sMax * Math.pow(r, -2.5);
}
