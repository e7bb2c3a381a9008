/**
 * Colour-mapped pictures of grids (height maps, error maps) as `Image`s, with an
 * optional colour bar (ticks and digit labels) and a length scale bar.
 *
 * The images hold linear RGB like every `Image` in the library; write them with the sRGB
 * transfer (`writePng(path, image, { transfer: 'srgb' })` in `meniscus/node`) and the file
 * holds exactly the colour map's sRGB colours.
 *
 * @module
 */
import { checkRangePair, checkBoolean, checkGrid, checkInteger, checkMask, checkOneOf, checkOptions, createImage, rangeError, typeError } from '../core/index.js';
import type { Grid, Image, Mask } from '../core/index.js';
import { COLORMAP_NAMES, getColormap } from './colormap.js';
import type { ColormapName } from './colormap.js';
import { GLYPH_HEIGHT, drawText, fillRect, indexOf, linearRgb, textWidth } from './internal.js';
import type { Rgb } from './internal.js';
import { formatTick, lengthUnit, niceNumber, niceTicks } from './ticks.js';

/** An 8-bit sRGB colour `[r, g, b]`, 0–255 each. */
export type Rgb8 = readonly [number, number, number];

/** Options for {@link colorizeGrid}. */
export interface ColorizeOptions {
  /** Colour map. @defaultValue 'viridis' */
  colormap?: ColormapName;
  /** Value range mapped onto the colour map; values outside get the end colours. @defaultValue the valid samples' min and max */
  range?: readonly [number, number];
  /** Make the range symmetric about zero: `[−m, m]` with `m` the largest |value| (ignored with `range`). @defaultValue false */
  symmetric?: boolean;
  /** Validity mask (`1` valid); holes are drawn in `maskColor` and may hold NaN. */
  mask?: Mask;
  /** Colour of holes, 8-bit sRGB. @defaultValue [160, 160, 160] */
  maskColor?: Rgb8;
  /** Pixels per sample along each axis (an integer ≥ 1). @defaultValue 1 */
  pixelSize?: number;
  /** Draw with y increasing upwards (north up): the grid's last row at the top. @defaultValue true */
  yUp?: boolean;
}

/** A colour-mapped grid as an image, with the range that was used. */
export interface ColorizedGrid {
  /** The picture: RGB, linear light, `width·pixelSize × height·pixelSize`. */
  readonly image: Image;
  /** The value range mapped onto the colour map. */
  readonly range: readonly [number, number];
  /** Valid samples outside `range` (drawn with the end colours). */
  readonly clipped: number;
}

interface Resolved {
  map: ReturnType<typeof getColormap>;
  lo: number;
  hi: number;
  mask: Mask | undefined;
  maskColor: Rgb;
  px: number;
  yUp: boolean;
}

function colour8(fn: string, parameter: string, c: unknown): Rgb {
  if (!Array.isArray(c) || c.length !== 3) typeError(fn, parameter, c, 'an [r, g, b] array of 0–255');
  for (let k = 0; k < 3; k++) checkInteger(fn, `${parameter}[${k}]`, c[k], 0, 255);
  return linearRgb(c[0], c[1], c[2]);
}

