/**
 * Argument parsing on Node's built-in `util.parseArgs`, with usage errors that name the
 * subcommand.
 *
 * @module
 */
import { parseArgs } from 'node:util';
import { UsageError } from './exit-codes.js';

/** An option of a subcommand. */
export interface OptionSpec {
  /** `'string'` takes a value; `'boolean'` is a switch. */
  readonly type: 'string' | 'boolean';
  /** One-letter alias. */
  readonly short?: string;
  /** Value placeholder in the help, e.g. `"DIR"`. */
  readonly value?: string;
  /** What it does, for the help. */
  readonly help: string;
}

/** Parsed options and positional arguments. */
export interface ParsedArgs {
  /** Options by name (strings or booleans). */
  readonly values: Record<string, string | boolean | undefined>;
  /** Positional arguments. */
  readonly positionals: string[];
}

/**
 * Parse a subcommand's arguments strictly: unknown options, a missing value and
 * duplicate values are usage errors.
 *
 * @param command - The subcommand (for messages).
 * @param argv - Its arguments.
 * @param options - Its options.
 * @returns The parsed arguments.
 * @throws {@link UsageError} for anything parseArgs refuses.
 * @example
 * ```ts
 * parseCommandArgs('design', ['s.json', '--json'], { json: { type: 'boolean', help: '…' } });
 * ```
 */
export function parseCommandArgs(command: string, argv: readonly string[], options: Readonly<Record<string, OptionSpec>>): ParsedArgs {
  const config: Record<string, { type: 'string' | 'boolean'; short?: string }> = {};
  for (const [name, o] of Object.entries(options)) config[name] = o.short === undefined ? { type: o.type } : { type: o.type, short: o.short };
  try {
    const r = parseArgs({ args: [...argv], options: config, allowPositionals: true, strict: true });
    return { values: r.values as Record<string, string | boolean | undefined>, positionals: r.positionals };
  } catch (e) {
    const msg = (e as Error).message.replace(/\. To specify a positional argument.*$/s, '.');
    throw new UsageError(msg, command);
  }
}

/**
 * Read an option as an integer in a range.
 *
 * @param command - The subcommand (for messages).
 * @param name - The option's name.
 * @param value - Its text (or undefined).
 * @param min - Smallest allowed.
 * @param max - Largest allowed.
 * @returns The integer, or undefined when the option was not given.
 * @throws {@link UsageError} for anything else.
 * @example
 * ```ts
 * intOption('process', 'workers', '2', 1, 256); // 2
 * ```
 */
export function intOption(command: string, name: string, value: string | boolean | undefined, min: number, max: number): number | undefined {
  if (value === undefined) return undefined;
  const n = typeof value === 'string' && /^[+-]?\d+$/.test(value.trim()) ? Number(value) : NaN;
  if (!(Number.isInteger(n) && n >= min && n <= max)) {
    throw new UsageError(`--${name} must be an integer from ${min} to ${max}; got ${JSON.stringify(value)}`, command);
  }
  return n;
}
