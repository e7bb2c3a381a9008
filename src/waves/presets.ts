/**
 * Ready-made seas for examples and tests, in invented settings: a laboratory wind-wave
 * tank with centimetre ripples, and a harbour mouth with a fetch-limited wind sea.
 *
 * @module
 */
import type { GridSpec } from '../core/index.js';
import type { SeaSpectrum } from './sea.js';
import { jonswapFromPeak, jonswapFromWind, jonswapSpectrumFunction } from './spectra.js';
import { cos2sSpreading, mitsuyasuExponent } from './spreading.js';

/** A ready-made sea: a grid that resolves it and its directional spectrum. */
export interface SeaPreset {
  /** Short name. */
  readonly name: string;
  /** What the scenario is. */
  readonly description: string;
  /** A grid that resolves the sea (power-of-two sizes, for {@link prepareRandomSea}). */
  readonly grid: Readonly<Required<GridSpec>>;
  /** The directional sea. */
  readonly sea: SeaSpectrum;
  /** The wind speed at 10 m (the tank's equivalent), m/s, for comparisons such as Cox & Munk. */
  readonly windSpeed10: number;
}

/**
 * An invented wind-wave tank: a 0.6 m deep flume whose fan drives short, steep wind
 * waves (JONSWAP, peak period 0.35 s, Hs 8 mm, cos-2s spreading with s = 4) with a
 * saturation-range tail of capillary–gravity ripples below 5 cm wavelength; a 512 × 512
 * grid of 1 mm (a 0.51 m square window, resolving ripples down to 2 mm).
 *
 * @returns The preset.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12) (JONSWAP); Phillips, O. M. (1958),
 *   Journal of Fluid Mechanics 4(4), 426–434 (the saturation range).
 * @example
 * ```ts
 * const { grid, sea } = tankSeaPreset();
 * const frame = prepareRandomSea(grid, sea, { seed: 1 }).frame(0);
 * ```
 */
export function tankSeaPreset(): SeaPreset {
  const p = jonswapFromPeak({ peakPeriod: 0.35, significantHeight: 0.008, gamma: 3.3 });
  return {
    name: 'tank',
    description: 'an invented 0.6 m deep wind-wave flume: fan-driven wind waves (Tp 0.35 s, Hs 8 mm) with capillary ripples',
    grid: { width: 512, height: 512, dx: 0.001, dy: 0.001, x0: 0, y0: 0 },
    sea: {
      frequencySpectrum: jonswapSpectrumFunction(p),
      spreading: (t) => cos2sSpreading(t, 4),
      meanDirection: 0,
      dispersion: { depth: 0.6 },
      saturationFrom: (2 * Math.PI) / 0.05,
    },
    windSpeed10: 5,
  };
}

/**
 * An invented harbour mouth: 14 m of water, a 9 m/s wind blowing out of the harbour over
 * a 12 km fetch (JONSWAP from wind and fetch, Mitsuyasu cos-2s spreading, about Tp 2.9 s,
 * Hs 0.57 m); a 512 × 512 grid of 0.25 m (a 128 m square).
 *
 * @returns The preset.
 * @see Hasselmann, K. et al. (1973), DHZ A8(12) (fetch relations); Mitsuyasu, H. et al.
 *   (1975), Journal of Physical Oceanography 5(4), 750–760 (spreading).
 * @example
 * ```ts
 * const { grid, sea } = harbourSeaPreset();
 * const frame = synthesizeSea(grid, sea, { seed: 2 });
 * ```
 */
export function harbourSeaPreset(): SeaPreset {
  const u10 = 9;
  const p = jonswapFromWind(u10, 12_000);
  const wp = p.peakOmega;
  return {
    name: 'harbour',
    description: 'an invented harbour mouth: 14 m deep, 9 m/s wind over a 12 km fetch',
    grid: { width: 512, height: 512, dx: 0.25, dy: 0.25, x0: 0, y0: 0 },
    sea: {
      frequencySpectrum: jonswapSpectrumFunction(p),
      spreading: (t, w) => cos2sSpreading(t, mitsuyasuExponent(w, wp, u10)),
      meanDirection: Math.PI / 6,
      dispersion: { depth: 14 },
    },
    windSpeed10: u10,
  };
}
