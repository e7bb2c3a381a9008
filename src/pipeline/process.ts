/**
 * The per-frame pipeline: a sensor frame and a simultaneous scene image in, the measured
 * surface, the corrected image and diagnostics out.
 *
 * @module
 */
import { checkImage, checkOptions, typeError } from '../core/index.js';
import type { Grid, Image, Mask } from '../core/index.js';
import type { CameraModel, CameraPose } from '../camera/index.js';
import { createGridSurface } from '../surface/index.js';
import type { Surface } from '../surface/index.js';
import { measureFrame, referenceSpots } from '../sensor/index.js';
import type { FrameMeasurement, MeasureFrameOptions, SensorSetup } from '../sensor/index.js';
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
}

/** Milliseconds spent in each stage of one frame. */
export interface PipelineTimings {
  /** Spot detection. */
  readonly detect: number;
  /** Spot-to-aperture matching (and mapping to the plane). */
  readonly match: number;
  /** Slopes, integration and refinement. */
  readonly reconstruct: number;
  /** Building the interpolating surface from the height grid. */
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
  /** The measured surface (bicubic on `height`), or `null`. */
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
   * @returns Surface, corrected image and diagnostics.
   * @throws {@link core!MeniscusTypeError} for malformed frames or a scene image whose size differs from the scene camera's calibration.
   */
  process(sensorFrame: Image, sceneImage: Image): PipelineResult;
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
  const process = (sensorFrame: Image, sceneImage: Image): PipelineResult => {
    const pfn = 'PreparedPipeline.process';
    checkImage(pfn, 'sensorFrame', sensorFrame, true);
    const img = checkImage(pfn, 'sceneImage', sceneImage, true);
    if (img.width !== prepared.width || img.height !== prepared.height) {
      typeError(pfn, 'sceneImage', `${img.width}×${img.height}`, `an image of the scene camera's calibrated size ${prepared.width}×${prepared.height}`);
    }
    const t0 = now();
    const m = measureFrame(sensorFrame, sensor, measureOptions);
    const warnings = [...m.diagnostics.warnings];
    const t1 = now();
    let surface: Surface | null = null;
    let correction: CorrectionResult | null = null;
    const rec = m.reconstruction;
    if (rec !== null) surface = createGridSurface(rec.height);
    const t2 = now();
    if (surface !== null) {
      correction = prepared.correct(img, surface);
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
