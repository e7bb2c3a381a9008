/**
 * Correction: from an image taken through a measured (wavy) surface, the image the same
 * camera would have taken through flat water, or through no water at all.
 *
 * @module
 */
import { checkFinite, checkImage, checkInteger, checkOneOf, checkOptions, checkPositive, createImage, rangeError, Status, typeError } from '../core/index.js';
import type { Image, Mask } from '../core/index.js';
import type { Surface } from '../surface/index.js';
import type { CameraModel, CameraPose } from '../camera/index.js';
import { interpolationCode, sampleInto } from './sample.js';
import type { ImageInterpolation } from './sample.js';
import type { ResolvedScene } from './scene.js';
import { checkCamera, checkPoseValue, createRowTracer, traceContext, traceRay, worldRays } from './trace.js';
import type { RowTracer } from './trace.js';
import type { TraceContext } from './trace.js';
import type { MediumOptions } from './trace.js';
import { flatContext, referencePoint, referencePoints } from './flat.js';
import type { CorrectionReference, FlatContext } from './flat.js';
import { TRI_STRIDE, bilinear1, putTriangle, rasterTriangleSnapped, rasterTrianglesSnapped, rasterUnitCellsSnapped, snapVertices } from './raster.js';
import { hermitePatches, refineMap } from './hermite.js';
import { cellEdgeCurvatures, mapSecondDerivatives } from './curvature.js';
import type { RasterTarget } from './raster.js';

// Status codes as local constants (read once, not through the module namespace in loops).
const S_OK = Status.ok;
const S_OUTSIDE = Status.outside;

/**
 * Where the scene lies, for a correction: at infinity (a sky) or on a horizontal plane at
 * height `z` (above the water for a camera below it, a bottom for a camera above it). A
 * {@link Scene} also fits (its texture is ignored).
 */
export type CorrectionTarget = { type: 'sky' } | { type: 'plane'; z: number };

/** How the correction map is built. */
export type CorrectionMode = 'exact' | 'fast';

/** Options of {@link prepareCorrection} and {@link correctImage}. */
export interface CorrectionOptions extends MediumOptions {
  /**
   * `'exact'`: every pixel's ray is traced through the surface (the map is known at every
   * pixel centre and inverted on one-pixel triangles). `'fast'`: rays are traced on a
   * mesh of `meshStep` pixels and the map is interpolated inside its triangles (see
   * {@link CorrectionOptions.meshInterpolation}).
   * @defaultValue 'exact'
   */
  mode?: CorrectionMode;
  /**
   * Mesh spacing of the fast mode, pixels (an integer ≥ 1; the exact mode uses 1). See
   * {@link CorrectionOptions.meshInterpolation} for the fast map's measured error: the
   * default keeps it within 0.05 px RMS on both shipped scenarios; wider meshes trade
   * accuracy for speed where the map is smooth on their scale.
   * @defaultValue 3
   */
  meshStep?: number;
  /**
   * How the fast mode interpolates the map inside a mesh cell; the error is the RMS
   * difference from the exact mode's map off folds, measured on the shipped scenarios'
   * measured surfaces (384² images) and on the benchmark's 1024² view.
   *
   * - `'linear'`: the source coordinates vary linearly over the cell's two triangles; the
   *   error grows as `meshStep² / 8 ×` the map's second derivative (tank 0.005 / 0.025 px,
   *   harbour 0.036 / 0.16 px at meshes of 2 / 4 px; benchmark 0.17 px at 8 px).
   * - `'quadratic'`: the linear source position gets the inverse map's second-order term,
   *   `½ Σ wᵢ wⱼ · DG·Dᵢⱼ` over the triangle's vertex pairs (`w` barycentric, `DG` the
   *   triangle's linear inverse, `Dᵢⱼ` the forward map's second difference along the
   *   source edge, from the neighbouring mesh vertices): no extra rays and a few
   *   operations a pixel. Tank 0.0035 / 0.0077 / 0.057 px, harbour 0.035 / 0.065 /
   *   0.38 px at 3 / 4 / 8 px; benchmark 0.005 / 0.036 px at 4 / 8 px; an analytic
   *   two-sinusoid sea (192²) 0.0055 px at 8 px against 0.075 px linear.
   * - `'cubic'`: two more rays a vertex, 1/32 px to the right and below, give the map's
   *   derivatives there; each cell holds the bicubic Hermite patch of the forward map
   *   and every covered pixel refines its linear source position by Newton's method on
   *   it (tank 0.0024 / 0.014 px, harbour 0.055 / 0.16 px at 4 / 8 px; about twice the
   *   linear mode's time).
   *
   * Measured surfaces should be smooth for the higher orders to pay: the pipeline builds
   * its surface as a C² spline (`interpolation: 'bspline'` of the surface area), whose
   * normals, and so the map, bend smoothly from cell to cell. Ignored in the exact mode.
   * @defaultValue 'quadratic'
   */
  meshInterpolation?: 'cubic' | 'linear' | 'quadratic';
  /** Through what the corrected image is seen: `'flat'` water or `'none'` (no water). @defaultValue 'flat' */
  reference?: CorrectionReference;
  /** Height of the flat reference water level, metres. @defaultValue 0 */
  level?: number;
  /** Interpolation of the distorted image. @defaultValue 'bilinear' */
  interpolation?: ImageInterpolation;
  /** Image width, pixels. @defaultValue `camera.width` */
  width?: number;
  /** Image height, pixels. @defaultValue `camera.height` */
  height?: number;
}

