/**
 * Refractive index of air (Edlén's equation as revised by Birch & Downs), and the
 * conversion of an index between "relative to vacuum" and "relative to air".
 *
 * @module
 */
import { checkFinite, checkOptions, checkPositive, rangeError } from '../core/index.js';
import { checkValidity, readExtrapolate } from './internal.js';

/** Options of {@link airRefractiveIndex} (and of the conversions that use it). */
export interface AirIndexOptions {
  /** Air temperature, °C, in [−40, 100]. @defaultValue 15 */
  temperatureC?: number;
  /** Total air pressure, hPa, in [600, 1200]. @defaultValue 1013.25 */
  pressureHPa?: number;
  /** Partial pressure of water vapour, hPa, in [0, 100]. @defaultValue 0 (dry air) */
  waterVapourHPa?: number;
  /**
   * Evaluate outside the validity ranges instead of refusing.
   * @defaultValue false
   */
  extrapolate?: boolean;
}

/** Ranges accepted by {@link airRefractiveIndex} without extrapolation. */
export const AIR_INDEX_RANGE = {
  wavelengthNm: [350, 650],
  temperatureC: [-40, 100],
  pressureHPa: [600, 1200],
  waterVapourHPa: [0, 100],
} as const;

/**
 * Refractive index of air, by Edlén's equation in the form revised by Birch & Downs:
 * standard dry air (15 °C, 101 325 Pa)
 * `(n − 1)ₛ·10⁸ = 8342.54 + 2406147/(130 − σ²) + 15998/(38.9 − σ²)`, σ = 1/λ in µm⁻¹;
 * at temperature t (°C) and pressure p (Pa)
 * `(n − 1)ₜₚ = (n − 1)ₛ · p [1 + 10⁻⁸ (0.601 − 0.00972 t) p] / (96095.43 (1 + 0.003661 t))`;
 * with water vapour of partial pressure f (Pa)
 * `n = nₜₚ − f (3.7345 − 0.0401 σ²)·10⁻¹⁰`.
 *
 * The equation was fitted to measurements in the visible; this function accepts
 * 350–650 nm without `options.extrapolate`.
 *
 * @param wavelengthNm - Vacuum wavelength, nm, in [350, 650] unless extrapolating.
 * @param options - Temperature, pressure, humidity, extrapolation; see
 *   {@link AirIndexOptions}.
 * @returns The refractive index of the air.
 * @throws {@link core!MeniscusRangeError} when an input is not finite, outside its range
 *   without `options.extrapolate`, or (even when extrapolating) a wavelength is not
 *   > 200 nm, a pressure < 0 or a temperature at or below absolute zero.
 * @see Edlén, B. (1966), "The refractive index of air", Metrologia 2, 71–80; Birch, K. P.
 *   & Downs, M. J. (1993), "An updated Edlén equation for the refractive index of air",
 *   Metrologia 30, 155–162, and (1994) "Correction to the updated Edlén equation for the
 *   refractive index of air", Metrologia 31, 315–316.
 * @example
 * ```ts
 * airRefractiveIndex(589.3); // ≈ 1.000277 (15 °C, 1013.25 hPa, dry)
 * airRefractiveIndex(589.3, { temperatureC: 0 }); // ≈ 1.000292
 * ```
 */
export function airRefractiveIndex(wavelengthNm: number, options?: AirIndexOptions): number {
  const fn = 'airRefractiveIndex';
  const o = checkOptions(fn, options);
  return airIndexChecked(fn, wavelengthNm, o);
}

