/**
 * A camera in a housing behind a flat window (a flat port), looking into water: exact
 * forward projection of underwater points through both interfaces and unprojection of
 * pixels into rays in the water.
 *
 * **Geometry** (camera frame, metres): the window's faces are planes perpendicular to the
 * unit `normal` (default the optical axis `[0, 0, 1]`), the inner face at `distance`
 * from the camera centre, the outer face `thickness` further. Inside the housing is a
 * medium of index `nAir`, then glass `nGlass`, then water `nWater`. As Agrawal et al.
 * show, such a camera is an axial camera: every ray in the water meets the line through
 * the camera centre along the normal.
 *
 * @module
 */
import { checkDirection, checkNonNegative, checkOptions, checkPositive, checkVec3, Status, typeError } from '../core/index.js';
import type { MutableVec3, Vec3 } from '../core/index.js';
import { refract, refractBatch } from '../optics/index.js';
import type { CameraModel, CameraRay, MutablePixel, Pixel, ProjectBatchOptions, ProjectBatchResult, UnprojectBatchOptions, UnprojectBatchResult, CameraParameters } from './model.js';
import { checkPixel, projectBuffers, unprojectBuffers } from './model.js';

/** Parameters of a {@link FlatPortHousing}. */
export interface FlatPortOptions {
  /** The camera inside the housing (a central model: pinhole or fisheye). */
  camera: CameraModel;
  /** Distance from the camera centre to the window's inner face, along the normal, metres (> 0). */
  distance: number;
  /** Window thickness, metres (≥ 0). */
  thickness: number;
  /** Refractive index of the window. */
  nGlass: number;
  /** Refractive index of the water. */
  nWater: number;
  /** Refractive index inside the housing. @defaultValue 1 */
  nAir?: number;
  /** The window's normal in the camera frame, pointing out of the housing (normalised here). @defaultValue [0, 0, 1] */
  normal?: Vec3;
}

/** The plain-JSON form of a {@link FlatPortHousing}. */
export interface FlatPortParameters {
  /** The camera's parameters. */
  camera: CameraParameters;
  /** Inner-face distance, metres. */
  distance: number;
  /** Window thickness, metres. */
  thickness: number;
  /** Window index. */
  nGlass: number;
  /** Water index. */
  nWater: number;
  /** Housing index. */
  nAir: number;
  /** Window normal, camera frame. */
  normal: [number, number, number];
}

/** Tolerance of the forward solve, in the Snell invariant κ = n sin θ. */
export const FLAT_PORT_TOLERANCE = 1e-15;

/**
 * A camera behind a flat port.
 *
 * @see Agrawal, A., Ramalingam, S., Taguchi, Y. & Chari, V. (2012), "A theory of
 *   multi-layer flat refractive geometry", IEEE CVPR, 3346–3353 (the axial-camera
 *   geometry and the forward projection through parallel layers).
 * @see Treibitz, T., Schechner, Y. & Kunz, C. (2012), "Flat refractive geometry", IEEE
 *   TPAMI 34(1), 51–65.
 * @example
 * ```ts
 * const cam = new PinholeCamera({ model: 'pinhole', fx: 1000, fy: 1000, cx: 640, cy: 480 });
 * const port = new FlatPortHousing({ camera: cam, distance: 0.02, thickness: 0.01, nGlass: 1.49, nWater: 1.333 });
 * const px = port.project([0.2, 0.1, 1.5]);     // pixel of an underwater point
 * const ray = port.unproject(px!);              // ray in the water through that point
 * ```
 */
export class FlatPortHousing {
  /** The camera inside. */
  readonly camera: CameraModel;
  /** Inner-face distance, metres. */
  readonly distance: number;
  /** Window thickness, metres. */
  readonly thickness: number;
  /** Window index. */
  readonly nGlass: number;
  /** Water index. */
  readonly nWater: number;
  /** Housing index. */
  readonly nAir: number;
  /** Unit window normal, camera frame. */
  readonly normal: MutableVec3;

