/**
 * The work on one frame of a run, the same in the main thread and in a worker: read the
 * sensor frame (and scene image), measure the surface (and correct the scene image
 * through it with the pipeline), write the frame's result folder, and return a short
 * summary for the report.
 *
 * @module
 */
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { basename, extname, join } from 'node:path';
import { createGrid, createImage, gridFromFunction } from '../../core/index.js';
import type { Grid, Image, Mask } from '../../core/index.js';
import { heightError, ssim } from '../../metrics/index.js';
import { createGridSurface } from '../../surface/index.js';
import type { CorrectionResult } from '../../imaging/index.js';
import { preparePipeline } from '../../pipeline/index.js';
import type { PreparedPipeline } from '../../pipeline/index.js';
import { measureFrame, referenceSpots } from '../../sensor/index.js';
import type { CameraPlaneView, FrameMeasurement, MeasureFrameOptions, SensorSetup } from '../../sensor/index.js';
import { heightMapImage } from '../../viz/index.js';
import { readFrameResult, writeFrameResult } from '../frame-result.js';
import { npyToImage } from '../npy-convert.js';
import { readNpy } from '../npy.js';
import { decodePng, pngInfo, readPng, writePng } from '../png.js';
import type { LoadedRunConfig } from '../schemas/build.js';
import { lightFromJson, sensorFromJson, viewFromJson } from '../schemas/build.js';

/** What every worker needs to process frames (structured-cloneable). */
export interface FrameJobSetup {
  /** The run, every part inline. */
  readonly run: LoadedRunConfig['run'];
  /** The run's output folder. */
  readonly outDir: string;
  /** Fingerprint of the run configuration, written into each frame's `meta.json`. */
  readonly configHash: string;
}

/** One frame to process. */
export interface FrameTask {
  /** Name of the frame (its output folder). */
  readonly stem: string;
  /** Path of the sensor frame. */
  readonly frame: string;
  /** Path of the scene image, when there is one. */
  readonly scene?: string;
  /** A truth folder written by `meniscus simulate` (`truth/<name>/`), to score against. */
  readonly truth?: string;
}

/** Scores of a frame against the simulated truth. */
export interface FrameScores {
  /** RMS height error after removing the mean, metres, over the measured nodes. */
  readonly heightRms: number;
  /** RMS of the true heights over the same nodes (mean removed): the error of assuming flat water. */
  readonly truthRms: number;
  /** SSIM of the distorted scene image against the flat-water view (null without scene images). */
  readonly ssimDistorted: number | null;
  /** SSIM of the corrected image against the flat-water view (null without scene images). */
  readonly ssimCorrected: number | null;
}

/** What a processed frame reports. */
export interface FrameSummary {
  /** Name of the frame. */
  readonly stem: string;
  /** Spots found, matched and rejected; apertures missing. */
  readonly spotsFound: number;
  /** See `spotsFound`. */
  readonly spotsMatched: number;
  /** See `spotsFound`. */
  readonly spotsRejected: number;
  /** See `spotsFound`. */
  readonly aperturesMissing: number;
  /** RMS slope residual of the integration. */
  readonly rmsResidual: number;
  /** Refinement passes. */
  readonly iterations: number;
  /** RMS of the height map over its valid nodes, metres. */
  readonly heightRms: number;
  /** Corrected pixels with a source, or `null` without a scene image. */
  readonly correctedPixels: number | null;
  /** Scores against the truth, when a truth folder was given. */
  readonly scores: FrameScores | null;
  /** Plain-language notes. */
  readonly warnings: readonly string[];
  /** Milliseconds the frame took (not written into the frame's folder). */
  readonly milliseconds: number;
}

/** The name of the folder of a frame's results inside the run's output folder. */
export const FRAMES_FOLDER = 'frames';