function airIndexChecked(fn: string, wavelengthNm: number, o: AirIndexOptions): number {
  const prefix = 'options.';
  const ex = readExtrapolate(fn, o);
  const model = 'the revised Edlén equation (Birch & Downs 1993/1994)';
  checkValidity(fn, 'wavelengthNm', wavelengthNm, 350, 650, 'nm', model, ex);
  if (!(wavelengthNm > 200)) rangeError(fn, 'wavelengthNm', wavelengthNm, 'a wavelength > 200 nm (the equation has poles below)');
  const t = o.temperatureC === undefined ? 15 : checkValidity(fn, `${prefix}temperatureC`, o.temperatureC, -40, 100, '°C', model, ex);
  if (!(t > -273.15)) rangeError(fn, `${prefix}temperatureC`, t, 'a temperature above absolute zero (−273.15 °C)');
  const pHPa = o.pressureHPa === undefined ? 1013.25 : checkValidity(fn, `${prefix}pressureHPa`, o.pressureHPa, 600, 1200, 'hPa', model, ex);
  if (!(pHPa >= 0)) rangeError(fn, `${prefix}pressureHPa`, pHPa, 'a pressure >= 0 hPa');
  const fHPa =
    o.waterVapourHPa === undefined ? 0 : checkValidity(fn, `${prefix}waterVapourHPa`, o.waterVapourHPa, 0, 100, 'hPa', model, ex);
  if (!(fHPa >= 0 && fHPa <= pHPa)) rangeError(fn, `${prefix}waterVapourHPa`, fHPa, `a partial pressure in [0, ${pHPa}] hPa (the total pressure)`);
  return edlen(wavelengthNm, t, pHPa * 100, fHPa * 100);
}

function edlen(wavelengthNm: number, t: number, p: number, f: number): number {
  const s2 = (1000 / wavelengthNm) ** 2;
  const ns = (8342.54 + 2406147 / (130 - s2) + 15998 / (38.9 - s2)) * 1e-8;
  const ntp = (ns * p * (1 + 1e-8 * (0.601 - 0.00972 * t) * p)) / (96095.43 * (1 + 0.003661 * t));
  return 1 + ntp - f * (3.7345 - 0.0401 * s2) * 1e-10;
}

/**
 * Convert an index relative to vacuum into one relative to air: `n / n_air(λ)`, with
 * `n_air` from {@link airRefractiveIndex}.
 *
 * @param nVacuum - Index relative to vacuum (> 0), e.g. from {@link waterRefractiveIndex}.
 * @param wavelengthNm - Vacuum wavelength, nm (range as for {@link airRefractiveIndex}).
 * @param options - The air; see {@link AirIndexOptions}.
 * @returns The index relative to the given air.
 * @throws {@link core!MeniscusRangeError} on a bad index or air state (see
 *   {@link airRefractiveIndex}).
 * @see Edlén (1966); Birch & Downs (1993, 1994), as for {@link airRefractiveIndex}.
 * @example
 * ```ts
 * airRelativeIndex(1.3333, 589.3); // ≈ 1.33293
 * ```
 */
export function airRelativeIndex(nVacuum: number, wavelengthNm: number, options?: AirIndexOptions): number {
  const fn = 'airRelativeIndex';
  checkPositive(fn, 'nVacuum', nVacuum);
  checkFinite(fn, 'wavelengthNm', wavelengthNm);
  const o = checkOptions(fn, options);
  return nVacuum / airIndexChecked(fn, wavelengthNm, o);
}

/**
 * Convert an index relative to air into one relative to vacuum: `n · n_air(λ)`, with
 * `n_air` from {@link airRefractiveIndex}.
 *
 * @param nAir - Index relative to air (> 0), e.g. from {@link seawaterRefractiveIndex}.
 * @param wavelengthNm - Vacuum wavelength, nm (range as for {@link airRefractiveIndex}).
 * @param options - The air the index was measured against; see {@link AirIndexOptions}.
 * @returns The index relative to vacuum.
 * @throws {@link core!MeniscusRangeError} on a bad index or air state (see
 *   {@link airRefractiveIndex}).
 * @see Edlén (1966); Birch & Downs (1993, 1994), as for {@link airRefractiveIndex}.
 * @example
 * ```ts
 * vacuumRelativeIndex(1.339406, 589.3, { temperatureC: 20 }); // ≈ 1.339771
 * ```
 */
export function vacuumRelativeIndex(nAir: number, wavelengthNm: number, options?: AirIndexOptions): number {
  const fn = 'vacuumRelativeIndex';
  checkPositive(fn, 'nAir', nAir);
  checkFinite(fn, 'wavelengthNm', wavelengthNm);
  const o = checkOptions(fn, options);
  return nAir * airIndexChecked(fn, wavelengthNm, o);
}
