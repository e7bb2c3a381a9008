/**
 * Validation of configuration files against their JSON Schemas (ajv, all errors), with
 * messages that name the field by its JSON pointer, the value found and what was
 * expected.
 *
 * @module
 */
import { readFileSync } from 'node:fs';
import Ajv from 'ajv';
import type { ErrorObject, ValidateFunction } from 'ajv';
import { checkOneOf, describeValue, MeniscusRangeError, rangeError, typeError } from '../../core/index.js';
import { CAMERA_SCHEMA, LIGHT_SCHEMA } from './camera.js';
import { checkPathArg } from './paths.js';
import type { JsonSchema } from './common.js';
import { RUN_SCHEMA } from './run.js';
import type { RunConfigJson } from './run.js';
import { SCENARIO_SCHEMA } from './scenario.js';
import type { ScenarioJson } from './scenario.js';
import { SENSOR_DESIGN_SCHEMA, SENSOR_SCHEMA } from './sensor.js';
import type { CameraJson, LightJson, SensorDesignJson, SensorJson } from './types.js';

/** The kinds of configuration file. */
export type ConfigKind = 'sensor-design' | 'sensor' | 'camera' | 'light' | 'scenario' | 'run';

/** What {@link validateConfig} returns for each kind. */
export interface ConfigTypes {
  /** The design calculator's input. */
  'sensor-design': SensorDesignJson;
  /** A built sensor. */
  sensor: SensorJson;
  /** How the camera sees the plane. */
  camera: CameraJson;
  /** A guide light. */
  light: LightJson;
  /** A simulated experiment. */
  scenario: ScenarioJson;
  /** A processing run. */
  run: RunConfigJson;
}

/**
 * The schema of every configuration kind (JSON Schema draft-07), for users who generate
 * or check their configuration files with their own tools.
 *
 * @example
 * ```ts
 * import { CONFIG_SCHEMAS } from 'meniscus/node';
 * import { writeFileSync } from 'node:fs';
 * writeFileSync('run.schema.json', JSON.stringify(CONFIG_SCHEMAS.run, null, 2));
 * ```
 */
export const CONFIG_SCHEMAS: Readonly<Record<ConfigKind, JsonSchema>> = {
  'sensor-design': SENSOR_DESIGN_SCHEMA,
  sensor: SENSOR_SCHEMA,
  camera: CAMERA_SCHEMA,
  light: LIGHT_SCHEMA,
  scenario: SCENARIO_SCHEMA,
  run: RUN_SCHEMA,
};

/** The configuration kinds, in a fixed order. */
export const CONFIG_KINDS: readonly ConfigKind[] = ['sensor-design', 'sensor', 'camera', 'light', 'scenario', 'run'];

/** One thing wrong with a configuration. */
export interface ConfigIssue {
  /** JSON pointer (RFC 6901) of the field, `""` for the whole document. */
  readonly pointer: string;
  /** The value found there (`undefined` when the field is missing). */
  readonly value: unknown;
  /** What was expected, in words. */
  readonly expected: string;
  /** The schema's description of the field, when it has one. */
  readonly description?: string;
  /** The schema keyword that failed (`"type"`, `"minimum"`, `"required"`, …; `"json"` for a syntax error). */
  readonly keyword: string;
}

/**
 * Thrown by {@link validateConfig} and {@link readConfigFile} when a configuration does
 * not match its schema (or is not JSON). `parameter` is the first wrong field's JSON
 * pointer; `issues` lists all of them; the message has one line per issue.
 */
