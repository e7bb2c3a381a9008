/**
 * Seeing through the surface: sampling images at real-valued positions, sRGB ↔ linear
 * conversion, rendering a scene (a sky, a plane above the water, a bottom below it)
 * through any surface for any camera, and correcting an image taken through a measured
 * surface to the view through flat water (or through no water), exactly or fast.
 *
 * @module imaging
 */
export * from './sample.js';
export type { SkyScene, PlaneScene, Scene } from './scene.js';
export type { MediumOptions } from './trace.js';
export type { CorrectionReference } from './flat.js';
export * from './render.js';
export * from './correct.js';
export { srgbEncode, srgbDecode, srgbEncodeArray, srgbDecodeArray, srgbByteToLinear } from '../viz/srgb.js';
export type { SrgbArray } from '../viz/srgb.js';
