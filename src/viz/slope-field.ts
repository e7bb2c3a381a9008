/**
 * Slope fields as SVG vector plots: an arrow per subsampled grid point along the
 * gradient `(p, q) = (∂h/∂x, ∂h/∂y)`, axes in metres with y up, and a legend arrow.
 *
 * @module
 */
import { checkGrid, checkInteger, checkMask, checkOptions, checkPositive, checkSameShape, rangeError, typeError } from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';
import { esc, n2, toPx, xAxisSvg, yAxisSvg } from './internal-svg.js';
import type { Axis } from './internal-svg.js';
import { formatTick, niceNumber } from './ticks.js';

/** Options for {@link slopeFieldSvg}. */
export interface SlopeFieldOptions {
  /** Validity mask (`1` valid); masked samples get no arrow and may hold NaN. */
  mask?: Mask;
  /** Draw every `step`-th sample along each axis. @defaultValue `ceil(max(width, height) / 24)` */
  step?: number;
  /**
   * Arrow length in metres per unit slope. @defaultValue such that the longest drawn
   * arrow spans 0.9 of the spacing between arrows
   */
  arrowScale?: number;
  /** Slope shown by the legend arrow. @defaultValue a nice number near half the largest drawn slope */
  legendSlope?: number;
  /** Width of the SVG in pixels (the height follows from the grid's aspect). @defaultValue 640 */
  width?: number;
  /** Title above the plot. @defaultValue none */
  title?: string;
  /** Arrow colour (any SVG colour). @defaultValue '#1b2a49' */
  color?: string;
}

/**
 * Draw a slope field as an SVG string.
 *
 * Arrows start at the sample position and point along `(p, q)`, uphill; the plot has
 * x to the right and y up (east and north in the world frame), both in metres with an SI
 * prefix chosen for the extent.
 *
 * @param slopeX - Slope `p = ∂h/∂x` (unitless) on a grid.
 * @param slopeY - Slope `q = ∂h/∂y` on the same grid.
 * @param options - See {@link SlopeFieldOptions}.
 * @returns A standalone SVG document.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for invalid grids or
 *   grids of different geometry, a bad mask, or bad options.
 * @example
 * ```ts
 * import { slopeFieldSvg } from 'meniscus/viz';
 * const svg = slopeFieldSvg(p, q, { title: 'Invented wave tank, frame 12' });
 * ```
 */
