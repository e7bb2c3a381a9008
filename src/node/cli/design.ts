/**
 * `meniscus design`: the design calculator on a JSON sensor description.
 *
 * @module
 */
import { resolve } from 'node:path';
import { designSensor, formatSensorDesign } from '../../sensor/index.js';
import { designInputFromJson } from '../schemas/build.js';
import { readConfigFile } from '../schemas/validate.js';
import { parseCommandArgs, type OptionSpec } from './args.js';
import { EXIT_CODES, UsageError } from './exit-codes.js';
import { formatCommandHelp } from './help.js';
import type { CommandHelp } from './help.js';
import type { CliIO } from './io.js';

const OPTIONS: Record<string, OptionSpec> = {
  json: { type: 'boolean', help: 'Print the design as JSON instead of text.' },
  strict: { type: 'boolean', help: 'Exit with code 1 when the design has warnings.' },
  help: { type: 'boolean', short: 'h', help: 'Show this help.' },
};

/** The help of `design`. */
export const DESIGN_HELP: CommandHelp = {
  name: 'design',
  summary: 'work out what a slope-sensor design will measure, with warnings',
  usage: ['design SENSOR-DESIGN.json [--json] [--strict]'],
  description: [
    'Reads a sensor design (pitch, aperture, distances, guide light, pixel size and, optionally, the expected sea), ' +
      'checks it against the sensor-design schema and prints the spot-size budget, the gain, the slope range and resolution, ' +
      'the shortest wave sampled without aliasing, the fraction of expected slopes in range, and plain-language warnings.',
    'Lengths are metres, angles radians. Print the schema with "meniscus schema sensor-design" and an example with ' +
      '"meniscus schema sensor-design --example".',
  ],
  options: OPTIONS,
  examples: [
    ['the budget and warnings as text', 'design tank-sensor.json'],
    ['as JSON, failing a script when the design has warnings', 'design tank-sensor.json --json --strict > budget.json'],
  ],
};

/**
 * Run `design`.
 *
 * @param argv - Arguments after the subcommand.
 * @param io - Streams and folder.
 * @returns The exit code.
 * @throws {@link UsageError}, `ConfigValidationError` or file-system errors (mapped to
 *   exit codes by the caller).
 * @example
 * ```ts
 * await runDesign(['tank-sensor.json'], { stdout: process.stdout, stderr: process.stderr });
 * ```
 */
export async function runDesign(argv: readonly string[], io: CliIO): Promise<number> {
  const { values, positionals } = parseCommandArgs('design', argv, OPTIONS);
  if (values.help) {
    io.stdout.write(formatCommandHelp(DESIGN_HELP));
    return EXIT_CODES.ok;
  }
  if (positionals.length !== 1) throw new UsageError(`expected one sensor design file; got ${positionals.length}`, 'design');
  const path = resolve(io.cwd ?? process.cwd(), positionals[0]!);
  const json = readConfigFile('sensor-design', path);
  const design = designSensor(designInputFromJson(json));
  if (values.json) io.stdout.write(JSON.stringify(design, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v), 2) + '\n');
  else io.stdout.write(formatSensorDesign(design) + '\n');
  return values.strict && design.warnings.length > 0 ? EXIT_CODES.framesFailed : EXIT_CODES.ok;
}