/** Options of {@link PreparedCorrection.correct}. */
export interface CorrectOptions {
  /** Output image to reuse (the distorted image's size and channels). */
  out?: Image;
  /**
   * A previous result of the same prepared correction whose buffers (image unless `out`
   * is given, mask, map and fold mask) are overwritten with this frame's, for video:
   * fresh multi-megabyte buffers every frame cost more than the work on them. The old
   * result must not be used afterwards; the returned result shares its buffers.
   */
  reuse?: CorrectionResult;
}

/** Pixels where two parts of the map overlap. */
export interface FoldReport {
  /** Output pixels covered by more than one triangle of the map. */
  readonly pixels: number;
  /** Mesh triangles whose orientation is flipped (the map folds over there). */
  readonly triangles: number;
  /** `1` at the fold pixels. */
  readonly mask: Mask;
}

/** The result of a correction. */
export interface CorrectionResult {
  /** The corrected image; 0 where `mask` is 0. */
  readonly image: Image;
  /** `1` where the corrected pixel has a source in the distorted image. */
  readonly mask: Mask;
  /**
   * For each corrected pixel, the position in the distorted image it was taken from
   * (pixels, packed `u v u v …`); NaN where `mask` is 0.
   */
  readonly map: Float32Array;
  /** Folds of the map and how they were resolved. */
  readonly folds: FoldReport;
  /** Mesh vertices whose ray had no valid path (camera field, miss, TIR, outside). */
  readonly invalidVertices: number;
  /** Pixels with `mask = 1`. */
  readonly valid: number;
  /** Milliseconds: tracing the mesh, rasterising, sampling. */
  readonly timings: { readonly trace: number; readonly raster: number; readonly sample: number };
  /** Plain-language notes (for example a camera that never sees the surface). */
  readonly warnings: readonly string[];
}

/** A correction set up once for a camera, pose and scene geometry, run on many frames. */
export interface PreparedCorrection {
  /** Image width, pixels. */
  readonly width: number;
  /** Image height, pixels. */
  readonly height: number;
  /** The mode. */
  readonly mode: CorrectionMode;
  /** Mesh spacing, pixels. */
  readonly meshStep: number;
  /** Mesh vertices along u and v. */
  readonly meshSize: readonly [number, number];
  /**
   * Correct one frame taken through `surface`.
   *
   * @param distorted - The image taken through the surface (the prepared size).
   * @param surface - The measured (or true) surface at the same instant.
   * @param options - Optional output image.
   * @returns The corrected image, its mask, the map, folds, timings.
   * @throws {@link core!MeniscusTypeError} for an image of another size or a malformed surface.
   * @throws {@link core!MeniscusRangeError} when the camera lies inside the surface's height
   *   range or the scene lies on the camera's side of the water.
   */
  correct(distorted: Image, surface: Surface, options?: CorrectOptions): CorrectionResult;
}

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

function resolveTarget(fn: string, value: unknown): ResolvedScene {
  if (value === null || typeof value !== 'object') typeError(fn, 'target', value, "a target { type: 'sky' } or { type: 'plane', z }");
  const t = value as { type?: unknown; z?: unknown };
  const type = checkOneOf(fn, 'target.type', t.type, ['sky', 'plane'] as const);
  const dummy = createImage(1, 1, 1);
  if (type === 'sky') return { kind: 0, image: dummy, gnomonic: false, scale: 0, cu: 0, cv: 0, z: Infinity, x0: 0, y0: 0, idx: 0, idy: 0 };
  const z = checkFinite(fn, 'target.z', t.z);
  return { kind: 1, image: dummy, gnomonic: false, scale: 0, cu: 0, cv: 0, z, x0: 0, y0: 0, idx: 0, idy: 0 };
}