export function slopeFieldSvg(slopeX: Grid, slopeY: Grid, options?: SlopeFieldOptions): string {
  const fn = 'slopeFieldSvg';
  const o = checkOptions(fn, options);
  const mask = o.mask === undefined ? undefined : checkMask(fn, 'options.mask', o.mask, slopeX?.width, slopeX?.height);
  checkGrid(fn, 'slopeX', slopeX, mask !== undefined);
  checkGrid(fn, 'slopeY', slopeY, mask !== undefined);
  checkSameShape(fn, 'slopeY', slopeY, slopeX);
  const { width: gw, height: gh, dx, dy, x0, y0 } = slopeX;
  const step = o.step === undefined ? Math.max(1, Math.ceil(Math.max(gw, gh) / 24)) : checkInteger(fn, 'options.step', o.step, 1, 65536);
  const svgW = o.width === undefined ? 640 : checkInteger(fn, 'options.width', o.width, 100, 20000);
  const color = o.color === undefined ? '#1b2a49' : o.color;
  if (typeof color !== 'string') typeError(fn, 'options.color', color, 'an SVG colour string');
  if (o.title !== undefined && typeof o.title !== 'string') typeError(fn, 'options.title', o.title, 'a string');

  // the arrows to draw
  const P = slopeX.data;
  const Q = slopeY.data;
  const pts: number[] = [];
  let maxMag = 0;
  for (let j = 0; j < gh; j += step) {
    for (let i = 0; i < gw; i += step) {
      const k = j * gw + i;
      if (mask !== undefined && mask[k] === 0) continue;
      const p = P[k]!;
      const q = Q[k]!;
      if (!Number.isFinite(p) || !Number.isFinite(q)) rangeError(fn, `slopeX/slopeY at sample ${k}`, [p, q], 'finite slopes where the mask is 1');
      pts.push(x0 + i * dx, y0 + j * dy, p, q);
      maxMag = Math.max(maxMag, Math.hypot(p, q));
    }
  }
  const spacing = step * Math.min(dx, dy);
  const arrowScale = o.arrowScale === undefined ? (maxMag > 0 ? (0.9 * spacing) / maxMag : 1) : checkPositive(fn, 'options.arrowScale', o.arrowScale);
  const legendSlope =
    o.legendSlope === undefined ? (maxMag > 0 ? niceNumber(maxMag / 2) : 0.01) : checkPositive(fn, 'options.legendSlope', o.legendSlope);

  // layout
  const font = 12;
  const left = 70;
  const right = 20;
  const top = o.title === undefined ? 16 : 36;
  const bottom = 78;
  const xlo = x0 - spacing / 2;
  const xhi = x0 + (gw - 1) * dx + spacing / 2;
  const ylo = y0 - spacing / 2;
  const yhi = y0 + (gh - 1) * dy + spacing / 2;
  const plotW = svgW - left - right;
  const k = plotW / (xhi - xlo); // pixels per metre, equal on both axes
  const plotH = Math.max(40, (yhi - ylo) * k);
  const svgH = Math.ceil(top + plotH + bottom);
  const ax: Axis = { lo: xlo, hi: xhi, p0: left, p1: left + plotW };
  const ay: Axis = { lo: ylo, hi: yhi, p0: top + plotH, p1: top }; // y up

  const shafts: string[] = [];
  const heads: string[] = [];
  const arrow = (sx: number, sy: number, vx: number, vy: number) => {
    const len = Math.hypot(vx, vy);
    if (!(len > 0.25)) {
      heads.push(`M${n2(sx - 0.8)} ${n2(sy)}h1.6`);
      return;
    }
    const ex = sx + vx;
    const ey = sy + vy;
    shafts.push(`M${n2(sx)} ${n2(sy)}L${n2(ex)} ${n2(ey)}`);
    const h = Math.min(0.35 * len, 7);
    const ux = vx / len;
    const uy = vy / len;
    const bx = ex - ux * h;
    const by = ey - uy * h;
    const w = h * 0.45;
    heads.push(`M${n2(ex)} ${n2(ey)}L${n2(bx - uy * w)} ${n2(by + ux * w)}L${n2(bx + uy * w)} ${n2(by - ux * w)}Z`);
  };
  for (let a = 0; a < pts.length; a += 4) {
    const sx = toPx(ax, pts[a]!);
    const sy = toPx(ay, pts[a + 1]!);
    arrow(sx, sy, pts[a + 2]! * arrowScale * k, -pts[a + 3]! * arrowScale * k);
  }
  // legend arrow, bottom right
  const legendLen = legendSlope * arrowScale * k;
  const lyPx = top + plotH + 62;
  const lxPx = left + plotW - legendLen - 4;
  const legendStart = shafts.length;
  arrow(lxPx, lyPx, legendLen, 0);
  const legendShaft = shafts.splice(legendStart).join('');
  const legendHead = heads.splice(heads.length - 1).join('');

  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${svgW}" height="${svgH}" viewBox="0 0 ${svgW} ${svgH}" font-family="sans-serif" font-size="${font}">`);
  out.push(`<rect x="0" y="0" width="${svgW}" height="${svgH}" fill="#fff"/>`);
  if (o.title !== undefined) out.push(`<text x="${n2(left + plotW / 2)}" y="22" text-anchor="middle" font-size="${font + 2}">${esc(o.title)}</text>`);
  out.push(`<rect x="${n2(left)}" y="${n2(top)}" width="${n2(plotW)}" height="${n2(plotH)}" fill="none" stroke="#999" stroke-width="0.5"/>`);
  out.push(`<g class="arrows" stroke="${esc(color)}" fill="${esc(color)}" stroke-width="1.2">`);
  if (shafts.length > 0) out.push(`<path fill="none" d="${shafts.join('')}"/>`);
  if (heads.length > 0) out.push(`<path stroke="none" d="${heads.join('')}"/>`);
  out.push('</g>');
  out.push(xAxisSvg(ax, top + plotH, 6, true, 'x', font));
  out.push(yAxisSvg(ay, left, Math.max(3, Math.min(8, Math.round(plotH / 60))), true, 'y', font));
  out.push(`<g class="legend" stroke="${esc(color)}" fill="${esc(color)}" stroke-width="1.2">`);
  if (legendShaft !== '') out.push(`<path fill="none" d="${legendShaft}"/>`);
  out.push(`<path stroke="none" d="${legendHead}"/>`);
  out.push('</g>');
  out.push(`<text x="${n2(lxPx - 6)}" y="${n2(lyPx + 4)}" text-anchor="end">slope ${esc(formatTick(legendSlope))}</text>`);
  out.push(`<text x="${n2(left)}" y="${n2(lyPx + 4)}" fill="#555">arrows: every ${step} sample${step > 1 ? 's' : ''}, ${pts.length / 4} drawn</text>`);
  out.push('</svg>');
  return out.join('\n') + '\n';
}
