/**
 * A `Grid` as a 16-bit grey PNG plus a JSON side file that records how to turn the
 * stored codes back into values and where the samples sit (Node only).
 *
 * Layout: PNG row `j` is grid row `j` (the PNG's top row is `y = y0`), column `i` is
 * grid column `i`. A sample's value is `offset + scale · code`. With a mask, code 0 is
 * reserved for holes and valid samples use codes 1 to 65535.
 *
 * @module
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { checkRangePair, checkFinite, checkGrid, checkMask, checkOptions, createGrid, createImage, rangeError, typeError } from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';
import { decodePng, encodePng, pngInfo } from './png.js';

/** The side file's `format` string. */
export const GRID_PNG_FORMAT = 'meniscus-grid-png';

/** The JSON side file written beside a grid PNG. */
export interface GridPngSidecar {
  /** Always {@link GRID_PNG_FORMAT}. */
  readonly format: typeof GRID_PNG_FORMAT;
  /** Side-file layout version (1). */
  readonly version: 1;
  /** The PNG's file name (no directory). */
  readonly image: string;
  /** Columns. */
  readonly width: number;
  /** Rows. */
  readonly height: number;
  /** Spacing along x, metres. */
  readonly dx: number;
  /** Spacing along y, metres. */
  readonly dy: number;
  /** World x of column 0, metres. */
  readonly x0: number;
  /** World y of row 0 (the PNG's top row), metres. */
  readonly y0: number;
  /** Value of code 0 (or of code 1 less one step with a mask): `value = offset + scale · code`. */
  readonly offset: number;
  /** Value step per code. */
  readonly scale: number;
  /** Units of the values, e.g. `"m"` for heights, `"1"` for slopes. */
  readonly units: string;
  /** Present when the grid has a mask: samples stored with this code are holes. */
  readonly mask: { readonly holeCode: 0 } | null;
  /** Smallest and largest valid value written (after clamping to `range`). */
  readonly min: number;
  /** See `min`. */
  readonly max: number;
  /** Valid values that lay outside the chosen range and were clamped. */
  readonly clipped: number;
  /** Free-form notes. */
  readonly description?: string;
}

/** Options for {@link writeGridPng}. */
export interface GridPngWriteOptions {
  /** Validity mask (`1` valid); holes are stored as code 0. @defaultValue none */
  mask?: Mask;
  /**
   * Value range mapped to the codes. Values outside are clamped and counted.
   * @defaultValue the valid samples' min and max
   */
  range?: readonly [number, number];
  /** Units of the values, recorded in the side file. @defaultValue 'm' */
  units?: string;
  /** Free-form description recorded in the side file. */
  description?: string;
  /** Where to write the side file. @defaultValue the PNG path with `.png` replaced by `.json` */
  sidecarPath?: string;
}

/** A grid read back from a PNG and its side file. */
export interface GridPngReadResult {
  /** The grid (holes hold 0). */
  readonly grid: Grid;
  /** The mask, when the side file records one. */
  readonly mask: Mask | null;
  /** The side file. */
  readonly sidecar: GridPngSidecar;
}

function sidecarFor(pngPath: string): string {
  return /\.png$/i.test(pngPath) ? pngPath.replace(/\.png$/i, '.json') : `${pngPath}.json`;
}

function baseName(p: string): string {
  const k = Math.max(p.lastIndexOf('/'), p.lastIndexOf('\\'));
  return k < 0 ? p : p.slice(k + 1);
}

/**
 * Write a grid as a 16-bit grey PNG with a JSON side file holding its scale and
 * geometry, so that it can be viewed as a picture and read back to within half a code
 * step (`scale / 2`).
 *
 * @param path - PNG path (overwritten).
 * @param grid - The grid. Without a mask every sample must be finite; with one, holes may
 *   hold anything.
 * @param options - See {@link GridPngWriteOptions}.
 * @returns The side file's contents.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for an invalid grid,
 *   mask or range, or a mask with no valid sample.
 * @see ISO/IEC 15948:2004 (PNG) for the 16-bit grey colour type.
 * @example
 * ```ts
 * import { writeGridPng } from 'meniscus/node';
 * writeGridPng('height.png', height, { units: 'm' }); // also writes height.json
 * ```
 */