export class ConfigValidationError extends MeniscusRangeError {
  /** Every issue found. */
  readonly issues: readonly ConfigIssue[];
  /** The configuration kind. */
  readonly kind: ConfigKind;
  /** Where the configuration came from (a file path, or the kind). */
  readonly source: string;
  /**
   * @param kind - The configuration kind.
   * @param source - Where the configuration came from.
   * @param issues - The issues found (at least one).
   * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a kind
   *   that is not a configuration kind, a source that is not a string, or issues that
   *   are not a non-empty array of {@link ConfigIssue}s.
   */
  constructor(kind: ConfigKind, source: string, issues: readonly ConfigIssue[]) {
    checkOneOf('ConfigValidationError', 'kind', kind, CONFIG_KINDS);
    if (typeof source !== 'string') typeError('ConfigValidationError', 'source', source, 'a string');
    if (!Array.isArray(issues)) typeError('ConfigValidationError', 'issues', issues, 'a non-empty array of configuration issues');
    if (issues.length === 0) rangeError('ConfigValidationError', 'issues', issues, 'a non-empty array of configuration issues');
    for (let k = 0; k < issues.length; k++) checkIssue('ConfigValidationError', `issues[${k}]`, issues[k]);
    const first = issues[0]!;
    super({ fn: 'validateConfig', parameter: first.pointer || '/', value: first.value, expected: first.expected });
    this.issues = issues;
    this.kind = kind;
    this.source = source;
    this.message = `${source}: ${issues.length} problem${issues.length === 1 ? '' : 's'} in the ${kind} configuration\n${issues.map(formatConfigIssue).join('\n')}`;
  }
}

/**
 * One issue as a line of text: `  /pointer: expected …; got … (description)`.
 *
 * @param issue - An issue.
 * @returns The line.
 * @throws {@link core!MeniscusTypeError} when `issue` is not an object with string
 *   `pointer`, `expected` and `keyword`.
 * @example
 * ```ts
 * formatConfigIssue({ pointer: '/pitch', value: -1, expected: 'a number > 0', keyword: 'exclusiveMinimum' });
 * // "  /pitch: expected a number > 0; got -1"
 * ```
 */
export function formatConfigIssue(issue: ConfigIssue): string {
  checkIssue('formatConfigIssue', 'issue', issue);
  const got = issue.keyword === 'required' ? 'it is missing' : `got ${describeValue(issue.value)}`;
  return `  ${issue.pointer || '/'}: expected ${issue.expected}; ${got}${issue.description ? ` (${issue.description.replace(/\.$/, '')})` : ''}`;
}

/** Require a {@link ConfigIssue}: an object with string `pointer`, `expected` and `keyword` (and `description`, when given). */
function checkIssue(fn: string, parameter: string, issue: unknown): asserts issue is ConfigIssue {
  if (typeof issue !== 'object' || issue === null) typeError(fn, parameter, issue, 'a configuration issue { pointer, value, expected, keyword }');
  const o = issue as Record<string, unknown>;
  for (const key of ['pointer', 'expected', 'keyword'] as const) {
    if (typeof o[key] !== 'string') typeError(fn, `${parameter}.${key}`, o[key], 'a string');
  }
  if (o.description !== undefined && typeof o.description !== 'string') typeError(fn, `${parameter}.description`, o.description, 'a string or undefined');
}

let ajv: Ajv | null = null;
const compiled = new Map<ConfigKind, ValidateFunction>();

function validator(kind: ConfigKind): ValidateFunction {
  let v = compiled.get(kind);
  if (v !== undefined) return v;
  if (ajv === null) {
    ajv = new Ajv({ allErrors: true, verbose: true, discriminator: true, strict: true, strictRequired: false, allowUnionTypes: true });
    for (const k of CONFIG_KINDS) ajv.addSchema(CONFIG_SCHEMAS[k] as object);
  }
  v = ajv.getSchema((CONFIG_SCHEMAS[kind] as { $id: string }).$id)!;
  compiled.set(kind, v);
  return v;
}

const TYPE_WORDS: Record<string, string> = {
  number: 'a number',
  integer: 'an integer',
  string: 'a string',
  boolean: 'true or false',
  array: 'an array',
  object: 'an object',
  null: 'null',
};

type Schemaish = { [k: string]: unknown };

