/**
 * The command line's dispatcher: picks the subcommand, runs it and turns every error
 * into a message and a documented exit code.
 *
 * @module
 */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { isMeniscusError } from '../../core/index.js';
import { ConfigValidationError } from '../schemas/validate.js';
import { DESIGN_HELP, runDesign } from './design.js';
import { EXIT_CODES, isIoError, UsageError } from './exit-codes.js';
import { formatMainHelp, PROGRAM } from './help.js';
import type { CommandHelp } from './help.js';
import type { CliIO } from './io.js';
import { PROCESS_HELP, runProcess } from './process.js';
import { runSchema, SCHEMA_HELP } from './schema.js';
import { runSimulate, SIMULATE_HELP } from './simulate.js';

/** The subcommands, their help and how to run them. */
export const COMMANDS: readonly (CommandHelp & { readonly run: (argv: readonly string[], io: CliIO) => Promise<number> })[] = [
  { ...DESIGN_HELP, run: runDesign },
  { ...SIMULATE_HELP, run: runSimulate },
  { ...PROCESS_HELP, run: runProcess },
  { ...SCHEMA_HELP, run: runSchema },
];

declare const __filename: string | undefined;

/** @internal The package version, from the nearest package.json named "meniscus". */
export function packageVersion(): string {
  try {
    const meta = (import.meta as { url?: string }).url;
    let dir = dirname(typeof meta === 'string' && meta.length > 0 ? fileURLToPath(meta) : (__filename as string));
    for (let k = 0; k < 6; k++) {
      const p = join(dir, 'package.json');
      if (existsSync(p)) {
        const pkg = JSON.parse(readFileSync(p, 'utf8')) as { name?: string; version?: string };
        if (pkg.name === 'meniscus' && typeof pkg.version === 'string') return pkg.version;
      }
      dir = dirname(dir);
    }
  } catch {
    // fall through
  }
  return 'unknown';
}

/**
 * Run the command line with the given arguments and report errors on `io.stderr`:
 * usage and configuration errors (exit code 2, with the subcommand's usage), file
 * errors (3), anything else (4). Never throws.
 *
 * @param argv - The arguments after the program name, e.g. `['design', 'sensor.json']`.
 * @param io - Streams and folder. @defaultValue `process.stdout`, `process.stderr`, `process.cwd()`
 * @returns The exit code (see {@link EXIT_CODES}).
 * @example
 * ```ts
 * import { runCli } from 'meniscus/node';
 * const code = await runCli(['design', 'tank-sensor.json', '--json']);
 * ```
 */
export async function runCli(argv: readonly string[], io: CliIO = { stdout: process.stdout, stderr: process.stderr }): Promise<number> {
  const [name, ...rest] = argv;
  let command: string | undefined;
  try {
    if (name === undefined || name === '-h' || name === '--help') {
      io.stdout.write(formatMainHelp(COMMANDS, packageVersion()));
      return name === undefined ? EXIT_CODES.usage : EXIT_CODES.ok;
    }
    if (name === '-V' || name === '--version') {
      io.stdout.write(`${packageVersion()}\n`);
      return EXIT_CODES.ok;
    }
    if (name === 'help') {
      const target = rest[0];
      if (target === undefined) {
        io.stdout.write(formatMainHelp(COMMANDS, packageVersion()));
        return EXIT_CODES.ok;
      }
      const c = COMMANDS.find((x) => x.name === target);
      if (c === undefined) throw new UsageError(`unknown command ${JSON.stringify(target)}`);
      return await c.run(['--help'], io);
    }
    const c = COMMANDS.find((x) => x.name === name);
    if (c === undefined) throw new UsageError(`unknown command ${JSON.stringify(name)}; the commands are ${COMMANDS.map((x) => x.name).join(', ')}`);
    command = c.name;
    return await c.run(rest, io);
  } catch (e) {
    if (e instanceof UsageError) {
      const cmd = e.command ?? command;
      io.stderr.write(`${PROGRAM}${cmd ? ` ${cmd}` : ''}: ${e.message}\nRun "${PROGRAM} ${cmd ? `${cmd} ` : ''}--help" for usage.\n`);
      return EXIT_CODES.usage;
    }
    if (e instanceof ConfigValidationError) {
      io.stderr.write(`${PROGRAM}${command ? ` ${command}` : ''}: invalid configuration\n${e.message}\n`);
      return EXIT_CODES.usage;
    }
    if (isMeniscusError(e)) {
      io.stderr.write(`${PROGRAM}${command ? ` ${command}` : ''}: the configuration was refused: ${e.message}\n`);
      return EXIT_CODES.usage;
    }
    if (isIoError(e)) {
      io.stderr.write(`${PROGRAM}${command ? ` ${command}` : ''}: ${(e as Error).message}\n`);
      return EXIT_CODES.io;
    }
    io.stderr.write(`${PROGRAM}${command ? ` ${command}` : ''}: unexpected error (please report it): ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return EXIT_CODES.internal;
  }
}
