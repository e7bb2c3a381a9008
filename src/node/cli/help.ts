/**
 * Help texts of the command line, generated from each subcommand's description.
 *
 * @module
 */
import type { OptionSpec } from './args.js';
import { EXIT_CODES } from './exit-codes.js';

/** What the help of one subcommand says. */
export interface CommandHelp {
  /** The subcommand's name. */
  readonly name: string;
  /** One line for the command list. */
  readonly summary: string;
  /** Usage lines without the program name, e.g. `"design SENSOR.json [--json]"`. */
  readonly usage: readonly string[];
  /** Paragraphs explaining what it does. */
  readonly description: readonly string[];
  /** Its options. */
  readonly options: Readonly<Record<string, OptionSpec>>;
  /** Example command lines, each with a comment line before it. */
  readonly examples: readonly (readonly [comment: string, command: string])[];
}

/** The program's name as typed by users. */
export const PROGRAM = 'meniscus';

/** @internal The exit-code table as help text. */
export function exitCodeLines(): string[] {
  return [
    'Exit codes:',
    `  ${EXIT_CODES.ok}  everything asked for was done`,
    `  ${EXIT_CODES.framesFailed}  some frames failed (the rest were written; see report.json), or design --strict found warnings`,
    `  ${EXIT_CODES.usage}  wrong command line or configuration (nothing was processed)`,
    `  ${EXIT_CODES.io}  a file could not be read or written`,
    `  ${EXIT_CODES.internal}  unexpected internal error`,
  ];
}

function wrap(text: string, indent: string, width = 88): string[] {
  const out: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (line.length > 0 && indent.length + line.length + 1 + word.length > width) {
      out.push(indent + line);
      line = word;
    } else line = line.length > 0 ? `${line} ${word}` : word;
  }
  if (line.length > 0) out.push(indent + line);
  return out;
}

/**
 * The full help text of a subcommand.
 *
 * @param c - The subcommand's description.
 * @returns The text, ending with a newline.
 * @example
 * ```ts
 * process.stdout.write(formatCommandHelp(DESIGN_HELP));
 * ```
 */
export function formatCommandHelp(c: CommandHelp): string {
  const lines: string[] = [];
  lines.push(`${PROGRAM} ${c.name}: ${c.summary}`, '', 'Usage:');
  for (const u of c.usage) lines.push(`  ${PROGRAM} ${u}`);
  lines.push('');
  for (const p of c.description) lines.push(...wrap(p, ''), '');
  lines.push('Options:');
  const entries = Object.entries(c.options).map(([name, o]) => [`${o.short ? `-${o.short}, ` : '    '}--${name}${o.type === 'string' ? ` ${o.value ?? 'VALUE'}` : ''}`, o.help] as const);
  const w = Math.max(...entries.map(([a]) => a.length));
  for (const [a, h] of entries) {
    const wrapped = wrap(h, ' '.repeat(w + 4));
    lines.push(`  ${a.padEnd(w)}  ${wrapped[0]!.trimStart()}`, ...wrapped.slice(1));
  }
  lines.push('', 'Examples:');
  for (const [comment, cmd] of c.examples) lines.push(`  # ${comment}`, `  ${PROGRAM} ${cmd}`, '');
  lines.push(...exitCodeLines(), '');
  return lines.join('\n');
}

/**
 * The top-level help: the subcommands and the exit codes.
 *
 * @param commands - The subcommands.
 * @param version - The package version.
 * @returns The text, ending with a newline.
 * @example
 * ```ts
 * process.stdout.write(formatMainHelp(COMMANDS, '0.1.0'));
 * ```
 */
export function formatMainHelp(commands: readonly CommandHelp[], version: string): string {
  const w = Math.max(...commands.map((c) => c.name.length));
  return [
    `${PROGRAM} ${version}: see through a moving water surface from the command line`,
    '',
    'Usage:',
    `  ${PROGRAM} <command> [options]`,
    `  ${PROGRAM} <command> --help`,
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(w)}  ${c.summary}`),
    `  ${'help'.padEnd(w)}  show the help of a command`,
    '',
    'Options:',
    '  -h, --help     show this help',
    '  -V, --version  print the version',
    '',
    'Examples:',
    `  ${PROGRAM} design tank-sensor.json`,
    `  ${PROGRAM} simulate wave-tank.json --out sim`,
    `  ${PROGRAM} process run.json --frames sim/frames --out results --workers 2`,
    '',
    ...exitCodeLines(),
    '',
  ].join('\n');
}
