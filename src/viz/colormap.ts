/**
 * Colour maps: 256-entry tables of sRGB colours and lookups into them.
 *
 * @module
 */
import { checkFinite, checkOneOf } from '../core/index.js';
import { BLUE_RED_HEX, VIRIDIS_HEX } from './colormap-data.js';
import { indexOf } from './internal.js';
import { srgbDecode } from './srgb.js';

/** The built-in colour maps. */
export type ColormapName = 'viridis' | 'blueRed';

/** The names of the built-in colour maps. */
export const COLORMAP_NAMES: readonly ColormapName[] = ['viridis', 'blueRed'];

/** A colour map: a table of colours from low (entry 0) to high. */
export interface Colormap {
  /** Name of the map. */
  readonly name: ColormapName;
  /** Number of entries (256). */
  readonly size: number;
  /** `size × 3` 8-bit sRGB codes, r g b per entry. */
  readonly rgb: Uint8Array;
  /** `size × 3` linear-light values of the same colours (for building `Image`s). */
  readonly linear: Float32Array;
  /** Where the data come from and under which licence. */
  readonly licence: string;
}

const LICENCES: Record<ColormapName, string> = {
  viridis: 'viridis, van der Walt & Smith (2015), CC0 1.0',
  blueRed: 'ColorBrewer RdBu (reversed), Brewer, Harrower & The Pennsylvania State University, Apache License 2.0',
};

const cache = new Map<ColormapName, Colormap>();

/**
 * A built-in colour map.
 *
 * - `'viridis'`: perceptually uniform sequential map for heights and magnitudes.
 * - `'blueRed'`: diverging map for signed values such as errors (blue negative, white
 *   near zero, red positive).
 *
 * @param name - Map name.
 * @returns The map (shared, do not modify its tables).
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for an unknown name.
 * @see van der Walt, S. & Smith, N. (2015), "A better default colormap for Matplotlib",
 *   SciPy 2015 (viridis); Brewer, C. A. et al. (2003), Cartography and Geographic
 *   Information Science 30(1), 5–32 (ColorBrewer).
 * @example
 * ```ts
 * getColormap('viridis').rgb.subarray(0, 3); // [68, 1, 84]
 * ```
 */
export function getColormap(name: ColormapName): Colormap {
  checkOneOf('getColormap', 'name', name, COLORMAP_NAMES);
  let map = cache.get(name);
  if (map === undefined) {
    const hex = name === 'viridis' ? VIRIDIS_HEX : BLUE_RED_HEX;
    const size = hex.length / 6;
    const rgb = new Uint8Array(size * 3);
    const linear = new Float32Array(size * 3);
    for (let k = 0; k < size * 3; k++) {
      rgb[k] = parseInt(hex.slice(k * 2, k * 2 + 2), 16);
      linear[k] = srgbDecode(rgb[k]! / 255);
    }
    map = { name, size, rgb, linear, licence: LICENCES[name] };
    cache.set(name, map);
  }
  return map;
}

/**
 * The table entry for a position `t` in [0, 1]: `min(size − 1, floor(t · size))`, with
 * `t` clamped to [0, 1] (the same rule as d3-scale-chromatic's ramps).
 *
 * @param map - The colour map.
 * @param t - Position, 0 low to 1 high.
 * @returns The entry index.
 * @throws {@link core!MeniscusRangeError} for a non-finite `t`.
 * @example
 * ```ts
 * colormapIndex(getColormap('viridis'), 0.5); // 128
 * ```
 */
export function colormapIndex(map: Colormap, t: number): number {
  checkFinite('colormapIndex', 't', t);
  return indexOf(map.size, t);
}


/**
 * The 8-bit sRGB colour of a colour map at position `t` in [0, 1].
 *
 * @param name - Map name.
 * @param t - Position, clamped to [0, 1].
 * @returns `[r, g, b]`, integers 0–255 (display values, not linear).
 * @throws {@link core!MeniscusRangeError} for an unknown name or a non-finite `t`.
 * @see {@link getColormap} for the data sources.
 * @example
 * ```ts
 * colormapColor('viridis', 1); // [253, 231, 37]
 * ```
 */
export function colormapColor(name: ColormapName, t: number): [number, number, number] {
  const map = getColormap(name);
  const k = colormapIndex(map, t) * 3;
  return [map.rgb[k]!, map.rgb[k + 1]!, map.rgb[k + 2]!];
}

/**
 * A CSS hex colour (`#rrggbb`) of a colour map at position `t`, for SVG.
 *
 * @param name - Map name.
 * @param t - Position, clamped to [0, 1].
 * @returns The colour.
 * @example
 * ```ts
 * colormapHex('viridis', 0); // "#440154"
 * ```
 */
export function colormapHex(name: ColormapName, t: number): string {
  return '#' + colormapColor(name, t).map((v) => v.toString(16).padStart(2, '0')).join('');
}
