/**
 * Fresnel coefficients of a flat interface between two non-absorbing dielectrics, and the
 * special angles of such an interface (critical angle, Brewster angle, Snell's window).
 *
 * Angles are in radians, measured from the normal. `n1` is the index on the incident
 * side, `n2` on the far side.
 *
 * @module
 */
import { checkInRange, checkPositive, rangeError } from '../core/index.js';

/** Amplitude (field) coefficients of reflection and transmission. */
export interface FresnelAmplitudes {
  /** Reflection coefficient, s (TE) polarisation. */
  rs: number;
  /** Reflection coefficient, p (TM) polarisation. */
  rp: number;
  /** Transmission coefficient, s polarisation. */
  ts: number;
  /** Transmission coefficient, p polarisation. */
  tp: number;
}

/** A power fraction (reflectance or transmittance) for each polarisation. */
export interface FresnelPower {
  /** s (TE) polarisation, in [0, 1]. */
  s: number;
  /** p (TM) polarisation, in [0, 1]. */
  p: number;
  /** Unpolarised light: the mean of `s` and `p`, in [0, 1]. */
  unpolarized: number;
}

/**
 * The Fresnel amplitude coefficients from the cosines of the incidence and refraction
 * angles (both in [0, 1]; they must satisfy Snell's law for the result to be physical —
 * this is not checked).
 *
 * `rs = (n1 cos θi − n2 cos θt)/(n1 cos θi + n2 cos θt)`,
 * `rp = (n2 cos θi − n1 cos θt)/(n2 cos θi + n1 cos θt)`,
 * `ts = 2 n1 cos θi/(n1 cos θi + n2 cos θt)`, `tp = 2 n1 cos θi/(n2 cos θi + n1 cos θt)`.
 * With this sign convention `rp = −rs` at normal incidence.
 *
 * @param cosIncident - Cosine of the incidence angle, in [0, 1].
 * @param cosTransmitted - Cosine of the refraction angle, in [0, 1].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns The four amplitude coefficients. At grazing incidence onto a distinct medium
 *   (`cosIncident = 0`) the reflection coefficients are ∓1 and transmission is 0.
 * @throws {@link core!MeniscusRangeError} when a cosine is outside [0, 1] or both are 0, or
 *   an index is not a finite number > 0.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.2 (Fresnel formulae).
 * @example
 * ```ts
 * fresnelAmplitudesFromCosines(1, 1, 1, 1.333).rs; // (1 − 1.333)/(1 + 1.333) ≈ −0.1427
 * ```
 */
export function fresnelAmplitudesFromCosines(cosIncident: number, cosTransmitted: number, n1: number, n2: number): FresnelAmplitudes {
  const fn = 'fresnelAmplitudesFromCosines';
  checkInRange(fn, 'cosIncident', cosIncident, 0, 1);
  checkInRange(fn, 'cosTransmitted', cosTransmitted, 0, 1);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  if (cosIncident === 0 && cosTransmitted === 0) {
    rangeError(fn, 'cosTransmitted', cosTransmitted, 'not 0 when cosIncident is 0 (no such refraction)');
  }
  return amplitudes(cosIncident, cosTransmitted, n1, n2);
}

function amplitudes(ci: number, ct: number, n1: number, n2: number): FresnelAmplitudes {
  const ds = n1 * ci + n2 * ct;
  const dp = n2 * ci + n1 * ct;
  return {
    rs: (n1 * ci - n2 * ct) / ds,
    rp: (n2 * ci - n1 * ct) / dp,
    ts: (2 * n1 * ci) / ds,
    tp: (2 * n1 * ci) / dp,
  };
}

/** cos θt from cos θi by Snell's law, or -1 on total internal reflection. */
function cosTransmitted(ci: number, n1: number, n2: number): number {
  const eta = n1 / n2;
  const k = 1 - eta * eta * (1 - ci * ci);
  return k < 0 ? -1 : Math.sqrt(k);
}

/**
 * The Fresnel amplitude coefficients at an incidence angle.
 *
 * @param angle - Incidence angle from the normal, radians, in [0, π/2].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns The coefficients (sign convention of {@link fresnelAmplitudesFromCosines}), or
 *   `null` beyond the critical angle, where the reflection coefficients are complex of
 *   modulus 1 (total internal reflection; the reflectance is 1).
 * @throws {@link core!MeniscusRangeError} when the angle is outside [0, π/2] or an index is
 *   not a finite number > 0.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.2 (Fresnel formulae).
 * @example
 * ```ts
 * fresnelAmplitudes(0, 1, 1.333)!.ts; // 2/(1 + 1.333) ≈ 0.857
 * ```
 */
