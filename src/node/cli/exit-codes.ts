/**
 * The command line's exit codes, stable across versions so that scripts can rely on
 * them.
 *
 * @module
 */
import { typeError } from '../../core/index.js';

/**
 * Exit codes of the `meniscus` command:
 *
 * | code | name | meaning |
 * | --- | --- | --- |
 * | 0 | `ok` | everything asked for was done |
 * | 1 | `framesFailed` | the run finished but some frames failed (see the report), or `design --strict` found warnings |
 * | 2 | `usage` | wrong command line or configuration: nothing was processed |
 * | 3 | `io` | a file could not be read or written |
 * | 4 | `internal` | an unexpected error (a bug: please report it with the message) |
 */
export const EXIT_CODES = {
  /** Everything asked for was done. */
  ok: 0,
  /** Some frames failed (the others were written), or `design --strict` found warnings. */
  framesFailed: 1,
  /** Wrong command line or configuration. */
  usage: 2,
  /** A file could not be read or written. */
  io: 3,
  /** An unexpected error. */
  internal: 4,
} as const;

/** One of the {@link EXIT_CODES}. */
export type ExitCode = (typeof EXIT_CODES)[keyof typeof EXIT_CODES];

/** Thrown for a wrong command line: reported with the subcommand's usage, exit code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
  /** The subcommand whose usage applies (`undefined` for the top level). */
  readonly command: string | undefined;
  /**
   * @param message - What is wrong with the command line.
   * @param command - The subcommand whose usage applies.
   * @throws {@link core!MeniscusTypeError} for a message that is not a string or a
   *   command that is neither a string nor `undefined`.
   */
  constructor(message: string, command?: string) {
    if (typeof message !== 'string') typeError('UsageError', 'message', message, 'a string');
    if (command !== undefined && typeof command !== 'string') typeError('UsageError', 'command', command, 'a string or undefined');
    super(message);
    this.command = command;
  }
}

const IO_CODES = new Set(['ENOENT', 'EACCES', 'EPERM', 'EISDIR', 'ENOTDIR', 'EEXIST', 'ENOSPC', 'EROFS', 'EMFILE', 'ENFILE', 'EIO', 'EBUSY', 'ENOTEMPTY', 'EDQUOT']);

/**
 * Whether an error is a file-system error (exit code 3).
 *
 * @param e - A caught value.
 * @returns True for errors with a file-system `code` such as `ENOENT`.
 * @example
 * ```ts
 * try { readFileSync('nope'); } catch (e) { isIoError(e); } // true
 * ```
 */
export function isIoError(e: unknown): boolean {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' && IO_CODES.has(code);
}