/**
 * Set up a correction for a camera at a pose looking at a scene through the water: the
 * mesh of pixels to trace and their rays are computed once and reused for every frame.
 *
 * **Method.** Each mesh vertex (a pixel of the distorted image) is traced through the
 * measured surface to the scene (vector Snell law); the scene point is then projected
 * back into the camera through the reference — flat water at `level` (Snell's law at a
 * plane, solved exactly for the refraction point) or no water. This gives the forward map
 * distorted pixel → reference pixel at the vertices. Its inverse is found by
 * rasterising the mesh's triangles in the reference image with the source coordinates
 * interpolated linearly (barycentric); each covered pixel then samples the distorted
 * image there. In the exact mode every pixel is a vertex; in the fast mode the vertices
 * are `meshStep` pixels apart, so the cost is dominated by the sampling.
 *
 * **Folds.** Where the map folds (the surface focuses two parts of the distorted image
 * onto one part of the scene), triangles overlap or flip. The rule is deterministic:
 * a pixel takes its source from a triangle with the map's own orientation before a
 * flipped one, and among equals from the first triangle in mesh order (rows top to
 * bottom, columns left to right). Overlapping pixels are counted and masked in
 * {@link FoldReport}.
 *
 * **No source.** Pixels no triangle covers (rays that missed the surface, TIR, beyond the
 * camera's field or the scene plane) have `mask = 0`. A pixel centre exactly on an edge
 * belongs to the triangle on one side by the tie rule, so where the mesh ends on such a
 * line (through flat water: the left column and the bottom row) those pixels stay
 * uncovered.
 *
 * **Rasterisation.** The mesh's vertices are snapped to a 1/256-pixel lattice in the
 * output image (moving each by at most 1/512 pixel), which makes the edge functions at
 * pixel centres exact integers: neighbouring triangles agree on every shared edge and
 * ties follow the rule exactly. The exact mode takes its one-pixel cells two triangles
 * at a time; the fast mode steps the edge functions along each row and, for a
 * one-channel bilinear image, samples each pixel as it is covered. (Vertices beyond
 * ±32768 pixels fall back to floating-point edge functions in a canonical vertex order.)
 *
 * @param camera - The camera model (of the distorted and the corrected image).
 * @param pose - Its pose in the world.
 * @param target - Where the scene lies (a sky, or a plane at height `z`).
 * @param options - Mode, mesh, reference, indices, size.
 * @returns The prepared correction.
 * @throws {@link core!MeniscusRangeError} for bad options or a size the camera cannot give;
 *   {@link core!MeniscusTypeError} for a malformed camera, pose or target.
 * @see Snell's law at a plane and in vector form: Glassner, A. S. (ed.) (1989), "An
 *   Introduction to Ray Tracing", Academic Press, ch. 4.
 * @see Pineda, J. (1988), "A parallel algorithm for polygon rasterization", SIGGRAPH
 *   Computer Graphics 22(4), 17–20 (edge functions and the tie rule).
 * @example
 * ```ts
 * const prep = prepareCorrection(camera, pose, { type: 'plane', z: 2 }, { mode: 'fast' });
 * const { image, mask, folds } = prep.correct(distorted, measuredSurface);
 * ```
 */