function resolve(fn: string, grid: Grid, o: ColorizeOptions, defaultMap: ColormapName, defaultSymmetric: boolean): Resolved {
  const mask = o.mask === undefined ? undefined : checkMask(fn, 'options.mask', o.mask, grid?.width, grid?.height);
  checkGrid(fn, 'grid', grid, mask !== undefined);
  const name = o.colormap === undefined ? defaultMap : checkOneOf(fn, 'options.colormap', o.colormap, COLORMAP_NAMES);
  const px = o.pixelSize === undefined ? 1 : checkInteger(fn, 'options.pixelSize', o.pixelSize, 1, 64);
  const yUp = o.yUp === undefined ? true : checkBoolean(fn, 'options.yUp', o.yUp);
  const symmetric = o.symmetric === undefined ? defaultSymmetric : checkBoolean(fn, 'options.symmetric', o.symmetric);
  const maskColor = o.maskColor === undefined ? linearRgb(160, 160, 160) : colour8(fn, 'options.maskColor', o.maskColor);
  const d = grid.data;
  if (mask !== undefined) {
    for (let k = 0; k < d.length; k++) if (mask[k] === 1 && !Number.isFinite(d[k]!)) rangeError(fn, `grid.data[${k}]`, d[k], 'a finite value where the mask is 1');
  }
  let lo: number;
  let hi: number;
  if (o.range !== undefined) {
    [lo, hi] = checkRangePair(fn, 'options.range', o.range);
  } else {
    lo = Infinity;
    hi = -Infinity;
    for (let k = 0; k < d.length; k++) {
      if (mask !== undefined && mask[k] === 0) continue;
      const v = d[k]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (lo === Infinity) {
      lo = -1;
      hi = 1;
    }
    if (symmetric) {
      const m = Math.max(Math.abs(lo), Math.abs(hi));
      lo = -m;
      hi = m;
    }
    if (!(hi > lo)) {
      // a constant field: centre it in a small range of its own size (or ±1 about 0)
      const half = Math.abs(lo) > 0 ? Math.abs(lo) * 0.05 : 1;
      lo -= half;
      hi += half;
    }
  }
  return { map: getColormap(name), lo, hi, mask, maskColor, px, yUp };
}

function paint(grid: Grid, r: Resolved, out: Image, ox: number, oy: number): number {
  const { width, height, data } = grid;
  const { map, lo, hi, mask, maskColor, px, yUp } = r;
  const lut = map.linear;
  const size = map.size;
  const inv = 1 / (hi - lo);
  const ow = out.width;
  const od = out.data;
  let clipped = 0;
  for (let j = 0; j < height; j++) {
    const row = yUp ? height - 1 - j : j;
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      let c0: number;
      let c1: number;
      let c2: number;
      if (mask !== undefined && mask[k] === 0) {
        c0 = maskColor[0];
        c1 = maskColor[1];
        c2 = maskColor[2];
      } else {
        const v = data[k]!;
        if (v < lo || v > hi) clipped++;
        const e = indexOf(size, (v - lo) * inv) * 3;
        c0 = lut[e]!;
        c1 = lut[e + 1]!;
        c2 = lut[e + 2]!;
      }
      for (let a = 0; a < px; a++) {
        let q = ((oy + row * px + a) * ow + ox + i * px) * 3;
        for (let b = 0; b < px; b++) {
          od[q] = c0;
          od[q + 1] = c1;
          od[q + 2] = c2;
          q += 3;
        }
      }
    }
  }
  return clipped;
}

/**
 * Colour-map a grid: one `pixelSize × pixelSize` block per sample.
 *
 * @param grid - The field (heights in metres, errors, slopes, …). Samples must be finite
 *   unless a mask marks them as holes.
 * @param options - See {@link ColorizeOptions}.
 * @returns The image and the range used.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for an invalid grid,
 *   mask or options.
 * @see van der Walt & Smith (2015), "A better default colormap for Matplotlib", SciPy
 *   2015 (viridis, the default map).
 * @example
 * ```ts
 * const { image } = colorizeGrid(height, { pixelSize: 4 });
 * ```
 */
export function colorizeGrid(grid: Grid, options?: ColorizeOptions): ColorizedGrid {
  const fn = 'colorizeGrid';
  const o = checkOptions(fn, options);
  const r = resolve(fn, grid, o, 'viridis', false);
  const image = createImage(grid.width * r.px, grid.height * r.px, 3);
  const clipped = paint(grid, r, image, 0, 0);
  return { image, range: [r.lo, r.hi], clipped };
}

/** Options for {@link heightMapImage} and {@link errorMapImage}. */
export interface MapImageOptions extends ColorizeOptions {
  /** Draw a colour bar with ticks to the right. @defaultValue true */
  colorBar?: boolean;
  /** Draw digit labels (and a units caption) beside the colour bar's ticks. @defaultValue true */
  labels?: boolean;
  /** Draw a length scale bar under the map (from `grid.dx`). @defaultValue true */
  scaleBar?: boolean;
  /**
   * Units of the values. `'m'` labels the colour bar in a suitable SI prefix (mm, µm,
   * …) with the prefix as its caption; other units label the raw values and are used as
   * the caption (empty for none). @defaultValue 'm'
   */
  units?: string;
  /** Size of the bitmap digits and of the decorations, an integer ≥ 1. @defaultValue 2 */
  fontScale?: number;
  /** Background colour, 8-bit sRGB. @defaultValue [255, 255, 255] */
  background?: Rgb8;
  /** Colour of ticks, text and the scale bar, 8-bit sRGB. @defaultValue [0, 0, 0] */
  foreground?: Rgb8;
}

