/**
 * The design calculator: before building a sensor, what its pitch, distances, aperture,
 * guide light and camera will measure, and plain-language warnings when a choice will
 * fail.
 *
 * @module
 */
import { checkFinite, checkFloat64Array, checkNonNegative, checkOneOf, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import type { MutableVec3 } from '../core/index.js';
import { refract } from '../optics/index.js';
import { normalFromSlopes } from '../optics/index.js';
import type { LatticeKind } from './lattice.js';

/** The sea the sensor is meant for. Give any of these; more gives a fuller budget. */
export interface ExpectedSea {
  /** The steepest slope magnitude to be measured (unitless). */
  maxSlope?: number;
  /** The shortest wavelength to be resolved, metres. */
  shortestWavelength?: number;
  /** Mean-square slope, both components together (`⟨p²⟩ + ⟨q²⟩`). */
  meanSquareSlope?: number;
  /** Standard deviations of the two slope components `[σp, σq]` (e.g. up- and cross-wind). */
  slopeStd?: readonly [number, number];
  /**
   * An omnidirectional wavenumber spectrum `F(k)`, m³, sampled at increasing `k` (rad/m):
   * its mean-square slope is `∫ k² F dk` and its shortest significant wavelength the one
   * below which 1 % of that slope variance lies.
   */
  spectrum?: { readonly k: Float64Array; readonly F: Float64Array };
  /** Significant wave height, metres (to check that troughs clear the mask). */
  significantWaveHeight?: number;
}

/** What {@link designSensor} needs. */
export interface SensorDesignInput {
  /** Lattice type. @defaultValue `'square'` */
  lattice?: LatticeKind;
  /** Aperture pitch, metres. */
  pitch: number;
  /** Aperture diameter, metres. */
  apertureDiameter: number;
  /** Lenslet focal length, metres (absent for pinholes). */
  focalLength?: number | null;
  /** Mask-to-plane distance, metres. */
  planeDistance: number;
  /** Mask depth below the mean water level, metres. */
  maskDepth: number;
  /** Angular radius of the guide light's source, radians (the sun ≈ 0.00465). */
  sourceAngularRadius: number;
  /** Zenith angle of the guide light, radians. @defaultValue 0 */
  sourceZenith?: number;
  /** Wavelength of the guide light in vacuum, nanometres. @defaultValue 550 */
  wavelengthNm?: number;
  /** Size of one camera pixel on the plane, metres. */
  pixelSize: number;
  /** Centroid precision, pixels RMS. @defaultValue 0.05 */
  centroidPrecision?: number;
  /** Blur of the diffuser on the plane, Gaussian σ, metres. @defaultValue 0 */
  diffuserBlur?: number;
  /** The expected sea. */
  sea?: ExpectedSea;
  /** Refractive index of air. @defaultValue 1.000293 */
  nAir?: number;
  /** Refractive index of water. @defaultValue 1.333 */
  nWater?: number;
}

/** The spot-diameter budget, metres on the plane. */
export interface SpotBudget {
  /** The source disc seen from the plane: `2 α_w L` (α_w the in-water angular radius). */
  readonly source: number;
  /** Diffraction: Airy first-zero diameter `2.44 λ_w L / D`. */
  readonly diffraction: number;
  /** The aperture's geometric shadow (pinhole: `D`; lenslet: the defocus disc `D |L − f| / f`). */
  readonly aperture: number;
  /** The diffuser blur as a diameter, `2.355 σ` (full width at half maximum). */
  readonly diffuser: number;
  /** Root-sum-square of the terms (common practice for a budget). */
  readonly total: number;
  /** `total` in camera pixels. */
  readonly totalPixels: number;
}

/** The result of {@link designSensor}. */
export interface SensorDesign {
  /** Spot diameter budget. */
  readonly spot: SpotBudget;
  /** Spot displacement on the plane per unit slope at rest, metres (the sensor's gain; worst azimuth). */
  readonly gain: number;
  /** Largest slope magnitude before a spot leaves its cell (pitch/2 − spot radius), worst azimuth. */
  readonly maxSlopeCell: number;
  /**
   * Largest slope magnitude that lattice-growing matching follows for the sea's shortest
   * wavelength (spots of neighbours must neither merge nor outrun the prediction); `null`
   * without a wavelength.
   */
  readonly maxSlopeGrowing: number | null;
  /** Largest slope difference between neighbouring apertures before their spots merge. */
  readonly maxSlopeDifference: number;
  /** Smallest resolvable slope: the slope that moves a spot by the centroid precision (worst azimuth). */
  readonly minSlope: number;
  /** Shortest wavelength sampled without aliasing: two samples per wavelength, `2 × pitch` (square) or `√3 × pitch` row spacing (hexagonal). */
  readonly shortestWave: number;
  /** The sea's steepest slope, its RMS slope and shortest wavelength as used here (null when not known). */
  readonly sea: { readonly maxSlope: number | null; readonly rmsSlope: number | null; readonly shortestWavelength: number | null };
  /** Fraction of the expected slope distribution within `maxSlopeCell` (null without a distribution). */
  readonly fractionInRange: number | null;
  /** Fraction within `maxSlopeGrowing` (null without a distribution or wavelength). */
  readonly fractionInRangeGrowing: number | null;
  /** Plain-language warnings; empty when nothing is expected to fail. */
  readonly warnings: readonly string[];
}

function displacement(slope: number, azimuth: number, zenith: number, nAir: number, nWater: number, L: number, t0: MutableVec3): number {
  const n = normalFromSlopes(slope * Math.cos(azimuth), slope * Math.sin(azimuth));
  const d: MutableVec3 = [-Math.sin(zenith), 0, -Math.cos(zenith)];
  const t = refract(d, n, nAir, nWater);
  if (t === null || !(t[2] < 0)) return Infinity;
  const dx = L * (t[0] / -t[2] - t0[0] / -t0[2]), dy = L * (t[1] / -t[2] - t0[1] / -t0[2]);
  return Math.hypot(dx, dy);
}

/** The slope at which the displacement reaches `target` along `azimuth` (bisection on a monotone range). */
function slopeFor(target: number, azimuth: number, zenith: number, nAir: number, nWater: number, L: number, t0: MutableVec3, sMax: number): number {
  let lo = 0, hi = sMax;
  if (displacement(hi, azimuth, zenith, nAir, nWater, L, t0) < target) return hi;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (displacement(mid, azimuth, zenith, nAir, nWater, L, t0) < target) lo = mid;
    else hi = mid;
    if (hi - lo < 1e-14 * Math.max(1, hi)) break;
  }
  return 0.5 * (lo + hi);
}

