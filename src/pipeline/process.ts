/**
 * The per-frame pipeline: a sensor frame and a simultaneous scene image in, the measured
 * surface, the corrected image and diagnostics out.
 *
 * @module
 */
import { checkImage, checkInteger, checkOptions, checkPositive, createGrid, typeError } from '../core/index.js';
import type { Grid, Image, Mask } from '../core/index.js';
import { integrateScattered } from '../integrate/index.js';
import type { CameraModel, CameraPose } from '../camera/index.js';
import { createGridSurface } from '../surface/index.js';
import type { Surface } from '../surface/index.js';
import { measureFrame, referenceSpots } from '../sensor/index.js';
import { samplesFor } from '../sensor/sample-data.js';
import type { FrameMeasurement, MeasureFrameOptions, Reconstruction, SensorSetup } from '../sensor/index.js';
import { prepareCorrection } from '../imaging/index.js';
import type { CorrectionOptions, CorrectionResult, CorrectionTarget, PreparedCorrection } from '../imaging/index.js';

/** The scene camera's calibration and what it looks at. */
export interface SceneSetup {
  /** The scene camera's model (its size must match the scene images). */
  readonly camera: CameraModel;
  /** Its pose in the world. */
  readonly pose: CameraPose;
  /** Where the scene lies (a sky, or a plane at height `z`). */
  readonly target: CorrectionTarget;
}

/** Everything fixed while frames come in. */
export interface PipelineSetup {
  /** The slope sensor: geometry, guide light, how its camera sees the detection plane. */
  readonly sensor: SensorSetup;
  /** The scene camera and target. */
  readonly scene: SceneSetup;
}

/** Options of {@link preparePipeline} and {@link processFrame}. */
export interface PipelineOptions {
  /** Options of the sensor's measurement chain (detection, matching, reconstruction). @defaultValue `{}` */
  measure?: MeasureFrameOptions;
  /** Options of the correction (mode, mesh, reference, indices). @defaultValue `{}` (exact, through flat water) */
  correction?: CorrectionOptions;
  /** How the surface the correction traces through is built from the measurement. @defaultValue `{}` */
  surface?: SurfaceBuildOptions;
}

/**
 * How the pipeline builds the surface it corrects through.
 *
 * The sensor's reconstruction grid has one node a pitch, and a bicubic interpolant of
 * heights at that spacing cannot follow the slopes the sensor measured: on the shipped
 * tank scenario its slopes at the very sample points err by 0.0077 RMS (27 % of the true
 * slope RMS of 0.029) while the measured slopes err by 0.0010. The correction refracts by
 * the surface's slopes, so the pipeline integrates the final slope samples once more onto
 * a grid `subdivision` times finer (thin-plate smoothed least squares, started from the
 * sensor's heights), whose slopes err by 0.0059 over the camera's footprint.
 */
export interface SurfaceBuildOptions {
  /**
   * Nodes of the correction surface per sensor grid step (an integer, 1 to 4): 1 uses the
   * sensor's height grid as it is.
   * @defaultValue 2
   */
  subdivision?: number;
  /** Thin-plate smoothness of the finer integration (see `integrateScattered`). @defaultValue 0.03 */
  smoothness?: number;
  /**
   * Relative residual at which the finer integration's solver stops. On the tank scenario
   * at 1024² the default's slopes differ from the fully converged solution's by 3e-6 RMS,
   * 0.2 % of their 1.7e-3 RMS error against the true surface, in 28 iterations (42 at 1e-6).
   * @defaultValue 1e-5
   */
  tolerance?: number;
}

/** Milliseconds spent in each stage of one frame. */
export interface PipelineTimings {
  /** Spot detection. */
  readonly detect: number;
  /** Spot-to-aperture matching (and mapping to the plane). */
  readonly match: number;
  /** Slopes, integration and refinement. */
  readonly reconstruct: number;
  /** Building the correction surface (the finer integration and the interpolant). */
  readonly surface: number;
  /** Tracing the correction mesh through the surface. */
  readonly correctTrace: number;
  /** Rasterising the correction map. */
  readonly correctRaster: number;
  /** Sampling the scene image. */
  readonly correctSample: number;
  /** The whole frame. */
  readonly total: number;
}