export function prepareCorrection(camera: CameraModel, pose: CameraPose, target: CorrectionTarget, options?: CorrectionOptions): PreparedCorrection {
  const fn = 'prepareCorrection';
  const cam = checkCamera(fn, 'camera', camera);
  const ps = checkPoseValue(fn, 'pose', pose);
  const sc = resolveTarget(fn, target);
  const o = checkOptions(fn, options);
  const mode = o.mode === undefined ? 'exact' : checkOneOf(fn, 'options.mode', o.mode, ['exact', 'fast'] as const);
  const W = o.width !== undefined ? checkInteger(fn, 'options.width', o.width, 1, 65536) : cam.width;
  const H = o.height !== undefined ? checkInteger(fn, 'options.height', o.height, 1, 65536) : cam.height;
  if (W === undefined) rangeError(fn, 'options.width', undefined, 'an image width (the camera has none)');
  if (H === undefined) rangeError(fn, 'options.height', undefined, 'an image height (the camera has none)');
  if (W < 2 || H < 2) rangeError(fn, 'options.width', `${W}×${H}`, 'an image of at least 2 × 2 pixels');
  let step = 1;
  if (mode === 'fast') step = o.meshStep === undefined ? 3 : checkInteger(fn, 'options.meshStep', o.meshStep, 1, 1024);
  else if (o.meshStep !== undefined && o.meshStep !== 1) rangeError(fn, 'options.meshStep', o.meshStep, "1 in the exact mode (or mode: 'fast')");
  const reference = o.reference === undefined ? 'flat' : checkOneOf(fn, 'options.reference', o.reference, ['flat', 'none'] as const);
  const level = o.level === undefined ? 0 : checkFinite(fn, 'options.level', o.level);
  const interp = interpolationCode(fn, 'options.interpolation', o.interpolation);
  const meshInterp = o.meshInterpolation === undefined ? 'quadratic' : checkOneOf(fn, 'options.meshInterpolation', o.meshInterpolation, ['cubic', 'linear', 'quadratic'] as const);
  const cubic = meshInterp === 'cubic' && step > 1;
  const quadratic = meshInterp === 'quadratic' && step > 1;
  if (sc.kind === 0 && !cam.central) rangeError(fn, 'target.type', 'sky', 'a plane target for a non-central (orthographic) camera: all its rays share one direction');
  const medium: MediumOptions = { nWater: o.nWater, nAir: o.nAir, tolerance: o.tolerance };
  if (o.nWater !== undefined) checkPositive(fn, 'options.nWater', o.nWater);
  if (o.nAir !== undefined) checkPositive(fn, 'options.nAir', o.nAir);
  if (o.tolerance !== undefined) checkPositive(fn, 'options.tolerance', o.tolerance);

  // Mesh vertices: every `step` pixels, the last row and column always included.
  const cols: number[] = [];
  for (let u = 0; u < W - 1; u += step) cols.push(u);
  cols.push(W - 1);
  const rows: number[] = [];
  for (let v = 0; v < H - 1; v += step) rows.push(v);
  rows.push(H - 1);
  const MC = cols.length, MR = rows.length, NV = MC * MR;
  const colsA = Float64Array.from(cols), rowsA = Float64Array.from(rows);
  const vpix = new Float64Array(2 * NV);
  for (let j = 0; j < MR; j++) {
    for (let i = 0; i < MC; i++) {
      vpix[2 * (j * MC + i)] = cols[i]!;
      vpix[2 * (j * MC + i) + 1] = rows[j]!;
    }
  }
  const rays = worldRays(cam, ps, vpix);
  // Cubic fast mode: rays a small offset to the right of and below each vertex, for the
  // map's derivatives by forward differences.
  const DELTA = 1 / 32;
  let raysU: ReturnType<typeof worldRays> | null = null, raysV: ReturnType<typeof worldRays> | null = null;
  if (cubic) {
    const pu = vpix.slice(), pv = vpix.slice();
    for (let k = 0; k < NV; k++) {
      pu[2 * k]! += DELTA;
      pv[2 * k + 1]! += DELTA;
    }
    raysU = worldRays(cam, ps, pu);
    raysV = worldRays(cam, ps, pv);
  }
  const tHit = cubic ? new Float64Array(NV) : null;
  const cptsD = cubic ? new Float64Array(3 * NV) : null;
  const outU = cubic ? new Float64Array(2 * NV) : null;
  const outV = cubic ? new Float64Array(2 * NV) : null;
  const statU = cubic ? new Uint8Array(NV) : null;
  const statV = cubic ? new Uint8Array(NV) : null;
  const dStat = cubic ? new Uint8Array(NV) : null;
  const Fu = cubic ? new Float64Array(2 * NV) : null;
  const Fv = cubic ? new Float64Array(2 * NV) : null;
  const dOk = cubic ? new Uint8Array(NV) : null;
  const coef = cubic ? new Float64Array(32 * (MC - 1) * (MR - 1)) : null;
  const cellOk = cubic ? new Uint8Array((MC - 1) * (MR - 1)) : null;
  const Fuu = quadratic ? new Float64Array(2 * NV) : null;
  const Fvv = quadratic ? new Float64Array(2 * NV) : null;
  const haveD = quadratic ? new Uint8Array(NV) : null;
  const okV = quadratic ? new Uint8Array(NV) : null;
  const curv1 = quadratic ? new Float64Array(6) : null;
  const curv2 = quadratic ? new Float64Array(6) : null;
  // Buffers reused frame after frame.
  const vstat = new Uint8Array(NV);
  const cpts = new Float64Array(3 * NV);
  const outPix = new Float64Array(2 * NV);
  const projStat = new Uint8Array(NV);
  const hit = new Float64Array(6);
  const res = new Float64Array(6);
  let flatCache: { below: boolean; fl: FlatContext } | null = null;
  // Scratch reused frame after frame.
  const owner = new Uint8Array(W * H);
  const meshScratch = meshTraceScratch(MC);
  const rasterScratch = rasterMeshScratch(MC, MR, step);

  const correct = (distorted: Image, surface: Surface, copts?: CorrectOptions): CorrectionResult => {
    const cfn = 'PreparedCorrection.correct';
    const img = checkImage(cfn, 'distorted', distorted, true);
    if (img.width !== W || img.height !== H) {
      typeError(cfn, 'distorted', `${img.width}×${img.height}`, `an image of the prepared size ${W}×${H} (the camera's calibration)`);
    }
    const co = checkOptions(cfn, copts);
    const C = img.channels;
    let out: Image;
    let reuse: CorrectionResult | null = null;
    if (co.reuse !== undefined) {
      const r = co.reuse as Partial<CorrectionResult> | null;
      if (r === null || typeof r !== 'object' || !(r.map instanceof Float32Array) || !(r.mask instanceof Uint8Array) || r.folds === undefined || !(r.folds.mask instanceof Uint8Array) || r.image === undefined) {
        typeError(cfn, 'options.reuse', r, 'a CorrectionResult returned by this prepared correction');
      }
      if (r.map.length !== 2 * W * H || r.mask.length !== W * H || r.folds.mask.length !== W * H) {
        typeError(cfn, 'options.reuse', `a result of ${r.mask.length} pixels`, `a result of this prepared correction (${W}×${H})`);
      }
      reuse = r as CorrectionResult;
    }
    if (co.out === undefined) {
      // The old result's image, unless it is the very image being corrected.
      const ri = reuse === null ? null : reuse.image;
      out = ri !== null && ri.data !== img.data && ri.width === W && ri.height === H && ri.channels === C ? ri : createImage(W, H, C);
    } else {
      out = checkImage(cfn, 'options.out', co.out, true);
      if (out.width !== W || out.height !== H || out.channels !== C) typeError(cfn, 'options.out', `${out.width}×${out.height}×${out.channels}`, `an image of ${W}×${H}×${C}`);
      if (out.data === img.data) typeError(cfn, 'options.out', 'the distorted image itself', 'an image other than the one being corrected (it is read while the output is written)');
    }
    const ctx = traceContext(cfn, surface, ps, sc, medium);
    if (flatCache === null || flatCache.below !== ctx.below) {
      flatCache = { below: ctx.below, fl: flatContext(cfn, cam, ps, reference === 'flat', level, ctx.n1, ctx.n2, sc.kind, sc.z) };
    }
    const fl = flatCache.fl;
    const t0 = now();
    const traced = traceMesh(ctx, fl, rays.origins, rays.directions, rays.status, MC, tHit, cpts, vstat, meshScratch);
    cam.projectBatch(cpts, { out: outPix, status: projStat });
    let invalidVertices = 0;
    for (let k = 0; k < NV; k++) {
      if (vstat[k] === S_OK && projStat[k] !== S_OK) vstat[k] = S_OUTSIDE;
      if (vstat[k] !== S_OK) invalidVertices++;
    }
    if (cubic) {
      // The map's derivatives at the vertices: the offset rays, traced from the vertex's
      // own surface distance, projected, differenced.
      for (let pass = 0; pass < 2; pass++) {
        const rr = pass === 0 ? raysU! : raysV!;
        const oo = rr.origins, dd = rr.directions, ss = rr.status;
        const cp = cptsD!;
        for (let k = 0; k < NV; k++) {
          const a = 3 * k;
          let st: number = vstat[k] === S_OK ? ss[k]! : S_OUTSIDE;
          if (st === S_OK) st = traceRay(ctx, oo[a]!, oo[a + 1]!, oo[a + 2]!, dd[a]!, dd[a + 1]!, dd[a + 2]!, hit, res, tHit![k]!);
          if (st === S_OK) st = referencePoint(fl, res[0]!, res[1]!, res[2]!, cp, a);
          if (st !== S_OK) {
            cp[a] = 0;
            cp[a + 1] = 0;
            cp[a + 2] = -1;
          }
          dStat![k] = st;
        }
        const outD = pass === 0 ? outU! : outV!, stD = pass === 0 ? statU! : statV!;
        cam.projectBatch(cp, { out: outD, status: stD });
        for (let k = 0; k < NV; k++) if (dStat![k] !== S_OK) stD[k] = S_OUTSIDE;
      }
      const inv = 1 / DELTA;
      for (let k = 0; k < NV; k++) {
        const okk = vstat[k] === S_OK && statU![k] === S_OK && statV![k] === S_OK;
        dOk![k] = okk ? 1 : 0;
        if (!okk) continue;
        Fu![2 * k] = (outU![2 * k]! - outPix[2 * k]!) * inv;
        Fu![2 * k + 1] = (outU![2 * k + 1]! - outPix[2 * k + 1]!) * inv;
        Fv![2 * k] = (outV![2 * k]! - outPix[2 * k]!) * inv;
        Fv![2 * k + 1] = (outV![2 * k + 1]! - outPix[2 * k + 1]!) * inv;
      }
      hermitePatches(cols, rows, outPix, Fu!, Fv!, dOk!, coef!, cellOk!);
    }
    if (quadratic) {
      for (let k = 0; k < NV; k++) okV![k] = vstat[k] === S_OK ? 1 : 0;
      mapSecondDerivatives(cols, rows, outPix, okV!, Fuu!, Fvv!, haveD!);
    }
    const t1 = now();
    const map = reuse === null ? new Float32Array(2 * W * H) : (reuse.map as Float32Array);
    owner.fill(0);
    const foldMask = reuse === null ? new Uint8Array(W * H) : (reuse.folds.mask as Uint8Array).fill(0);
    // The fast mode samples a one-channel image bilinearly as it rasterises (one pass
    // over the pixels instead of two); the cubic map is refined first, so it samples after.
    const fused = step > 1 && !cubic && C === 1 && interp === 1;
    const target: RasterTarget = { width: W, height: H, map, owner, fold: foldMask, sample: fused ? { source: img.data, out: out.data } : null };
    const flipped = rasterMesh(target, colsA, rowsA, vstat, outPix, step, Fuu, Fvv, curv1, curv2, rasterScratch);
    if (cubic) refineMap(W, H, map, owner, foldMask, step, cols, rows, coef!, cellOk!, 2, 2 * step);
    const t2 = now();
    const mask = reuse === null ? new Uint8Array(W * H) : (reuse.mask as Uint8Array);
    const od = out.data, id = img.data;
    let valid = 0;
    const foldPixels = countOnes(foldMask);
    if (fused) valid = finishSampled(W * H, owner, map, od, mask);
    else if (C === 1 && interp === 1) valid = sampleBilinear1(W, H, map, owner, mask, id, od);
    else if (interp === 1) valid = sampleBilinearN(W, H, C, map, owner, mask, id, od);
    else {
      const px = new Float32Array(C);
      for (let p = 0; p < W * H; p++) {
        if (owner[p] === 0) {
          map[2 * p] = NaN;
          map[2 * p + 1] = NaN;
          for (let c = 0; c < C; c++) od[p * C + c] = 0;
          mask[p] = 0;
          continue;
        }
        sampleInto(id, W, H, C, map[2 * p]!, map[2 * p + 1]!, interp, px, 0);
        for (let c = 0; c < C; c++) od[p * C + c] = px[c]!;
        mask[p] = 1;
        valid++;
      }
    }
    const t3 = now();
    const warnings: string[] = [];
    if (traced === 0) warnings.push('no ray of the camera reaches the scene through the surface (the camera never sees the surface, or the surface does not cover its view)');
    else if (invalidVertices > 0) warnings.push(`${invalidVertices} of ${NV} mesh rays had no valid path (outside the surface's domain, total internal reflection, or beyond the field); their pixels are masked`);
    if (foldPixels > 0) warnings.push(`the map folds over ${foldPixels} pixel(s); resolved by orientation, then mesh order`);
    return {
      image: out,
      mask,
      map,
      folds: { pixels: foldPixels, triangles: flipped, mask: foldMask },
      invalidVertices,
      valid,
      timings: { trace: t1 - t0, raster: t2 - t1, sample: t3 - t2 },
      warnings,
    };
  };

  return { width: W, height: H, mode, meshStep: step, meshSize: [MC, MR], correct };
}

