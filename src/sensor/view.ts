/**
 * How the camera sees the detection plane: a plane-to-pixel homography (a bare image
 * sensor, or a camera whose distortion is negligible) or a full camera model with its
 * pose. Both map plane coordinates (metres, see {@link SensorGeometry}) to pixels and
 * back. Rays between the plane and the camera are taken as straight lines.
 *
 * @module
 */
import { checkFloat64Array, checkInteger, checkOptions, checkPositive, checkFinite, typeError, rangeError, Status } from '../core/index.js';
import type { Mat3, MutableVec3 } from '../core/index.js';
import { cameraDirectionToWorld, cameraToWorld, worldToCamera } from '../camera/pose.js';
import type { CameraPose } from '../camera/pose.js';
import { invertHomography } from '../camera/homography.js';
import type { CameraModel } from '../camera/model.js';
import type { SensorGeometry } from './geometry.js';

/** The plane seen through a homography: `pixel ∝ H · [x, y, 1]` with `(x, y)` plane coordinates in metres. */
export interface HomographyPlaneView {
  /** Image width, pixels. */
  readonly width: number;
  /** Image height, pixels. */
  readonly height: number;
  /** Plane (metres) → pixel homography, row-major. */
  readonly planeToPixel: Mat3;
}

/** The plane seen by a camera model at a pose (world frame). */
export interface CameraPlaneView {
  /** Image width, pixels. */
  readonly width: number;
  /** Image height, pixels. */
  readonly height: number;
  /** The camera model. */
  readonly camera: CameraModel;
  /** The camera's pose in the world. */
  readonly pose: CameraPose;
}

/** Either way of seeing the plane. */
export type PlaneView = HomographyPlaneView | CameraPlaneView;

/** Options of {@link createPlaneView}. */
export interface PlaneViewOptions {
  /** Image width, pixels. */
  width: number;
  /** Image height, pixels. */
  height: number;
  /** Size of one pixel on the plane, metres. */
  pixelSize: number;
  /** Plane coordinates seen at the image centre, metres. @defaultValue [0, 0] */
  centre?: readonly [number, number];
  /** Image rows run along +y (`true`) or −y (`false`, the plane's y up in the picture). @defaultValue false */
  yDown?: boolean;
}

/**
 * A plane view for a bare image sensor in the plane (or a telecentric camera): a
 * scale-and-shift homography.
 *
 * @param options - Image size, pixel size on the plane, centre.
 * @returns The view.
 * @throws {@link core!MeniscusRangeError} for non-positive sizes.
 * @example
 * ```ts
 * const view = createPlaneView({ width: 1024, height: 1024, pixelSize: 50e-6 });
 * ```
 */
export function createPlaneView(options: PlaneViewOptions): HomographyPlaneView {
  const fn = 'createPlaneView';
  const o = checkOptions(fn, options);
  const width = checkInteger(fn, 'options.width', o.width, 1, 65536);
  const height = checkInteger(fn, 'options.height', o.height, 1, 65536);
  const s = checkPositive(fn, 'options.pixelSize', o.pixelSize);
  let cx = 0, cy = 0;
  if (o.centre !== undefined) {
    cx = checkFinite(fn, 'options.centre[0]', o.centre[0]);
    cy = checkFinite(fn, 'options.centre[1]', o.centre[1]);
  }
  const sy = o.yDown ? 1 / s : -1 / s;
  const u0 = (width - 1) / 2, v0 = (height - 1) / 2;
  return { width, height, planeToPixel: [1 / s, 0, u0 - cx / s, 0, sy, v0 - cy * sy, 0, 0, 1] };
}

/** @internal Pixel ↔ plane mapping prepared from a view. */
export interface PlaneMapper {
  readonly width: number;
  readonly height: number;
  /** Plane → pixel; false when not visible. */
  toPixel(x: number, y: number, out: Float64Array | number[]): boolean;
  /** Pixel → plane; false when the pixel does not see the plane. */
  toPlane(u: number, v: number, out: Float64Array | number[]): boolean;
  /** Homography case: H⁻¹ for fast loops, else null. */
  readonly inverse: Mat3 | null;
}

