/**
 * Slope statistics against the Cox & Munk (1954) Gaussian model: histograms of the
 * slope components, the Gaussian densities, and an SVG comparing the two.
 *
 * Cox & Munk fitted the distribution of sea-surface slopes `(zu, zc)` along and across
 * the wind as a Gram–Charlier series whose leading term is the bivariate Gaussian
 * `p(zu, zc) = exp(−½(zu²/σu² + zc²/σc²)) / (2π σu σc)`. Only that Gaussian term is used
 * here; the mean-square slope formula as a function of wind speed lives in the waves area.
 *
 * @module
 */
import { checkRangePair, checkFinite, checkGrid, checkInteger, checkMask, checkOptions, checkPositive, checkSameShape, rangeError, typeError } from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';
import { esc, n2, toPx, xAxisSvg, yAxisSvg } from './internal-svg.js';
import type { Axis } from './internal-svg.js';
import { formatTick } from './ticks.js';

/**
 * The normal (Gaussian) probability density of a slope component.
 *
 * @param s - Slope value (unitless).
 * @param variance - Variance σ² (> 0).
 * @param mean - Mean. @defaultValue 0
 * @returns `exp(−(s − mean)²/(2σ²)) / √(2π σ²)`.
 * @throws {@link core!MeniscusRangeError} for a non-positive variance or non-finite input.
 * @see Cox, C. & Munk, W. (1954), "Measurement of the roughness of the sea surface from
 *   photographs of the sun's glitter", JOSA 44(11), 838–850: each marginal of the
 *   Gaussian term is a normal density.
 * @example
 * ```ts
 * gaussianSlopePdf(0, 0.02); // 2.8209…
 * ```
 */
export function gaussianSlopePdf(s: number, variance: number, mean = 0): number {
  const fn = 'gaussianSlopePdf';
  checkFinite(fn, 's', s);
  checkPositive(fn, 'variance', variance);
  checkFinite(fn, 'mean', mean);
  const d = s - mean;
  return Math.exp((-0.5 * d * d) / variance) / Math.sqrt(2 * Math.PI * variance);
}

/**
 * The bivariate Gaussian slope density of Cox & Munk's model (its leading term, without
 * the skewness and peakedness corrections).
 *
 * @param zu - Slope component along the wind (upwind axis).
 * @param zc - Slope component across the wind.
 * @param upwindVariance - σu² (> 0).
 * @param crosswindVariance - σc² (> 0).
 * @returns `exp(−½(zu²/σu² + zc²/σc²)) / (2π σu σc)`, per unit slope².
 * @throws {@link core!MeniscusRangeError} for non-positive variances or non-finite slopes.
 * @see Cox, C. & Munk, W. (1954), JOSA 44(11), 838–850, the Gram–Charlier expansion of
 *   the slope distribution (its Gaussian term).
 * @example
 * ```ts
 * coxMunkGaussianPdf(0, 0, 0.03, 0.02); // 1 / (2π √(0.03 · 0.02))
 * ```
 */
export function coxMunkGaussianPdf(zu: number, zc: number, upwindVariance: number, crosswindVariance: number): number {
  const fn = 'coxMunkGaussianPdf';
  checkFinite(fn, 'zu', zu);
  checkFinite(fn, 'zc', zc);
  checkPositive(fn, 'upwindVariance', upwindVariance);
  checkPositive(fn, 'crosswindVariance', crosswindVariance);
  const e = -0.5 * ((zu * zu) / upwindVariance + (zc * zc) / crosswindVariance);
  return Math.exp(e) / (2 * Math.PI * Math.sqrt(upwindVariance * crosswindVariance));
}

/** A histogram of slope values. */
export interface SlopeHistogram {
  /** `bins + 1` bin edges, ascending. */
  readonly edges: Float64Array;
  /** Samples per bin (the last bin includes its right edge). */
  readonly counts: Float64Array;
  /** Probability density per bin: `count / (n · binWidth)`, with `n` all valid samples. */
  readonly density: Float64Array;
  /** Valid samples counted (inside and outside the range). */
  readonly n: number;
  /** Valid samples outside the range. */
  readonly outside: number;
  /** Mean of the valid samples. */
  readonly mean: number;
  /** Variance of the valid samples about their mean (divided by n). */
  readonly variance: number;
}