/**
 * Read a sensor frame as camera counts: a PNG's integer codes as they are stored (0 to
 * 255 or 0 to 65535), a `.npy` file's values as they are (integers and floats alike).
 *
 * @param path - The file.
 * @returns The frame, counts.
 * @throws File-system errors; the library's errors for files that are not images.
 * @example
 * ```ts
 * const frame = readSensorFrame('frames/frame_0001.png');
 * ```
 */
export function readSensorFrame(path: string): Image {
  if (extname(path).toLowerCase() === '.npy') {
    const a = readNpy(path);
    const img = npyToImage(a);
    const max = a.dtype === 'uint8' ? 255 : a.dtype === 'uint16' ? 65535 : a.dtype === 'uint32' ? 4294967295 : a.dtype === 'bool' ? 1 : 0;
    if (max > 0) for (let k = 0; k < img.data.length; k++) img.data[k] = Math.round(img.data[k]! * max);
    return img;
  }
  const bytes = readFileSync(path);
  const info = pngInfo(bytes);
  const max = info.colorType === 3 ? 255 : 2 ** info.bitDepth - 1;
  const img = decodePng(bytes);
  for (let k = 0; k < img.data.length; k++) img.data[k] = Math.round(img.data[k]! * max);
  return img;
}

/**
 * Read a scene image: PNG codes scaled to [0, 1] (no transfer function: codes in, codes
 * out), or a `.npy` file (floats as they are, unsigned integers scaled by their maximum).
 *
 * @param path - The file.
 * @returns The image.
 * @throws File-system errors; the library's errors for files that are not images.
 * @example
 * ```ts
 * const scene = readSceneImage('scenes/frame_0001.png');
 * ```
 */
export function readSceneImage(path: string): Image {
  return extname(path).toLowerCase() === '.npy' ? npyToImage(readNpy(path)) : readPng(path);
}

/**
 * The folder holding a frame's result.
 *
 * @param outDir - The run's output folder.
 * @param stem - The frame's name.
 * @returns The folder path.
 * @example
 * ```ts
 * frameOutputDir('results', 'frame_0001'); // "results/frames/frame_0001"
 * ```
 */
export function frameOutputDir(outDir: string, stem: string): string {
  return join(outDir, FRAMES_FOLDER, stem);
}

/**
 * Remove what an interrupted run left half-written in a folder (entries whose names
 * contain `.partial-`).
 *
 * @param dir - The folder.
 * @example
 * ```ts
 * removePartials('results/frames');
 * ```
 */
export function removePartials(dir: string): void {
  for (const name of readdirSync(dir)) if (name.includes('.partial-')) rmSync(join(dir, name), { recursive: true, force: true });
}

/**
 * Whether a frame was already done by a run with the same configuration: its
 * `meta.json` exists and holds the same fingerprint. Returns `'other'` when it was done
 * with another configuration.
 *
 * @param outDir - The run's output folder.
 * @param stem - The frame's name.
 * @param configHash - The fingerprint of this run.
 * @returns `'done'`, `'other'` or `'todo'`.
 * @example
 * ```ts
 * if (frameState('results', 'frame_0001', hash) === 'done') skip();
 * ```
 */
export function frameState(outDir: string, stem: string, configHash: string): 'done' | 'other' | 'todo' {
  const meta = join(frameOutputDir(outDir, stem), 'meta.json');
  if (!existsSync(meta)) return 'todo';
  try {
    const index = JSON.parse(readFileSync(meta, 'utf8')) as { meta?: { configHash?: unknown } };
    return index.meta?.configHash === configHash ? 'done' : 'other';
  } catch {
    return 'todo';
  }
}

/**
 * Score a measured frame against a truth folder written by `meniscus simulate`: the
 * height error (mean removed) at the measured nodes, with the true heights interpolated
 * there, and, with scene images, the SSIM of the distorted and corrected images against
 * the flat-water view over the pixels all of them have.
 *
 * @param truthDir - The frame's truth folder.
 * @param height - The measured heights.
 * @param mask - Their valid nodes.
 * @param scene - The distorted scene image, or null.
 * @param corrected - The correction, or null.
 * @returns The scores.
 * @throws File-system errors for a missing truth folder.
 * @see Wang, Z., Bovik, A. C., Sheikh, H. R. & Simoncelli, E. P. (2004), "Image quality
 *   assessment: from error visibility to structural similarity", IEEE Trans. Image
 *   Processing 13(4), 600–612 (SSIM).
 * @example
 * ```ts
 * scoreAgainstTruth('sim/truth/frame_0003', r.height, r.mask, null, null).heightRms;
 * ```
 */
