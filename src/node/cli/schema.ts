/**
 * `meniscus schema`: print a configuration schema or an example file, or check files.
 *
 * @module
 */
import { resolve } from 'node:path';
import { EXAMPLE_CONFIGS } from '../schemas/examples.js';
import { CONFIG_KINDS, CONFIG_SCHEMAS, readConfigFile } from '../schemas/validate.js';
import type { ConfigKind } from '../schemas/validate.js';
import { parseCommandArgs, type OptionSpec } from './args.js';
import { EXIT_CODES, UsageError } from './exit-codes.js';
import { formatCommandHelp } from './help.js';
import type { CommandHelp } from './help.js';
import type { CliIO } from './io.js';

const OPTIONS: Record<string, OptionSpec> = {
  example: { type: 'boolean', help: 'Print an example file of the kind instead of its schema.' },
  check: { type: 'string', value: 'FILE', help: 'Validate FILE against the kind\'s schema and print every problem (exit 2 when there are any).' },
  list: { type: 'boolean', help: 'List the kinds.' },
  help: { type: 'boolean', short: 'h', help: 'Show this help.' },
};

/** The help of `schema`. */
export const SCHEMA_HELP: CommandHelp = {
  name: 'schema',
  summary: 'print the JSON Schema or an example of a configuration file, or check one',
  usage: ['schema KIND [--example]', 'schema KIND --check FILE', 'schema --list'],
  description: [
    `Configuration files are JSON checked against JSON Schemas (draft-07). KIND is one of: ${CONFIG_KINDS.join(', ')}. ` +
      'Point an editor at the printed schema (or give "$schema" in the file) to get completion and checks while writing.',
  ],
  options: OPTIONS,
  examples: [
    ['save the run schema for an editor', 'schema run > run.schema.json'],
    ['start a sensor file from the example', 'schema sensor --example > sensor.json'],
    ['check a file without running anything', 'schema light --check light.json'],
  ],
};

/**
 * Run `schema`.
 *
 * @param argv - Arguments after the subcommand.
 * @param io - Streams and folder.
 * @returns The exit code.
 * @throws {@link UsageError} for a wrong command line; `ConfigValidationError` from
 *   `--check`.
 * @example
 * ```ts
 * await runSchema(['run'], { stdout: process.stdout, stderr: process.stderr });
 * ```
 */
export async function runSchema(argv: readonly string[], io: CliIO): Promise<number> {
  const { values, positionals } = parseCommandArgs('schema', argv, OPTIONS);
  if (values.help) {
    io.stdout.write(formatCommandHelp(SCHEMA_HELP));
    return EXIT_CODES.ok;
  }
  if (values.list) {
    io.stdout.write(CONFIG_KINDS.join('\n') + '\n');
    return EXIT_CODES.ok;
  }
  if (positionals.length !== 1) throw new UsageError(`expected one KIND (${CONFIG_KINDS.join(', ')})`, 'schema');
  const kind = positionals[0]!;
  if (!(CONFIG_KINDS as readonly string[]).includes(kind)) {
    throw new UsageError(`unknown KIND ${JSON.stringify(kind)}; expected one of ${CONFIG_KINDS.join(', ')}`, 'schema');
  }
  const k = kind as ConfigKind;
  if (typeof values.check === 'string') {
    readConfigFile(k, resolve(io.cwd ?? process.cwd(), values.check));
    io.stdout.write(`${values.check}: a valid ${k} configuration\n`);
    return EXIT_CODES.ok;
  }
  io.stdout.write(JSON.stringify(values.example ? EXAMPLE_CONFIGS[k] : CONFIG_SCHEMAS[k], null, 2) + '\n');
  return EXIT_CODES.ok;
}
