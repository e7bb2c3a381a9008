/**
 * Turning validated configuration JSON into the library's objects: sensor geometry,
 * plane view, guide light, design input; and loading a run file whose parts may live in
 * files of their own.
 *
 * @module
 */
import { dirname, resolve } from 'node:path';
import { createCameraPose, cameraFromJSON, lookAt } from '../../camera/index.js';
import type { CameraPose } from '../../camera/index.js';
import { createApertureArray, createPlaneView, createSensorGeometry } from '../../sensor/index.js';
import type { PlaneView, SensorDesignInput, SensorGeometry } from '../../sensor/index.js';
import { createCollimatedLight, createPointLight, createSunLight } from '../../sun/index.js';
import type { GuideLight } from '../../sun/index.js';
import type { CorrectionJson, RunConfigJson } from './run.js';
import type { CameraJson, LightJson, ModelCameraJson, PoseJson, SensorDesignJson, SensorJson } from './types.js';
import { rangeError, typeError } from '../../core/index.js';
import { checkPathArg } from './paths.js';
import { ConfigValidationError, readConfigFile, validateConfig } from './validate.js';
import type { ConfigKind, ConfigTypes } from './validate.js';

/** A JSON pointer (`/sea/spectrum/k/0`) as a parameter path under `root` (`json.sea.spectrum.k[0]`). */
function pointerToPath(root: string, pointer: string): string {
  if (pointer === '') return root;
  return (
    root +
    pointer
      .slice(1)
      .split('/')
      .map((t) => t.replace(/~1/g, '/').replace(/~0/g, '~'))
      .map((t) => (/^\d+$/.test(t) ? `[${t}]` : `.${t}`))
      .join('')
  );
}

/**
 * Require `json` to match the schema of `kind` (which also rejects NaN and infinities):
 * a {@link core!MeniscusTypeError} for a non-object, a {@link core!MeniscusRangeError}
 * naming the first wrong field (`json.apertures.pitch`) otherwise.
 */
function checkJson<K extends ConfigKind>(fn: string, kind: K, json: unknown): ConfigTypes[K] {
  if (typeof json !== 'object' || json === null || Array.isArray(json)) typeError(fn, 'json', json, `an object (a ${kind} configuration)`);
  try {
    return validateConfig(kind, json, 'json');
  } catch (e) {
    if (!(e instanceof ConfigValidationError)) throw e;
    const first = e.issues[0]!;
    const more = e.issues.length > 1 ? ` (${e.issues.length - 1} more problem${e.issues.length === 2 ? '' : 's'} after this one)` : '';
    return rangeError(fn, pointerToPath('json', first.pointer), first.value, first.expected + more);
  }
}

/**
 * Build the sensor's geometry from its JSON form.
 *
 * @param json - A validated sensor (see `SENSOR_SCHEMA`).
 * @returns The geometry.
 * @throws {@link core!MeniscusTypeError} for a `json` that is not an object;
 *   {@link core!MeniscusRangeError} naming the field for one that does not match the
 *   schema (NaN and infinities included), and for values the schema cannot express (an aperture
 *   wider than the pitch, a matrix that is not a rotation).
 * @example
 * ```ts
 * const g = sensorFromJson({ apertures: { pitch: 0.01, columns: 8, rows: 8, apertureDiameter: 0.001 },
 *   maskDepth: 0.3, planeDistance: 0.05 });
 * ```
 */
export function sensorFromJson(json: SensorJson): SensorGeometry {
  const { apertures, ...rest } = checkJson('sensorFromJson', 'sensor', json);
  delete (rest as { $schema?: string }).$schema;
  return createSensorGeometry({ ...rest, apertures: createApertureArray(apertures) });
}

/**
 * Build the camera's view of the plane from its JSON form.
 *
 * @param json - A validated camera view (see `CAMERA_SCHEMA`).
 * @returns The view.
 * @throws {@link core!MeniscusTypeError} for a `json` that is not an object;
 *   {@link core!MeniscusRangeError} naming the field for one that does not match the
 *   schema, for a pose whose matrix is not a rotation, or
 *   camera parameters the model refuses.
 * @example
 * ```ts
 * const view = viewFromJson({ kind: 'plane', width: 256, height: 256, pixelSize: 4e-4 });
 * ```
 */
