/**
 * Refractive index of pure water (IAPWS R9-97), the density of pure water from its
 * temperature (Tanaka et al. 2001), and the refractive index of sea water (Quan & Fry
 * 1995).
 *
 * @module
 */
import { checkOptions, checkPositive, rangeError } from '../core/index.js';
import { checkValidity, readExtrapolate } from './internal.js';

/** Options of {@link pureWaterDensity}. */
export interface WaterDensityOptions {
  /**
   * Evaluate outside the formula's validity range (0–40 °C) instead of refusing.
   * @defaultValue false
   */
  extrapolate?: boolean;
}

/** Validity range of {@link pureWaterDensity}, °C. */
export const PURE_WATER_DENSITY_RANGE = { temperatureC: [0, 40] } as const;

/**
 * Density of air-free pure water (Vienna Standard Mean Ocean Water isotopic
 * composition) at 101 325 Pa, from its temperature:
 * `ρ = a5 [1 − (t + a1)² (t + a2) / (a3 (t + a4))]`.
 *
 * @param temperatureC - Temperature, °C (ITS-90), in [0, 40] unless extrapolating.
 * @param options - See {@link WaterDensityOptions}.
 * @returns Density in kg m⁻³.
 * @throws {@link core!MeniscusRangeError} when the temperature is not finite, or outside
 *   0–40 °C without `options.extrapolate`.
 * @see Tanaka, M., Girard, G., Davis, R., Peuto, A. & Bignell, N. (2001), "Recommended
 *   table for the density of water between 0 °C and 40 °C based on recent experimental
 *   reports", Metrologia 38, 301–309.
 * @example
 * ```ts
 * pureWaterDensity(20); // ≈ 998.2067 kg/m³
 * ```
 */
export function pureWaterDensity(temperatureC: number, options?: WaterDensityOptions): number {
  const fn = 'pureWaterDensity';
  const o = checkOptions(fn, options);
  const ex = readExtrapolate(fn, o);
  checkValidity(fn, 'temperatureC', temperatureC, 0, 40, '°C', 'Tanaka et al. (2001)', ex);
  const rho = tanaka(temperatureC);
  if (!(rho > 0)) rangeError(fn, 'temperatureC', temperatureC, 'a temperature at which the formula gives a positive density');
  return rho;
}

function tanaka(t: number): number {
  const a1 = -3.983035;
  const a2 = 301.797;
  const a3 = 522528.9;
  const a4 = 69.34881;
  const a5 = 999.97495;
  return a5 * (1 - ((t + a1) * (t + a1) * (t + a2)) / (a3 * (t + a4)));
}

/** Options of {@link waterRefractiveIndex}. */
export interface WaterIndexOptions {
  /**
   * Density of the water, kg m⁻³, in [0, 1060]. When omitted it is computed from the
   * temperature with {@link pureWaterDensity} (liquid water at 101 325 Pa; 0–40 °C).
   * @defaultValue `pureWaterDensity(temperatureC)`
   */
  densityKgM3?: number;
  /**
   * Evaluate outside the validity ranges instead of refusing (the result must still be a
   * real index: a wavelength on one of the formula's resonances is refused).
   * @defaultValue false
   */
  extrapolate?: boolean;
}

/** Validity ranges of {@link waterRefractiveIndex} (IAPWS R9-97). */
export const WATER_INDEX_RANGE = {
  wavelengthNm: [200, 1100],
  temperatureC: [-12, 500],
  densityKgM3: [0, 1060],
} as const;

/**
 * Refractive index of water and steam relative to vacuum, by the IAPWS formulation of
 * 1997:
 * `(n² − 1)/(n² + 2) · 1/ρ̄ = a0 + a1 ρ̄ + a2 T̄ + a3 λ̄² T̄ + a4/λ̄² + a5/(λ̄² − λ̄UV²) +
 * a6/(λ̄² − λ̄IR²) + a7 ρ̄²`, with `T̄ = T/273.15 K`, `ρ̄ = ρ/(1000 kg m⁻³)`,
 * `λ̄ = λ/0.589 µm`.
 *
 * The wavelength is used as given; a wavelength in vacuum and the same light's
 * wavelength in air differ by about 0.03 %, which changes the index by about 1e-5 or less
 * in the visible.
 *
 * @param wavelengthNm - Wavelength, nm, in [200, 1100] unless extrapolating.
 * @param temperatureC - Temperature, °C, in [−12, 500] unless extrapolating (in [0, 40]
 *   when the density is left to {@link pureWaterDensity}).
 * @param options - Density and extrapolation; see {@link WaterIndexOptions}.
 * @returns The refractive index relative to vacuum.
 * @throws {@link core!MeniscusRangeError} when an input is not finite, is outside its
 *   validity range without `options.extrapolate`, or the formula gives no real index.
 * @see IAPWS (1997), "Release on the Refractive Index of Ordinary Water Substance as a
 *   Function of Wavelength, Temperature and Pressure", IAPWS R9-97 (the formulation and its table of coefficients);
 *   Harvey, A. H., Gallagher, J. S. & Levelt Sengers, J. M. H. (1998), J. Phys. Chem.
 *   Ref. Data 27, 761.
 * @example
 * ```ts
 * waterRefractiveIndex(589.3, 25, { densityKgM3: 997.047435 }); // 1.33285819…
 * ```
 */