  /**
   * @param options - The camera, the window's geometry and the three indices.
   * @throws {@link core!MeniscusRangeError} for a distance ≤ 0, a negative thickness, an index
   *   ≤ 0 or a zero normal; {@link core!MeniscusTypeError} for a non-central camera.
   */
  constructor(options: FlatPortOptions) {
    const fn = 'FlatPortHousing';
    const o = checkOptions(fn, options);
    const cam = o.camera;
    if (cam === null || typeof cam !== 'object' || typeof cam.project !== 'function' || typeof cam.unproject !== 'function') {
      typeError(fn, 'options.camera', cam, 'a camera model');
    }
    if (!cam.central) typeError(fn, 'options.camera', cam.model, 'a central camera model (pinhole or fisheye)');
    this.camera = cam;
    this.distance = checkPositive(fn, 'options.distance', o.distance);
    this.thickness = checkNonNegative(fn, 'options.thickness', o.thickness);
    this.nGlass = checkPositive(fn, 'options.nGlass', o.nGlass);
    this.nWater = checkPositive(fn, 'options.nWater', o.nWater);
    this.nAir = o.nAir === undefined ? 1 : checkPositive(fn, 'options.nAir', o.nAir);
    this.normal = o.normal === undefined ? [0, 0, 1] : checkDirection(fn, 'options.normal', o.normal);
  }

  /**
   * The direction, in the housing, of the ray that reaches an underwater point: the
   * exact solution of the refraction through both faces, by a safeguarded Newton solve
   * of the 1-D equation in the Snell invariant κ = n sin θ,
   * ρ = d κ/√(nA² − κ²) + t κ/√(nG² − κ²) + w κ/√(nW² − κ²),
   * with ρ the point's distance from the axis and w its depth beyond the outer face.
   * The left side rises monotonically from 0, so the root is unique.
   *
   * @param point - Camera-frame point in the water, metres.
   * @returns The unit direction from the camera centre, or `null` when the point is not
   *   beyond the window's outer face.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad point.
   */
  housingDirection(point: Vec3): MutableVec3 | null {
    const q = checkVec3('FlatPortHousing.housingDirection', 'point', point);
    const out: MutableVec3 = [0, 0, 0];
    return this.directionKernel(q[0], q[1], q[2], out) === Status.ok ? out : null;
  }

  private directionKernel(x: number, y: number, z: number, out: MutableVec3): number {
    const [n0, n1, n2] = this.normal;
    const a = n0 * x + n1 * y + n2 * z;
    const d = this.distance, t = this.thickness, w = a - d - t;
    if (!(w > 0)) return Status.outside;
    const rx = x - a * n0, ry = y - a * n1, rz = z - a * n2;
    const rho = Math.hypot(rx, ry, rz);
    if (rho === 0) {
      out[0] = n0;
      out[1] = n1;
      out[2] = n2;
      return Status.ok;
    }
    const nA = this.nAir, nG = this.nGlass, nW = this.nWater;
    const nA2 = nA * nA, nG2 = nG * nG, nW2 = nW * nW;
    let kmax = Math.min(nA, nW);
    if (t > 0) kmax = Math.min(kmax, nG);
    const g = (k: number): number =>
      (d * k) / Math.sqrt(nA2 - k * k) + (t > 0 ? (t * k) / Math.sqrt(nG2 - k * k) : 0) + (w * k) / Math.sqrt(nW2 - k * k) - rho;
    const gp = (k: number): number => {
      const ea = nA2 - k * k, eg = nG2 - k * k, ew = nW2 - k * k;
      return (d * nA2) / (ea * Math.sqrt(ea)) + (t > 0 ? (t * nG2) / (eg * Math.sqrt(eg)) : 0) + (w * nW2) / (ew * Math.sqrt(ew));
    };
    let lo = 0, hi = kmax;
    // Start from the straight-line guess (κ of the unrefracted direction), inside the bracket.
    let k = Math.min(kmax * (1 - 1e-12), (kmax * rho) / Math.hypot(rho, a));
    for (let it = 0; it < 200; it++) {
      const f = g(k);
      if (f > 0) hi = k;
      else lo = k;
      if (f === 0 || hi - lo <= FLAT_PORT_TOLERANCE * kmax) break;
      let next = k - f / gp(k);
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      if (Math.abs(next - k) <= FLAT_PORT_TOLERANCE * kmax) {
        k = next;
        break;
      }
      k = next;
    }
    const s = k / nA;
    const c = Math.sqrt(Math.max(0, 1 - s * s));
    out[0] = c * n0 + (s * rx) / rho;
    out[1] = c * n1 + (s * ry) / rho;
    out[2] = c * n2 + (s * rz) / rho;
    return Status.ok;
  }