export function scoreAgainstTruth(truthDir: string, height: Grid, mask: Mask, scene: Image | null, corrected: CorrectionResult | null): FrameScores {
  const truth = readFrameResult(truthDir);
  const surface = createGridSurface(truth.height);
  const t = truth.height;
  const covered = (x: number, y: number): boolean => x >= t.x0 && y >= t.y0 && x <= t.x0 + (t.width - 1) * t.dx && y <= t.y0 + (t.height - 1) * t.dy;
  const inside = new Uint8Array(mask.length);
  for (let j = 0; j < height.height; j++) {
    for (let i = 0; i < height.width; i++) {
      const k = j * height.width + i;
      inside[k] = mask[k] === 1 && covered(height.x0 + i * height.dx, height.y0 + j * height.dy) ? 1 : 0;
    }
  }
  const truthHere = gridFromFunction(height, (x, y) => (covered(x, y) ? surface.height(x, y) : 0));
  const err = heightError(height, truthHere, { mask: inside, remove: 'piston' });
  const flat = heightError(createGrid(height), truthHere, { mask: inside, remove: 'piston' });
  let ssimDistorted: number | null = null, ssimCorrected: number | null = null;
  const truthScene = join(truthDir, 'scene.png');
  if (scene !== null && corrected !== null && existsSync(truthScene)) {
    const view = readPng(truthScene);
    const tm = readPng(join(truthDir, 'scene_mask.png'));
    const dm = existsSync(join(truthDir, 'distorted_mask.png')) ? readPng(join(truthDir, 'distorted_mask.png')) : null;
    const m = new Uint8Array(view.width * view.height);
    for (let k = 0; k < m.length; k++) m[k] = tm.data[k]! > 0.5 && corrected.mask[k] === 1 && (dm === null || dm.data[k]! > 0.5) ? 1 : 0;
    ssimDistorted = ssim(scene, view, { mask: m }).ssim;
    ssimCorrected = ssim(corrected.image, view, { mask: m }).ssim;
  }
  return { heightRms: err.rms, truthRms: flat.rms, ssimDistorted, ssimCorrected };
}

/**
 * Prepare the per-frame function of a run: builds the sensor, view, light, flat-water
 * reference and (with a `correct` section) the scene correction once.
 *
 * @param setup - The run and its output folder.
 * @returns The function that processes one frame (it throws when the frame fails).
 * @throws The library's errors for a configuration the schema lets through but the
 *   library refuses.
 * @example
 * ```ts
 * const job = prepareFrameJob({ run, outDir: 'results', configHash });
 * const summary = job({ stem: 'frame_0001', frame: 'frames/frame_0001.png' });
 * ```
 */