/** @internal Validate a view and prepare its mapping. */
export function planeMapper(fn: string, view: unknown, geometry: SensorGeometry): PlaneMapper {
  if (view === null || typeof view !== 'object') typeError(fn, 'view', view, 'a PlaneView (createPlaneView, or { width, height, camera, pose })');
  const v = view as Partial<HomographyPlaneView & CameraPlaneView>;
  const width = checkInteger(fn, 'view.width', v.width, 1, 65536);
  const height = checkInteger(fn, 'view.height', v.height, 1, 65536);
  if (v.planeToPixel !== undefined) {
    const H = v.planeToPixel;
    const Hi = invertHomography(H);
    return {
      width,
      height,
      inverse: Hi,
      toPixel(x, y, out) {
        const w = H[6] * x + H[7] * y + H[8];
        if (!(w > 0 || w < 0)) return false;
        out[0] = (H[0] * x + H[1] * y + H[2]) / w;
        out[1] = (H[3] * x + H[4] * y + H[5]) / w;
        return true;
      },
      toPlane(u, vv, out) {
        const w = Hi[6] * u + Hi[7] * vv + Hi[8];
        if (!(w > 0 || w < 0)) return false;
        out[0] = (Hi[0] * u + Hi[1] * vv + Hi[2]) / w;
        out[1] = (Hi[3] * u + Hi[4] * vv + Hi[5]) / w;
        return true;
      },
    };
  }
  if (v.camera === undefined || v.pose === undefined || typeof v.camera.project !== 'function') {
    typeError(fn, 'view', view, 'a PlaneView with planeToPixel, or with camera and pose');
  }
  const cam = v.camera, pose = v.pose;
  const R = geometry.rotation, c = geometry.centre, d = geometry.planeDistance;
  const m: MutableVec3 = [R[2], R[5], R[8]];
  const P0: MutableVec3 = [c[0] - d * m[0], c[1] - d * m[1], c[2] - d * m[2]];
  return {
    width,
    height,
    inverse: null,
    toPixel(x, y, out) {
      const wp: MutableVec3 = [P0[0] + R[0] * x + R[1] * y, P0[1] + R[3] * x + R[4] * y, P0[2] + R[6] * x + R[7] * y];
      const px = cam.project(worldToCamera(pose, wp));
      if (px === null) return false;
      out[0] = px[0];
      out[1] = px[1];
      return true;
    },
    toPlane(u, vv, out) {
      const ray = cam.unproject([u, vv]);
      if (ray === null) return false;
      const o = cameraToWorld(pose, ray.origin);
      const dir = cameraDirectionToWorld(pose, ray.direction);
      const den = dir[0] * m[0] + dir[1] * m[1] + dir[2] * m[2];
      if (!(den > 0 || den < 0)) return false;
      const s = ((P0[0] - o[0]) * m[0] + (P0[1] - o[1]) * m[1] + (P0[2] - o[2]) * m[2]) / den;
      if (!(s > 0)) return false;
      const qx = o[0] + s * dir[0] - P0[0], qy = o[1] + s * dir[1] - P0[1], qz = o[2] + s * dir[2] - P0[2];
      out[0] = qx * R[0] + qy * R[3] + qz * R[6];
      out[1] = qx * R[1] + qy * R[4] + qz * R[7];
      return true;
    },
  };
}

/** Spot positions and their covariance on the plane. */
export interface PlaneSpots {
  /** Plane x, metres (NaN where the pixel does not see the plane). */
  readonly x: Float64Array;
  /** Plane y, metres. */
  readonly y: Float64Array;
  /** Covariance entries of (x, y), m²: `cxx`, `cxy`, `cyy`. */
  readonly cxx: Float64Array;
  /** See `cxx`. */
  readonly cxy: Float64Array;
  /** See `cxx`. */
  readonly cyy: Float64Array;
  /** `Status.ok`, or `Status.outside` where the pixel does not see the plane. */
  readonly status: Uint8Array;
}

/**
 * Map spot centres from pixels to plane coordinates, with the covariance carried through
 * the local Jacobian of the mapping.
 *
 * @param geometry - The sensor (for a camera view).
 * @param view - How the camera sees the plane.
 * @param px - Spot x, pixels.
 * @param py - Spot y, pixels.
 * @param sigmaX - 1-σ of `px`, pixels (optional; zero covariance when absent).
 * @param sigmaY - 1-σ of `py`, pixels.
 * @returns Plane positions and covariances.
 * @throws {@link core!MeniscusTypeError} for mismatched lengths or a malformed view.
 * @example
 * ```ts
 * const ps = pixelsToPlane(geometry, view, spots.x, spots.y, spots.sigmaX, spots.sigmaY);
 * ```
 */
export function pixelsToPlane(
  geometry: SensorGeometry,
  view: PlaneView,
  px: Float64Array,
  py: Float64Array,
  sigmaX?: Float64Array,
  sigmaY?: Float64Array,
): PlaneSpots {
  const fn = 'pixelsToPlane';
  checkFloat64Array(fn, 'px', px);
  const n = px.length;
  checkFloat64Array(fn, 'py', py, 1, n);
  if (sigmaX !== undefined) checkFloat64Array(fn, 'sigmaX', sigmaX, 1, n);
  if (sigmaY !== undefined) checkFloat64Array(fn, 'sigmaY', sigmaY, 1, n);
  const map = planeMapper(fn, view, geometry);
  const x = new Float64Array(n), y = new Float64Array(n), cxx = new Float64Array(n), cxy = new Float64Array(n), cyy = new Float64Array(n);
  const status = new Uint8Array(n);
  const a = [0, 0], b = [0, 0], c = [0, 0];
  for (let k = 0; k < n; k++) {
    const u = px[k]!, v = py[k]!;
    if (!Number.isFinite(u) || !Number.isFinite(v)) rangeError(fn, `px/py[${k}]`, [u, v], 'a finite pixel position');
    if (!map.toPlane(u, v, a) || !map.toPlane(u + 0.5, v, b) || !map.toPlane(u, v + 0.5, c)) {
      x[k] = y[k] = cxx[k] = cxy[k] = cyy[k] = NaN;
      status[k] = Status.outside;
      continue;
    }
    x[k] = a[0]!;
    y[k] = a[1]!;
    const j00 = (b[0]! - a[0]!) * 2, j10 = (b[1]! - a[1]!) * 2, j01 = (c[0]! - a[0]!) * 2, j11 = (c[1]! - a[1]!) * 2;
    const su = sigmaX ? sigmaX[k]! ** 2 : 0, sv = sigmaY ? sigmaY[k]! ** 2 : 0;
    cxx[k] = j00 * j00 * su + j01 * j01 * sv;
    cxy[k] = j00 * j10 * su + j01 * j11 * sv;
    cyy[k] = j10 * j10 * su + j11 * j11 * sv;
    status[k] = Status.ok;
  }
  return { x, y, cxx, cxy, cyy, status };
}