/** What happened to one frame, in numbers. */
export interface PipelineDiagnostics {
  /** Spots found by the detector. */
  readonly spotsFound: number;
  /** Spots paired with an aperture. */
  readonly spotsMatched: number;
  /** Spots refused (size limits, extra, ambiguous). */
  readonly spotsRejected: number;
  /** Apertures without a spot. */
  readonly aperturesMissing: number;
  /** RMS slope residual of the integration (NaN without a surface). */
  readonly rmsResidual: number;
  /** Refinement passes run. */
  readonly iterations: number;
  /** Corrected pixels with a source. */
  readonly correctedPixels: number;
  /** Pixels where the correction map folds. */
  readonly foldPixels: number;
  /** Per-stage timings. */
  readonly timings: PipelineTimings;
  /** Plain-language notes from every stage. */
  readonly warnings: readonly string[];
}

/** The result of one frame. */
export interface PipelineResult {
  /** The sensor's measurement (spots, matches, reconstruction). */
  readonly measurement: FrameMeasurement;
  /** The measured heights, metres (zero mean), or `null` when the frame gave no surface. */
  readonly height: Grid | null;
  /** Nodes of `height` that data reach, or `null`. */
  readonly heightMask: Mask | null;
  /**
   * The heights the correction surface interpolates, metres: `height` itself with
   * `surface.subdivision` 1, otherwise the slope samples integrated onto a finer grid
   * over the same extent (see {@link SurfaceBuildOptions}); `null` without a surface.
   */
  readonly surfaceHeight: Grid | null;
  /** The measured surface (bicubic on `surfaceHeight`), or `null`. */
  readonly surface: Surface | null;
  /** The corrected scene image with its mask and map, or `null` without a surface. */
  readonly correction: CorrectionResult | null;
  /** Counts, residual, timings, warnings. */
  readonly diagnostics: PipelineDiagnostics;
}

/** A pipeline set up once and run frame after frame. */
export interface PreparedPipeline {
  /** The setup it was made for. */
  readonly setup: PipelineSetup;
  /**
   * Process one pair of simultaneous frames.
   *
   * @param sensorFrame - The slope sensor's camera frame.
   * @param sceneImage - The scene camera's image (the scene camera's size).
   * @param options - Per-frame options (buffer reuse for video).
   * @returns Surface, corrected image and diagnostics.
   * @throws {@link core!MeniscusTypeError} for malformed frames, a scene image whose size differs from the scene camera's calibration, or an `options.reuse` that is not a result of this pipeline.
   */
  process(sensorFrame: Image, sceneImage: Image, options?: ProcessFrameOptions): PipelineResult;
}

/** Per-frame options of {@link PreparedPipeline.process}. */
export interface ProcessFrameOptions {
  /**
   * A previous result of the same prepared pipeline whose correction buffers (corrected
   * image, mask, map and fold mask) are overwritten with this frame's, for video: fresh
   * multi-megabyte buffers every frame cost the garbage collector more than the work on
   * them. The old result's correction must not be used afterwards; the new result shares
   * its buffers. A result without a correction reuses nothing.
   */
  reuse?: PipelineResult;
}

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

function checkSetup(fn: string, setup: unknown): PipelineSetup {
  if (setup === null || typeof setup !== 'object') typeError(fn, 'setup', setup, 'a PipelineSetup { sensor, scene }');
  const s = setup as Partial<PipelineSetup>;
  if (s.sensor === null || typeof s.sensor !== 'object' || s.sensor.geometry === undefined || s.sensor.light === undefined || s.sensor.view === undefined) {
    typeError(fn, 'setup.sensor', s.sensor, 'a SensorSetup { geometry, light, view, reference? }');
  }
  if (s.scene === null || typeof s.scene !== 'object' || s.scene.camera === undefined || s.scene.pose === undefined || s.scene.target === undefined) {
    typeError(fn, 'setup.scene', s.scene, 'a SceneSetup { camera, pose, target }');
  }
  return s as PipelineSetup;
}