/** Options for {@link slopeHistogram}. */
export interface SlopeHistogramOptions {
  /** Number of bins (1–10000). @defaultValue 41 */
  bins?: number;
  /** Histogram range. @defaultValue symmetric, ±(largest |value|) */
  range?: readonly [number, number];
  /** Validity mask (`1` valid) of the same length as the values. */
  mask?: Mask;
}

/**
 * Histogram a set of slope values, with their mean and variance.
 *
 * @param values - Slope values (finite where valid).
 * @param options - See {@link SlopeHistogramOptions}.
 * @returns The histogram.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a non-array, a
 *   mask of another length, non-finite valid values, no valid values, or a bad range.
 * @see Common practice: a density histogram `count / (n · width)` is comparable with a
 *   probability density.
 * @example
 * ```ts
 * const h = slopeHistogram(p.data, { bins: 51, range: [-0.5, 0.5] });
 * ```
 */
export function slopeHistogram(values: Float64Array | Float32Array, options?: SlopeHistogramOptions): SlopeHistogram {
  const fn = 'slopeHistogram';
  if (!(values instanceof Float64Array || values instanceof Float32Array)) typeError(fn, 'values', values, 'a Float64Array or Float32Array');
  const o = checkOptions(fn, options);
  const bins = o.bins === undefined ? 41 : checkInteger(fn, 'options.bins', o.bins, 1, 10000);
  const mask = o.mask;
  if (mask !== undefined && (!(mask instanceof Uint8Array) || mask.length !== values.length)) {
    typeError(fn, 'options.mask', mask, `a Uint8Array of length ${values.length}`);
  }
  let n = 0;
  let sum = 0;
  let maxAbs = 0;
  for (let k = 0; k < values.length; k++) {
    if (mask !== undefined && mask[k] === 0) continue;
    const v = values[k]!;
    if (!Number.isFinite(v)) rangeError(fn, `values[${k}]`, v, 'a finite slope (mask holes out)');
    n++;
    sum += v;
    maxAbs = Math.max(maxAbs, Math.abs(v));
  }
  if (n === 0) rangeError(fn, 'values', values, 'at least one valid value');
  const mean = sum / n;
  let ss = 0;
  for (let k = 0; k < values.length; k++) {
    if (mask !== undefined && mask[k] === 0) continue;
    const d = values[k]! - mean;
    ss += d * d;
  }
  let lo: number;
  let hi: number;
  if (o.range !== undefined) {
    [lo, hi] = checkRangePair(fn, 'options.range', o.range);
  } else {
    const m = maxAbs > 0 ? maxAbs : 1;
    lo = -m;
    hi = m;
  }
  const edges = new Float64Array(bins + 1);
  for (let b = 0; b <= bins; b++) edges[b] = lo + ((hi - lo) * b) / bins;
  const counts = new Float64Array(bins);
  let outside = 0;
  const scale = bins / (hi - lo);
  for (let k = 0; k < values.length; k++) {
    if (mask !== undefined && mask[k] === 0) continue;
    const v = values[k]!;
    if (v < lo || v > hi) {
      outside++;
      continue;
    }
    let b = Math.floor((v - lo) * scale);
    if (b >= bins) b = bins - 1;
    counts[b]!++;
  }
  const width = (hi - lo) / bins;
  const density = new Float64Array(bins);
  for (let b = 0; b < bins; b++) density[b] = counts[b]! / (n * width);
  return { edges, counts, density, n, outside, mean, variance: ss / n };
}

/** Options for {@link slopeHistogramSvg}. */
export interface SlopeHistogramSvgOptions {
  /** Validity mask (`1` valid). */
  mask?: Mask;
  /** Bins per panel. @defaultValue 41 */
  bins?: number;
  /** Model: total mean-square slope σ² = σu² + σc², split equally (isotropic). */
  meanSquareSlope?: number;
  /** Model: variance of the slope along the wind, σu². Give with `crosswindVariance`. */
  upwindVariance?: number;
  /** Model: variance of the slope across the wind, σc². Give with `upwindVariance`. */
  crosswindVariance?: number;
  /**
   * Direction the wind blows towards, radians counter-clockwise from +x (east): the
   * upwind axis of the model. @defaultValue 0
   */
  windDirection?: number;
  /** Half-width of the slope axis. @defaultValue 4 × the larger standard deviation (model or measured) */
  halfRange?: number;
  /** Width of the SVG in pixels. @defaultValue 720 */
  width?: number;
  /** Title above the panels. */
  title?: string;
}