  /**
   * The pixel of an underwater point (camera frame): {@link FlatPortHousing.housingDirection}
   * then the camera's projection.
   *
   * @param point - Camera-frame point in the water, metres.
   * @returns `[u, v]`, or `null` when the point is not beyond the window or its ray falls
   *   outside the camera's valid field.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad point.
   */
  project(point: Vec3): MutablePixel | null {
    const dir = this.housingDirection(point);
    return dir === null ? null : this.camera.project(dir);
  }

  /**
   * {@link FlatPortHousing.project} for packed points `xyz xyz …`.
   *
   * @returns Packed pixels and a status a point (`ok` or `outside`).
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  projectBatch(points: Float64Array, options?: ProjectBatchOptions): ProjectBatchResult {
    const res = projectBuffers('FlatPortHousing.projectBatch', points, options);
    const n = res.status.length;
    const dirs = new Float64Array(3 * n);
    const st = new Uint8Array(n);
    const tmp: MutableVec3 = [0, 0, 0];
    for (let i = 0; i < n; i++) {
      st[i] = this.directionKernel(points[3 * i]!, points[3 * i + 1]!, points[3 * i + 2]!, tmp);
      dirs[3 * i] = st[i] === Status.ok ? tmp[0] : 0;
      dirs[3 * i + 1] = st[i] === Status.ok ? tmp[1] : 0;
      dirs[3 * i + 2] = st[i] === Status.ok ? tmp[2] : 1;
    }
    this.camera.projectBatch(dirs, { out: res.pixels, status: res.status });
    for (let i = 0; i < n; i++) {
      if (st[i] !== Status.ok) {
        res.status[i] = st[i]!;
        res.pixels[2 * i] = NaN;
        res.pixels[2 * i + 1] = NaN;
      }
    }
    return res;
  }

  private rayKernel(d: Vec3, origin: MutableVec3, direction: MutableVec3): number {
    const [n0, n1, n2] = this.normal;
    const c = d[0] * n0 + d[1] * n1 + d[2] * n2;
    if (!(c > 0)) return Status.miss;
    const back: Vec3 = [-n0, -n1, -n2];
    const s1 = this.distance / c;
    let px = d[0] * s1, py = d[1] * s1, pz = d[2] * s1;
    const g = refract(d, back, this.nAir, this.nGlass);
    if (g === null) return Status.tir;
    const cg = g[0] * n0 + g[1] * n1 + g[2] * n2;
    if (!(cg > 0)) return Status.tir;
    const s2 = this.thickness / cg;
    px += g[0] * s2;
    py += g[1] * s2;
    pz += g[2] * s2;
    const wv = refract(g, back, this.nGlass, this.nWater);
    if (wv === null) return Status.tir;
    origin[0] = px;
    origin[1] = py;
    origin[2] = pz;
    direction[0] = wv[0];
    direction[1] = wv[1];
    direction[2] = wv[2];
    return Status.ok;
  }

  /**
   * The ray in the water of a pixel: the camera's ray refracted at the inner and outer
   * faces by the vector Snell law.
   *
   * @param pixel - `[u, v]`.
   * @returns The ray in the water (camera frame): `origin` on the outer face, unit
   *   `direction`; `null` when the camera cannot unproject the pixel, its ray misses the
   *   window, or it is totally reflected.
   * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for a bad pixel.
   */
  unproject(pixel: Pixel): CameraRay | null {
    checkPixel('FlatPortHousing.unproject', 'pixel', pixel);
    const r = this.camera.unproject(pixel);
    if (r === null) return null;
    const origin: MutableVec3 = [0, 0, 0], direction: MutableVec3 = [0, 0, 0];
    return this.rayKernel(r.direction, origin, direction) === Status.ok ? { origin, direction } : null;
  }