/**
 * Trace the mesh's rays through the surface to the scene and their reference points
 * (camera-frame points to project) into `cpts`, statuses into `vstat`; rays without a
 * path get a point behind the camera. The rays go a mesh row at a time; each starts its
 * surface search from the distance extrapolated from up to four previous rows' hits in
 * its column. Returns the rays traced.
 */
function traceMesh(
  ctx: TraceContext,
  fl: FlatContext,
  ro: Float64Array,
  rd: Float64Array,
  rs: Uint8Array,
  MC: number,
  tHit: Float64Array | null,
  cpts: Float64Array,
  vstat: Uint8Array,
  scr: MeshTraceScratch,
): number {
  const NV = vstat.length, MR = NV / MC;
  const { rows, stat, pts } = scr;
  rows.reset();
  let traced = 0;
  for (let j = 0; j < MR; j++) {
    const k0 = j * MC;
    const t = rows.traceRow(ctx, ro, rd, rs, k0, MC, stat, pts);
    if (tHit !== null) tHit.set(t, k0);
    referencePoints(fl, pts, stat, MC, cpts, k0);
    for (let i = 0; i < MC; i++) {
      const st = stat[i]!;
      const a = 3 * (k0 + i);
      if (st !== S_OK) {
        cpts[a] = 0;
        cpts[a + 1] = 0;
        cpts[a + 2] = -1; // behind the camera: projects as outside
      } else traced++;
      vstat[k0 + i] = st;
    }
  }
  return traced;
}