/**
 * The heights to correct through: the slope samples of the reconstruction's last pass
 * integrated onto a grid `f` times finer than its own, over the same extent, started from
 * its heights (bicubic-interpolated), with the piston of the sensor's heights.
 */
function finerHeights(rec: Reconstruction, f: number, smoothness: number, tolerance: number): Grid {
  const h = rec.height;
  const { x, y, p, q } = samplesFor(rec.samples, false); // unweighted
  const coarse = createGridSurface(h);
  const spec = { width: (h.width - 1) * f + 1, height: (h.height - 1) * f + 1, dx: h.dx / f, dy: h.dy / f, x0: h.x0, y0: h.y0 };
  const start = new Float64Array(spec.width * spec.height);
  for (let j = 0; j < spec.height; j++) {
    for (let c = 0; c < spec.width; c++) start[j * spec.width + c] = coarse.height(h.x0 + c * spec.dx, h.y0 + j * spec.dy);
  }
  const r = integrateScattered({ x, y, p, q }, spec, { smoothness, region: 'grid', model: 'smooth', tolerance, initialGuess: start });
  // Same piston as the sensor's heights: equal means over the sensor's valid nodes.
  const d = r.height.data;
  let shift = 0, n = 0;
  for (let j = 0; j < h.height; j++) {
    for (let c = 0; c < h.width; c++) {
      const k = j * h.width + c;
      if (rec.mask[k] !== 1) continue;
      shift += h.data[k]! - d[j * f * spec.width + c * f]!;
      n++;
    }
  }
  shift = n > 0 ? shift / n : 0;
  const out = createGrid(spec);
  for (let k = 0; k < d.length; k++) out.data[k] = d[k]! + shift;
  return out;
}

/**
 * Set up the pipeline once: the sensor's flat-water reference spots and the scene
 * camera's correction mesh and rays are computed here and reused for every frame.
 *
 * @param setup - Sensor and scene calibration.
 * @param options - Options of the measurement and of the correction.
 * @returns The prepared pipeline.
 * @throws {@link core!MeniscusTypeError} for a malformed setup; {@link core!MeniscusRangeError} for bad options.
 * @see {@link measureFrame} (the sensor chain) and {@link prepareCorrection} (the correction).
 * @example
 * ```ts
 * const pipe = preparePipeline({ sensor: { geometry, light, view }, scene: { camera, pose, target: { type: 'plane', z: 2 } } });
 * const r = pipe.process(sensorFrame, sceneImage);
 * r.correction?.image; r.diagnostics.timings.total;
 * ```
 */