function erfApprox(x: number): number {
  // Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7).
  const s = x < 0 ? -1 : 1;
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

/** P(√(p² + q²) < r) for independent normal p, q with σp, σq. */
function fractionWithin(r: number, sp: number, sq: number): number {
  if (!(r > 0)) return 0;
  if (!(sp > 0) && !(sq > 0)) return 1;
  if (Math.abs(sp - sq) < 1e-12 * Math.max(sp, sq)) return 1 - Math.exp(-(r * r) / (2 * sp * sp));
  // Integrate over p: P = ∫ φ(p/σp)/σp · erf(√(r² − p²)/(σq√2)) dp on |p| < r.
  const N = 2000;
  let acc = 0;
  for (let i = 0; i < N; i++) {
    const p = -r + ((i + 0.5) * 2 * r) / N;
    const w = Math.exp(-(p * p) / (2 * sp * sp)) / (Math.sqrt(2 * Math.PI) * (sp || 1e-300));
    const half = Math.sqrt(Math.max(0, r * r - p * p));
    acc += w * (sq > 0 ? erfApprox(half / (sq * Math.SQRT2)) : 1);
  }
  return Math.min(1, (acc * 2 * r) / N);
}

/**
 * Work out what a slope-sensor design will measure.
 *
 * The spot budget adds the source disc (`2 α_w L`, α_w the source's angular radius after
 * refraction into water), diffraction (`2.44 λ_w L / D`), the aperture's shadow and the
 * diffuser in quadrature. The spot displacement for a slope is computed with the vector
 * Snell law at the tilted surface (no small-slope approximation), for 36 azimuths, the
 * worst one reported. The largest slope keeps the spot inside the inscribed circle of its
 * cell (radius pitch/2 minus the spot radius); the smallest moves it by the centroid
 * precision; two samples per wavelength bound the shortest wave. With a slope
 * distribution (Gaussian, from `meanSquareSlope`, `slopeStd` or `spectrum`) the fraction
 * of slopes in range follows.
 *
 * @param input - The design.
 * @returns Budget, limits, fractions and warnings.
 * @throws {@link core!MeniscusRangeError} for non-positive or non-finite sizes and distances,
 *   an aperture wider than the pitch, or a zenith angle outside [0, π/2).
 * @see Platt, B. C. & Shack, R. (2001), "History and principles of Shack–Hartmann
 *   wavefront sensing", J. Refractive Surgery 17, S573 (dynamic range and sensitivity);
 *   Born, M. & Wolf, E. (1999), Principles of Optics, §8.5.2 (Airy disc 2.44 λ N);
 *   Cox, C. & Munk, W. (1954), "Measurement of the roughness of the sea surface from
 *   photographs of the sun's glitter", JOSA 44(11), 838 (Gaussian slope statistics);
 *   Shannon, C. E. (1949), "Communication in the presence of noise", Proc. IRE 37, 10.
 * @example
 * ```ts
 * const d = designSensor({ pitch: 0.01, apertureDiameter: 0.001, planeDistance: 0.05, maskDepth: 0.3,
 *   sourceAngularRadius: 0.00465, pixelSize: 50e-6, sea: { maxSlope: 0.3, shortestWavelength: 0.05 } });
 * d.maxSlopeCell; d.warnings;
 * ```
 */
export function designSensor(input: SensorDesignInput): SensorDesign {
  const fn = 'designSensor';
  const o = checkOptions(fn, input, 'input');
  const lattice = o.lattice === undefined ? 'square' : checkOneOf(fn, 'input.lattice', o.lattice, ['square', 'hexagonal'] as const);
  const pitch = checkPositive(fn, 'input.pitch', o.pitch);
  const D = checkPositive(fn, 'input.apertureDiameter', o.apertureDiameter);
  if (!(D <= pitch)) rangeError(fn, 'input.apertureDiameter', D, `at most the pitch (${pitch} m)`);
  const f = o.focalLength === undefined || o.focalLength === null ? null : checkPositive(fn, 'input.focalLength', o.focalLength);
  if (typeof o.planeDistance !== 'number' || !(o.planeDistance > 0) || o.planeDistance === Infinity) {
    rangeError(fn, 'input.planeDistance', o.planeDistance, 'a distance > 0 m (the plane must lie below the mask)');
  }
  const L = o.planeDistance;
  if (typeof o.maskDepth !== 'number' || !(o.maskDepth > 0) || o.maskDepth === Infinity) {
    rangeError(fn, 'input.maskDepth', o.maskDepth, 'a depth below the mean water level > 0 m');
  }
  const depth = o.maskDepth;
  const alpha = checkNonNegative(fn, 'input.sourceAngularRadius', o.sourceAngularRadius);
  const zenith = o.sourceZenith === undefined ? 0 : checkFinite(fn, 'input.sourceZenith', o.sourceZenith);
  if (!(zenith >= 0 && zenith < Math.PI / 2)) rangeError(fn, 'input.sourceZenith', zenith, 'an angle in [0, π/2) radians');
  const lambda = (o.wavelengthNm === undefined ? 550 : checkPositive(fn, 'input.wavelengthNm', o.wavelengthNm)) * 1e-9;
  const px = checkPositive(fn, 'input.pixelSize', o.pixelSize);
  const sigmaC = o.centroidPrecision === undefined ? 0.05 : checkPositive(fn, 'input.centroidPrecision', o.centroidPrecision);
  const blur = o.diffuserBlur === undefined ? 0 : checkNonNegative(fn, 'input.diffuserBlur', o.diffuserBlur);
  const nAir = o.nAir === undefined ? 1.000293 : checkPositive(fn, 'input.nAir', o.nAir);
  const nWater = o.nWater === undefined ? 1.333 : checkPositive(fn, 'input.nWater', o.nWater);
  const sea = o.sea === undefined ? {} : checkOptions(fn, o.sea, 'input.sea');

  // ---- the spot budget
  const d0: MutableVec3 = [-Math.sin(zenith), 0, -Math.cos(zenith)];
  const t0 = refract(d0, [0, 0, 1], nAir, nWater);
  if (t0 === null) rangeError(fn, 'input.nAir', nAir, 'an index that lets the light into the water');
  const cosW = -t0[2];
  const path = L / cosW;
  const alphaW = alpha * (nAir / nWater) * Math.sqrt(Math.cos(zenith) / cosW);
  const lambdaW = lambda / nWater;
  const source = 2 * alphaW * path;
  const diffraction = (2.44 * lambdaW * (f ?? path)) / D;
  const aperture = f === null ? D : (D * Math.abs(path - f)) / f;
  const diffuser = 2.355 * blur;
  const total = Math.hypot(source, diffraction, aperture, diffuser);
  const spot: SpotBudget = { source, diffraction, aperture, diffuser, total, totalPixels: total / px };
  const rSpot = total / 2;

  // ---- slope limits (worst azimuth)
  const grazing = Math.tan(Math.PI / 2 - zenith) * 0.999;
  const az = Array.from({ length: 36 }, (_, i) => (i * 2 * Math.PI) / 36);
  const cellRoom = pitch / 2 - rSpot;
  let maxSlopeCell = 0;
  if (cellRoom > 0) {
    maxSlopeCell = Infinity;
    for (const a of az) maxSlopeCell = Math.min(maxSlopeCell, slopeFor(cellRoom, a, zenith, nAir, nWater, L, t0, grazing));
  }
  const res = sigmaC * px;
  let minSlope = 0;
  for (const a of az) minSlope = Math.max(minSlope, slopeFor(res, a, zenith, nAir, nWater, L, t0, grazing));
  const ds = 1e-4;
  let gain = 0;
  for (const a of az) gain = Math.max(gain, displacement(ds, a, zenith, nAir, nWater, L, t0) / ds);
  const maxSlopeDifference = Math.max(0, pitch - 2 * rSpot) / gain;

  // ---- the sea
  const warnings: string[] = [];
  let seaMax: number | null = sea.maxSlope === undefined ? null : checkNonNegative(fn, 'input.sea.maxSlope', sea.maxSlope);
  let shortest: number | null = sea.shortestWavelength === undefined ? null : checkPositive(fn, 'input.sea.shortestWavelength', sea.shortestWavelength);
  let sp: number | null = null, sq: number | null = null;
  if (sea.slopeStd !== undefined) {
    if (!Array.isArray(sea.slopeStd) || sea.slopeStd.length !== 2) typeError(fn, 'input.sea.slopeStd', sea.slopeStd, 'a pair [σp, σq]');
    sp = checkNonNegative(fn, 'input.sea.slopeStd[0]', sea.slopeStd[0]);
    sq = checkNonNegative(fn, 'input.sea.slopeStd[1]', sea.slopeStd[1]);
  } else if (sea.meanSquareSlope !== undefined) {
    const mss = checkNonNegative(fn, 'input.sea.meanSquareSlope', sea.meanSquareSlope);
    sp = sq = Math.sqrt(mss / 2);
  } else if (sea.spectrum !== undefined) {
    const k = checkFloat64Array(fn, 'input.sea.spectrum.k', sea.spectrum.k);
    const F = checkFloat64Array(fn, 'input.sea.spectrum.F', sea.spectrum.F, 1, k.length);
    if (k.length < 2) rangeError(fn, 'input.sea.spectrum.k', k, 'at least 2 wavenumbers');
    const cum = new Float64Array(k.length);
    for (let i = 1; i < k.length; i++) {
      if (!(k[i]! > k[i - 1]!)) rangeError(fn, `input.sea.spectrum.k[${i}]`, k[i], 'increasing wavenumbers');
      if (!(F[i]! >= 0) || !(F[i - 1]! >= 0)) rangeError(fn, `input.sea.spectrum.F[${i}]`, F[i], 'a finite value >= 0');
      cum[i] = cum[i - 1]! + 0.5 * (k[i]! - k[i - 1]!) * (k[i]! ** 2 * F[i]! + k[i - 1]! ** 2 * F[i - 1]!);
    }
    const mss = cum[k.length - 1]!;
    sp = sq = Math.sqrt(mss / 2);
    if (shortest === null && mss > 0) {
      let i = 0;
      while (i < k.length - 1 && cum[i]! < 0.99 * mss) i++;
      shortest = (2 * Math.PI) / k[i]!;
    }
  }
  const rms = sp !== null && sq !== null ? Math.hypot(sp, sq) : null;
  if (seaMax === null && rms !== null) seaMax = 3 * Math.max(sp!, sq!); // three standard deviations of the steeper component
  let maxSlopeGrowing: number | null = null;
  if (shortest !== null) {
    const k = (2 * Math.PI) / shortest;
    // Neighbours' spots must not merge (slope step s·k·pitch) and the prediction from the
    // two neighbours on a line (their mean, error s·k²·pitch²/2) must stay within a
    // quarter pitch, both times the gain.
    const merge = maxSlopeDifference / (k * pitch);
    const predict = (0.25 * pitch) / (0.5 * gain * k * k * pitch * pitch);
    maxSlopeGrowing = Math.min(merge, predict, grazing);
  }
  const fractionInRange = sp !== null && sq !== null ? fractionWithin(maxSlopeCell, sp, sq) : null;
  const fractionInRangeGrowing = sp !== null && sq !== null && maxSlopeGrowing !== null ? fractionWithin(maxSlopeGrowing, sp, sq) : null;
  const shortestWave = lattice === 'square' ? 2 * pitch : Math.sqrt(3) * pitch;

  // ---- warnings
  const fmt = (v: number, d = 3): string => (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e4 ? v.toPrecision(d) : v.toExponential(d - 1));
  if (total >= pitch) {
    warnings.push(`Spots (${fmt(total * 1e3)} mm across) are wider than the pitch (${fmt(pitch * 1e3)} mm): neighbouring spots overlap even on calm water. Use a larger pitch, a smaller source or a shorter mask-to-plane distance.`);
  } else if (total > pitch / 2) {
    warnings.push(`Spots fill ${((100 * total) / pitch).toFixed(0)} % of the pitch: little room is left for them to move before they leave their cells.`);
  }
  if (spot.totalPixels < 3) {
    warnings.push(`Spots span only ${fmt(spot.totalPixels, 2)} pixels: centroids will be pulled towards pixel centres (pixel locking). Magnify the plane or add a little blur.`);
  }
  if (diffraction > 2 * Math.max(source, aperture) && f === null) {
    warnings.push(`Diffraction dominates the spot (${fmt(diffraction * 1e3)} mm against a ${fmt(D * 1e3)} mm pinhole): a wider pinhole would give a smaller spot.`);
  }
  if (seaMax !== null && seaMax > maxSlopeCell) {
    warnings.push(`The steepest expected slopes (${fmt(seaMax)}) move spots out of their cells (limit ${fmt(maxSlopeCell)}): nearest-cell matching will fail; use lattice-growing matching or shorten the mask-to-plane distance.`);
  }
  if (seaMax !== null && maxSlopeGrowing !== null && seaMax > maxSlopeGrowing) {
    warnings.push(`Even lattice-growing matching cannot follow the expected sea: slopes of ${fmt(seaMax)} on waves of ${fmt(shortest! * 100)} cm make neighbouring spots cross or outrun the prediction (limit ${fmt(maxSlopeGrowing)}). Shorten the mask-to-plane distance or reduce the pitch.`);
  }
  if (shortest !== null && shortest < shortestWave) {
    warnings.push(`Waves as short as ${fmt(shortest * 100)} cm are expected, but the pitch samples waves only down to ${fmt(shortestWave * 100)} cm: shorter ones will be aliased into false longer waves. Reduce the pitch.`);
  }
  if (fractionInRange !== null && fractionInRange < 0.99) {
    warnings.push(`${(100 * (1 - fractionInRange)).toFixed(1)} % of the expected slopes fall outside the nearest-cell range${fractionInRangeGrowing !== null ? ` (${(100 * (1 - fractionInRangeGrowing)).toFixed(1)} % outside the lattice-growing range)` : ''}.`);
  }
  if (rms !== null && rms > 0 && minSlope > 0.1 * rms) {
    warnings.push(`The smallest resolvable slope (${fmt(minSlope)}) is more than a tenth of the RMS slope (${fmt(rms)}): the measurement will be noisy. Lengthen the mask-to-plane distance or improve the centroid precision.`);
  }
  if (sea.significantWaveHeight !== undefined) {
    const hs = checkNonNegative(fn, 'input.sea.significantWaveHeight', sea.significantWaveHeight);
    if (depth < hs) {
      warnings.push(`The mask lies ${fmt(depth * 100)} cm below the mean level but significant waves are ${fmt(hs * 100)} cm high: deep troughs will uncover it. Lower the sensor.`);
    }
  }
  return {
    spot,
    gain,
    maxSlopeCell,
    maxSlopeGrowing,
    maxSlopeDifference,
    minSlope,
    shortestWave,
    sea: { maxSlope: seaMax, rmsSlope: rms, shortestWavelength: shortest },
    fractionInRange,
    fractionInRangeGrowing,
    warnings,
  };
}

/**
 * The design as printable text, one quantity a line, then the warnings.
 *
 * @param d - A design from {@link designSensor}.
 * @returns Lines of text joined by newlines.
 * @example
 * ```ts
 * console.log(formatSensorDesign(designSensor(input)));
 * ```
 */
export function formatSensorDesign(d: SensorDesign): string {
  if (d === null || typeof d !== 'object' || d.spot === null || typeof d.spot !== 'object' || typeof d.spot.totalPixels !== 'number') {
    typeError('formatSensorDesign', 'd', d, 'a SensorDesign from designSensor');
  }
  const mm = (v: number): string => `${(v * 1e3).toFixed(3)} mm`;
  const s = (v: number | null): string => (v === null ? 'n/a' : Number.isFinite(v) ? v.toPrecision(4) : 'unbounded');
  const pct = (v: number | null): string => (v === null ? 'n/a' : `${(100 * v).toFixed(2)} %`);
  const lines = [
    `spot diameter       ${mm(d.spot.total)} (${d.spot.totalPixels.toFixed(1)} px): source ${mm(d.spot.source)}, diffraction ${mm(d.spot.diffraction)}, aperture ${mm(d.spot.aperture)}, diffuser ${mm(d.spot.diffuser)}`,
    `gain                ${mm(d.gain)} of spot shift per unit slope`,
    `largest slope       ${s(d.maxSlopeCell)} (nearest cell), ${s(d.maxSlopeGrowing)} (lattice growing)`,
    `neighbour step      ${s(d.maxSlopeDifference)} largest slope difference between neighbours`,
    `smallest slope      ${s(d.minSlope)}`,
    `shortest wave       ${(d.shortestWave * 100).toFixed(2)} cm without aliasing`,
    `expected sea        max slope ${s(d.sea.maxSlope)}, RMS slope ${s(d.sea.rmsSlope)}, shortest wave ${d.sea.shortestWavelength === null ? 'n/a' : `${(d.sea.shortestWavelength * 100).toFixed(2)} cm`}`,
    `slopes in range     ${pct(d.fractionInRange)} (nearest cell), ${pct(d.fractionInRangeGrowing)} (lattice growing)`,
  ];
  if (d.warnings.length === 0) lines.push('warnings            none');
  else for (const w of d.warnings) lines.push(`warning: ${w}`);
  return lines.join('\n');
}