/** Buffers of {@link traceMesh} for a mesh row, reused frame after frame. */
interface MeshTraceScratch {
  rows: RowTracer;
  stat: Uint8Array;
  pts: Float64Array;
}

function meshTraceScratch(MC: number): MeshTraceScratch {
  return { rows: createRowTracer(MC), stat: new Uint8Array(MC), pts: new Float64Array(3 * MC) };
}

/**
 * Rasterise the mesh's triangles (two a cell, (a, b, d) and (a, d, c)) into `target`:
 * one-pixel cells of the exact mode together, larger ones (and cells with a corner
 * missing) triangle by triangle, all on the snapped lattice, with the quadratic term when `Fuu` is given. Returns the flipped
 * triangles.
 */
function rasterMesh(
  target: RasterTarget,
  cols: Float64Array,
  rows: Float64Array,
  vstat: Uint8Array,
  outPix: Float64Array,
  step: number,
  Fuu: Float64Array | null,
  Fvv: Float64Array | null,
  curv1: Float64Array | null,
  curv2: Float64Array | null,
  scratch: RasterMeshScratch,
): number {
  const MC = cols.length, MR = rows.length;
  let flipped = 0;
  const quadratic = Fuu !== null && Fvv !== null && curv1 !== null && curv2 !== null;
  // The exact mode's one-pixel cells take their corners on the snap lattice, computed
  // once a vertex; larger cells go to the rasteriser a mesh row at a time, as one list
  // in mesh order.
  const { snapped, snapOk, tris } = scratch;
  if (step === 1) snapVertices(outPix, vstat, S_OK, snapped, snapOk);
  // exact mode: whether each mesh row has all its vertices on the lattice (the common
  // case, whose cells then go in one call without a test a cell)
  let rowAll = step === 1 ? rowOnLattice(snapOk, 0, MC) : false;
  for (let j = 0; j + 1 < MR; j++) {
    const va = rows[j]!, vc = rows[j + 1]!;
    let n = 0;
    if (step === 1) {
      const nextAll = rowOnLattice(snapOk, (j + 1) * MC, MC);
      const both = rowAll && nextAll;
      rowAll = nextAll;
      if (both) {
        flipped += rasterUnitCellsSnapped(target, snapped, MC, va, 0, MC - 1);
        continue;
      }
    }
    for (let i = 0; i + 1 < MC; i++) {
      if (step === 1 && cellSnapped(snapOk, j * MC + i, MC)) {
        // a run of one-pixel cells whose corners are all on the lattice, in one call
        let e = i + 1;
        while (e + 1 < MC && cellSnapped(snapOk, j * MC + e, MC)) e++;
        flipped += rasterUnitCellsSnapped(target, snapped, MC, va, i, e);
        i = e - 1;
        continue;
      }
      const ka = j * MC + i, kb = ka + 1, kc = ka + MC, kd = kc + 1;
      const sa = vstat[ka] === S_OK, sb = vstat[kb] === S_OK, scc = vstat[kc] === S_OK, sd = vstat[kd] === S_OK;
      const ua = cols[i]!, ub = cols[i + 1]!;
      const xa = outPix[2 * ka]!, ya = outPix[2 * ka + 1]!;
      const xb = outPix[2 * kb]!, yb = outPix[2 * kb + 1]!;
      const xc = outPix[2 * kc]!, yc = outPix[2 * kc + 1]!;
      const xd = outPix[2 * kd]!, yd = outPix[2 * kd + 1]!;
      if (quadratic) cellEdgeCurvatures(outPix, Fuu, Fvv, ka, kb, kc, kd, ub - ua, vc - va, curv1, curv2, sa && sb && scc && sd);
      // Triangle a, b, d (source orientation positive in u-right, v-down pixels).
      if (sa && sb && sd) {
        const ar = (xb - xa) * (yd - ya) - (yb - ya) * (xd - xa);
        if (ar < 0) flipped++;
        if (step > 1) putTriangle(tris, n++, ar > 0 ? 2 : 1, xa, ya, xb, yb, xd, yd, ua, va, ub, va, ub, vc, quadratic ? curv1 : null);
        else rasterTriangleSnapped(target, ar > 0 ? 2 : 1, xa, ya, xb, yb, xd, yd, ua, va, ub, va, ub, vc, null);
      }
      // Triangle a, d, c.
      if (sa && sd && scc) {
        const ar = (xd - xa) * (yc - ya) - (yd - ya) * (xc - xa);
        if (ar < 0) flipped++;
        if (step > 1) putTriangle(tris, n++, ar > 0 ? 2 : 1, xa, ya, xd, yd, xc, yc, ua, va, ub, vc, ua, vc, quadratic ? curv2 : null);
        else rasterTriangleSnapped(target, ar > 0 ? 2 : 1, xa, ya, xd, yd, xc, yc, ua, va, ub, vc, ua, vc, null);
      }
    }
    if (n > 0) rasterTrianglesSnapped(target, tris, n);
  }
  return flipped;
}

