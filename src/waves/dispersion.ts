/**
 * Linear dispersion of gravity–capillary waves in water of finite depth, and the surface
 * tension of water.
 *
 * @module
 */
import { checkInRange, checkNonNegative, checkOptions, checkPositive, rangeError } from '../core/index.js';

/** Standard acceleration of gravity, m/s² (3rd CGPM, 1901). */
export const STANDARD_GRAVITY = 9.80665;

/**
 * Surface tension of ordinary water against its vapour (in practice, air), N/m, by the
 * IAPWS formula `σ = B τ^μ (1 + b τ)`, `τ = 1 − T/Tc`, with `B = 235.8 mN/m`,
 * `b = −0.625`, `μ = 1.256`, `Tc = 647.096 K`.
 *
 * Valid from the triple point (0.01 °C) to the critical point (373.946 °C); the release
 * notes that it also extrapolates well into supercooled water, which is accepted here
 * down to −25 °C.
 *
 * @param temperatureC - Temperature, °C, in [−25, 373.946].
 * @returns Surface tension, N/m.
 * @throws {@link core!MeniscusRangeError} outside the accepted range.
 * @see IAPWS R1-76(2014), "Revised Release on Surface Tension of Ordinary Water
 *   Substance", International Association for the Properties of Water and Steam, eq. (1).
 * @example
 * ```ts
 * surfaceTensionWater(20); // 0.072736 N/m
 * ```
 */
export function surfaceTensionWater(temperatureC: number): number {
  checkInRange('surfaceTensionWater', 'temperatureC', temperatureC, -25, 373.946);
  const tau = 1 - (temperatureC + 273.15) / 647.096;
  return 0.2358 * Math.pow(tau, 1.256) * (1 - 0.625 * tau);
}

/** The medium and forces of {@link angularFrequency} and its relatives. */
export interface DispersionOptions {
  /** Water depth, m (> 0; `Infinity` for deep water). @defaultValue Infinity */
  depth?: number;
  /** Surface tension, N/m (≥ 0; 0 for pure gravity waves). @defaultValue `surfaceTensionWater(20)` ≈ 0.072736 */
  surfaceTension?: number;
  /** Water density, kg/m³. @defaultValue 998.2 (pure water at 20 °C) */
  density?: number;
  /** Acceleration of gravity, m/s². @defaultValue {@link STANDARD_GRAVITY} */
  gravity?: number;
}

/** Validated, unpacked dispersion settings: depth, σ/ρ and g. */
export interface DispersionParameters {
  /** Depth, m (`Infinity` for deep water). */
  readonly depth: number;
  /** Kinematic surface tension `σ/ρ`, m³/s². */
  readonly tensionOverDensity: number;
  /** Gravity, m/s². */
  readonly gravity: number;
}

const DEFAULT_TENSION = surfaceTensionWater(20);

/**
 * Validate and unpack {@link DispersionOptions} (used by the spectra and the synthesis).
 *
 * @param fn - The calling function's name.
 * @param options - The options.
 * @param parameter - The options' name in messages. @defaultValue 'options'
 * @returns The unpacked parameters.
 * @throws {@link core!MeniscusRangeError} for a non-positive depth, density or gravity, or a
 *   negative surface tension.
 * @example
 * ```ts
 * dispersionParameters('mySolver', { depth: 0.6 }).tensionOverDensity; // 7.287e-5
 * ```
 */
export function dispersionParameters(fn: string, options: DispersionOptions | undefined, parameter = 'options'): DispersionParameters {
  const o = checkOptions(fn, options, parameter);
  let depth = Infinity;
  if (o.depth !== undefined) {
    if (typeof o.depth !== 'number' || !(o.depth > 0)) rangeError(fn, `${parameter}.depth`, o.depth, 'a depth > 0 m (Infinity for deep water)');
    depth = o.depth;
  }
  const sigma = o.surfaceTension === undefined ? DEFAULT_TENSION : checkNonNegative(fn, `${parameter}.surfaceTension`, o.surfaceTension);
  const rho = o.density === undefined ? 998.2 : checkPositive(fn, `${parameter}.density`, o.density);
  const gravity = o.gravity === undefined ? STANDARD_GRAVITY : checkPositive(fn, `${parameter}.gravity`, o.gravity);
  return { depth, tensionOverDensity: sigma / rho, gravity };
}