/** A decorated map picture and what its decorations say. */
export interface MapImage {
  /** The picture: RGB, linear light. */
  readonly image: Image;
  /** The value range of the colour bar. */
  readonly range: readonly [number, number];
  /** Valid samples outside `range`. */
  readonly clipped: number;
  /** Colour-bar tick values (in the grid's units). */
  readonly ticks: readonly number[];
  /** Caption under the colour bar (e.g. `"mm"`). */
  readonly caption: string;
  /** Length of the scale bar in metres and its label, or `null` when none was drawn. */
  readonly scaleBar: { readonly metres: number; readonly pixels: number; readonly label: string } | null;
  /** Where the map sits in the picture: top-left pixel and size. */
  readonly mapRect: { readonly x: number; readonly y: number; readonly width: number; readonly height: number };
}

function decorated(fn: string, grid: Grid, options: MapImageOptions | undefined, defaultMap: ColormapName, defaultSymmetric: boolean): MapImage {
  const o = checkOptions(fn, options);
  const r = resolve(fn, grid, o, defaultMap, defaultSymmetric);
  const colorBar = o.colorBar === undefined ? true : checkBoolean(fn, 'options.colorBar', o.colorBar);
  const labels = o.labels === undefined ? true : checkBoolean(fn, 'options.labels', o.labels);
  const scaleBarOn = o.scaleBar === undefined ? true : checkBoolean(fn, 'options.scaleBar', o.scaleBar);
  const units = o.units === undefined ? 'm' : o.units;
  if (typeof units !== 'string') typeError(fn, 'options.units', units, 'a string');
  const s = o.fontScale === undefined ? 2 : checkInteger(fn, 'options.fontScale', o.fontScale, 1, 16);
  const bg = o.background === undefined ? linearRgb(255, 255, 255) : colour8(fn, 'options.background', o.background);
  const fg = o.foreground === undefined ? linearRgb(0, 0, 0) : colour8(fn, 'options.foreground', o.foreground);

  const W = grid.width * r.px;
  const H = grid.height * r.px;
  const pad = 4 * s;
  const textH = GLYPH_HEIGHT * s;

  // colour-bar ticks and labels
  const ticks = niceTicks(r.lo, r.hi, Math.max(2, Math.min(8, Math.floor(H / (textH * 3)) + 1))).values;
  let caption = units === '1' ? '' : units;
  let tickLabels: string[] = [];
  if (colorBar && labels) {
    const step = ticks.length > 1 ? ticks[1]! - ticks[0]! : Math.abs(r.hi - r.lo);
    if (units === 'm') {
      const u = lengthUnit(Math.max(Math.abs(r.lo), Math.abs(r.hi)), false);
      caption = u.symbol;
      tickLabels = ticks.map((t) => formatTick(t / u.metres, step / u.metres));
    } else tickLabels = ticks.map((t) => formatTick(t, step));
  }
  const barGap = 4 * s;
  const barW = 6 * s;
  const tickLen = 2 * s;
  const labelW = Math.max(0, ...tickLabels.map((t) => textWidth(t, s)), colorBar && labels ? textWidth(caption, s) : 0);
  const rightW = colorBar ? barGap + barW + tickLen + (labels ? s + labelW : 0) : 0;

  // scale bar
  let scale: MapImage['scaleBar'] = null;
  const dxPerPixel = grid.dx / r.px;
  if (scaleBarOn) {
    const target = (W / 4) * dxPerPixel;
    let metres = niceNumber(target, true);
    let pixels = Math.round(metres / dxPerPixel);
    if (pixels > W) {
      metres = niceNumber(target / 2, false) / 2;
      pixels = Math.round(metres / dxPerPixel);
    }
    if (pixels >= 2 && pixels <= W) {
      const u = lengthUnit(metres);
      scale = { metres, pixels, label: `${formatTick(metres / u.metres)} ${u.symbol}` };
    }
  }
  const captionBelow = colorBar && labels && caption !== '';
  const belowH = scale !== null || captionBelow ? 3 * s + 2 * s + 2 * s + textH : 0;
  const width = pad + W + rightW + pad;
  const height = pad + H + belowH + pad;
  const image = createImage(width, height, 3);
  fillRect(image, 0, 0, width, height, bg);
  const clipped = paint(grid, r, image, pad, pad);

  if (colorBar) {
    const bx = pad + W + barGap;
    const lut = r.map.linear;
    for (let v = 0; v < H; v++) {
      // top row = high end, bottom row = low end, as the ticks are placed
      const t = H > 1 ? 1 - v / (H - 1) : 0.5;
      const e = indexOf(r.map.size, t) * 3;
      fillRect(image, bx, pad + v, barW, 1, [lut[e]!, lut[e + 1]!, lut[e + 2]!]);
    }
    ticks.forEach((t, k) => {
      const y = pad + Math.round((1 - (t - r.lo) / (r.hi - r.lo)) * (H - 1));
      fillRect(image, bx + barW, y - Math.floor(s / 2), tickLen, s, fg);
      if (labels) {
        const ty = Math.min(Math.max(y - Math.floor(textH / 2), 0), height - textH);
        drawText(image, tickLabels[k]!, bx + barW + tickLen + s, ty, s, fg);
      }
    });
    if (captionBelow) drawText(image, caption, bx, pad + H + 3 * s + 2 * s + 2 * s, s, fg);
  }
  if (scale !== null) {
    const y = pad + H + 3 * s;
    fillRect(image, pad, y, scale.pixels, 2 * s, fg);
    drawText(image, scale.label, pad, y + 2 * s + 2 * s, s, fg);
  }
  return { image, range: [r.lo, r.hi], clipped, ticks, caption, scaleBar: scale, mapRect: { x: pad, y: pad, width: W, height: H } };
}