/** Buffers of {@link rasterMesh}, reused frame after frame (9 bytes a vertex in the exact mode). */
interface RasterMeshScratch {
  /** Exact mode: the vertices on the snap lattice, and whether each is on it. */
  snapped: Int32Array;
  snapOk: Uint8Array;
  /** Fast mode: one mesh row's triangle list. */
  tris: Float64Array;
}

function rasterMeshScratch(MC: number, MR: number, step: number): RasterMeshScratch {
  const nv = step === 1 ? MC * MR : 0;
  return { snapped: new Int32Array(2 * nv), snapOk: new Uint8Array(nv), tris: new Float64Array(step > 1 ? 2 * (MC - 1) * TRI_STRIDE : 0) };
}

/** Whether the `n` vertices from `k0` are all on the snap lattice. */
function rowOnLattice(snapOk: Uint8Array, k0: number, n: number): boolean {
  let all = 1;
  for (let k = k0; k < k0 + n; k++) all &= snapOk[k]!;
  return all === 1;
}

/** Whether the one-pixel cell with top-left vertex ka has all four corners on the snap lattice (so all valid). */
function cellSnapped(snapOk: Uint8Array, ka: number, mc: number): boolean {
  return snapOk[ka] === 1 && snapOk[ka + 1] === 1 && snapOk[ka + mc] === 1 && snapOk[ka + mc + 1] === 1;
}

/** Number of ones in a 0/1 mask (four bytes a step where the mask is word-aligned). */
function countOnes(m: Uint8Array): number {
  let c = 0, p = 0;
  if ((m.byteOffset & 3) === 0) {
    const w = new Uint32Array(m.buffer, m.byteOffset, m.length >> 2);
    // each byte is 0 or 1: the product's top byte is the sum of the four
    for (let k = 0; k < w.length; k++) c += Math.imul(w[k]!, 0x01010101) >>> 24;
    p = w.length << 2;
  }
  for (; p < m.length; p++) c += m[p]!;
  return c;
}

/** A one-channel pixel with no source: 0, a NaN map, mask 0. */
function uncover(p: number, map: Float32Array, od: Float32Array, mask: Uint8Array): void {
  map[2 * p] = NaN;
  map[2 * p + 1] = NaN;
  od[p] = 0;
  mask[p] = 0;
}

/**
 * After a sampling rasterisation: mask the pixels no triangle covered. Returns the
 * covered pixels. Owner bytes are 0, 1 or 2; where both arrays are word-aligned, four
 * pixels are masked a step and only words with an uncovered pixel are visited bytewise.
 */
function finishSampled(n: number, owner: Uint8Array, map: Float32Array, od: Float32Array, mask: Uint8Array): number {
  let valid = 0, p = 0;
  if ((owner.byteOffset & 3) === 0 && (mask.byteOffset & 3) === 0) {
    const nw = n >> 2;
    const ow = new Uint32Array(owner.buffer, owner.byteOffset, nw);
    const mw = new Uint32Array(mask.buffer, mask.byteOffset, nw);
    for (let k = 0; k < nw; k++) {
      const w = ow[k]!;
      const m = (w | (w >>> 1)) & 0x01010101; // 1 in each byte whose owner is not 0
      mw[k] = m;
      if (m === 0x01010101) valid += 4;
      else {
        valid += Math.imul(m, 0x01010101) >>> 24;
        for (let q = 4 * k; q < 4 * k + 4; q++) if (owner[q] === 0) uncover(q, map, od, mask);
      }
    }
    p = nw << 2;
  }
  for (; p < n; p++) {
    if (owner[p] === 0) uncover(p, map, od, mask);
    else {
      mask[p] = 1;
      valid++;
    }
  }
  return valid;
}

