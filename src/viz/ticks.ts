/**
 * Axis helpers: "nice" tick positions, short tick labels and SI prefixes for lengths.
 *
 * @module
 */
import { checkFinite, checkInteger, rangeError } from '../core/index.js';

/**
 * The "nice" number nearest `x` (or, with `round` false, the nice number at or above
 * it) from the sequence 1, 2, 5 × 10ⁿ.
 *
 * @param x - A positive number.
 * @param round - Round to the nearest nice number rather than up. @defaultValue true
 * @returns The nice number.
 * @throws {@link core!MeniscusRangeError} when `x` is not a finite positive number.
 * @see Heckbert, P. S. (1990), "Nice numbers for graph labels", in Graphics Gems,
 *   Academic Press, 61–63.
 * @example
 * ```ts
 * niceNumber(0.0037); // 0.005
 * ```
 */
export function niceNumber(x: number, round = true): number {
  if (typeof x !== 'number' || !(x > 0) || !Number.isFinite(x)) rangeError('niceNumber', 'x', x, 'a finite number > 0');
  const e = Math.floor(Math.log10(x));
  const f = x / 10 ** e;
  let nf: number;
  if (round) nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  else nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
  // Build from the integer mantissa and exponent to avoid 0.30000000000000004-type values.
  return e >= 0 ? nf * 10 ** e : nf / 10 ** -e;
}

/** Tick positions and their spacing. */
export interface Ticks {
  /** Tick values, ascending, inside `[lo, hi]`. */
  readonly values: number[];
  /** Spacing between ticks. */
  readonly step: number;
}

/**
 * About `count` evenly spaced ticks at nice values inside `[lo, hi]`.
 *
 * @param lo - Lower end.
 * @param hi - Upper end (> lo).
 * @param count - Wanted number of ticks (2–50). @defaultValue 5
 * @returns The ticks.
 * @throws {@link core!MeniscusRangeError} for non-finite ends or `hi ≤ lo`.
 * @see Heckbert, P. S. (1990), "Nice numbers for graph labels", Graphics Gems, 61–63.
 * @example
 * ```ts
 * niceTicks(-0.0023, 0.0041).values; // [-0.002, 0, 0.002, 0.004]
 * ```
 */
export function niceTicks(lo: number, hi: number, count = 5): Ticks {
  const fn = 'niceTicks';
  checkFinite(fn, 'lo', lo);
  checkFinite(fn, 'hi', hi);
  checkInteger(fn, 'count', count, 2, 50);
  if (!(hi > lo)) rangeError(fn, 'hi', hi, `a number > lo (${lo})`);
  const step = niceNumber((hi - lo) / (count - 1), true);
  const first = Math.ceil(lo / step - 1e-9);
  const last = Math.floor(hi / step + 1e-9);
  const values: number[] = [];
  for (let k = first; k <= last; k++) {
    // multiply integer by step, then clean up representation error
    const v = Number((k * step).toPrecision(12));
    values.push(Object.is(v, -0) ? 0 : v);
  }
  return { values, step };
}

/**
 * A short label for a tick value given the tick spacing: as many decimals as the
 * spacing needs, or exponent notation for very small or large values.
 *
 * @param value - The tick value.
 * @param step - The tick spacing (> 0). @defaultValue `|value|` (or 1 for 0)
 * @returns The label, e.g. `"-0.25"`, `"1500"`, `"2e-5"`.
 * @example
 * ```ts
 * formatTick(0.25, 0.05); // "0.25"
 * formatTick(0.00002, 0.00001); // "2e-5"
 * ```
 */
export function formatTick(value: number, step?: number): string {
  checkFinite('formatTick', 'value', value);
  const s = step === undefined ? Math.abs(value) || 1 : Math.abs(checkFinite('formatTick', 'step', step)) || 1;
  if (value === 0) return '0';
  const mag = Math.max(Math.abs(value), s);
  if (mag >= 1e5 || mag < 1e-3) {
    const digits = Math.max(0, Math.min(6, Math.floor(Math.log10(Math.abs(value))) - Math.floor(Math.log10(s))));
    const [m, e] = value.toExponential(digits).split('e') as [string, string];
    const mant = m.includes('.') ? m.replace(/\.?0+$/, '') : m;
    return `${mant}e${Number(e)}`;
  }
  const decimals = Math.max(0, Math.min(10, -Math.floor(Math.log10(s) + 1e-9)));
  return value.toFixed(decimals).replace(/^-0(\.0*)?$/, '0');
}

/** A length unit with SI prefix. */
export interface LengthUnit {
  /** Metres per unit (`1e-3` for millimetres). */
  readonly metres: number;
  /** Unit symbol, e.g. `"mm"`. */
  readonly symbol: string;
}

const LENGTH_UNITS: readonly LengthUnit[] = [
  { metres: 1e3, symbol: 'km' },
  { metres: 1, symbol: 'm' },
  { metres: 1e-2, symbol: 'cm' },
  { metres: 1e-3, symbol: 'mm' },
  { metres: 1e-6, symbol: 'µm' },
  { metres: 1e-9, symbol: 'nm' },
];

/**
 * The SI length unit (km, m, cm, mm, µm, nm) in which `metres` reads as a number of at
 * least 1 and below 1000 (below 100 for centimetres, which can be switched off).
 *
 * @param metres - A length in metres (sign ignored; 0 gives metres).
 * @param allowCentimetres - Offer cm between mm and m. @defaultValue true
 * @returns The unit.
 * @example
 * ```ts
 * lengthUnit(0.004).symbol; // "mm"
 * lengthUnit(0.25).symbol; // "cm"
 * ```
 */
export function lengthUnit(metres: number, allowCentimetres = true): LengthUnit {
  const a = Math.abs(checkFinite('lengthUnit', 'metres', metres));
  if (a === 0) return LENGTH_UNITS[1]!;
  for (const u of LENGTH_UNITS) {
    if (u.symbol === 'cm' && !allowCentimetres) continue;
    if (a >= u.metres * (1 - 1e-12)) return u;
  }
  return LENGTH_UNITS[LENGTH_UNITS.length - 1]!;
}
