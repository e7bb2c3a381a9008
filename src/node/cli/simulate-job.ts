/**
 * The work on one frame of a simulated sequence, the same in the main thread and in a
 * worker: simulate the scenario at the frame's time and write the sensor frame, the
 * scene image and the truth.
 *
 * @module
 */
import { mkdirSync, renameSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { Image, Mask, Mat3 } from '../../core/index.js';
import { createImage } from '../../core/index.js';
import { simulateScenario } from '../../pipeline/index.js';
import type { Scenario, SimulatedScenario } from '../../pipeline/index.js';
import { writeFrameResult } from '../frame-result.js';
import { writePng } from '../png.js';
import type { RunConfigJson } from '../schemas/run.js';
import type { LightJson } from '../schemas/types.js';

/** What every worker needs to simulate frames (structured-cloneable). */
export interface SimulateJobSetup {
  /** The scenario (validated, defaults filled in). */
  readonly scenario: Scenario;
  /** The output folder. */
  readonly outDir: string;
  /** Seconds between frames. */
  readonly interval: number;
  /** Fingerprint of scenario and interval, written into each truth folder. */
  readonly configHash: string;
}

/** One frame to simulate. */
export interface SimulateTask {
  /** Position in the sequence (0 first). */
  readonly index: number;
  /** File name stem, e.g. `frame_0003`. */
  readonly stem: string;
}

/** What a simulated frame reports. */
export interface SimulateSummary {
  /** The frame's name. */
  readonly stem: string;
  /** Sea time, seconds. */
  readonly time: number;
  /** Spots that reached the sensor's frame. */
  readonly spots: number;
  /** A run configuration for `meniscus process` that matches the simulation (frame 0 only). */
  readonly run?: RunConfigJson;
}

/** The sub-folders a simulation writes. */
export const SIMULATE_FOLDERS = { frames: 'frames', scenes: 'scenes', truth: 'truth' } as const;

/**
 * The scenario of the n-th frame of a sequence: the sea's `time` advanced by n
 * intervals and the frame-noise seed by n; everything else unchanged.
 *
 * @param scenario - The scenario (defaults filled in).
 * @param index - Frame number, 0 first.
 * @param interval - Seconds between frames.
 * @returns A new scenario.
 * @example
 * ```ts
 * scenarioAt(tankScenario(), 3, 0.04).sea.time; // 0.12
 * ```
 */
export function scenarioAt(scenario: Scenario, index: number, interval: number): Scenario {
  const s = structuredClone(scenario);
  s.sea.time = (s.sea.time ?? 0) + index * interval;
  s.sensor.seed = (s.sensor.seed ?? 7) + index;
  return s;
}

function maskImage(mask: Mask, width: number, height: number): Image {
  const img = createImage(width, height, 1);
  for (let k = 0; k < mask.length; k++) img.data[k] = mask[k]!;
  return img;
}

/**
 * The run configuration that processes simulated frames exactly as the simulator set the
 * pipeline up (sensor placement, view, light, refinement and correction settings).
 *
 * @param sim - A simulated scenario.
 * @returns The run configuration, every part inline.
 * @example
 * ```ts
 * writeFileSync('run.json', JSON.stringify(runConfigFor(simulateScenario(tankScenario()))));
 * ```
 */
export function runConfigFor(sim: SimulatedScenario): RunConfigJson {
  const sc = sim.scenario;
  const g = sim.sensor.geometry;
  const a = g.apertures;
  const L = sim.light;
  let light: LightJson;
  if (L.kind === 'sun') light = { kind: 'sun', time: sc.time!, site: { latitudeDeg: sc.site!.latitudeDeg, longitudeDeg: sc.site!.longitudeDeg, height: sc.site!.height ?? 0 } };
  else if (L.kind === 'collimated') {
    const d = (L as unknown as { direction: number[] }).direction;
    light = { kind: 'collimated', toLight: [d[0]!, d[1]!, d[2]!], angularRadius: L.angularRadius([0, 0, 0]) };
  } else {
    const p = (L as unknown as { position: number[]; radius: number });
    light = { kind: 'point', position: [p.position[0]!, p.position[1]!, p.position[2]!], radius: p.radius };
  }
  const measure = sim.options.measure?.reconstruct ?? {};
  const corr = sim.options.correction ?? {};
  const run: RunConfigJson = {
    sensor: {
      apertures: { lattice: a.lattice, pitch: a.pitch, columns: a.columns, rows: a.rows, apertureDiameter: a.apertureDiameter },
      maskDepth: g.maskDepth,
      planeDistance: g.planeDistance,
      position: [g.centre[0], g.centre[1]],
      nAir: g.nAir,
      nWater: g.nWater,
    },
    camera: { kind: 'homography', width: sim.sensor.view.width, height: sim.sensor.view.height, planeToPixel: [...sim.sensor.view.planeToPixel] as unknown as Mat3 },
    light,
    reconstruct: { ...(measure.refine !== undefined ? { refine: measure.refine } : {}), ...(measure.maxIterations !== undefined ? { maxIterations: measure.maxIterations } : {}) },
    correct: {
      camera: {
        kind: 'camera',
        width: sim.sceneImage.width,
        height: sim.sceneImage.height,
        camera: sim.camera.toJSON(),
        pose: { rotation: [...sim.pose.rotation] as unknown as Mat3, position: [sim.pose.position[0], sim.pose.position[1], sim.pose.position[2]] },
      },
      target: sim.setup.scene.target,
      ...(corr.mode !== undefined ? { mode: corr.mode } : {}),
      ...(corr.meshStep !== undefined ? { meshStep: corr.meshStep } : {}),
      ...(corr.reference !== undefined ? { reference: corr.reference } : {}),
      ...(corr.nWater !== undefined ? { nWater: corr.nWater } : {}),
      ...(corr.nAir !== undefined ? { nAir: corr.nAir } : {}),
    },
  };
  return run;
}

/**
 * Prepare the per-frame function of a simulation.
 *
 * @param setup - Scenario, output folder, interval, fingerprint.
 * @returns The function that simulates and writes one frame.
 * @example
 * ```ts
 * const job = prepareSimulateJob({ scenario, outDir: 'sim', interval: 0.04, configHash });
 * job({ index: 0, stem: 'frame_0000' });
 * ```
 */
export function prepareSimulateJob(setup: SimulateJobSetup): (task: SimulateTask) => SimulateSummary {
  const { scenario, outDir, interval, configHash } = setup;
  return (task: SimulateTask): SimulateSummary => {
    const sc = scenarioAt(scenario, task.index, interval);
    const sim = simulateScenario(sc);
    // Sensor frame: counts as 16-bit codes (as a 16-bit camera stores them).
    const f = sim.sensorFrame;
    const scaled = createImage(f.width, f.height, f.channels);
    for (let k = 0; k < f.data.length; k++) scaled.data[k] = f.data[k]! / 65535;
    const frames = join(outDir, SIMULATE_FOLDERS.frames), scenes = join(outDir, SIMULATE_FOLDERS.scenes);
    const tag = `.partial-${process.pid}-${Math.random().toString(36).slice(2, 8)}`;
    const framePath = join(frames, `${task.stem}.png`), scenePath = join(scenes, `${task.stem}.png`);
    writePng(framePath + tag, scaled, { bitDepth: 16 });
    writePng(scenePath + tag, sim.sceneImage, { bitDepth: 16 });
    // Truth: the sea on its grid, the flat-water view of the scene and its mask.
    const truthDir = join(outDir, SIMULATE_FOLDERS.truth, task.stem);
    const tmp = truthDir + tag;
    rmSync(tmp, { recursive: true, force: true });
    mkdirSync(tmp, { recursive: true });
    writePng(join(tmp, 'scene.png'), sim.truthImage, { bitDepth: 16 });
    writePng(join(tmp, 'scene_mask.png'), maskImage(sim.truthMask, sim.truthImage.width, sim.truthImage.height));
    writePng(join(tmp, 'distorted_mask.png'), maskImage(sim.sceneMask, sim.sceneImage.width, sim.sceneImage.height));
    let spots = 0;
    const c = sim.sensorRender.centres;
    for (let k = 0; k < c.length; k += 2) if (Number.isFinite(c[k]!)) spots++;
    writeFrameResult(tmp, {
      height: sim.sea.height,
      slopeX: sim.sea.slopeX,
      slopeY: sim.sea.slopeY,
      meta: { frame: task.stem, index: task.index, time: sim.sea.time, noiseSeed: sc.sensor.seed, scenario: sc.name, configHash, spots },
    });
    renameSync(framePath + tag, framePath);
    renameSync(scenePath + tag, scenePath);
    rmSync(truthDir, { recursive: true, force: true });
    renameSync(tmp, truthDir);
    const summary: SimulateSummary = { stem: task.stem, time: sim.sea.time, spots };
    return task.index === 0 ? { ...summary, run: runConfigFor(sim) } : summary;
  };
}
