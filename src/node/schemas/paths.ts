/**
 * The file-path argument check shared by the configuration readers (internal: not
 * re-exported).
 *
 * @module
 */
import { rangeError, typeError } from '../../core/index.js';

/**
 * Require a file path: a non-empty string without NUL characters. A number must never
 * reach `node:fs`, which takes it as a file descriptor (0 is stdin).
 *
 * @param fn - The public function's name.
 * @param parameter - The parameter's name.
 * @param path - The value to check.
 * @throws {@link core!MeniscusTypeError} for a non-string; {@link core!MeniscusRangeError}
 *   for an empty string or one holding a NUL character.
 */
export function checkPathArg(fn: string, parameter: string, path: unknown): asserts path is string {
  if (typeof path !== 'string') typeError(fn, parameter, path, 'a file path (a string)');
  if (path === '' || path.includes('\0')) rangeError(fn, parameter, path, 'a non-empty file path without NUL characters');
}