export function viewFromJson(json: CameraJson): PlaneView {
  checkJson('viewFromJson', 'camera', json);
  if (json.kind === 'plane') {
    const { kind: _k, $schema: _s, ...o } = json;
    return createPlaneView(o);
  }
  if (json.kind === 'homography') return { width: json.width, height: json.height, planeToPixel: json.planeToPixel };
  return { width: json.width, height: json.height, camera: cameraFromJSON(json.camera), pose: poseFromJson(json.pose) };
}

/**
 * Build a camera pose from its JSON form.
 *
 * @param json - `{ rotation, position }` or `{ eye, target, up? }`.
 * @returns The pose.
 * @throws {@link core!MeniscusTypeError} for a `json` that is not an object;
 *   {@link core!MeniscusRangeError} for a matrix that is not a rotation, or an eye
 *   on its target.
 * @example
 * ```ts
 * poseFromJson({ eye: [0, 0, -1], target: [0, 0, 0], up: [0, 1, 0] }); // looking straight up
 * ```
 */
export function poseFromJson(json: PoseJson): CameraPose {
  if (typeof json !== 'object' || json === null || Array.isArray(json)) typeError('poseFromJson', 'json', json, 'an object { rotation, position } or { eye, target, up? }');
  if ('eye' in json) return lookAt(json.eye, json.target, json.up ?? [0, 0, 1]);
  return createCameraPose(json.rotation, json.position);
}

/**
 * Build a guide light from its JSON form.
 *
 * @param json - A validated light (see `LIGHT_SCHEMA`).
 * @param source - Where it came from, for the message of an unreadable time.
 * @returns The guide light.
 * @throws {@link core!MeniscusTypeError} for a `json` that is not an object or a
 *   `source` that is not a string; {@link core!MeniscusRangeError} naming the field for
 *   one that does not match the schema;
 *   {@link ConfigValidationError} for a time string that is not a date;
 *   {@link core!MeniscusRangeError} for a zero direction.
 * @example
 * ```ts
 * const sun = lightFromJson({ kind: 'sun', time: '2024-06-21T10:00:00Z', site: { latitudeDeg: 47.2, longitudeDeg: 8.5 } });
 * ```
 */
export function lightFromJson(json: LightJson, source = 'light'): GuideLight {
  if (typeof source !== 'string') typeError('lightFromJson', 'source', source, 'a string');
  checkJson('lightFromJson', 'light', json);
  if (json.kind === 'collimated') return createCollimatedLight(json.toLight, json.angularRadius ?? 0);
  if (json.kind === 'point') return createPointLight(json.position, json.radius ?? 0);
  const t = typeof json.time === 'number' ? json.time : Date.parse(json.time);
  if (!Number.isFinite(t)) {
    throw new ConfigValidationError('light', source, [{ pointer: '/time', value: json.time, keyword: 'format', expected: 'an ISO 8601 date-time such as "2024-06-21T10:00:00Z"' }]);
  }
  const options: { refraction?: boolean; pressureHPa?: number; temperatureC?: number } = {};
  if (json.refraction !== undefined) options.refraction = json.refraction;
  if (json.pressureHPa !== undefined) options.pressureHPa = json.pressureHPa;
  if (json.temperatureC !== undefined) options.temperatureC = json.temperatureC;
  return createSunLight(t, json.site, options);
}

/**
 * The design calculator's input from its JSON form (the spectrum's arrays become
 * `Float64Array`s).
 *
 * @param json - A validated design (see `SENSOR_DESIGN_SCHEMA`).
 * @returns The input of {@link sensor!designSensor}.
 * @throws {@link core!MeniscusTypeError} for a `json` that is not an object;
 *   {@link core!MeniscusRangeError} naming the JSON field (`json.sea.depth`) for one that
 *   does not match the schema, NaN and infinities included.
 * @example
 * ```ts
 * designSensor(designInputFromJson(readConfigFile('sensor-design', 'tank-sensor.json')));
 * ```
 */