export function waterRefractiveIndex(wavelengthNm: number, temperatureC: number, options?: WaterIndexOptions): number {
  const fn = 'waterRefractiveIndex';
  const o = checkOptions(fn, options);
  const ex = readExtrapolate(fn, o);
  const model = 'IAPWS R9-97';
  checkValidity(fn, 'wavelengthNm', wavelengthNm, 200, 1100, 'nm', model, ex);
  if (!(wavelengthNm > 0)) rangeError(fn, 'wavelengthNm', wavelengthNm, 'a wavelength > 0 nm');
  checkValidity(fn, 'temperatureC', temperatureC, -12, 500, '°C', model, ex);
  if (!(temperatureC > -273.15)) rangeError(fn, 'temperatureC', temperatureC, 'above absolute zero (−273.15 °C)');
  let rho: number;
  if (o.densityKgM3 === undefined) {
    checkValidity(fn, 'temperatureC', temperatureC, 0, 40, '°C', 'the density formula of Tanaka et al. (2001), used when options.densityKgM3 is omitted', ex);
    rho = tanaka(temperatureC);
    if (!(rho > 0)) rangeError(fn, 'temperatureC', temperatureC, 'a temperature at which the density formula gives a positive density');
  } else {
    rho = checkValidity(fn, 'options.densityKgM3', o.densityKgM3, 0, 1060, 'kg/m³', model, ex);
    if (!(rho >= 0)) rangeError(fn, 'options.densityKgM3', rho, 'a density >= 0 kg/m³');
  }
  const n = iapws(wavelengthNm, temperatureC, rho);
  if (!(n >= 0)) rangeError(fn, 'wavelengthNm', wavelengthNm, 'a wavelength at which the formulation gives a real index');
  return n;
}

function iapws(wavelengthNm: number, temperatureC: number, rho: number): number {
  const Tb = (temperatureC + 273.15) / 273.15;
  const rb = rho / 1000;
  const lb = wavelengthNm / 1000 / 0.589;
  const l2 = lb * lb;
  const uv = 0.229202 * 0.229202;
  const ir = 5.432937 * 5.432937;
  const A =
    0.244257733 +
    9.74634476e-3 * rb -
    3.73234996e-3 * Tb +
    2.68678472e-4 * l2 * Tb +
    1.5892057e-3 / l2 +
    2.45934259e-3 / (l2 - uv) +
    0.90070492 / (l2 - ir) -
    1.66626219e-2 * rb * rb;
  const L = A * rb;
  const n2 = (1 + 2 * L) / (1 - L);
  return n2 >= 0 && Number.isFinite(n2) ? Math.sqrt(n2) : -1;
}

/** Options of {@link seawaterRefractiveIndex}. */
export interface SeawaterIndexOptions {
  /**
   * Evaluate outside the equation's validity range instead of refusing.
   * @defaultValue false
   */
  extrapolate?: boolean;
}

/** Validity ranges of {@link seawaterRefractiveIndex} (Quan & Fry 1995). */
export const SEAWATER_INDEX_RANGE = {
  wavelengthNm: [400, 700],
  temperatureC: [0, 30],
  salinityPsu: [0, 35],
} as const;

/**
 * Refractive index of sea water relative to air, by the empirical equation of Quan & Fry:
 * `n = n0 + (n1 + n2 T + n3 T²) S + n4 T² + (n5 + n6 S + n7 T)/λ + n8/λ² + n9/λ³`
 * (λ in nm, T in °C, S in ‰). At salinity 0 it describes pure water.
 *
 * The salinity is the one of the data the equation was fitted to, in parts per thousand,
 * which is practical salinity for present purposes (absolute salinity in g/kg is about
 * 1.0047 times larger).
 *
 * @param wavelengthNm - Wavelength, nm, in [400, 700] unless extrapolating.
 * @param temperatureC - Temperature, °C, in [0, 30] unless extrapolating.
 * @param salinityPsu - Salinity, ‰ (practical), in [0, 35] unless extrapolating.
 * @param options - See {@link SeawaterIndexOptions}.
 * @returns The refractive index relative to air ({@link vacuumRelativeIndex} converts it
 *   to one relative to vacuum).
 * @throws {@link core!MeniscusRangeError} when an input is not finite, outside its validity
 *   range without `options.extrapolate`, or a wavelength is not > 0.
 * @see Quan, X. & Fry, E. S. (1995), "Empirical equation for the index of refraction of
 *   seawater", Applied Optics 34(18), 3477–3480.
 * @example
 * ```ts
 * seawaterRefractiveIndex(589.3, 20, 35); // ≈ 1.339406
 * ```
 */
export function seawaterRefractiveIndex(
  wavelengthNm: number,
  temperatureC: number,
  salinityPsu: number,
  options?: SeawaterIndexOptions,
): number {
  const fn = 'seawaterRefractiveIndex';
  const o = checkOptions(fn, options);
  const ex = readExtrapolate(fn, o);
  const model = 'Quan & Fry (1995)';
  checkValidity(fn, 'wavelengthNm', wavelengthNm, 400, 700, 'nm', model, ex);
  checkPositive(fn, 'wavelengthNm', wavelengthNm);
  checkValidity(fn, 'temperatureC', temperatureC, 0, 30, '°C', model, ex);
  checkValidity(fn, 'salinityPsu', salinityPsu, 0, 35, '‰', model, ex);
  if (!(salinityPsu >= 0)) rangeError(fn, 'salinityPsu', salinityPsu, 'a salinity >= 0');
  const T = temperatureC;
  const S = salinityPsu;
  const l = wavelengthNm;
  return (
    1.31405 +
    (1.779e-4 - 1.05e-6 * T + 1.6e-8 * T * T) * S -
    2.02e-6 * T * T +
    (15.868 + 0.01155 * S - 0.00423 * T) / l -
    4382 / (l * l) +
    1.1455e6 / (l * l * l)
  );
}