/**
 * Compare a measured slope field with the Cox & Munk Gaussian slope distribution: two
 * panels (slope along and across the wind axis), each with the density histogram of the
 * measured slopes and the model's normal curve, and the measured and model variances.
 *
 * With no model given the curves are the normal densities of the measured variances.
 *
 * @param slopeX - Slope `p = ∂h/∂x` on a grid.
 * @param slopeY - Slope `q = ∂h/∂y` on the same grid.
 * @param options - See {@link SlopeHistogramSvgOptions}.
 * @returns A standalone SVG document.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for invalid grids,
 *   both `meanSquareSlope` and the variance pair, only one of the pair, or bad options.
 * @see Cox, C. & Munk, W. (1954), "Measurement of the roughness of the sea surface from
 *   photographs of the sun's glitter", JOSA 44(11), 838–850.
 * @example
 * ```ts
 * import { slopeHistogramSvg } from 'meniscus/viz';
 * const svg = slopeHistogramSvg(p, q, { upwindVariance: 0.016, crosswindVariance: 0.012 });
 * ```
 */
export function slopeHistogramSvg(slopeX: Grid, slopeY: Grid, options?: SlopeHistogramSvgOptions): string {
  const fn = 'slopeHistogramSvg';
  const o = checkOptions(fn, options);
  const mask = o.mask === undefined ? undefined : checkMask(fn, 'options.mask', o.mask, slopeX?.width, slopeX?.height);
  checkGrid(fn, 'slopeX', slopeX, mask !== undefined);
  checkGrid(fn, 'slopeY', slopeY, mask !== undefined);
  checkSameShape(fn, 'slopeY', slopeY, slopeX, false);
  const bins = o.bins === undefined ? 41 : checkInteger(fn, 'options.bins', o.bins, 1, 10000);
  const phi = o.windDirection === undefined ? 0 : checkFinite(fn, 'options.windDirection', o.windDirection);
  const svgW = o.width === undefined ? 720 : checkInteger(fn, 'options.width', o.width, 200, 20000);
  if (o.title !== undefined && typeof o.title !== 'string') typeError(fn, 'options.title', o.title, 'a string');
  let model: [number, number] | null = null;
  const hasPair = o.upwindVariance !== undefined || o.crosswindVariance !== undefined;
  if (o.meanSquareSlope !== undefined) {
    if (hasPair) rangeError(fn, 'options', 'meanSquareSlope and upwind/crosswind variances', 'either meanSquareSlope or the two variances, not both');
    const mss = checkPositive(fn, 'options.meanSquareSlope', o.meanSquareSlope);
    model = [mss / 2, mss / 2];
  } else if (hasPair) {
    if (o.upwindVariance === undefined || o.crosswindVariance === undefined) {
      rangeError(fn, 'options', 'one variance', 'both upwindVariance and crosswindVariance');
    }
    model = [checkPositive(fn, 'options.upwindVariance', o.upwindVariance), checkPositive(fn, 'options.crosswindVariance', o.crosswindVariance)];
  }

  // rotate into wind axes
  const n = slopeX.data.length;
  const zu = new Float64Array(n);
  const zc = new Float64Array(n);
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  for (let k = 0; k < n; k++) {
    if (mask !== undefined && mask[k] === 0) continue;
    const p = slopeX.data[k]!;
    const q = slopeY.data[k]!;
    zu[k] = p * c + q * s;
    zc[k] = -p * s + q * c;
  }
  const histOptions = mask === undefined ? {} : { mask };
  const mu = slopeHistogram(zu, histOptions);
  const mc = slopeHistogram(zc, histOptions);
  const sdMax = Math.sqrt(Math.max(mu.variance, mc.variance, model?.[0] ?? 0, model?.[1] ?? 0));
  const half = o.halfRange === undefined ? (sdMax > 0 ? 4 * sdMax : 1) : checkPositive(fn, 'options.halfRange', o.halfRange);
  const hu = slopeHistogram(zu, { ...histOptions, bins, range: [-half, half] });
  const hc = slopeHistogram(zc, { ...histOptions, bins, range: [-half, half] });

  const font = 12;
  const top = o.title === undefined ? 20 : 40;
  const panelGap = 40;
  const left = 60;
  const right = 16;
  const panelW = (svgW - left - right - panelGap) / 2;
  const panelH = Math.round(panelW * 0.7);
  const bottom = 96;
  const svgH = top + panelH + bottom;
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${svgW}" height="${svgH}" viewBox="0 0 ${svgW} ${svgH}" font-family="sans-serif" font-size="${font}">`);
  out.push(`<rect x="0" y="0" width="${svgW}" height="${svgH}" fill="#fff"/>`);
  if (o.title !== undefined) out.push(`<text x="${n2(svgW / 2)}" y="22" text-anchor="middle" font-size="${font + 2}">${esc(o.title)}</text>`);
  const panels: [string, SlopeHistogram, number, number | null][] = [
    ['slope along the wind axis', hu, hu.variance, model?.[0] ?? null],
    ['slope across the wind axis', hc, hc.variance, model?.[1] ?? null],
  ];
  panels.forEach(([label, h, measured, modelVar], idx) => {
    const curveVar = modelVar ?? measured;
    const px0 = left + idx * (panelW + panelGap);
    let ymax = 0;
    for (const d of h.density) ymax = Math.max(ymax, d);
    if (curveVar > 0) ymax = Math.max(ymax, 1 / Math.sqrt(2 * Math.PI * curveVar));
    if (!(ymax > 0)) ymax = 1;
    ymax *= 1.08;
    const ax: Axis = { lo: -half, hi: half, p0: px0, p1: px0 + panelW };
    const ay: Axis = { lo: 0, hi: ymax, p0: top + panelH, p1: top };
    const bars: string[] = [];
    for (let b = 0; b < h.counts.length; b++) {
      const d = h.density[b]!;
      if (!(d > 0)) continue;
      const x1 = toPx(ax, h.edges[b]!);
      const x2 = toPx(ax, h.edges[b + 1]!);
      const y = toPx(ay, d);
      bars.push(`M${n2(x1)} ${n2(top + panelH)}V${n2(y)}H${n2(x2)}V${n2(top + panelH)}Z`);
    }
    out.push(`<g class="panel">`);
    if (bars.length > 0) out.push(`<path class="bars" d="${bars.join('')}" fill="#9ecae1" stroke="#4f7fa8" stroke-width="0.5"/>`);
    if (curveVar > 0) {
      const pts: string[] = [];
      const m = 200;
      for (let t = 0; t <= m; t++) {
        const sv = -half + (2 * half * t) / m;
        const y = gaussianSlopePdf(sv, curveVar);
        pts.push(`${t === 0 ? 'M' : 'L'}${n2(toPx(ax, sv))} ${n2(toPx(ay, Math.min(y, ymax)))}`);
      }
      out.push(`<path class="model" d="${pts.join('')}" fill="none" stroke="#c0392b" stroke-width="1.6"/>`);
    }
    out.push(xAxisSvg(ax, top + panelH, 5, false, label, font));
    out.push(yAxisSvg(ay, px0, 4, false, idx === 0 ? 'probability density' : '', font));
    const ty = top + panelH + 58;
    out.push(`<text x="${n2(px0)}" y="${n2(ty)}">measured: n ${h.n}, variance ${esc(formatTick(measured, measured / 100 || 1))}${h.outside > 0 ? `, ${h.outside} outside` : ''}</text>`);
    out.push(
      `<text x="${n2(px0)}" y="${n2(ty + 16)}" fill="#c0392b">${modelVar === null ? 'Gaussian of the measured variance' : `Cox &amp; Munk Gaussian: variance ${esc(formatTick(modelVar, modelVar / 100))}`}</text>`,
    );
    out.push('</g>');
  });
  out.push('</svg>');
  return out.join('\n') + '\n';
}