export function designInputFromJson(json: SensorDesignJson): SensorDesignInput {
  const { $schema: _s, sea, ...rest } = checkJson('designInputFromJson', 'sensor-design', json);
  if (sea === undefined) return rest;
  const { spectrum, ...seaRest } = sea;
  return { ...rest, sea: spectrum === undefined ? seaRest : { ...seaRest, spectrum: { k: Float64Array.from(spectrum.k), F: Float64Array.from(spectrum.F) } } };
}

/** A run configuration with its parts read from their files. */
export interface LoadedRunConfig {
  /** The run, every part inline. */
  readonly run: Omit<RunConfigJson, 'correct'> & { sensor: SensorJson; camera: CameraJson; light: LightJson; correct?: CorrectionJson & { camera: ModelCameraJson } };
  /** The folder the run file lies in (parts' paths are relative to it). */
  readonly baseDir: string;
  /** The file each part came from (the run file itself for inline parts). */
  readonly sources: { readonly sensor: string; readonly camera: string; readonly light: string; readonly sceneCamera?: string };
}

/**
 * Read and validate a run file, then read and validate each part given as a path
 * (relative to the run file's folder).
 *
 * @param path - The run file.
 * @returns The run with every part inline.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a path
 *   that is not a non-empty string; {@link ConfigValidationError} for a file that does not match its schema; the
 *   file system's error when a file cannot be read.
 * @example
 * ```ts
 * const { run } = loadRunConfig('tank/run.json');
 * const geometry = sensorFromJson(run.sensor);
 * ```
 */
export function loadRunConfig(path: string): LoadedRunConfig {
  checkPathArg('loadRunConfig', 'path', path);
  const raw = readConfigFile('run', path);
  return resolveRunConfig(raw, path);
}

/**
 * Resolve the parts of an already parsed run configuration that are given as paths.
 *
 * @param run - A run configuration (validated here again).
 * @param path - The run file's path (parts' paths are relative to its folder); a
 *   made-up name such as `"run.json"` in the current folder when it did not come from a
 *   file.
 * @returns The run with every part inline.
 * @throws As {@link loadRunConfig}.
 * @example
 * ```ts
 * const { run } = resolveRunConfig({ sensor: 'sensor.json', camera: {...}, light: {...} }, 'tank/run.json');
 * ```
 */
export function resolveRunConfig(run: unknown, path: string): LoadedRunConfig {
  checkPathArg('resolveRunConfig', 'path', path);
  const raw = validateConfig('run', run, path);
  const baseDir = dirname(resolve(path));
  const part = <K extends 'sensor' | 'camera' | 'light'>(kind: K, value: unknown, field: string = kind): [unknown, string] => {
    if (typeof value !== 'string') return [value, path];
    if (value === '' || value.includes('\0')) rangeError('resolveRunConfig', `run.${field}`, value, 'an inline part or a non-empty file path without NUL characters');
    const file = resolve(baseDir, value);
    return [readConfigFile(kind, file), file];
  };
  const [sensor, sensorSrc] = part('sensor', raw.sensor);
  const [camera, cameraSrc] = part('camera', raw.camera);
  const [light, lightSrc] = part('light', raw.light);
  const out = { ...raw, sensor, camera, light } as LoadedRunConfig['run'];
  let correctSrc: string | undefined;
  if (raw.correct !== undefined) {
    const [c, src] = part('camera', raw.correct.camera, 'correct.camera');
    if ((c as CameraJson).kind !== 'camera') {
      const pointer = src === path ? '/correct/camera/kind' : '/kind';
      throw new ConfigValidationError('camera', src, [
        { pointer, value: (c as CameraJson).kind, keyword: 'const', expected: '"camera" (the scene camera needs a camera model and a pose)' },
      ]);
    }
    out.correct = { ...raw.correct, camera: c as ModelCameraJson };
    correctSrc = src;
  }
  return { run: out, baseDir, sources: { sensor: sensorSrc, camera: cameraSrc, light: lightSrc, ...(correctSrc === undefined ? {} : { sceneCamera: correctSrc }) } };
}
