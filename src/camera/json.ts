/**
 * Camera parameters to and from plain JSON objects, in the common open names
 * (fx, fy, cx, cy, k1, k2, p1, p2, k3, k4, k5, k6).
 *
 * @module
 */
import { checkOneOf, typeError } from '../core/index.js';
import { FisheyeCamera } from './fisheye.js';
import type { CameraModel, CameraParameters } from './model.js';
import { OrthographicCamera } from './orthographic.js';
import { PinholeCamera } from './pinhole.js';

/**
 * Build a camera model from its plain parameters (as from `JSON.parse`). The `model`
 * field picks the model; missing distortion coefficients are 0.
 *
 * @param params - `{ model: 'pinhole' | 'fisheye' | 'orthographic', fx, fy, cx, cy, … }`.
 * @returns The camera model.
 * @throws {@link core!MeniscusTypeError} for a non-object or unknown model;
 *   {@link core!MeniscusRangeError} for bad values.
 * @example
 * ```ts
 * const cam = cameraFromJSON(JSON.parse('{"model":"pinhole","fx":800,"fy":800,"cx":320,"cy":240,"k1":-0.2}'));
 * ```
 */
export function cameraFromJSON(params: CameraParameters): CameraModel {
  const fn = 'cameraFromJSON';
  if (params === null || typeof params !== 'object' || Array.isArray(params)) {
    typeError(fn, 'params', params, 'a camera parameters object');
  }
  const model = checkOneOf(fn, 'params.model', (params as { model?: unknown }).model, ['pinhole', 'fisheye', 'orthographic'] as const);
  if (model === 'pinhole') return new PinholeCamera(params as CameraParameters & { model: 'pinhole' });
  if (model === 'fisheye') return new FisheyeCamera(params as CameraParameters & { model: 'fisheye' });
  return new OrthographicCamera(params as CameraParameters & { model: 'orthographic' });
}

/**
 * A camera model's parameters as a plain JSON object (the same as `camera.toJSON()`).
 *
 * @param camera - Any camera model.
 * @returns Its parameters.
 * @example
 * ```ts
 * JSON.stringify(cameraToJSON(cam));
 * ```
 */
export function cameraToJSON(camera: CameraModel): CameraParameters {
  if (camera === null || typeof camera !== 'object' || typeof (camera as CameraModel).toJSON !== 'function') {
    typeError('cameraToJSON', 'camera', camera, 'a camera model');
  }
  return camera.toJSON();
}