export function fresnelAmplitudes(angle: number, n1: number, n2: number): FresnelAmplitudes | null {
  const fn = 'fresnelAmplitudes';
  checkInRange(fn, 'angle', angle, 0, Math.PI / 2);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  const ci = Math.cos(Math.min(angle, Math.PI / 2));
  const ct = cosTransmitted(ci, n1, n2);
  if (ct < 0) return null;
  if (n1 === n2) return { rs: 0, rp: 0, ts: 1, tp: 1 };
  return amplitudes(Math.max(ci, 0), ct, n1, n2);
}

/** Reflectance from cos θi (already checked), TIR and grazing included. */
function reflectanceKernel(ci: number, n1: number, n2: number): FresnelPower {
  if (n1 === n2) return { s: 0, p: 0, unpolarized: 0 };
  const ct = cosTransmitted(ci, n1, n2);
  if (ct < 0 || ci <= 0) return { s: 1, p: 1, unpolarized: 1 };
  const a = amplitudes(ci, ct, n1, n2);
  const s = a.rs * a.rs;
  const p = a.rp * a.rp;
  return { s, p, unpolarized: 0.5 * (s + p) };
}

/** Transmittance from cos θi (already checked), from the transmission amplitudes. */
function transmittanceKernel(ci: number, n1: number, n2: number): FresnelPower {
  if (n1 === n2) return { s: 1, p: 1, unpolarized: 1 };
  const ct = cosTransmitted(ci, n1, n2);
  if (ct < 0 || ci <= 0) return { s: 0, p: 0, unpolarized: 0 };
  // T = (n2 cos θt)/(n1 cos θi) · t², written without dividing by cos θi
  const ds = n1 * ci + n2 * ct;
  const dp = n2 * ci + n1 * ct;
  const num = 4 * n1 * n2 * ci * ct;
  const s = num / (ds * ds);
  const p = num / (dp * dp);
  return { s, p, unpolarized: 0.5 * (s + p) };
}

/**
 * Fraction of the incident power reflected at an incidence angle (reflectance).
 * `Rs = rs²`, `Rp = rp²`, unpolarised `R = (Rs + Rp)/2`; 1 under total internal
 * reflection and at grazing incidence.
 *
 * @param angle - Incidence angle from the normal, radians, in [0, π/2].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns Reflectance for s, p and unpolarised light.
 * @throws {@link core!MeniscusRangeError} on an angle outside [0, π/2] or a bad index.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.3 (reflectivity and transmissivity).
 * @example
 * ```ts
 * fresnelReflectance(0, 1, 1.333).unpolarized; // ((1.333 − 1)/(1.333 + 1))² ≈ 0.02037
 * ```
 */
export function fresnelReflectance(angle: number, n1: number, n2: number): FresnelPower {
  const fn = 'fresnelReflectance';
  checkInRange(fn, 'angle', angle, 0, Math.PI / 2);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return reflectanceKernel(Math.max(Math.cos(angle), 0), n1, n2);
}

/**
 * Reflectance from the cosine of the incidence angle, as {@link fresnelReflectance}.
 *
 * @param cosIncident - Cosine of the incidence angle, in [0, 1].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns Reflectance for s, p and unpolarised light.
 * @throws {@link core!MeniscusRangeError} on a cosine outside [0, 1] or a bad index.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.3 (reflectivity and transmissivity).
 * @example
 * ```ts
 * fresnelReflectanceFromCosine(1, 1, 1.5).unpolarized; // 0.04
 * ```
 */
export function fresnelReflectanceFromCosine(cosIncident: number, n1: number, n2: number): FresnelPower {
  const fn = 'fresnelReflectanceFromCosine';
  checkInRange(fn, 'cosIncident', cosIncident, 0, 1);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return reflectanceKernel(cosIncident, n1, n2);
}

/**
 * Fraction of the incident power transmitted through the interface (transmittance),
 * computed from the transmission amplitudes as `T = (n2 cos θt)/(n1 cos θi) · t²` for
 * each polarisation (so that `R + T = 1` is a law, not a definition); 0 under total
 * internal reflection and at grazing incidence.
 *
 * @param angle - Incidence angle from the normal, radians, in [0, π/2].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns Transmittance for s, p and unpolarised light.
 * @throws {@link core!MeniscusRangeError} on an angle outside [0, π/2] or a bad index.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.3 (reflectivity and transmissivity).
 * @example
 * ```ts
 * fresnelTransmittance(0, 1, 1.333).unpolarized; // ≈ 0.97963
 * ```
 */
