/**
 * Camera models (pinhole with Brown–Conrady distortion, equidistant fisheye,
 * orthographic) behind one interface, camera poses and mirrors, flat-port housings, and
 * plane-to-image homographies.
 *
 * @module camera
 */
export type {
  CameraModel,
  CameraParameters,
  CameraRay,
  FisheyeParameters,
  MutablePixel,
  OrthographicParameters,
  PinholeParameters,
  Pixel,
  ProjectBatchOptions,
  ProjectBatchResult,
  UnprojectBatchOptions,
  UnprojectBatchResult,
} from './model.js';
export { checkPixel } from './model.js';
export * from './pinhole.js';
export * from './fisheye.js';
export * from './orthographic.js';
export * from './json.js';
export * from './pose.js';
export * from './flat-port.js';
export * from './homography.js';