/** @internal ω(k) without checks. */
export function omegaOf(k: number, d: DispersionParameters): number {
  const th = d.depth === Infinity ? 1 : Math.tanh(k * d.depth);
  return Math.sqrt((d.gravity * k + d.tensionOverDensity * k * k * k) * th);
}

/** @internal dω/dk without checks. */
export function groupSpeedOf(k: number, d: DispersionParameters): number {
  const g = d.gravity;
  const s = d.tensionOverDensity;
  const w = omegaOf(k, d);
  if (d.depth === Infinity) return (g + 3 * s * k * k) / (2 * w);
  const th = Math.tanh(k * d.depth);
  const sech2 = 1 - th * th;
  return ((g + 3 * s * k * k) * th + (g * k + s * k * k * k) * d.depth * sech2) / (2 * w);
}

/** @internal k(ω) without checks: safeguarded Newton on f(k) = (g k + s k³) tanh(k h) − ω². */
export function wavenumberOf(omega: number, d: DispersionParameters): number {
  const w2 = omega * omega;
  const f = (k: number): number => {
    const th = d.depth === Infinity ? 1 : Math.tanh(k * d.depth);
    return (d.gravity * k + d.tensionOverDensity * k * k * k) * th - w2;
  };
  // f(0) = −ω² < 0 and f grows without bound: bracket the single root.
  let lo = 0;
  let hi = Math.max(w2 / d.gravity, d.depth === Infinity ? 0 : omega / Math.sqrt(d.gravity * d.depth));
  if (!(hi > 0)) hi = 1e-300;
  while (f(hi) < 0) {
    lo = hi;
    hi *= 2;
  }
  let k = hi;
  for (let it = 0; it < 300; it++) {
    const fk = f(k);
    if (fk === 0) return k;
    if (fk < 0) lo = k;
    else hi = k;
    // f'(k) = 2 ω(k) c_g(k).
    const w = omegaOf(k, d);
    const df = 2 * w * groupSpeedOf(k, d);
    let kn = k - fk / df;
    if (!(kn > lo && kn < hi)) kn = 0.5 * (lo + hi);
    if (Math.abs(kn - k) <= 4e-16 * k || hi - lo <= 4e-16 * hi) return kn;
    k = kn;
  }
  return k;
}

/**
 * The largest wavenumber the dispersion functions accept, rad/m (a wavelength of about
 * 0.6 µm). Linear capillary–gravity theory has lost its meaning long before this; the
 * bound keeps every result finite.
 */
export const MAX_WAVENUMBER = 1e7;

function checkWavenumber(fn: string, k: number): number {
  checkPositive(fn, 'k', k);
  if (!(k <= MAX_WAVENUMBER)) rangeError(fn, 'k', k, `a wavenumber in (0, ${MAX_WAVENUMBER}] rad/m (MAX_WAVENUMBER)`);
  return k;
}

/**
 * Angular frequency of a linear gravity–capillary wave,
 * `ω = √((g k + σ k³/ρ) tanh(k h))`.
 *
 * @param k - Wavenumber, rad/m (> 0).
 * @param options - Depth, surface tension, density, gravity.
 * @returns ω, rad/s.
 * @throws {@link core!MeniscusRangeError} for a wavenumber outside (0, {@link MAX_WAVENUMBER}] or bad options.
 * @see Lamb, H. (1932), Hydrodynamics, 6th ed., Cambridge University Press, §267
 *   (capillary–gravity waves on water of finite depth).
 * @example
 * ```ts
 * angularFrequency(1, { surfaceTension: 0, gravity: 9.81 }); // 3.1321 (deep water: √(g k))
 * ```
 */
export function angularFrequency(k: number, options?: DispersionOptions): number {
  checkWavenumber('angularFrequency', k);
  return omegaOf(k, dispersionParameters('angularFrequency', options));
}

/**
 * Wavenumber of the linear gravity–capillary wave of angular frequency `ω`: the root of
 * `(g k + σ k³/ρ) tanh(k h) = ω²` (unique, the left side grows with `k`), found by
 * Newton's method safeguarded with bisection on a bracket, to full double precision.
 *
 * @param omega - Angular frequency, rad/s (> 0).
 * @param options - Depth, surface tension, density, gravity.
 * @returns k, rad/m.
 * @throws {@link core!MeniscusRangeError} for a non-positive frequency or bad options.
 * @see Lamb, H. (1932), Hydrodynamics, 6th ed., §267.
 * @example
 * ```ts
 * wavenumber(2 * Math.PI / 8, { depth: 10, surfaceTension: 0 }); // 0.0878 rad/m
 * ```
 */