function range(s: Schemaish): string {
  const what = s.type === 'integer' ? 'an integer' : 'a number';
  const lo = s.minimum as number | undefined, xlo = s.exclusiveMinimum as number | undefined;
  const hi = s.maximum as number | undefined, xhi = s.exclusiveMaximum as number | undefined;
  const fmt = (v: number): string => (Math.abs(v - Math.PI / 2) < 1e-15 ? 'π/2' : String(v));
  if ((lo !== undefined || xlo !== undefined) && (hi !== undefined || xhi !== undefined)) {
    return `${what} in ${lo !== undefined ? '[' + fmt(lo) : '(' + fmt(xlo!)}, ${hi !== undefined ? fmt(hi) + ']' : fmt(xhi!) + ')'}`;
  }
  if (xlo !== undefined) return `${what} > ${fmt(xlo)}`;
  if (lo !== undefined) return `${what} >= ${fmt(lo)}`;
  if (xhi !== undefined) return `${what} < ${fmt(xhi)}`;
  return `${what} <= ${fmt(hi!)}`;
}

function editDistance(a: string, b: string): number {
  const d = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = d[0]!;
    d[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const t = d[j]!;
      d[j] = Math.min(d[j]! + 1, d[j - 1]! + 1, prev + (a[i - 1]!.toLowerCase() === b[j - 1]!.toLowerCase() ? 0 : 1));
      prev = t;
    }
  }
  return d[b.length]!;
}

