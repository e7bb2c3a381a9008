/**
 * A per-frame result folder that a Python user can load with NumPy alone: one `.npy`
 * file per array plus a `meta.json` index with the grid geometry, units and free-form
 * metadata (Node only).
 *
 * Load it in Python:
 *
 * ```python
 * import json, pathlib
 * import numpy as np
 *
 * d = pathlib.Path("run/frame_0001")
 * index = json.loads((d / "meta.json").read_text())
 * a = {name: np.load(d / item["file"]) for name, item in index["arrays"].items()}
 * g = index["grid"]
 * x = g["x0"] + g["dx"] * np.arange(g["width"])   # a["height"][j, i] sits at (x[i], y[j])
 * y = g["y0"] + g["dy"] * np.arange(g["height"])
 * h = np.where(a["mask"], a["height"], np.nan) if "mask" in a else a["height"]
 * ```
 *
 * @module
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkGrid, checkMask, checkOneOf, checkOptions, checkSameShape, rangeError, typeError } from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';
import { npyDescr } from './npy-codec.js';
import { gridToNpy, maskToNpy, npyToGrid, npyToMask } from './npy-convert.js';
import { readNpy, writeNpy } from './npy.js';

/** The index file's `format` string. */
export const FRAME_RESULT_FORMAT = 'meniscus-frame';

/** A grid with its units, for the extra arrays of a frame result. */
export interface UnitGrid {
  /** The grid (same size and geometry as the height map). */
  readonly grid: Grid;
  /** Units of its values, e.g. `"m"`, `"1"` (unitless), `"rad"`. */
  readonly units: string;
}

/** What one frame produced. */
export interface FrameResult {
  /** Height map, metres. */
  readonly height: Grid;
  /** Valid samples (`1`) of every grid. */
  readonly mask?: Mask;
  /** Slope `p = ∂h/∂x`, unitless, on the same grid. */
  readonly slopeX?: Grid;
  /** Slope `q = ∂h/∂y`, unitless, on the same grid. */
  readonly slopeY?: Grid;
  /** Further grids by name (letters, digits and `_`, not starting with a digit). */
  readonly grids?: Readonly<Record<string, UnitGrid>>;
  /** Free-form JSON-serialisable metadata (frame number, time, settings, scores). */
  readonly meta?: Readonly<Record<string, unknown>>;
}

/** Options for {@link writeFrameResult}. */
export interface FrameResultWriteOptions {
  /** Element type of the grids. @defaultValue 'float64' */
  dtype?: 'float64' | 'float32';
}

/** One entry of the index's `arrays`. */
export interface FrameArrayEntry {
  /** File name inside the folder. */
  readonly file: string;
  /** NumPy type descriptor, e.g. `"<f8"`. */
  readonly descr: string;
  /** NumPy shape, `[height, width]`. */
  readonly shape: readonly number[];
  /** Units of the values (`"bool"` for the mask). */
  readonly units: string;
}

/** The `meta.json` index. */
export interface FrameResultIndex {
  /** Always {@link FRAME_RESULT_FORMAT}. */
  readonly format: typeof FRAME_RESULT_FORMAT;
  /** Layout version (1). */
  readonly version: 1;
  /** Geometry shared by every array: `a[j, i]` sits at `(x0 + i·dx, y0 + j·dy)`, metres. */
  readonly grid: {
    readonly width: number;
    readonly height: number;
    readonly dx: number;
    readonly dy: number;
    readonly x0: number;
    readonly y0: number;
  };
  /** The arrays by name. */
  readonly arrays: Readonly<Record<string, FrameArrayEntry>>;
  /** The caller's metadata, as given. */
  readonly meta: Readonly<Record<string, unknown>>;
}

const NAME_RE = /^[A-Za-z_][A-Za-z0-9_]{0,63}$/;
const RESERVED = new Set(['height', 'mask', 'slope_x', 'slope_y', 'meta']);