export function fresnelTransmittance(angle: number, n1: number, n2: number): FresnelPower {
  const fn = 'fresnelTransmittance';
  checkInRange(fn, 'angle', angle, 0, Math.PI / 2);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return transmittanceKernel(Math.max(Math.cos(angle), 0), n1, n2);
}

/**
 * Transmittance from the cosine of the incidence angle, as {@link fresnelTransmittance}.
 *
 * @param cosIncident - Cosine of the incidence angle, in [0, 1].
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns Transmittance for s, p and unpolarised light.
 * @throws {@link core!MeniscusRangeError} on a cosine outside [0, 1] or a bad index.
 * @see Born, M. & Wolf, E. (1999), "Principles of Optics", 7th ed., §1.5.3 (reflectivity and transmissivity).
 * @example
 * ```ts
 * fresnelTransmittanceFromCosine(1, 1, 1.5).unpolarized; // 0.96
 * ```
 */
export function fresnelTransmittanceFromCosine(cosIncident: number, n1: number, n2: number): FresnelPower {
  const fn = 'fresnelTransmittanceFromCosine';
  checkInRange(fn, 'cosIncident', cosIncident, 0, 1);
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return transmittanceKernel(cosIncident, n1, n2);
}

/**
 * The critical angle for total internal reflection, `asin(n2/n1)`, going from the denser
 * medium (`n1`) towards the rarer one (`n2`).
 *
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns The angle in radians, or `null` when `n1 ≤ n2` (no total internal reflection).
 * @throws {@link core!MeniscusRangeError} when an index is not a finite number > 0.
 * @see Snell's law at θt = 90°: Born, M. & Wolf, E. (1999), "Principles of Optics",
 *   7th ed., §1.5.4.
 * @example
 * ```ts
 * criticalAngle(1.333, 1)! * 180 / Math.PI; // ≈ 48.61
 * ```
 */
export function criticalAngle(n1: number, n2: number): number | null {
  const fn = 'criticalAngle';
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return n1 > n2 ? Math.asin(n2 / n1) : null;
}

/**
 * Brewster's angle, `atan(n2/n1)`: the incidence angle at which p-polarised light is not
 * reflected.
 *
 * @param n1 - Index on the incident side (> 0).
 * @param n2 - Index on the far side (> 0).
 * @returns The angle in radians, in (0, π/2).
 * @throws {@link core!MeniscusRangeError} when an index is not a finite number > 0.
 * @see Brewster, D. (1815), Phil. Trans. R. Soc. 105, 125; Born, M. & Wolf, E. (1999),
 *   "Principles of Optics", 7th ed., §1.5.3.
 * @example
 * ```ts
 * brewsterAngle(1, 1.333) * 180 / Math.PI; // ≈ 53.12
 * ```
 */
export function brewsterAngle(n1: number, n2: number): number {
  const fn = 'brewsterAngle';
  checkPositive(fn, 'n1', n1);
  checkPositive(fn, 'n2', n2);
  return Math.atan2(n2, n1);
}

/**
 * Half-angle of Snell's window: seen from inside the denser medium, the whole hemisphere
 * above a flat surface is squeezed into a cone of this half-angle about the normal,
 * `asin(nAbove/nBelow)` (the critical angle from below).
 *
 * @param nBelow - Index of the denser medium the observer is in, e.g. water (> nAbove).
 * @param nAbove - Index of the medium above. @defaultValue 1.000293 (air, visible)
 * @returns The half-angle in radians.
 * @throws {@link core!MeniscusRangeError} when an index is not a finite number > 0, or when
 *   `nBelow ≤ nAbove` (no window forms).
 * @see Snell's law at grazing incidence from above: Born, M. & Wolf, E. (1999), "Principles
 *   of Optics", 7th ed., §1.5.4 (total reflection).
 * @example
 * ```ts
 * snellWindowHalfAngle(1.333, 1) * 180 / Math.PI; // ≈ 48.61, a 97° cone
 * ```
 */
export function snellWindowHalfAngle(nBelow: number, nAbove = 1.000293): number {
  const fn = 'snellWindowHalfAngle';
  checkPositive(fn, 'nBelow', nBelow);
  checkPositive(fn, 'nAbove', nAbove);
  if (!(nBelow > nAbove)) rangeError(fn, 'nBelow', nBelow, `greater than nAbove (${nAbove}) for a window to form`);
  return Math.asin(nAbove / nBelow);
}