function escapePointer(key: string): string {
  return key.replace(/~/g, '~0').replace(/\//g, '~1');
}

function issueOf(e: ErrorObject): ConfigIssue {
  const parent = (e.parentSchema ?? {}) as Schemaish;
  const description = typeof parent.description === 'string' ? parent.description : undefined;
  const base = { pointer: e.instancePath, value: e.data, keyword: e.keyword };
  const p = e.params as Record<string, unknown>;
  switch (e.keyword) {
    case 'type': {
      const types = Array.isArray(p.type) ? (p.type as string[]) : String(p.type).split(',');
      const words = types.map((t) => TYPE_WORDS[t] ?? t).join(' or ');
      const bounded = ['minimum', 'maximum', 'exclusiveMinimum', 'exclusiveMaximum'].some((k) => k in parent);
      return { ...base, expected: bounded && types.every((t) => t === 'number' || t === 'integer') ? range(parent) : words, description };
    }
    case 'minimum':
    case 'maximum':
    case 'exclusiveMinimum':
    case 'exclusiveMaximum':
      return { ...base, expected: range(parent), description };
    case 'minItems':
    case 'maxItems': {
      const lo = parent.minItems as number | undefined, hi = parent.maxItems as number | undefined;
      const expected = lo !== undefined && lo === hi ? `an array of ${lo} items` : lo !== undefined && hi !== undefined ? `an array of ${lo} to ${hi} items` : lo !== undefined ? `an array of at least ${lo} items` : `an array of at most ${hi} items`;
      return { ...base, expected, description };
    }
    case 'enum':
      return { ...base, expected: `one of ${(p.allowedValues as unknown[]).map((v) => JSON.stringify(v)).join(', ')}`, description };
    case 'const':
      return { ...base, expected: JSON.stringify(p.allowedValue), description };
    case 'required': {
      const name = String(p.missingProperty);
      const props = (parent.properties ?? {}) as Record<string, Schemaish>;
      const d = props[name]?.description;
      return { pointer: `${e.instancePath}/${escapePointer(name)}`, value: undefined, keyword: 'required', expected: 'a value (this field is required)', description: typeof d === 'string' ? d : undefined };
    }
    case 'additionalProperties': {
      const name = String(p.additionalProperty);
      const allowed = Object.keys((parent.properties ?? {}) as object).filter((k) => k !== '$schema');
      let best = '', bestD = Infinity;
      for (const k of allowed) {
        const dd = editDistance(name, k);
        if (dd < bestD) [best, bestD] = [k, dd];
      }
      const hint = bestD <= Math.max(2, Math.floor(name.length / 3)) ? `; did you mean "${best}"?` : '';
      const obj = e.data as Record<string, unknown>;
      return {
        pointer: `${e.instancePath}/${escapePointer(name)}`,
        value: obj?.[name],
        keyword: 'additionalProperties',
        expected: `no field "${name}" here (allowed: ${allowed.join(', ')})${hint}`,
      };
    }
    case 'discriminator': {
      const tag = String(p.tag);
      const values = ((parent.oneOf ?? []) as Schemaish[]).map((b) => ((b.properties as Record<string, Schemaish>)?.[tag]?.const as string)).filter((v) => v !== undefined);
      const obj = e.data as Record<string, unknown> | null;
      return {
        pointer: `${e.instancePath}/${escapePointer(tag)}`,
        value: obj !== null && typeof obj === 'object' ? obj[tag] : undefined,
        keyword: 'discriminator',
        expected: `one of ${values.map((v) => JSON.stringify(v)).join(', ')}`,
        description: typeof parent.description === 'string' ? parent.description : undefined,
      };
    }
    default:
      return { ...base, expected: `a value that ${e.message ?? `satisfies "${e.keyword}"`}`, description };
  }
}

/**
 * Check a configuration against its schema and list what is wrong (nothing when it is
 * valid), at most one issue per field, in the order the validator meets them.
 *
 * @param kind - The configuration kind.
 * @param value - The parsed JSON.
 * @returns The issues; empty when valid.
 * @throws {@link core!MeniscusRangeError} for an unknown kind.
 * @example
 * ```ts
 * import { checkConfig } from 'meniscus/node';
 * checkConfig('light', { kind: 'collimated', toLight: [0, 0] });
 * // [{ pointer: '/toLight', expected: 'an array of 3 items', … }]
 * ```
 */
export function checkConfig(kind: ConfigKind, value: unknown): ConfigIssue[] {
  if (!(CONFIG_KINDS as readonly string[]).includes(kind)) typeError('checkConfig', 'kind', kind, `one of ${CONFIG_KINDS.map((k) => JSON.stringify(k)).join(', ')}`);
  const v = validator(kind);
  if (v(value)) return [];
  const byPointer = new Map<string, ConfigIssue>();
  for (const e of v.errors ?? []) {
    if (e.keyword === 'if') continue; // the failing branch's own errors say it better
    const issue = issueOf(e);
    const had = byPointer.get(issue.pointer);
    // A discriminator's message (the allowed kinds) beats a bare "required".
    if (had === undefined || (had.keyword === 'required' && issue.keyword === 'discriminator')) byPointer.set(issue.pointer, issue);
  }
  return [...byPointer.values()];
}

/**
 * Validate a configuration and return it typed, or throw one error listing every
 * problem.
 *
 * @param kind - The configuration kind.
 * @param value - The parsed JSON.
 * @param source - Where it came from, for the message. @defaultValue the kind
 * @returns The same value, typed as {@link ConfigTypes}`[kind]`.
 * @throws {@link ConfigValidationError} when it does not match the schema.
 * @example
 * ```ts
 * import { validateConfig } from 'meniscus/node';
 * const light = validateConfig('light', JSON.parse('{"kind":"collimated","toLight":[0,0,1]}'));
 * ```
 */
export function validateConfig<K extends ConfigKind>(kind: K, value: unknown, source: string = kind): ConfigTypes[K] {
  const issues = checkConfig(kind, value);
  if (issues.length > 0) throw new ConfigValidationError(kind, source, issues);
  return value as ConfigTypes[K];
}

/**
 * Parse JSON text, turning a syntax error into a {@link ConfigValidationError} that
 * gives the line and column.
 *
 * @param kind - The configuration kind (for the message).
 * @param text - The JSON text.
 * @param source - Where it came from.
 * @returns The parsed value.
 * @throws {@link ConfigValidationError} for invalid JSON; {@link core!MeniscusTypeError} /
 *   {@link core!MeniscusRangeError} for an unknown kind or a text or source that is not a string.
 * @example
 * ```ts
 * parseConfigText('run', '{"frames": }', 'run.json'); // throws: … at line 1, column 12
 * ```
 */
export function parseConfigText(kind: ConfigKind, text: string, source: string): unknown {
  checkOneOf('parseConfigText', 'kind', kind, CONFIG_KINDS);
  if (typeof text !== 'string') typeError('parseConfigText', 'text', text, 'a string of JSON text');
  if (typeof source !== 'string') typeError('parseConfigText', 'source', source, 'a string');
  try {
    return JSON.parse(text) as unknown;
  } catch (e) {
    const [pos, what] = jsonErrorAt(text);
    const before = text.slice(0, pos).split('\n');
    const line = before.length, column = before[before.length - 1]!.length + 1;
    const shown = text.slice(pos, pos + 20).split('\n')[0];
    throw new ConfigValidationError(kind, source, [
      { pointer: '', value: shown === '' ? 'the end of the file' : shown, keyword: 'json', expected: `valid JSON: ${what} at line ${line}, column ${column}` },
    ]);
  }
}

/** Where the first syntax error of a JSON text is (offset) and what was expected there. */
function jsonErrorAt(text: string): [number, string] {
  let i = 0;
  class Stop extends Error {
    constructor(readonly at: number, readonly what: string) {
      super(what);
    }
  }
  const ws = (): void => {
    while (i < text.length && ' \t\n\r'.includes(text[i]!)) i++;
  };
  const fail = (what: string): never => {
    throw new Stop(i, what);
  };
  const str = (): void => {
    i++;
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text.charCodeAt(i) < 0x20) fail('no control character inside a string');
      i++;
    }
    if (i >= text.length) fail('a closing quote');
    i++;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') {
        i++;
        return;
      }
      for (;;) {
        ws();
        if (text[i] !== '"') fail('a field name in double quotes');
        str();
        ws();
        if (text[i] !== ':') fail('a colon');
        i++;
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === '}') {
          i++;
          return;
        }
        fail('a comma or a closing brace');
      }
    }
    if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') {
        i++;
        return;
      }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') {
          i++;
          continue;
        }
        if (text[i] === ']') {
          i++;
          return;
        }
        fail('a comma or a closing bracket');
      }
    }
    if (c === '"') return str();
    const m = /^(?:-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?|true|false|null)/.exec(text.slice(i, i + 400));
    if (m === null) fail('a value (number, string, true, false, null, object or array)');
    i += m![0].length;
  };
  try {
    value();
    ws();
    if (i < text.length) fail('the end of the file');
    return [0, 'unreadable text'];
  } catch (e) {
    if (e instanceof Stop) return [e.at, `expected ${e.what}`];
    throw e;
  }
}

/**
 * Read, parse and validate a configuration file.
 *
 * @param kind - The configuration kind.
 * @param path - The file.
 * @returns The validated configuration.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for an unknown
 *   kind or a path that is not a non-empty string;
 *   {@link ConfigValidationError} for invalid JSON or a schema mismatch; the file
 *   system's error (with its `code`, e.g. `ENOENT`) when it cannot be read.
 * @example
 * ```ts
 * import { readConfigFile } from 'meniscus/node';
 * const run = readConfigFile('run', 'tank-run.json');
 * ```
 */
export function readConfigFile<K extends ConfigKind>(kind: K, path: string): ConfigTypes[K] {
  checkOneOf('readConfigFile', 'kind', kind, CONFIG_KINDS);
  checkPathArg('readConfigFile', 'path', path);
  const text = readFileSync(path, 'utf8');
  return validateConfig(kind, parseConfigText(kind, text, path), path);
}
