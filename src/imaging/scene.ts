/**
 * Scenes the imaging code can see through a surface: a scene at infinity (a sky image
 * given by direction) and a textured plane at a given height (above the water, or a
 * bottom below it).
 *
 * @module
 */
import { checkFinite, checkImage, checkOneOf, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';

/**
 * A scene at infinity: every direction of arrival has a colour, read from `image`.
 *
 * Directions are world directions of travel *away from the water* (towards the sky).
 * - `'equirectangular'`: column `u = azimuth / 2π · width − 0.5` with the azimuth
 *   clockwise from north (`atan2(east, north)` in `[0, 2π)`), row
 *   `v = zenith angle / (π/2) · height − 0.5`: the image spans the upper hemisphere,
 *   the zenith along the top edge, the horizon along the bottom edge.
 * - `'gnomonic'`: the sky projected onto a horizontal plane at unit height,
 *   `u = centre[0] + scale · d_x / d_z`, `v = centre[1] + scale · d_y / d_z` (east to
 *   the right, north down the rows); directions at or below the horizon are outside.
 */
export interface SkyScene {
  /** Scene tag. */
  type: 'sky';
  /** The sky, linear intensity. */
  image: Image;
  /** How directions map to pixels. @defaultValue 'equirectangular' */
  mapping?: 'equirectangular' | 'gnomonic';
  /** Gnomonic scale, pixels per unit of `tan(zenith angle)`. @defaultValue `min(width, height) / 2` */
  scale?: number;
  /** Gnomonic pixel of the zenith. @defaultValue the image centre `[(width − 1)/2, (height − 1)/2]` */
  centre?: readonly [number, number];
}

/**
 * A textured horizontal plane `z = z` (world frame, metres): above the water for a camera
 * below it, or a bottom below the water for a camera above it. Texture pixel `(u, v)`
 * (centres at integers) sits at world `x = x0 + u·dx`, `y = y0 + v·dy`, as for a `Grid`.
 */
export interface PlaneScene {
  /** Scene tag. */
  type: 'plane';
  /** Height of the plane, metres (world frame, mean water level 0). */
  z: number;
  /** The plane's texture, linear intensity. */
  image: Image;
  /** World x of texture column 0, metres. @defaultValue centres the texture on x = 0 */
  x0?: number;
  /** World y of texture row 0, metres. @defaultValue centres the texture on y = 0 */
  y0?: number;
  /** Texture pixel size along x, metres (> 0). */
  dx: number;
  /** Texture pixel size along y, metres. @defaultValue `dx` */
  dy?: number;
}

/** Any scene. */
export type Scene = SkyScene | PlaneScene;

/** @internal A validated scene. */
export interface ResolvedScene {
  readonly kind: 0 | 1; // 0 sky, 1 plane
  readonly image: Image;
  // sky
  readonly gnomonic: boolean;
  readonly scale: number;
  readonly cu: number;
  readonly cv: number;
  // plane
  readonly z: number;
  readonly x0: number;
  readonly y0: number;
  readonly idx: number;
  readonly idy: number;
}

/** @internal Validate a scene given by a user. */
export function resolveScene(fn: string, parameter: string, value: unknown): ResolvedScene {
  if (value === null || typeof value !== 'object') typeError(fn, parameter, value, "a scene { type: 'sky' | 'plane', … }");
  const s = value as Partial<PlaneScene> & Partial<Omit<SkyScene, 'type'>> & { type?: unknown };
  const type = checkOneOf(fn, `${parameter}.type`, s.type, ['sky', 'plane'] as const);
  const image = checkImage(fn, `${parameter}.image`, s.image);
  if (type === 'sky') {
    const sk = checkOptions(fn, value as SkyScene, parameter);
    const mapping = sk.mapping === undefined ? 'equirectangular' : checkOneOf(fn, `${parameter}.mapping`, sk.mapping, ['equirectangular', 'gnomonic'] as const);
    const scale = sk.scale === undefined ? Math.min(image.width, image.height) / 2 : checkPositive(fn, `${parameter}.scale`, sk.scale);
    let cu = (image.width - 1) / 2, cv = (image.height - 1) / 2;
    if (sk.centre !== undefined) {
      if (!Array.isArray(sk.centre) || sk.centre.length !== 2) typeError(fn, `${parameter}.centre`, sk.centre, 'a pixel [u, v]');
      cu = checkFinite(fn, `${parameter}.centre[0]`, sk.centre[0]);
      cv = checkFinite(fn, `${parameter}.centre[1]`, sk.centre[1]);
    }
    return { kind: 0, image, gnomonic: mapping === 'gnomonic', scale, cu, cv, z: Infinity, x0: 0, y0: 0, idx: 0, idy: 0 };
  }
  const z = checkFinite(fn, `${parameter}.z`, s.z);
  const dx = checkPositive(fn, `${parameter}.dx`, s.dx);
  const dy = s.dy === undefined ? dx : checkPositive(fn, `${parameter}.dy`, s.dy);
  const x0 = s.x0 === undefined ? (-(image.width - 1) * dx) / 2 : checkFinite(fn, `${parameter}.x0`, s.x0);
  const y0 = s.y0 === undefined ? (-(image.height - 1) * dy) / 2 : checkFinite(fn, `${parameter}.y0`, s.y0);
  if (!Number.isFinite(dx) || !Number.isFinite(dy)) rangeError(fn, `${parameter}.dx`, dx, 'a finite pixel size');
  return { kind: 1, image, gnomonic: false, scale: 0, cu: 0, cv: 0, z, x0, y0, idx: 1 / dx, idy: 1 / dy };
}

/**
 * @internal Texture position of a scene point (plane: world x, y) or direction (sky:
 * unit direction towards the sky). Writes u, v into out[o], out[o+1]; returns false when
 * the direction has no pixel (gnomonic at or below the horizon, equirectangular below it).
 */
export function sceneToTexture(sc: ResolvedScene, a: number, b: number, c: number, out: Float64Array | Float32Array, o: number): boolean {
  if (sc.kind === 1) {
    out[o] = (a - sc.x0) * sc.idx;
    out[o + 1] = (b - sc.y0) * sc.idy;
    return true;
  }
  if (sc.gnomonic) {
    if (!(c > 0)) return false;
    out[o] = sc.cu + (sc.scale * a) / c;
    out[o + 1] = sc.cv + (sc.scale * b) / c;
    return true;
  }
  if (c < 0) return false;
  let az = Math.atan2(a, b);
  if (az < 0) az += 2 * Math.PI;
  const zen = Math.acos(c > 1 ? 1 : c);
  out[o] = (az / (2 * Math.PI)) * sc.image.width - 0.5;
  out[o + 1] = (zen / (Math.PI / 2)) * sc.image.height - 0.5;
  return true;
}
