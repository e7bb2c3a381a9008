/**
 * The library's error types. Every wrong argument at a public boundary throws one of
 * these; physical non-results (total internal reflection, a missed surface) are never
 * errors but data.
 *
 * @module
 */

/** Anything that can be said about a bad argument, used by both error classes. */
export interface MeniscusErrorDetails {
  /** The public function that refused the argument, e.g. `"refract"`. */
  readonly fn: string;
  /** The parameter's name as the caller sees it, e.g. `"incident"` or `"options.tolerance"`. */
  readonly parameter: string;
  /** The offending value (as given, not copied). */
  readonly value: unknown;
  /** What was expected, in words, e.g. `"a finite number > 0"`. */
  readonly expected: string;
}

/**
 * Render a value for an error message: short, never throwing, arrays and typed arrays
 * abbreviated.
 *
 * @param value - Anything.
 * @returns A short printable description.
 * @example
 * ```ts
 * describeValue([1, NaN, 3]); // "[1, NaN, 3]"
 * ```
 */
export function describeValue(value: unknown): string {
  try {
    if (value === null) return 'null';
    if (value === undefined) return 'undefined';
    if (typeof value === 'number') return Object.is(value, -0) ? '-0' : String(value);
    if (typeof value === 'string') return JSON.stringify(value.length > 60 ? value.slice(0, 57) + '...' : value);
    if (typeof value === 'bigint') return `${value}n`;
    if (typeof value === 'boolean' || typeof value === 'symbol') return String(value);
    if (typeof value === 'function') return 'a function';
    if (ArrayBuffer.isView(value)) {
      const ctor = (value as object).constructor?.name ?? 'TypedArray';
      const len = (value as unknown as { length?: number }).length;
      return `${ctor}(length ${len ?? (value as ArrayBufferView).byteLength})`;
    }
    if (Array.isArray(value)) {
      const head = value.slice(0, 6).map((v) => (typeof v === 'object' && v !== null ? '…' : describeValue(v)));
      return `[${head.join(', ')}${value.length > 6 ? `, … (${value.length} items)` : ''}]`;
    }
    if (value instanceof Date) return Number.isNaN(value.getTime()) ? 'Invalid Date' : value.toISOString();
    const keys = Object.keys(value as object);
    return `{${keys.slice(0, 6).join(', ')}${keys.length > 6 ? ', …' : ''}}`;
  } catch {
    return 'an unprintable value';
  }
}

function formatMessage(d: MeniscusErrorDetails): string {
  return `${d.fn}: ${d.parameter} must be ${d.expected}; got ${describeValue(d.value)}`;
}

/**
 * Thrown when an argument has the right type but a value outside what the function
 * accepts: out of range, non-finite, a zero-length direction, a size above a limit.
 *
 * @example
 * ```ts
 * try { criticalAngle(-1, 1.33); } catch (e) {
 *   if (e instanceof MeniscusRangeError) console.log(e.parameter); // "n1"
 * }
 * ```
 */
export class MeniscusRangeError extends RangeError implements MeniscusErrorDetails {
  override readonly name = 'MeniscusRangeError';
  readonly fn: string;
  readonly parameter: string;
  readonly value: unknown;
  readonly expected: string;
  constructor(details: MeniscusErrorDetails) {
    super(formatMessage(details));
    this.fn = details.fn;
    this.parameter = details.parameter;
    this.value = details.value;
    this.expected = details.expected;
  }
}

/**
 * Thrown when an argument has the wrong type or shape: not a number, not a typed
 * array, a packed array whose length is not a multiple of 3, mismatched lengths.
 *
 * @example
 * ```ts
 * try { refract('up' as never, [0, 0, 1], 1, 1.33); } catch (e) {
 *   console.log(e instanceof MeniscusTypeError); // true
 * }
 * ```
 */
export class MeniscusTypeError extends TypeError implements MeniscusErrorDetails {
  override readonly name = 'MeniscusTypeError';
  readonly fn: string;
  readonly parameter: string;
  readonly value: unknown;
  readonly expected: string;
  constructor(details: MeniscusErrorDetails) {
    super(formatMessage(details));
    this.fn = details.fn;
    this.parameter = details.parameter;
    this.value = details.value;
    this.expected = details.expected;
  }
}

/** Either of the library's error types. */
export type MeniscusError = MeniscusRangeError | MeniscusTypeError;

/**
 * True when `e` is one of the library's own errors.
 *
 * @param e - A caught value.
 * @returns Whether it is a {@link MeniscusRangeError} or {@link MeniscusTypeError}.
 * @example
 * ```ts
 * try { normalize([0, 0, 0]); } catch (e) { isMeniscusError(e); } // true
 * ```
 */
export function isMeniscusError(e: unknown): e is MeniscusError {
  return e instanceof MeniscusRangeError || e instanceof MeniscusTypeError;
}