  /**
   * {@link FlatPortHousing.unproject} for packed pixels `uv uv …`.
   *
   * @returns Origins on the outer face, directions in the water, and a status a pixel
   *   (`ok`, the camera's `outside`/`notConverged`, `miss` or `tir`).
   * @throws {@link core!MeniscusTypeError} for wrong array lengths.
   */
  unprojectBatch(pixels: Float64Array, options?: UnprojectBatchOptions): UnprojectBatchResult {
    const res = unprojectBuffers('FlatPortHousing.unprojectBatch', pixels, options);
    const { origins, directions, status } = res;
    this.camera.unprojectBatch(pixels, { origins, directions, status });
    const n = status.length;
    const [n0, n1, n2] = this.normal;
    const normal = new Float64Array(this.normal);
    // Rays that cannot go on get a stand-in direction (the normal) so that the batch
    // refraction sees only valid vectors; their status already says why.
    for (let i = 0, k = 0; i < n; i++, k += 3) {
      if (status[i] === Status.ok && !(directions[k]! * n0 + directions[k + 1]! * n1 + directions[k + 2]! * n2 > 0)) status[i] = Status.miss;
      if (status[i] !== Status.ok) directions.set(normal, k);
    }
    const glass = new Float64Array(3 * n);
    const st1 = new Uint8Array(n);
    refractBatch(directions, normal, this.nAir, this.nGlass, { out: glass, status: st1 });
    for (let i = 0, k = 0; i < n; i++, k += 3) {
      if (status[i] !== Status.ok) continue;
      const c = directions[k]! * n0 + directions[k + 1]! * n1 + directions[k + 2]! * n2;
      const cg = glass[k]! * n0 + glass[k + 1]! * n1 + glass[k + 2]! * n2;
      if (st1[i] !== Status.ok || !(cg > 0)) {
        status[i] = Status.tir;
        continue;
      }
      const s1 = this.distance / c, s2 = this.thickness / cg;
      origins[k] = directions[k]! * s1 + glass[k]! * s2;
      origins[k + 1] = directions[k + 1]! * s1 + glass[k + 1]! * s2;
      origins[k + 2] = directions[k + 2]! * s1 + glass[k + 2]! * s2;
    }
    refractBatch(glass, normal, this.nGlass, this.nWater, { out: directions, status: st1 });
    for (let i = 0, k = 0; i < n; i++, k += 3) {
      if (status[i] === Status.ok && st1[i] !== Status.ok) status[i] = Status.tir;
      if (status[i] !== Status.ok) {
        origins.fill(NaN, k, k + 3);
        directions.fill(NaN, k, k + 3);
      }
    }
    return res;
  }

  /**
   * The housing as a plain JSON object (the camera's parameters nested).
   *
   * @returns The parameters.
   */
  toJSON(): FlatPortParameters {
    return {
      camera: this.camera.toJSON(),
      distance: this.distance,
      thickness: this.thickness,
      nGlass: this.nGlass,
      nWater: this.nWater,
      nAir: this.nAir,
      normal: [this.normal[0], this.normal[1], this.normal[2]],
    };
  }
}

