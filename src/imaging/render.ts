/**
 * Rendering a scene through a water surface: the image a camera takes of a sky, a plane
 * above the water or a bottom below it, looking through a (wavy, flat or absent)
 * surface. This is the simulator's and the tests' source of truth.
 *
 * @module
 */
import { checkFinite, checkFloat64Array, checkImage, checkInteger, checkOneOf, checkOptions, createImage, rangeError, Status, typeError } from '../core/index.js';
import type { Image, Mask } from '../core/index.js';
import type { Surface } from '../surface/index.js';
import type { CameraModel, CameraPose } from '../camera/index.js';
import { interpolationCode, sampleInto } from './sample.js';
import type { ImageEdge, ImageInterpolation } from './sample.js';
import { resolveScene, sceneToTexture } from './scene.js';
import type { Scene } from './scene.js';
import { checkCamera, checkPoseValue, createRowTracer, traceContext, traceRay, worldRays } from './trace.js';
import type { MediumOptions } from './trace.js';
import type { CorrectionTarget } from './correct.js';

// Status codes as local constants (read once, not through the module namespace in loops).
const S_OK = Status.ok;
const S_OUTSIDE = Status.outside;

/** Options of {@link renderThroughSurface}. */
export interface RenderOptions extends MediumOptions {
  /** Image width, pixels. @defaultValue `camera.width` (required when the camera has none) */
  width?: number;
  /** Image height, pixels. @defaultValue `camera.height` */
  height?: number;
  /** Sub-samples per pixel side (the pixel's value is their mean). @defaultValue 1 */
  supersample?: number;
  /** Interpolation of the scene's texture. @defaultValue 'bilinear' */
  interpolation?: ImageInterpolation;
  /** Scene points beyond the texture: `'mask'` them or `'clamp'` to its edge. @defaultValue 'mask' */
  edge?: ImageEdge;
  /** Output image to reuse (`width × height × scene channels`). */
  out?: Image;
}

/** The result of {@link renderThroughSurface}. */
export interface RenderResult {
  /** The rendered image (linear intensity, the scene's channels); 0 where no sub-sample had a valid ray. */
  readonly image: Image;
  /** `1` where every sub-sample's ray reached the scene, `0` otherwise. */
  readonly mask: Mask;
  /**
   * One {@link Status} code a pixel: `ok`, or the first failure among its sub-samples:
   * `tir` (total internal reflection at the surface), `miss` (the ray left the
   * surface's domain without meeting it), `notConverged`, `outside` (beyond the
   * camera's field, beyond the texture, or a refracted ray that never reaches the plane).
   */
  readonly status: Uint8Array;
  /** Pixels with `mask = 0`. */
  readonly invalid: number;
}

/**
 * Render the image a camera takes of a scene through a water surface.
 *
 * Each (sub-)pixel's ray leaves the camera (any {@link CameraModel} at any
 * {@link CameraPose}), meets the surface (first crossing; camera below the surface looking
 * up, or above it looking down), refracts by the vector Snell law, travels to the scene
 * (a plane: the point where it meets `z = scene.z`; a sky: its direction) and reads the
 * scene's texture there. With `surface = null` the rays travel straight (no water at
 * all), which renders the "no water" reference.
 *
 * @param surface - The water surface, or `null` for no water.
 * @param camera - The camera model.
 * @param pose - The camera's pose (camera → world rotation and centre), world frame.
 * @param scene - What the camera looks at (see {@link SkyScene}, {@link PlaneScene}).
 * @param options - Size, supersampling, interpolation, refractive indices.
 * @returns The image, its mask and a status a pixel.
 * @throws {@link core!MeniscusRangeError} for a camera inside the surface's height range, a
 *   scene on the camera's side of the water, a sky under a camera above the water, or
 *   bad options; {@link core!MeniscusTypeError} for a malformed camera, pose, surface, scene
 *   or output image.
 * @see Snell's law in vector form: Glassner, A. S. (ed.) (1989), "An Introduction to Ray
 *   Tracing", Academic Press, ch. 4.
 * @example
 * ```ts
 * const camera = new PinholeCamera({ model: 'pinhole', fx: 300, fy: 300, cx: 127.5, cy: 127.5, width: 256, height: 256 });
 * const pose = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, -0.5]); // looking straight up
 * const board = { type: 'plane', z: 2, image: texture, dx: 0.005 } as const;
 * const { image, mask } = renderThroughSurface(sea, camera, pose, board, { supersample: 2 });
 * ```
 */