/**
 * A height map as a picture: the grid in the viridis colour map (north up), a colour bar
 * with ticks and labels in a suitable length unit, and a length scale bar.
 *
 * @param grid - Heights (metres unless `options.units` says otherwise).
 * @param options - See {@link MapImageOptions}.
 * @returns The picture and what its decorations say.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for an invalid grid,
 *   mask or options.
 * @see van der Walt & Smith (2015), "A better default colormap for Matplotlib", SciPy
 *   2015 (viridis); Heckbert (1990), "Nice numbers for graph labels", Graphics Gems (ticks).
 * @example
 * ```ts
 * import { heightMapImage } from 'meniscus/viz';
 * import { writePng } from 'meniscus/node';
 * const { image } = heightMapImage(height, { pixelSize: 3 });
 * writePng('height.png', image, { transfer: 'srgb' });
 * ```
 */
export function heightMapImage(grid: Grid, options?: MapImageOptions): MapImage {
  return decorated('heightMapImage', grid, options, 'viridis', false);
}

/**
 * An error map (measured − true, or any signed field) as a picture: the diverging
 * blue–white–red map on a range symmetric about zero, so zero is white, with colour bar
 * and scale bar as in {@link heightMapImage}.
 *
 * @param grid - Signed values (metres unless `options.units` says otherwise).
 * @param options - See {@link MapImageOptions}; `colormap` defaults to `'blueRed'` and
 *   `symmetric` to true.
 * @returns The picture and what its decorations say.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for an invalid grid,
 *   mask or options.
 * @see Brewer, C. A. et al. (2003), "ColorBrewer in print", Cartography and Geographic
 *   Information Science 30(1), 5–32 (the RdBu scheme).
 * @example
 * ```ts
 * const { image } = errorMapImage(errorGrid, { pixelSize: 2 });
 * ```
 */
export function errorMapImage(grid: Grid, options?: MapImageOptions): MapImage {
  return decorated('errorMapImage', grid, options, 'blueRed', true);
}