export function writeGridPng(path: string, grid: Grid, options?: GridPngWriteOptions): GridPngSidecar {
  const fn = 'writeGridPng';
  if (typeof path !== 'string' || path.length === 0) typeError(fn, 'path', path, 'a non-empty file path string');
  const o = checkOptions(fn, options);
  checkGrid(fn, 'grid', grid, true); // shape first: the mask check needs a valid width and height
  const mask = o.mask === undefined ? null : checkMask(fn, 'options.mask', o.mask, grid.width, grid.height);
  checkGrid(fn, 'grid', grid, mask !== null);
  const units = o.units === undefined ? 'm' : o.units;
  if (typeof units !== 'string') typeError(fn, 'options.units', units, 'a string');
  if (o.description !== undefined && typeof o.description !== 'string') typeError(fn, 'options.description', o.description, 'a string');
  if (o.sidecarPath !== undefined && (typeof o.sidecarPath !== 'string' || o.sidecarPath.length === 0)) {
    typeError(fn, 'options.sidecarPath', o.sidecarPath, 'a non-empty file path string or undefined');
  }
  const d = grid.data;
  const n = d.length;
  if (mask !== null) {
    for (let k = 0; k < n; k++) {
      if (mask[k] === 1 && !Number.isFinite(d[k]!)) rangeError(fn, `grid.data[${k}]`, d[k], 'a finite value where the mask is 1');
    }
  }
  let lo: number;
  let hi: number;
  if (o.range !== undefined) {
    [lo, hi] = checkRangePair(fn, 'options.range', o.range);
  } else {
    lo = Infinity;
    hi = -Infinity;
    for (let k = 0; k < n; k++) {
      if (mask !== null && mask[k] === 0) continue;
      const v = d[k]!;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (lo === Infinity) rangeError(fn, 'options.mask', mask, 'a mask with at least one valid sample');
  }
  const first = mask === null ? 0 : 1;
  const steps = 65535 - first;
  const scale = hi > lo ? (hi - lo) / steps : 1;
  const offset = lo - first * scale;
  const img = createImage(grid.width, grid.height, 1);
  const px = img.data;
  let clipped = 0;
  let vmin = Infinity;
  let vmax = -Infinity;
  for (let k = 0; k < n; k++) {
    if (mask !== null && mask[k] === 0) {
      px[k] = 0;
      continue;
    }
    let v = d[k]!;
    if (v < lo) {
      v = lo;
      clipped++;
    } else if (v > hi) {
      v = hi;
      clipped++;
    }
    if (v < vmin) vmin = v;
    if (v > vmax) vmax = v;
    const code = first + Math.round((v - lo) / scale);
    px[k] = code / 65535;
  }
  const { png } = encodePng(img, { bitDepth: 16 });
  const sidecar: GridPngSidecar = {
    format: GRID_PNG_FORMAT,
    version: 1,
    image: baseName(path),
    width: grid.width,
    height: grid.height,
    dx: grid.dx,
    dy: grid.dy,
    x0: grid.x0,
    y0: grid.y0,
    offset,
    scale,
    units,
    mask: mask === null ? null : { holeCode: 0 },
    min: vmin,
    max: vmax,
    clipped,
    ...(o.description === undefined ? {} : { description: o.description }),
  };
  writeFileSync(path, png);
  writeFileSync(o.sidecarPath ?? sidecarFor(path), JSON.stringify(sidecar, null, 2) + '\n');
  return sidecar;
}

function checkSidecar(fn: string, s: unknown): GridPngSidecar {
  if (s === null || typeof s !== 'object') typeError(fn, 'sidecar', s, 'a JSON object');
  const c = s as Record<string, unknown>;
  if (c.format !== GRID_PNG_FORMAT) rangeError(fn, 'sidecar.format', c.format, JSON.stringify(GRID_PNG_FORMAT));
  if (c.version !== 1) rangeError(fn, 'sidecar.version', c.version, 'version 1');
  for (const k of ['dx', 'dy', 'x0', 'y0', 'offset', 'scale', 'width', 'height'] as const) checkFinite(fn, `sidecar.${k}`, c[k]);
  if (c.mask !== null && (typeof c.mask !== 'object' || (c.mask as { holeCode?: unknown }).holeCode !== 0)) {
    rangeError(fn, 'sidecar.mask', c.mask, 'null or { "holeCode": 0 }');
  }
  return c as unknown as GridPngSidecar;
}

/**
 * Read a grid written by {@link writeGridPng}: the 16-bit PNG and its JSON side file.
 *
 * @param path - PNG path.
 * @param sidecarPath - Side-file path. @defaultValue the PNG path with `.png` replaced by `.json`
 * @returns The grid (values `offset + scale · code`; holes hold 0), its mask and the side file.
 * @throws {@link core!MeniscusRangeError} when the side file is not one of ours, or the PNG's
 *   size or depth does not match it.
 * @example
 * ```ts
 * import { readGridPng } from 'meniscus/node';
 * const { grid, mask } = readGridPng('height.png');
 * ```
 */
export function readGridPng(path: string, sidecarPath?: string): GridPngReadResult {
  const fn = 'readGridPng';
  if (typeof path !== 'string' || path.length === 0) typeError(fn, 'path', path, 'a non-empty file path string');
  if (sidecarPath !== undefined && (typeof sidecarPath !== 'string' || sidecarPath.length === 0)) {
    typeError(fn, 'sidecarPath', sidecarPath, 'a non-empty file path string or undefined');
  }
  const sidePath = sidecarPath ?? sidecarFor(path);
  let parsed: unknown;
  try {
    parsed = JSON.parse(readFileSync(sidePath, 'utf8'));
  } catch (e) {
    if ((e as { code?: string }).code !== undefined) throw e;
    rangeError(fn, 'sidecarPath', sidePath, `a JSON side file (${(e as Error).message})`);
  }
  const s = checkSidecar(fn, parsed);
  const bytes = readFileSync(path);
  const info = pngInfo(bytes);
  if (info.bitDepth !== 16) rangeError(fn, 'path', path, `a 16-bit grey PNG (found ${info.bitDepth}-bit)`);
  const img = decodePng(bytes);
  if (img.width !== s.width || img.height !== s.height || img.channels !== 1) {
    rangeError(fn, 'path', path, `a grey PNG of ${s.width}×${s.height} as the side file says (found ${img.width}×${img.height}, ${img.channels} channels)`);
  }
  const n = s.width * s.height;
  const data = new Float64Array(n);
  const mask = s.mask === null ? null : new Uint8Array(n);
  const px = img.data;
  for (let k = 0; k < n; k++) {
    const code = Math.round(px[k]! * 65535);
    if (mask !== null) {
      if (code === 0) continue;
      mask[k] = 1;
    }
    data[k] = s.offset + s.scale * code;
  }
  const grid = createGrid({ width: s.width, height: s.height, dx: s.dx, dy: s.dy, x0: s.x0, y0: s.y0 }, data);
  return { grid, mask, sidecar: s };
}