export function renderThroughSurface(surface: Surface | null, camera: CameraModel, pose: CameraPose, scene: Scene, options?: RenderOptions): RenderResult {
  const fn = 'renderThroughSurface';
  const cam = checkCamera(fn, 'camera', camera);
  const ps = checkPoseValue(fn, 'pose', pose);
  const sc = resolveScene(fn, 'scene', scene);
  const o = checkOptions(fn, options);
  const W = o.width !== undefined ? checkInteger(fn, 'options.width', o.width, 1, 65536) : cam.width;
  const H = o.height !== undefined ? checkInteger(fn, 'options.height', o.height, 1, 65536) : cam.height;
  if (W === undefined) rangeError(fn, 'options.width', undefined, 'an image width (the camera has none)');
  if (H === undefined) rangeError(fn, 'options.height', undefined, 'an image height (the camera has none)');
  const ss = o.supersample === undefined ? 1 : checkInteger(fn, 'options.supersample', o.supersample, 1, 16);
  const mode = interpolationCode(fn, 'options.interpolation', o.interpolation);
  const clamp = o.edge === undefined ? false : checkOneOf(fn, 'options.edge', o.edge, ['mask', 'clamp'] as const) === 'clamp';
  const ctx = traceContext(fn, surface, ps, sc, o);
  const C = sc.image.channels;
  let out: Image;
  if (o.out === undefined) out = createImage(W, H, C);
  else {
    out = checkImage(fn, 'options.out', o.out, true);
    if (out.width !== W || out.height !== H || out.channels !== C) typeError(fn, 'options.out', `${out.width}×${out.height}×${out.channels}`, `an image of ${W}×${H}×${C}`);
  }
  const tex = sc.image;
  const TW = tex.width, TH = tex.height;
  const mask = new Uint8Array(W * H);
  const status = new Uint8Array(W * H);
  const n = W * ss * ss;
  const pix = new Float64Array(2 * n);
  // the rays of a row, traced together, each from the hits of the rows above it
  const rows = createRowTracer(n);
  const rowStat = new Uint8Array(n);
  const rowPts = new Float64Array(3 * n);
  const uv = new Float64Array(2);
  const val = new Float32Array(C);
  const acc = new Float64Array(C);
  const od = out.data;
  let invalid = 0;
  for (let v = 0; v < H; v++) {
    let k = 0;
    for (let u = 0; u < W; u++) {
      for (let b = 0; b < ss; b++) {
        for (let a = 0; a < ss; a++) {
          pix[k++] = u + (a + 0.5) / ss - 0.5;
          pix[k++] = v + (b + 0.5) / ss - 0.5;
        }
      }
    }
    const rays = worldRays(cam, ps, pix);
    rows.traceRow(ctx, rays.origins, rays.directions, rays.status, 0, n, rowStat, rowPts);
    for (let u = 0; u < W; u++) {
      let first: number = S_OK;
      let good = 0;
      acc.fill(0);
      for (let q = 0; q < ss * ss; q++) {
        const r = u * ss * ss + q;
        let st: number = rowStat[r]!;
        if (st === S_OK) {
          if (!sceneToTexture(sc, rowPts[3 * r]!, rowPts[3 * r + 1]!, rowPts[3 * r + 2]!, uv, 0)) st = S_OUTSIDE;
          else if (!clamp && !(uv[0]! >= -0.5 && uv[0]! <= TW - 0.5 && uv[1]! >= -0.5 && uv[1]! <= TH - 0.5)) st = S_OUTSIDE;
        }
        if (st === S_OK) {
          sampleInto(tex.data, TW, TH, C, uv[0]!, uv[1]!, mode, val, 0);
          for (let c = 0; c < C; c++) acc[c]! += val[c]!;
          good++;
        } else if (first === S_OK) first = st;
      }
      const p = v * W + u;
      const inv = good > 0 ? 1 / good : 0;
      for (let c = 0; c < C; c++) od[p * C + c] = acc[c]! * inv;
      status[p] = first;
      mask[p] = first === S_OK ? 1 : 0;
      if (first !== S_OK) invalid++;
    }
  }
  return { image: out, mask, status, invalid };
}