export function prepareFrameJob(setup: FrameJobSetup): (task: FrameTask) => FrameSummary {
  const { run, outDir, configHash } = setup;
  const geometry = sensorFromJson(run.sensor);
  const view = viewFromJson(run.camera);
  const light = lightFromJson(run.light);
  const reference = referenceSpots(geometry, light);
  const sensorSetup: SensorSetup = { geometry, light, view, reference };
  const measure: MeasureFrameOptions = {};
  if (run.detect !== undefined) measure.detect = run.detect;
  if (run.match !== undefined) measure.match = run.match;
  if (run.reconstruct !== undefined) measure.reconstruct = run.reconstruct;
  let pipeline: PreparedPipeline | null = null;
  if (run.correct !== undefined) {
    const { camera: cam, target, ...correction } = run.correct;
    const sceneView = viewFromJson(cam) as CameraPlaneView;
    pipeline = preparePipeline(
      { sensor: sensorSetup, scene: { camera: sceneView.camera, pose: sceneView.pose, target } },
      { measure, correction: { ...correction, width: cam.width, height: cam.height } },
    );
  }
  const dtype = run.output?.dtype ?? 'float64';
  const pictures = run.output?.pictures === true;
  return (task: FrameTask): FrameSummary => {
    const t0 = performance.now();
    const frame = readSensorFrame(task.frame);
    let m: FrameMeasurement;
    let corrected: CorrectionResult | null = null;
    const warnings: string[] = [];
    if (task.scene !== undefined) {
      if (pipeline === null) throw new Error('a scene image was given but the run configuration has no "correct" section');
      const r = pipeline.process(frame, readSceneImage(task.scene));
      m = r.measurement;
      corrected = r.correction;
      warnings.push(...r.diagnostics.warnings);
    } else {
      m = measureFrame(frame, sensorSetup, measure);
      warnings.push(...m.diagnostics.warnings);
    }
    const d = m.diagnostics;
    const r = m.reconstruction;
    if (r === null) throw new Error(`no height map: ${warnings.join('; ') || 'too few spots matched'}`);
    let sum = 0, n = 0;
    for (let k = 0; k < r.mask.length; k++) {
      if (r.mask[k] === 1) {
        sum += r.height.data[k]! ** 2;
        n++;
      }
    }
    const heightRms = n > 0 ? Math.sqrt(sum / n) : NaN;
    const scores = task.truth === undefined ? null : scoreAgainstTruth(task.truth, r.height, r.mask, task.scene === undefined ? null : readSceneImage(task.scene), corrected);
    // Write into a temporary folder, then move it into place: a frame folder with a
    // meta.json is always complete, which is what resuming relies on.
    const dir = frameOutputDir(outDir, task.stem);
    const tmp = `${dir}.partial-${process.pid}-${Math.random().toString(36).slice(2, 8)}`;
    rmSync(tmp, { recursive: true, force: true });
    mkdirSync(tmp, { recursive: true });
    if (pictures) writePng(join(tmp, 'height.png'), heightMapImage(r.height, { mask: r.mask }).image, { transfer: 'srgb' });
    if (corrected !== null) {
      writePng(join(tmp, 'corrected.png'), corrected.image, { bitDepth: 16 });
      const mk = createImage(corrected.image.width, corrected.image.height, 1);
      for (let k = 0; k < corrected.mask.length; k++) mk.data[k] = corrected.mask[k]!;
      writePng(join(tmp, 'corrected_mask.png'), mk);
    }
    writeFrameResult(
      tmp,
      {
        height: r.height,
        mask: r.mask,
        meta: {
          frame: task.stem,
          source: basename(task.frame),
          scene: task.scene === undefined ? null : basename(task.scene),
          configHash,
          spotsFound: d.spotsFound,
          spotsMatched: d.spotsMatched,
          spotsRejected: d.spotsRejected,
          aperturesMissing: d.aperturesMissing,
          aperturesAmbiguous: d.aperturesAmbiguous,
          slopesUsed: d.slopesUsed,
          rmsResidual: d.rmsResidual,
          iterations: d.iterations,
          converged: r.converged,
          correctedPixels: corrected === null ? null : corrected.valid,
          foldPixels: corrected === null ? null : corrected.folds.pixels,
          scores,
          warnings,
        },
      },
      { dtype },
    );
    rmSync(dir, { recursive: true, force: true });
    renameSync(tmp, dir);
    return {
      stem: task.stem,
      spotsFound: d.spotsFound,
      spotsMatched: d.spotsMatched,
      spotsRejected: d.spotsRejected,
      aperturesMissing: d.aperturesMissing,
      rmsResidual: d.rmsResidual,
      iterations: d.iterations,
      heightRms,
      correctedPixels: corrected === null ? null : corrected.valid,
      scores,
      warnings,
      milliseconds: performance.now() - t0,
    };
  };
}