/**
 * Write one frame's results into a folder: `height.npy`, `mask.npy` (NumPy `bool`),
 * `slope_x.npy`, `slope_y.npy`, one `<name>.npy` per extra grid, and `meta.json`. Every
 * array has shape `(height, width)`, C order, little-endian. The folder is created if
 * needed; files of the same names are overwritten.
 *
 * @param dir - Folder path.
 * @param result - See {@link FrameResult}.
 * @param options - See {@link FrameResultWriteOptions}.
 * @returns The index written to `meta.json`.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for invalid grids, grids
 *   of another size or geometry than `height`, bad names, or metadata that JSON cannot
 *   hold.
 * @see NEP 1, "A simple file format for NumPy arrays".
 * @example
 * ```ts
 * import { writeFrameResult } from 'meniscus/node';
 * writeFrameResult('run/frame_0001', { height, mask, slopeX: p, slopeY: q, meta: { frame: 1 } });
 * ```
 */
export function writeFrameResult(dir: string, result: FrameResult, options?: FrameResultWriteOptions): FrameResultIndex {
  const fn = 'writeFrameResult';
  if (typeof dir !== 'string' || dir.length === 0) typeError(fn, 'dir', dir, 'a non-empty folder path string');
  if (result === null || typeof result !== 'object') typeError(fn, 'result', result, 'an object { height, mask?, slopeX?, slopeY?, grids?, meta? }');
  const o = checkOptions(fn, options);
  const dtype = o.dtype === undefined ? 'float64' : checkOneOf(fn, 'options.dtype', o.dtype, ['float64', 'float32'] as const);
  const mask = result.mask === undefined ? undefined : checkMask(fn, 'result.mask', result.mask, result.height?.width, result.height?.height);
  const height = checkGrid(fn, 'result.height', result.height, mask !== undefined);
  const items: [string, Grid, string][] = [['height', height, 'm']];
  if (result.slopeX !== undefined) items.push(['slope_x', result.slopeX, '1']);
  if (result.slopeY !== undefined) items.push(['slope_y', result.slopeY, '1']);
  if (result.grids !== undefined) {
    if (result.grids === null || typeof result.grids !== 'object') typeError(fn, 'result.grids', result.grids, 'an object of { grid, units }');
    for (const [name, g] of Object.entries(result.grids)) {
      if (!NAME_RE.test(name) || RESERVED.has(name)) {
        rangeError(fn, 'result.grids', name, 'names of letters, digits and "_" (not starting with a digit; not height, mask, slope_x, slope_y, meta)');
      }
      if (g === null || typeof g !== 'object' || typeof g.units !== 'string') typeError(fn, `result.grids.${name}`, g, 'an object { grid, units: string }');
      items.push([name, g.grid, g.units]);
    }
  }
  for (const [name, g] of items.slice(1)) {
    checkGrid(fn, `result.${name}`, g, mask !== undefined);
    checkSameShape(fn, `result.${name}`, g, height);
  }
  let meta: Record<string, unknown> = {};
  if (result.meta !== undefined) {
    if (result.meta === null || typeof result.meta !== 'object' || Array.isArray(result.meta)) typeError(fn, 'result.meta', result.meta, 'a plain object');
    try {
      meta = JSON.parse(JSON.stringify(result.meta)) as Record<string, unknown>;
    } catch (e) {
      typeError(fn, 'result.meta', result.meta, `JSON-serialisable metadata (${(e as Error).message})`);
    }
  }
  mkdirSync(dir, { recursive: true });
  const arrays: Record<string, FrameArrayEntry> = {};
  const shape = [height.height, height.width];
  for (const [name, g, units] of items) {
    const file = `${name}.npy`;
    writeNpy(join(dir, file), gridToNpy(g, { dtype }));
    arrays[name] = { file, descr: npyDescr(dtype), shape, units };
  }
  if (mask !== undefined) {
    writeNpy(join(dir, 'mask.npy'), maskToNpy(mask, height.width, height.height, { dtype: 'bool' }));
    arrays.mask = { file: 'mask.npy', descr: npyDescr('bool'), shape, units: 'bool' };
  }
  const index: FrameResultIndex = {
    format: FRAME_RESULT_FORMAT,
    version: 1,
    grid: { width: height.width, height: height.height, dx: height.dx, dy: height.dy, x0: height.x0, y0: height.y0 },
    arrays,
    meta,
  };
  writeFileSync(join(dir, 'meta.json'), JSON.stringify(index, null, 2) + '\n');
  return index;
}