/** Options of {@link traceToScene}. */
export type TraceToSceneOptions = MediumOptions;

/** The result of {@link traceToScene}. */
export interface TraceToSceneResult {
  /**
   * Packed xyz a pixel: the world point where the ray meets the scene plane (metres), or
   * for a sky the unit direction the ray travels after the surface; NaN where `status`
   * is not ok.
   */
  readonly points: Float64Array;
  /** Packed xyz: where the ray crossed the surface (the camera centre's side when `surface` is null); NaN where not ok. */
  readonly surfacePoints: Float64Array;
  /** One {@link Status} code a pixel: `ok`, `tir`, `miss`, `notConverged` or `outside`. */
  readonly status: Uint8Array;
}

/**
 * Where the rays of given pixels land in the scene after crossing the surface: the
 * geometric core of {@link renderThroughSurface}, in double precision.
 *
 * @param surface - The water surface, or `null` for no water.
 * @param camera - The camera model.
 * @param pose - Its pose in the world.
 * @param target - Where the scene lies (a sky, or a plane at height `z`).
 * @param pixels - Packed pixel positions `u v u v …`.
 * @param options - Refractive indices and the intersection tolerance.
 * @returns Scene points (or directions), surface crossings and a status a pixel.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} as {@link renderThroughSurface}.
 * @see Snell's law in vector form: Glassner, A. S. (ed.) (1989), "An Introduction to Ray
 *   Tracing", Academic Press, ch. 4.
 * @example
 * ```ts
 * const { points, status } = traceToScene(sea, camera, pose, { type: 'plane', z: 2 }, new Float64Array([10, 20]));
 * ```
 */
export function traceToScene(
  surface: Surface | null,
  camera: CameraModel,
  pose: CameraPose,
  target: CorrectionTarget,
  pixels: Float64Array,
  options?: TraceToSceneOptions,
): TraceToSceneResult {
  const fn = 'traceToScene';
  const cam = checkCamera(fn, 'camera', camera);
  const ps = checkPoseValue(fn, 'pose', pose);
  checkFloat64Array(fn, 'pixels', pixels, 2);
  if (target === null || typeof target !== 'object') typeError(fn, 'target', target, "a target { type: 'sky' } or { type: 'plane', z }");
  const type = checkOneOf(fn, 'target.type', (target as { type?: unknown }).type, ['sky', 'plane'] as const);
  const z = type === 'plane' ? checkFinite(fn, 'target.z', (target as { z?: unknown }).z) : Infinity;
  const sc = { kind: type === 'sky' ? 0 : 1, image: createImage(1, 1, 1), gnomonic: false, scale: 0, cu: 0, cv: 0, z, x0: 0, y0: 0, idx: 0, idy: 0 } as const;
  const ctx = traceContext(fn, surface, ps, sc, checkOptions(fn, options));
  const n = pixels.length / 2;
  const rays = worldRays(cam, ps, pixels);
  const points = new Float64Array(3 * n), surfacePoints = new Float64Array(3 * n), status = new Uint8Array(n);
  const hit = new Float64Array(6), res = new Float64Array(6);
  for (let k = 0; k < n; k++) {
    const a = 3 * k;
    let st: number = rays.status[k]!;
    if (st === S_OK) st = traceRay(ctx, rays.origins[a]!, rays.origins[a + 1]!, rays.origins[a + 2]!, rays.directions[a]!, rays.directions[a + 1]!, rays.directions[a + 2]!, hit, res);
    status[k] = st;
    for (let c = 0; c < 3; c++) {
      points[a + c] = st === S_OK ? res[c]! : NaN;
      surfacePoints[a + c] = st === S_OK ? res[3 + c]! : NaN;
    }
  }
  return { points, surfacePoints, status };
}