export function preparePipeline(setup: PipelineSetup, options?: PipelineOptions): PreparedPipeline {
  const fn = 'preparePipeline';
  const s = checkSetup(fn, setup);
  const o = checkOptions(fn, options);
  const sensor: SensorSetup = s.sensor.reference !== undefined ? s.sensor : { ...s.sensor, reference: referenceSpots(s.sensor.geometry, s.sensor.light) };
  const prepared: PreparedCorrection = prepareCorrection(s.scene.camera, s.scene.pose, s.scene.target, o.correction);
  const measureOptions = o.measure;
  const so = checkOptions(fn, o.surface, 'options.surface');
  const subdivision = so.subdivision === undefined ? 2 : checkInteger(fn, 'options.surface.subdivision', so.subdivision, 1, 4);
  const smoothness = so.smoothness === undefined ? 0.03 : checkPositive(fn, 'options.surface.smoothness', so.smoothness);
  const tolerance = so.tolerance === undefined ? 1e-5 : checkPositive(fn, 'options.surface.tolerance', so.tolerance);
  const process = (sensorFrame: Image, sceneImage: Image, frameOptions?: ProcessFrameOptions): PipelineResult => {
    const pfn = 'PreparedPipeline.process';
    checkImage(pfn, 'sensorFrame', sensorFrame, true);
    const img = checkImage(pfn, 'sceneImage', sceneImage, true);
    if (img.width !== prepared.width || img.height !== prepared.height) {
      typeError(pfn, 'sceneImage', `${img.width}×${img.height}`, `an image of the scene camera's calibrated size ${prepared.width}×${prepared.height}`);
    }
    const fo = checkOptions(pfn, frameOptions);
    let reuse: CorrectionResult | undefined;
    if (fo.reuse !== undefined) {
      const r = fo.reuse as Partial<PipelineResult> | null;
      if (r === null || typeof r !== 'object' || !('correction' in r) || r.diagnostics === undefined) {
        typeError(pfn, 'options.reuse', r, 'a PipelineResult returned by this prepared pipeline');
      }
      // the correction checks that the buffers are of its size
      reuse = r.correction ?? undefined;
    }
    const t0 = now();
    const m = measureFrame(sensorFrame, sensor, measureOptions);
    const warnings = [...m.diagnostics.warnings];
    const t1 = now();
    let surface: Surface | null = null;
    let surfaceHeight: Grid | null = null;
    let correction: CorrectionResult | null = null;
    const rec = m.reconstruction;
    if (rec !== null) {
      surfaceHeight = subdivision === 1 || rec.height.width < 3 || rec.height.height < 3 ? rec.height : finerHeights(rec, subdivision, smoothness, tolerance);
      surface = createGridSurface(surfaceHeight, { interpolation: 'bspline' });
    }
    const t2 = now();
    if (surface !== null) {
      correction = prepared.correct(img, surface, reuse === undefined ? undefined : { reuse });
      warnings.push(...correction.warnings);
    } else warnings.push('no surface was measured, so the scene image was not corrected');
    const t3 = now();
    const d = m.diagnostics;
    const timings: PipelineTimings = {
      detect: d.timings.detect,
      match: d.timings.match,
      reconstruct: d.timings.reconstruct,
      surface: t2 - t1,
      correctTrace: correction ? correction.timings.trace : 0,
      correctRaster: correction ? correction.timings.raster : 0,
      correctSample: correction ? correction.timings.sample : 0,
      total: t3 - t0,
    };
    return {
      measurement: m,
      height: rec ? rec.height : null,
      heightMask: rec ? rec.mask : null,
      surfaceHeight,
      surface,
      correction,
      diagnostics: {
        spotsFound: d.spotsFound,
        spotsMatched: d.spotsMatched,
        spotsRejected: d.spotsRejected,
        aperturesMissing: d.aperturesMissing,
        rmsResidual: d.rmsResidual,
        iterations: d.iterations,
        correctedPixels: correction ? correction.valid : 0,
        foldPixels: correction ? correction.folds.pixels : 0,
        timings,
        warnings,
      },
    };
  };
  return { setup: { sensor, scene: s.scene }, process };
}

/**
 * Process one pair of simultaneous frames: measure the surface from the sensor frame
 * (spots → matches → slopes → heights, with refinement), then correct the scene image
 * through it. {@link preparePipeline} once instead when many frames share a setup.
 *
 * @param sensorFrame - The slope sensor's camera frame.
 * @param sceneImage - The scene camera's image.
 * @param setup - Sensor and scene calibration.
 * @param options - Options of the measurement and the correction.
 * @returns Measured surface, corrected image and diagnostics (spots found, matched,
 *   rejected; integration residual; refinement passes; timing per stage).
 * @throws {@link core!MeniscusTypeError} for malformed frames or setup, or a scene image
 *   whose size differs from the scene camera's calibration.
 * @see {@link preparePipeline}.
 * @example
 * ```ts
 * const sim = simulateScenario(harbourScenario());
 * const r = processFrame(sim.sensorFrame, sim.sceneImage, sim.setup);
 * ```
 */
export function processFrame(sensorFrame: Image, sceneImage: Image, setup: PipelineSetup, options?: PipelineOptions): PipelineResult {
  return preparePipeline(setup, options).process(sensorFrame, sceneImage);
}
