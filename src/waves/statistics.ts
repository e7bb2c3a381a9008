/**
 * Statistics of a sea-surface field (significant height, slope variances, slope
 * histograms) and the Cox & Munk mean-square-slope model to compare them with.
 *
 * @module
 */
import { checkFinite, checkGrid, checkInteger, checkOneOf, checkOptions, checkNonNegative, checkSameShape, rangeError } from '../core/index.js';
import type { Grid } from '../core/index.js';

/**
 * Significant wave height of an elevation field, `Hs = 4 σ_h`, with `σ_h` the standard
 * deviation of the samples about their mean.
 *
 * @param height - Elevations, m.
 * @returns Hs, m.
 * @throws {@link core!MeniscusTypeError} when `height` is not a grid.
 * @throws {@link core!MeniscusRangeError} for non-finite samples.
 * @see Longuet-Higgins, M. S. (1952), "On the statistical distribution of the heights of
 *   sea waves", Journal of Marine Research 11(3), 245–266 (Hs ≈ 4√m0 for a narrow-band sea).
 * @example
 * ```ts
 * significantWaveHeight(frame.height);
 * ```
 */
export function significantWaveHeight(height: Grid): number {
  const g = checkGrid('significantWaveHeight', 'height', height);
  const d = g.data;
  let s = 0;
  for (let k = 0; k < d.length; k++) s += d[k]!;
  const mean = s / d.length;
  let v = 0;
  for (let k = 0; k < d.length; k++) {
    const e = d[k]! - mean;
    v += e * e;
  }
  return 4 * Math.sqrt(v / d.length);
}

/** Options of {@link slopeStatistics}. */
export interface SlopeStatisticsOptions {
  /** The mean (wind) direction, rad counter-clockwise from +x, for the along/across split. @defaultValue 0 */
  direction?: number;
}

/** Slope statistics of a field. */
export interface SlopeStatistics {
  /** Mean of `p`. */
  readonly meanX: number;
  /** Mean of `q`. */
  readonly meanY: number;
  /** Mean-square slope, the total slope variance `var(p) + var(q)`. */
  readonly meanSquareSlope: number;
  /** Variance of the slope along `direction` (upwind–downwind). */
  readonly meanSquareSlopeAlong: number;
  /** Variance of the slope across `direction` (crosswind). */
  readonly meanSquareSlopeAcross: number;
}

/**
 * Slope statistics of a field: means, and the variances of the slope along and across a
 * direction (their sum is the mean-square slope), as Cox & Munk report them.
 *
 * @param slopeX - `p = ∂h/∂x`.
 * @param slopeY - `q = ∂h/∂y`, the same size.
 * @param options - The direction of the along/across split.
 * @returns The statistics.
 * @throws {@link core!MeniscusTypeError} for mismatched grids.
 * @throws {@link core!MeniscusRangeError} for non-finite samples or direction.
 * @see Cox, C. & Munk, W. (1954), "Measurement of the roughness of the sea surface from
 *   photographs of the sun's glitter", Journal of the Optical Society of America 44(11),
 *   838–850 (upwind and crosswind slope variances).
 * @example
 * ```ts
 * slopeStatistics(frame.slopeX, frame.slopeY, { direction: 0 }).meanSquareSlope;
 * ```
 */
export function slopeStatistics(slopeX: Grid, slopeY: Grid, options?: SlopeStatisticsOptions): SlopeStatistics {
  const fn = 'slopeStatistics';
  const p = checkGrid(fn, 'slopeX', slopeX);
  const q = checkGrid(fn, 'slopeY', slopeY);
  checkSameShape(fn, 'slopeY', q, p, false);
  const o = checkOptions(fn, options);
  const dir = o.direction === undefined ? 0 : checkFinite(fn, 'options.direction', o.direction);
  const c = Math.cos(dir);
  const s = Math.sin(dir);
  const n = p.data.length;
  let sp = 0;
  let sq = 0;
  for (let k = 0; k < n; k++) {
    sp += p.data[k]!;
    sq += q.data[k]!;
  }
  const mp = sp / n;
  const mq = sq / n;
  let vp = 0;
  let vq = 0;
  let va = 0;
  for (let k = 0; k < n; k++) {
    const a = p.data[k]! - mp;
    const b = q.data[k]! - mq;
    vp += a * a;
    vq += b * b;
    const u = a * c + b * s;
    va += u * u;
  }
  const total = (vp + vq) / n;
  const along = va / n;
  return { meanX: mp, meanY: mq, meanSquareSlope: total, meanSquareSlopeAlong: along, meanSquareSlopeAcross: total - along };
}


/** Options of {@link coxMunkMeanSquareSlope}. */
export interface CoxMunkOptions {
  /** `'clean'` sea or `'slick'` (an oil film damping the short waves). @defaultValue 'clean' */
  surface?: 'clean' | 'slick';
}

/** Cox & Munk's slope variances at one wind speed. */
export interface CoxMunkSlopes {
  /** Total mean-square slope σ². */
  readonly total: number;
  /** Upwind–downwind slope variance σu². */
  readonly upwind: number;
  /** Crosswind slope variance σc². */
  readonly crosswind: number;
}

/**
 * The Cox & Munk (1954) linear fits of the sea-surface slope variances against wind
 * speed `U` at 12.5 m, from the sun's glitter:
 * clean `σ² = 0.003 + 5.12·10⁻³ U`, `σu² = 3.16·10⁻³ U`, `σc² = 0.003 + 1.92·10⁻³ U`;
 * slick `σ² = 0.008 + 1.56·10⁻³ U`, `σu² = 0.005 + 0.78·10⁻³ U`, `σc² = 0.003 + 0.84·10⁻³ U`.
 * (The fits were made separately, so `σu² + σc²` differs slightly from `σ²`.) Measured for
 * about 1–14 m/s; values outside that are extrapolations.
 *
 * @param windSpeed12_5 - Wind speed at 12.5 m above the sea, m/s (≥ 0).
 * @param options - Clean or slick surface.
 * @returns The total, upwind and crosswind variances.
 * @throws {@link core!MeniscusRangeError} for a negative or non-finite wind speed or an unknown surface.
 * @see Cox, C. & Munk, W. (1954), "Measurement of the roughness of the sea surface from
 *   photographs of the sun's glitter", Journal of the Optical Society of America 44(11),
 *   838–850; also "Statistics of the sea surface derived from sun glitter", Journal of
 *   Marine Research 13(2), 198–227 (1954).
 * @example
 * ```ts
 * coxMunkMeanSquareSlope(10).total; // 0.0542
 * ```
 */
export function coxMunkMeanSquareSlope(windSpeed12_5: number, options?: CoxMunkOptions): CoxMunkSlopes {
  const fn = 'coxMunkMeanSquareSlope';
  const u = checkNonNegative(fn, 'windSpeed12_5', windSpeed12_5);
  const o = checkOptions(fn, options);
  const surface = o.surface === undefined ? 'clean' : checkOneOf(fn, 'options.surface', o.surface, ['clean', 'slick'] as const);
  if (surface === 'clean') return { total: 0.003 + 5.12e-3 * u, upwind: 3.16e-3 * u, crosswind: 0.003 + 1.92e-3 * u };
  return { total: 0.008 + 1.56e-3 * u, upwind: 0.005 + 0.78e-3 * u, crosswind: 0.003 + 0.84e-3 * u };
}
