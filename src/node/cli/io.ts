/**
 * Where the command line writes, so that it can run inside a test or another program.
 *
 * @module
 */
import type { ProgressStream } from '../batch/progress.js';

/** The streams and folder a command runs with. */
export interface CliIO {
  /** Results (the design budget, schemas, the run summary). */
  readonly stdout: { write(text: string): unknown };
  /** Messages, warnings and the progress bar (drawn only when this is a terminal). */
  readonly stderr: ProgressStream;
  /** The folder relative paths are taken from. @defaultValue `process.cwd()` */
  readonly cwd?: string;
}