export function wavenumber(omega: number, options?: DispersionOptions): number {
  checkPositive('wavenumber', 'omega', omega);
  const d = dispersionParameters('wavenumber', options);
  const omegaMax = omegaOf(MAX_WAVENUMBER, d);
  if (!(omega <= omegaMax)) {
    rangeError('wavenumber', 'omega', omega, `an angular frequency in (0, ${omegaMax}] rad/s (the frequency of MAX_WAVENUMBER)`);
  }
  return wavenumberOf(omega, d);
}

/**
 * Phase speed `c = ω/k` of a linear gravity–capillary wave.
 *
 * @param k - Wavenumber, rad/m (> 0).
 * @param options - Depth, surface tension, density, gravity.
 * @returns c, m/s.
 * @throws {@link core!MeniscusRangeError} for a wavenumber outside (0, {@link MAX_WAVENUMBER}] or bad options.
 * @see Lamb, H. (1932), Hydrodynamics, 6th ed., §267.
 * @example
 * ```ts
 * phaseSpeed(1e-4, { depth: 4, surfaceTension: 0 }); // ≈ √(g h) = 6.26 m/s
 * ```
 */
export function phaseSpeed(k: number, options?: DispersionOptions): number {
  checkWavenumber('phaseSpeed', k);
  return omegaOf(k, dispersionParameters('phaseSpeed', options)) / k;
}

/**
 * Group speed `c_g = dω/dk` of a linear gravity–capillary wave (the exact derivative of
 * the dispersion relation).
 *
 * @param k - Wavenumber, rad/m (> 0).
 * @param options - Depth, surface tension, density, gravity.
 * @returns c_g, m/s.
 * @throws {@link core!MeniscusRangeError} for a wavenumber outside (0, {@link MAX_WAVENUMBER}] or bad options.
 * @see Lighthill, J. (1978), Waves in Fluids, Cambridge University Press, §3.6 (group
 *   velocity of capillary–gravity waves).
 * @example
 * ```ts
 * groupSpeed(1, { surfaceTension: 0 }) / phaseSpeed(1, { surfaceTension: 0 }); // 0.5 in deep water
 * ```
 */
export function groupSpeed(k: number, options?: DispersionOptions): number {
  checkWavenumber('groupSpeed', k);
  return groupSpeedOf(k, dispersionParameters('groupSpeed', options));
}

/** The slowest deep-water capillary–gravity wave. */
export interface MinimumPhaseSpeed {
  /** The minimum phase speed `(4 g σ/ρ)^(1/4)`, m/s. */
  readonly speed: number;
  /** Its wavenumber `√(ρ g/σ)`, rad/m. */
  readonly wavenumber: number;
  /** Its wavelength `2π √(σ/(ρ g))`, m. */
  readonly wavelength: number;
}

/**
 * The minimum phase speed of capillary–gravity waves on deep water and where it occurs:
 * `c_min = (4 g σ/ρ)^(1/4)` at `k_m = √(ρ g/σ)`. About 0.23 m/s at 1.7 cm for clean
 * water at 20 °C.
 *
 * @param options - Surface tension (> 0), density, gravity; `depth` is ignored.
 * @returns Speed, wavenumber and wavelength.
 * @throws {@link core!MeniscusRangeError} for a zero surface tension or bad options.
 * @see Lamb, H. (1932), Hydrodynamics, 6th ed., §267; Lighthill, J. (1978), Waves in
 *   Fluids, §3.6.
 * @example
 * ```ts
 * minimumPhaseSpeed().speed; // 0.2312 m/s
 * ```
 */
export function minimumPhaseSpeed(options?: DispersionOptions): MinimumPhaseSpeed {
  const fn = 'minimumPhaseSpeed';
  const d = dispersionParameters(fn, options);
  if (!(d.tensionOverDensity > 0)) rangeError(fn, 'options.surfaceTension', 0, 'a surface tension > 0 N/m');
  const km = Math.sqrt(d.gravity / d.tensionOverDensity);
  return { speed: Math.pow(4 * d.gravity * d.tensionOverDensity, 0.25), wavenumber: km, wavelength: (2 * Math.PI) / km };
}