/**
 * The corrected image for one channel, bilinear: each covered pixel samples the distorted
 * image at its source position (clamped to the image); uncovered pixels get 0, a NaN map
 * and mask 0. Returns the covered pixels.
 */
function sampleBilinear1(W: number, H: number, map: Float32Array, owner: Uint8Array, mask: Uint8Array, id: Float32Array, od: Float32Array): number {
  const n = W * H;
  let valid = 0;
  for (let p = 0; p < n; p++) {
    if (owner[p] === 0) {
      uncover(p, map, od, mask);
      continue;
    }
    od[p] = bilinear1(id, W, H, map[2 * p]!, map[2 * p + 1]!);
    mask[p] = 1;
    valid++;
  }
  return valid;
}

/**
 * The corrected image for C channels, bilinear, in one loop: each covered pixel samples
 * the distorted image at its source position with the weights and rounding of
 * `sampleInto` (so the same numbers, without a call a pixel); uncovered pixels get 0, a
 * NaN map and mask 0. Returns the covered pixels. Needs W, H ≥ 2.
 */
function sampleBilinearN(W: number, H: number, C: number, map: Float32Array, owner: Uint8Array, mask: Uint8Array, id: Float32Array, od: Float32Array): number {
  const Wm = W - 1, Hm = H - 1, Wm2 = W - 2, Hm2 = H - 2, n = W * H, row = W * C;
  let valid = 0;
  for (let p = 0, q = 0; p < n; p++, q += C) {
    if (owner[p] === 0) {
      map[2 * p] = NaN;
      map[2 * p + 1] = NaN;
      for (let c = 0; c < C; c++) od[q + c] = 0;
      mask[p] = 0;
      continue;
    }
    let u = map[2 * p]!, v = map[2 * p + 1]!;
    if (u < 0) u = 0;
    else if (u > Wm) u = Wm;
    if (v < 0) v = 0;
    else if (v > Hm) v = Hm;
    let i = u | 0, j = v | 0;
    if (i > Wm2) i = Wm2;
    if (j > Hm2) j = Hm2;
    const t = u - i, s = v - j;
    const w00 = (1 - t) * (1 - s), w10 = t * (1 - s), w01 = (1 - t) * s, w11 = t * s;
    const k = (j * W + i) * C;
    if (C === 3) {
      // colour images: the three channels written out
      const k1 = k + 3, k2 = k + row, k3 = k2 + 3;
      od[q] = w00 * id[k]! + w10 * id[k1]! + w01 * id[k2]! + w11 * id[k3]!;
      od[q + 1] = w00 * id[k + 1]! + w10 * id[k1 + 1]! + w01 * id[k2 + 1]! + w11 * id[k3 + 1]!;
      od[q + 2] = w00 * id[k + 2]! + w10 * id[k1 + 2]! + w01 * id[k2 + 2]! + w11 * id[k3 + 2]!;
    } else {
      for (let c = 0; c < C; c++) {
        od[q + c] = w00 * id[k + c]! + w10 * id[k + C + c]! + w01 * id[k + row + c]! + w11 * id[k + row + C + c]!;
      }
    }
    mask[p] = 1;
    valid++;
  }
  return valid;
}

/**
 * Correct one image: {@link prepareCorrection} followed by
 * {@link PreparedCorrection.correct}. Prepare once instead when many frames share a
 * camera, pose and target.
 *
 * @param distorted - The image taken through the surface.
 * @param camera - The camera model (its size must match the image when it has one).
 * @param pose - Its pose in the world.
 * @param surface - The measured surface.
 * @param target - Where the scene lies.
 * @param options - Mode, mesh, reference, indices.
 * @returns The corrected image with its mask, map, folds and timings.
 * @throws {@link core!MeniscusTypeError} when the image size differs from the camera's
 *   calibration, or for malformed inputs; {@link core!MeniscusRangeError} for bad options or
 *   geometry (see {@link prepareCorrection}).
 * @see {@link prepareCorrection} for the method and its references.
 * @example
 * ```ts
 * const { image, mask } = correctImage(distorted, camera, pose, measured, { type: 'plane', z: 2 });
 * ```
 */
export function correctImage(
  distorted: Image,
  camera: CameraModel,
  pose: CameraPose,
  surface: Surface,
  target: CorrectionTarget,
  options?: CorrectionOptions,
): CorrectionResult {
  const fn = 'correctImage';
  const img = checkImage(fn, 'distorted', distorted, true);
  const cam = checkCamera(fn, 'camera', camera);
  const o = checkOptions(fn, options);
  if ((cam.width !== undefined && cam.width !== img.width) || (cam.height !== undefined && cam.height !== img.height)) {
    typeError(fn, 'distorted', `${img.width}×${img.height}`, `an image of the camera's calibrated size ${cam.width}×${cam.height}`);
  }
  return prepareCorrection(cam, pose, target, { ...o, width: img.width, height: img.height }).correct(img, surface);
}
