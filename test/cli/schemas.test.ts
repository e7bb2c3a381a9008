import { describe, expect, it } from 'vitest';
import Ajv from 'ajv';
import {
  checkConfig,
  CONFIG_KINDS,
  CONFIG_SCHEMAS,
  ConfigValidationError,
  EXAMPLE_CONFIGS,
  lightFromJson,
  parseConfigText,
  resolveRunConfig,
  sensorFromJson,
  validateConfig,
  viewFromJson,
} from '../../src/node/schemas/index.js';
import { MeniscusRangeError } from '../../src/core/index.js';

describe('configuration schemas', () => {
  it('every schema is valid draft-07 for a second, independent ajv instance (JSON Schema draft-07 meta-schema)', () => {
    const ajv = new Ajv({ strict: false, validateSchema: true });
    for (const k of CONFIG_KINDS) expect(ajv.validateSchema(CONFIG_SCHEMAS[k] as object), k).toBe(true);
  });

  it('the example of every kind validates', () => {
    for (const k of CONFIG_KINDS) expect(checkConfig(k, EXAMPLE_CONFIGS[k]), k).toEqual([]);
  });

  it('names the wrong field by its JSON pointer (RFC 6901) with the expected range and the value', () => {
    const issues = checkConfig('sensor', { apertures: { pitch: -0.01, columns: 2.5, rows: 4, apertureDiameter: 0.001 }, maskDepth: 0.3, planeDistance: 0.05 });
    expect(issues.map((i) => i.pointer).sort()).toEqual(['/apertures/columns', '/apertures/pitch']);
    const pitch = issues.find((i) => i.pointer === '/apertures/pitch')!;
    expect(pitch.expected).toBe('a number > 0');
    expect(pitch.value).toBe(-0.01);
    const cols = issues.find((i) => i.pointer === '/apertures/columns')!;
    expect(cols.expected).toBe('an integer in [1, 65536]');
  });

  it('reports the expected type for a value of the wrong type', () => {
    const [i] = checkConfig('sensor', { apertures: { pitch: 0.01, columns: 4, rows: 4, apertureDiameter: 0.001 }, maskDepth: '0.3', planeDistance: 0.05 });
    expect(i).toMatchObject({ pointer: '/maskDepth', value: '0.3', expected: 'a number > 0', keyword: 'type' });
    const [j] = checkConfig('camera', { kind: 'plane', width: 64, height: 64, pixelSize: 1e-4, yDown: 'yes' });
    expect(j).toMatchObject({ pointer: '/yDown', expected: 'true or false' });
  });

  it('lists every problem at once (allErrors), missing fields by their pointer', () => {
    const issues = checkConfig('light', { kind: 'sun', time: '2024-06-01T12:00:00Z', site: { latitudeDeg: 95 } });
    expect(issues).toHaveLength(2);
    expect(issues.find((i) => i.pointer === '/site/longitudeDeg')).toMatchObject({ keyword: 'required', value: undefined });
    expect(issues.find((i) => i.pointer === '/site/latitudeDeg')).toMatchObject({ expected: 'a number in [-90, 90]' });
  });

  it('says which kinds exist when the "kind" is wrong, and only that', () => {
    const issues = checkConfig('camera', { kind: 'plain', width: 64 });
    expect(issues).toEqual([expect.objectContaining({ pointer: '/kind', value: 'plain', expected: 'one of "plane", "homography", "camera"' })]);
  });

  it('suggests the nearest field name for a misspelt one', () => {
    const [i] = checkConfig('sensor', { apertures: { pitch: 0.01, columns: 4, rows: 4, apertureDiameter: 0.001 }, maskDepht: 0.3, maskDepth: 0.3, planeDistance: 0.05 });
    expect(i!.pointer).toBe('/maskDepht');
    expect(i!.expected).toMatch(/did you mean "maskDepth"/);
  });

  it('follows references into the parts of a run file', () => {
    const issues = checkConfig('run', { sensor: 'sensor.json', camera: { kind: 'plane', width: 64, height: 64, pixelSize: 0 }, light: 'light.json', detect: { method: 'magic' } });
    expect(issues.map((i) => [i.pointer, i.expected])).toEqual([
      ['/camera/pixelSize', 'a number > 0'],
      ['/detect/method', 'one of "thresholded", "windowed", "iterative", "gaussian"'],
    ]);
  });

  it('throws one library error with a line per problem', () => {
    let err: unknown;
    try {
      validateConfig('light', { kind: 'collimated', toLight: [0, 0] }, 'lamp.json');
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(ConfigValidationError);
    expect(err).toBeInstanceOf(MeniscusRangeError);
    const e = err as ConfigValidationError;
    expect(e.parameter).toBe('/toLight');
    expect(e.message).toContain('lamp.json: 1 problem in the light configuration');
    expect(e.message).toContain('/toLight: expected an array of 3 items; got [0, 0]');
  });

  it('gives the line and column of a JSON syntax error', () => {
    expect(() => parseConfigText('run', '{\n  "sensor": ,\n}', 'run.json')).toThrow(/valid JSON: expected a value .* at line 2, column 13/);
  });

  it('an unreadable sun time is refused with its pointer', () => {
    expect(() => lightFromJson({ kind: 'sun', time: 'noon', site: { latitudeDeg: 50, longitudeDeg: 4 } })).toThrow(/\/time: expected an ISO 8601 date-time/);
  });

  it('builds working library objects from the examples', () => {
    const g = sensorFromJson(validateConfig('sensor', EXAMPLE_CONFIGS.sensor));
    expect(g.apertures.count).toBe(24 * 24);
    expect(g.maskDepth).toBe(0.3);
    const v = viewFromJson(validateConfig('camera', EXAMPLE_CONFIGS.camera));
    expect(v.width).toBe(512);
    const l = lightFromJson(validateConfig('light', EXAMPLE_CONFIGS.light));
    const d = l.toLight([0, 0, 0]);
    expect(Math.hypot(...d)).toBeCloseTo(1, 12);
  });

  it('reads the parts a run names as files, relative to the run file', () => {
    expect(() => resolveRunConfig(EXAMPLE_CONFIGS.run, '/nonexistent/run.json')).toThrow(/ENOENT/);
  });
});

describe('JSON syntax errors', () => {
  const where = (text: string): string => {
    try {
      parseConfigText('sensor', text, 's.json');
    } catch (e) {
      return (e as ConfigValidationError).issues[0]!.expected;
    }
    return 'parsed';
  };
  it('points at a missing comma, a trailing comma and an unquoted name (RFC 8259 grammar)', () => {
    expect(where('{"a": 1 "b": 2}')).toBe('valid JSON: expected a comma or a closing brace at line 1, column 9');
    expect(where('[1, 2, ]')).toMatch(/expected a value .* at line 1, column 8/);
    expect(where('{\n  pitch: 1\n}')).toBe('valid JSON: expected a field name in double quotes at line 2, column 3');
    expect(where('{"a": 1} x')).toBe('valid JSON: expected the end of the file at line 1, column 10');
    expect(where('{"a": 1}')).toBe('parsed');
  });
});