/** A frame result read back by {@link readFrameResult}. */
export interface FrameResultRead {
  /** Height map, metres. */
  readonly height: Grid;
  /** The mask, when one was written. */
  readonly mask: Mask | null;
  /** Slope along x, when written. */
  readonly slopeX: Grid | null;
  /** Slope along y, when written. */
  readonly slopeY: Grid | null;
  /** The extra grids with their units. */
  readonly grids: Record<string, UnitGrid>;
  /** The caller's metadata. */
  readonly meta: Record<string, unknown>;
  /** The whole index. */
  readonly index: FrameResultIndex;
}

/**
 * Read a folder written by {@link writeFrameResult}.
 *
 * @param dir - Folder path.
 * @returns The grids (with the index's geometry), mask and metadata.
 * @throws {@link core!MeniscusRangeError} when `meta.json` is not a frame index, names a file
 *   outside the folder, or an array does not match the index.
 * @example
 * ```ts
 * import { readFrameResult } from 'meniscus/node';
 * const { height, mask, meta } = readFrameResult('run/frame_0001');
 * ```
 */
export function readFrameResult(dir: string): FrameResultRead {
  const fn = 'readFrameResult';
  if (typeof dir !== 'string' || dir.length === 0) typeError(fn, 'dir', dir, 'a non-empty folder path string');
  let index: FrameResultIndex;
  try {
    index = JSON.parse(readFileSync(join(dir, 'meta.json'), 'utf8')) as FrameResultIndex;
  } catch (e) {
    if ((e as { code?: string }).code !== undefined) throw e;
    rangeError(fn, 'dir', dir, `a folder with a valid meta.json (${(e as Error).message})`);
  }
  if (index === null || typeof index !== 'object' || index.format !== FRAME_RESULT_FORMAT || index.version !== 1) {
    rangeError(fn, 'meta.json', (index as { format?: unknown } | null)?.format, `an index with format "${FRAME_RESULT_FORMAT}", version 1`);
  }
  const g = index.grid;
  const spec = { dx: g.dx, dy: g.dy, x0: g.x0, y0: g.y0 };
  const grids: Record<string, UnitGrid> = {};
  let height: Grid | null = null;
  let mask: Mask | null = null;
  let slopeX: Grid | null = null;
  let slopeY: Grid | null = null;
  for (const [name, entry] of Object.entries(index.arrays)) {
    if (typeof entry?.file !== 'string' || !/^[A-Za-z0-9_]+\.npy$/.test(entry.file)) {
      rangeError(fn, `meta.json arrays.${name}.file`, entry?.file, 'a plain .npy file name inside the folder');
    }
    const arr = readNpy(join(dir, entry.file));
    if (arr.shape.length !== 2 || arr.shape[0] !== g.height || arr.shape[1] !== g.width) {
      rangeError(fn, entry.file, arr.shape, `shape (${g.height}, ${g.width}) as meta.json says`);
    }
    if (name === 'mask') mask = npyToMask(arr).mask;
    else {
      const grid = npyToGrid(arr, spec);
      if (name === 'height') height = grid;
      else if (name === 'slope_x') slopeX = grid;
      else if (name === 'slope_y') slopeY = grid;
      else grids[name] = { grid, units: entry.units };
    }
  }
  if (height === null) rangeError(fn, 'meta.json', Object.keys(index.arrays), 'an index listing a "height" array');
  return { height, mask, slopeX, slopeY, grids, meta: index.meta ?? {}, index };
}
