/**
 * The scenario simulator: from a plain JSON scenario (an invented site, date and time,
 * sea state, sensor design, cameras and target) to the sensor frame, the distorted scene
 * image and the truth, so that a design can be tried before it is built.
 *
 * @module
 */
import { rangeError, typeError } from '../core/index.js';
import type { Image, Mask, Vec3 } from '../core/index.js';
import { PinholeCamera, createCameraPose } from '../camera/index.js';
import type { CameraPose } from '../camera/index.js';
import { createPlaneSurface } from '../surface/index.js';
import type { Surface } from '../surface/index.js';
import { refract } from '../optics/index.js';
import { createCollimatedLight, createPointLight, createSunLight } from '../sun/index.js';
import type { GuideLight } from '../sun/index.js';
import { cos2sSpreading, jonswapFromPeak, jonswapSpectrumFunction, prepareRandomSea, seaSurface } from '../waves/index.js';
import type { SeaFrame } from '../waves/index.js';
import { createApertureArray, createPlaneView, createSensorGeometry, referenceSpots, renderSpotFrame, traceSpots } from '../sensor/index.js';
import type { HomographyPlaneView, RenderedFrame, SensorGeometry, SpotReference } from '../sensor/index.js';
import { renderThroughSurface } from '../imaging/index.js';
import type { CorrectionOptions, PlaneScene } from '../imaging/index.js';
import { checkerboardTexture, patternTexture } from './targets.js';
import type { CheckerboardTexture, PlaneTexture } from './targets.js';
import type { PipelineOptions, PipelineSetup } from './process.js';

/** An invented site: where the scenario happens (for the sun's position). */
export interface ScenarioSite {
  /** A name for the report (invented). */
  name?: string;
  /** Latitude, degrees north. */
  latitudeDeg: number;
  /** Longitude, degrees east. */
  longitudeDeg: number;
  /** Height above sea level, metres. @defaultValue 0 */
  height?: number;
}

/** The sea state: a JONSWAP spectrum with cos-2s spreading, synthesised on a square grid. */
export interface ScenarioSea {
  /** Peak period, s (> 0). */
  peakPeriod: number;
  /** Significant wave height, m (> 0). */
  significantHeight: number;
  /** JONSWAP peak enhancement γ. @defaultValue 3.3 */
  gamma?: number;
  /** Spreading exponent s of cos²ˢ. @defaultValue 4 */
  spreadingS?: number;
  /** Mean direction the waves travel towards, degrees counter-clockwise from east. @defaultValue 0 */
  meanDirectionDeg?: number;
  /** Water depth, m. @defaultValue deep water */
  depth?: number;
  /** Grid samples per side (a power of two). @defaultValue 256 */
  gridSize?: number;
  /** Grid spacing, m (> 0). */
  gridSpacing: number;
  /** Seed of the random sea. @defaultValue 1 */
  seed?: number;
  /** Time of the frame, s. @defaultValue 0 */
  time?: number;
}

/** The guide light: the sun (from site and time), a collimated lamp or a point lamp. */
export type ScenarioLight =
  | { type: 'sun' }
  | { type: 'collimated'; zenithDeg: number; azimuthDeg: number; angularRadiusDeg?: number }
  | { type: 'point'; position: [number, number, number]; radius?: number };

/** The slope sensor's design and its camera. */
export interface ScenarioSensor {
  /** Aperture lattice. @defaultValue 'hexagonal' */
  lattice?: 'square' | 'hexagonal';
  /** Aperture pitch, m. */
  pitch: number;
  /** Apertures per row. */
  columns: number;
  /** Rows of apertures. */
  rows: number;
  /** Aperture diameter, m. */
  apertureDiameter: number;
  /** Depth of the mask below the mean level, m. */
  maskDepth: number;
  /** Mask-to-detection-plane distance, m. */
  planeDistance: number;
  /** The camera that images the detection plane. */
  frame: { width: number; height: number; pixelSize: number };
  /** Photo-electrons per spot. @defaultValue 30000 */
  photonsPerSpot?: number;
  /** Read noise, electrons RMS. @defaultValue 3 */
  readNoise?: number;
  /** Seed of the frame's noise. @defaultValue 7 */
  seed?: number;
  /** Refinement passes of the reconstruction. @defaultValue 3 */
  refinementPasses?: number;
}

/** The scene camera: a pinhole looking straight up from below the water (z < 0) or down from above it (z > 0). */
export interface ScenarioCamera {
  /** Image width, pixels. */
  width: number;
  /** Image height, pixels. */
  height: number;
  /** Horizontal field of view, degrees. */
  fovDeg: number;
  /** Height of the camera centre, m (negative below the mean level). */
  z: number;
  /** Horizontal position `[x, y]`, m. @defaultValue [0, 0] */
  position?: [number, number];
  /** Sub-samples per pixel side when rendering its images. @defaultValue 2 */
  supersample?: number;
}

/** What the scene camera looks at: a horizontal plane at height `z`. */
export type ScenarioTarget =
  | { type: 'pattern'; z: number; size: number; pixels?: number; seed?: number }
  | { type: 'checkerboard'; z: number; squareSize: number; columns: number; rows: number; pixelsPerSquare?: number };

/** A whole scenario, as plain JSON. */
export interface Scenario {
  /** Short name. */
  name: string;
  /** What it shows. */
  description?: string;
  /** The (invented) site. Needed for a sun light. */
  site?: ScenarioSite;
  /** The instant, ISO 8601 UTC (e.g. `"2025-06-21T11:00:00Z"`). Needed for a sun light. */
  time?: string;
  /** Refractive indices. @defaultValue `{ nWater: 1.333, nAir: 1.000293 }` */
  water?: { nWater?: number; nAir?: number };
  /** Sea state. */
  sea: ScenarioSea;
  /** Guide light. */
  light: ScenarioLight;
  /** Slope sensor. */
  sensor: ScenarioSensor;
  /** Scene camera. */
  camera: ScenarioCamera;
  /** Scene target. */
  target: ScenarioTarget;
  /** Correction settings for the pipeline. @defaultValue `{ mode: 'exact' }` */
  correction?: { mode?: 'exact' | 'fast'; meshStep?: number; reference?: 'flat' | 'none' };
}

/** Everything a simulated scenario produced. */
export interface SimulatedScenario {
  /** The scenario, as validated. */
  readonly scenario: Scenario;
  /** The guide light. */
  readonly light: GuideLight;
  /** The true sea at the frame's time. */
  readonly sea: SeaFrame;
  /** The true surface (bicubic on the sea grid). */
  readonly trueSurface: Surface;
  /** The sensor's geometry, view and flat-water reference. */
  readonly sensor: { readonly geometry: SensorGeometry; readonly view: HomographyPlaneView; readonly reference: SpotReference };
  /** The rendered sensor frame with its true spot centres. */
  readonly sensorRender: RenderedFrame;
  /** The sensor frame (counts). */
  readonly sensorFrame: Image;
  /** The scene camera and pose. */
  readonly camera: PinholeCamera;
  /** The scene camera's pose. */
  readonly pose: CameraPose;
  /** The scene (textured plane). */
  readonly scene: PlaneScene;
  /** The target's texture (and, for a checkerboard, its true corners). */
  readonly texture: PlaneTexture | CheckerboardTexture;
  /** The scene image through the true (wavy) surface. */
  readonly sceneImage: Image;
  /** Its mask (rays that reached the scene). */
  readonly sceneMask: Mask;
  /** The truth: the scene image through flat water (or no water, as the correction's reference). */
  readonly truthImage: Image;
  /** Its mask. */
  readonly truthMask: Mask;
  /** A pipeline setup for {@link processFrame}. */
  readonly setup: PipelineSetup;
  /** Pipeline options from the scenario (refinement passes; correction mode, mesh, reference, indices). */
  readonly options: PipelineOptions;
  /** Milliseconds per simulation stage. */
  readonly timings: Readonly<Record<'sea' | 'sensor' | 'scene', number>>;
}

const DEG = Math.PI / 180;

function fail(field: string, value: unknown, expected: string): never {
  rangeError('simulateScenario', `scenario.${field}`, value, expected);
}

function num(v: unknown, field: string, lo: number, hi: number, def?: number): number {
  if (v === undefined && def !== undefined) return def;
  if (typeof v !== 'number' || !Number.isFinite(v)) fail(field, v, `a finite number in [${lo}, ${hi}]`);
  if (!(v >= lo && v <= hi)) fail(field, v, `a number in [${lo}, ${hi}]`);
  return v;
}

function int(v: unknown, field: string, lo: number, hi: number, def?: number): number {
  const x = num(v, field, lo, hi, def);
  if (!Number.isInteger(x)) fail(field, v, `an integer in [${lo}, ${hi}]`);
  return x;
}

function obj(v: unknown, field: string): Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) typeError('simulateScenario', `scenario.${field}`, v, 'an object');
  return v as Record<string, unknown>;
}

function oneOf<T extends string>(v: unknown, field: string, options: readonly T[], def?: T): T {
  if (v === undefined && def !== undefined) return def;
  if (typeof v !== 'string' || !(options as readonly string[]).includes(v)) fail(field, v, `one of ${options.map((s) => `'${s}'`).join(', ')}`);
  return v as T;
}

function vec(v: unknown, field: string, n: number): number[] {
  if (!Array.isArray(v) || v.length !== n) typeError('simulateScenario', `scenario.${field}`, v, `an array of ${n} numbers`);
  return v.map((x, i) => num(x, `${field}[${i}]`, -1e6, 1e6));
}

const KNOWN: Record<string, readonly string[]> = {
  '': ['name', 'description', 'site', 'time', 'water', 'sea', 'light', 'sensor', 'camera', 'target', 'correction', '$schema'],
  site: ['name', 'latitudeDeg', 'longitudeDeg', 'height'],
  water: ['nWater', 'nAir'],
  sea: ['peakPeriod', 'significantHeight', 'gamma', 'spreadingS', 'meanDirectionDeg', 'depth', 'gridSize', 'gridSpacing', 'seed', 'time'],
  sensor: ['lattice', 'pitch', 'columns', 'rows', 'apertureDiameter', 'maskDepth', 'planeDistance', 'frame', 'photonsPerSpot', 'readNoise', 'seed', 'refinementPasses'],
  'sensor.frame': ['width', 'height', 'pixelSize'],
  camera: ['width', 'height', 'fovDeg', 'z', 'position', 'supersample'],
  correction: ['mode', 'meshStep', 'reference'],
};

function noExtra(o: Record<string, unknown>, field: string): void {
  const known = KNOWN[field];
  if (!known) return;
  for (const k of Object.keys(o)) {
    if (!known.includes(k)) fail(field === '' ? k : `${field}.${k}`, o[k], `no such field (known: ${known.join(', ')})`);
  }
}

/**
 * Check a scenario and fill in its defaults. Every problem is reported with the field's
 * path (`scenario.sea.gridSpacing`), the value given and what was expected.
 *
 * @param scenario - The scenario, as parsed from JSON.
 * @returns A copy with every default filled in.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} naming the field.
 * @example
 * ```ts
 * const s = validateScenario(JSON.parse(text));
 * ```
 */
export function validateScenario(scenario: unknown): Scenario {
  const s = obj(scenario, 'root');
  noExtra(s, '');
  if (typeof s.name !== 'string' || s.name.length === 0) fail('name', s.name, 'a non-empty string');
  if (s.description !== undefined && typeof s.description !== 'string') fail('description', s.description, 'a string');
  const w = s.water === undefined ? {} : obj(s.water, 'water');
  noExtra(w, 'water');
  const water = { nWater: num(w.nWater, 'water.nWater', 1, 2, 1.333), nAir: num(w.nAir, 'water.nAir', 0.9, 1.1, 1.000293) };
  const se = obj(s.sea, 'sea');
  noExtra(se, 'sea');
  const gridSize = int(se.gridSize, 'sea.gridSize', 16, 4096, 256);
  if ((gridSize & (gridSize - 1)) !== 0) fail('sea.gridSize', gridSize, 'a power of two (the FFT size)');
  const sea: ScenarioSea = {
    peakPeriod: num(se.peakPeriod, 'sea.peakPeriod', 0.05, 30),
    significantHeight: num(se.significantHeight, 'sea.significantHeight', 1e-5, 20),
    gamma: num(se.gamma, 'sea.gamma', 1, 10, 3.3),
    spreadingS: num(se.spreadingS, 'sea.spreadingS', 0.1, 100, 4),
    meanDirectionDeg: num(se.meanDirectionDeg, 'sea.meanDirectionDeg', -360, 360, 0),
    gridSize,
    gridSpacing: num(se.gridSpacing, 'sea.gridSpacing', 1e-5, 100),
    seed: int(se.seed, 'sea.seed', 0, 2 ** 31, 1),
    time: num(se.time, 'sea.time', -1e6, 1e6, 0),
  };
  if (se.depth !== undefined) sea.depth = num(se.depth, 'sea.depth', 1e-3, 1e4);
  const l = obj(s.light, 'light');
  const ltype = oneOf(l.type, 'light.type', ['sun', 'collimated', 'point'] as const);
  let light: ScenarioLight;
  let site: ScenarioSite | undefined;
  let time: string | undefined;
  if (ltype === 'sun') {
    const si = obj(s.site, 'site');
    noExtra(si, 'site');
    site = { latitudeDeg: num(si.latitudeDeg, 'site.latitudeDeg', -90, 90), longitudeDeg: num(si.longitudeDeg, 'site.longitudeDeg', -180, 180), height: num(si.height, 'site.height', -500, 10000, 0) };
    if (si.name !== undefined) site.name = String(si.name);
    if (typeof s.time !== 'string' || !Number.isFinite(Date.parse(s.time))) fail('time', s.time, 'an ISO 8601 UTC time such as "2025-06-21T11:00:00Z" (needed for the sun)');
    time = s.time;
    light = { type: 'sun' };
  } else if (ltype === 'collimated') {
    light = { type: 'collimated', zenithDeg: num(l.zenithDeg, 'light.zenithDeg', 0, 80), azimuthDeg: num(l.azimuthDeg, 'light.azimuthDeg', -360, 360), angularRadiusDeg: num(l.angularRadiusDeg, 'light.angularRadiusDeg', 0, 5, 0) };
  } else {
    const p = vec(l.position, 'light.position', 3) as [number, number, number];
    if (!(p[2] > 0)) fail('light.position[2]', p[2], 'a lamp above the water (z > 0 m)');
    light = { type: 'point', position: p, radius: num(l.radius, 'light.radius', 0, 10, 0) };
  }
  if (ltype !== 'sun') {
    if (s.site !== undefined) {
      const si = obj(s.site, 'site');
      noExtra(si, 'site');
      site = { latitudeDeg: num(si.latitudeDeg, 'site.latitudeDeg', -90, 90), longitudeDeg: num(si.longitudeDeg, 'site.longitudeDeg', -180, 180), height: num(si.height, 'site.height', -500, 10000, 0) };
      if (si.name !== undefined) site.name = String(si.name);
    }
    if (s.time !== undefined) {
      if (typeof s.time !== 'string' || !Number.isFinite(Date.parse(s.time))) fail('time', s.time, 'an ISO 8601 UTC time');
      time = s.time;
    }
  }
  const sn = obj(s.sensor, 'sensor');
  noExtra(sn, 'sensor');
  const fr = obj(sn.frame, 'sensor.frame');
  noExtra(fr, 'sensor.frame');
  const sensor: ScenarioSensor = {
    lattice: oneOf(sn.lattice, 'sensor.lattice', ['square', 'hexagonal'] as const, 'hexagonal'),
    pitch: num(sn.pitch, 'sensor.pitch', 1e-4, 1),
    columns: int(sn.columns, 'sensor.columns', 2, 512),
    rows: int(sn.rows, 'sensor.rows', 2, 512),
    apertureDiameter: num(sn.apertureDiameter, 'sensor.apertureDiameter', 1e-6, 0.1),
    maskDepth: num(sn.maskDepth, 'sensor.maskDepth', 1e-3, 100),
    planeDistance: num(sn.planeDistance, 'sensor.planeDistance', 1e-4, 10),
    frame: { width: int(fr.width, 'sensor.frame.width', 16, 8192), height: int(fr.height, 'sensor.frame.height', 16, 8192), pixelSize: num(fr.pixelSize, 'sensor.frame.pixelSize', 1e-7, 0.1) },
    photonsPerSpot: num(sn.photonsPerSpot, 'sensor.photonsPerSpot', 1, 1e9, 30000),
    readNoise: num(sn.readNoise, 'sensor.readNoise', 0, 1000, 3),
    seed: int(sn.seed, 'sensor.seed', 0, 2 ** 31, 7),
    refinementPasses: int(sn.refinementPasses, 'sensor.refinementPasses', 0, 50, 3),
  };
  if (!(sensor.apertureDiameter <= sensor.pitch)) fail('sensor.apertureDiameter', sensor.apertureDiameter, `at most the pitch (${sensor.pitch} m)`);
  const c = obj(s.camera, 'camera');
  noExtra(c, 'camera');
  const camera: ScenarioCamera = {
    width: int(c.width, 'camera.width', 8, 8192),
    height: int(c.height, 'camera.height', 8, 8192),
    fovDeg: num(c.fovDeg, 'camera.fovDeg', 1, 150),
    z: num(c.z, 'camera.z', -1000, 1000),
    position: c.position === undefined ? [0, 0] : (vec(c.position, 'camera.position', 2) as [number, number]),
    supersample: int(c.supersample, 'camera.supersample', 1, 8, 2),
  };
  const t = obj(s.target, 'target');
  const ttype = oneOf(t.type, 'target.type', ['pattern', 'checkerboard'] as const);
  const tz = num(t.z, 'target.z', -1000, 1000);
  let target: ScenarioTarget;
  if (ttype === 'pattern') {
    target = { type: 'pattern', z: tz, size: num(t.size, 'target.size', 1e-3, 1e4), pixels: int(t.pixels, 'target.pixels', 8, 8192, 1024), seed: int(t.seed, 'target.seed', 0, 2 ** 31, 1) };
  } else {
    target = {
      type: 'checkerboard',
      z: tz,
      squareSize: num(t.squareSize, 'target.squareSize', 1e-4, 100),
      columns: int(t.columns, 'target.columns', 2, 1000),
      rows: int(t.rows, 'target.rows', 2, 1000),
      pixelsPerSquare: int(t.pixelsPerSquare, 'target.pixelsPerSquare', 2, 1024, 16),
    };
  }
  const h = 2 * sea.significantHeight;
  if (camera.z < 0) {
    if (!(camera.z < -h)) fail('camera.z', camera.z, `a camera clear of the waves (below −${h} m, twice the significant height)`);
    if (!(tz > h)) fail('target.z', tz, `a target above the waves (> ${h} m) for a camera below the water`);
  } else {
    if (!(camera.z > h)) fail('camera.z', camera.z, `a camera clear of the waves (above ${h} m)`);
    if (!(tz < -h)) fail('target.z', tz, `a bottom below the waves (< −${h} m) for a camera above the water`);
  }
  const corr = s.correction === undefined ? {} : obj(s.correction, 'correction');
  noExtra(corr, 'correction');
  const correction = {
    mode: oneOf(corr.mode, 'correction.mode', ['exact', 'fast'] as const, 'exact'),
    meshStep: int(corr.meshStep, 'correction.meshStep', 1, 256, 3),
    reference: oneOf(corr.reference, 'correction.reference', ['flat', 'none'] as const, 'flat'),
  };
  const out: Scenario = { name: s.name, sea, light, sensor, camera, target, water, correction };
  if (typeof s.description === 'string') out.description = s.description;
  if (site) out.site = site;
  if (time !== undefined) out.time = time;
  return out;
}

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/**
 * Simulate a scenario: synthesise the sea, trace the guide light through it and the
 * sensor's apertures and render the sensor frame, render the scene camera's image through
 * the waves and through flat water (the truth), and assemble the pipeline setup.
 *
 * The sensor is placed so that the points where its rays cross the mean level are
 * centred under the scene camera's view. The sea grid is centred on `x = y = 0`.
 *
 * @param scenario - A scenario (plain JSON; see {@link harbourScenario}, {@link tankScenario}).
 * @returns Frames, truth, setup and timings.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} naming the bad field, a
 *   sun below the horizon at the scenario's time, or a sea grid that does not cover the
 *   sensor's footprint.
 * @see JONSWAP (Hasselmann et al. 1973) for the sea; the sensor area's forward model and
 *   the imaging area's renderer for the frames.
 * @example
 * ```ts
 * const sim = simulateScenario(tankScenario());
 * const r = processFrame(sim.sensorFrame, sim.sceneImage, sim.setup, sim.options);
 * ```
 */
export function simulateScenario(scenario: Scenario): SimulatedScenario {
  const sc = validateScenario(scenario);
  const t0 = now();
  const nWater = sc.water!.nWater!, nAir = sc.water!.nAir!;
  // The sea.
  const se = sc.sea;
  const N = se.gridSize!, dxs = se.gridSpacing;
  const half = ((N - 1) * dxs) / 2;
  const p = jonswapFromPeak({ peakPeriod: se.peakPeriod, significantHeight: se.significantHeight, gamma: se.gamma! });
  const spreadS = se.spreadingS!;
  const seaSpec = {
    frequencySpectrum: jonswapSpectrumFunction(p),
    spreading: (th: number) => cos2sSpreading(th, spreadS),
    meanDirection: se.meanDirectionDeg! * DEG,
    ...(se.depth !== undefined ? { dispersion: { depth: se.depth } } : {}),
  };
  const rs = prepareRandomSea({ width: N, height: N, dx: dxs, dy: dxs, x0: -half, y0: -half }, seaSpec, { seed: se.seed!, requirePeakResolved: false });
  const sea = rs.frame(se.time!);
  const trueSurface = seaSurface(sea);
  const t1 = now();
  // The light.
  let light: GuideLight;
  const L = sc.light;
  if (L.type === 'sun') {
    const sun = createSunLight(Date.parse(sc.time!), { latitudeDeg: sc.site!.latitudeDeg, longitudeDeg: sc.site!.longitudeDeg, height: sc.site!.height ?? 0 });
    if (sun.position.status !== 'ok') fail('time', sc.time, `a time when the sun is above the horizon at the site (it is ${(-sun.position.elevation / DEG).toFixed(1)}° below)`);
    light = sun;
  } else if (L.type === 'collimated') {
    const z = L.zenithDeg * DEG, a = L.azimuthDeg * DEG;
    light = createCollimatedLight([Math.sin(z) * Math.sin(a), Math.sin(z) * Math.cos(a), Math.cos(z)], (L.angularRadiusDeg ?? 0) * DEG);
  } else {
    light = createPointLight(L.position, L.radius ?? 0);
  }
  // The sensor, shifted so that its rays cross the mean level under the camera's view.
  const cam = sc.camera;
  const [cxw, cyw] = cam.position!;
  const S = sc.sensor;
  const toL = light.toLight([cxw, cyw, 0]);
  const down = refract([-toL[0], -toL[1], -toL[2]], [0, 0, 1], nAir, nWater);
  if (down === null) fail('light', L, 'a light that enters the water');
  const ox = (S.maskDepth * -down[0]) / -down[2], oy = (S.maskDepth * -down[1]) / -down[2];
  const apertures = createApertureArray({ lattice: S.lattice!, pitch: S.pitch, columns: S.columns, rows: S.rows, apertureDiameter: S.apertureDiameter });
  const geometry = createSensorGeometry({ apertures, maskDepth: S.maskDepth, planeDistance: S.planeDistance, position: [cxw - ox, cyw - oy], nAir, nWater });
  // The sea must cover the sensor's crossing points (with a margin of two pitches).
  let ext = 0;
  for (let k = 0; k < apertures.count; k++) {
    ext = Math.max(ext, Math.abs(geometry.apertureWorld[3 * k]! + ox), Math.abs(geometry.apertureWorld[3 * k + 1]! + oy));
  }
  if (!(ext + 2 * S.pitch <= half)) {
    fail('sea.gridSpacing', se.gridSpacing, `a sea grid wide enough for the sensor: it spans ±${half.toFixed(3)} m, the sensor's footprint needs ±${(ext + 2 * S.pitch).toFixed(3)} m (raise gridSize or gridSpacing)`);
  }
  const reference = referenceSpots(geometry, light);
  let mx = 0, my = 0, mc = 0;
  for (let k = 0; k < apertures.count; k++) {
    if (!Number.isFinite(reference.x[k]!)) continue;
    mx += reference.x[k]!;
    my += reference.y[k]!;
    mc++;
  }
  const view = createPlaneView({ width: S.frame.width, height: S.frame.height, pixelSize: S.frame.pixelSize, centre: [mx / mc, my / mc] });
  const sensorRender = renderSpotFrame(traceSpots(geometry, trueSurface, light), light, view, { photonsPerSpot: S.photonsPerSpot!, readNoise: S.readNoise!, seed: S.seed! });
  const t2 = now();
  // The scene camera, looking straight up (z < 0) or down (z > 0); x east.
  const f = (cam.width / 2) / Math.tan((cam.fovDeg * DEG) / 2);
  const camera = new PinholeCamera({ model: 'pinhole', fx: f, fy: f, cx: (cam.width - 1) / 2, cy: (cam.height - 1) / 2, width: cam.width, height: cam.height });
  const up = cam.z < 0;
  const pose = createCameraPose(up ? [1, 0, 0, 0, 1, 0, 0, 0, 1] : [1, 0, 0, 0, -1, 0, 0, 0, -1], [cxw, cyw, cam.z] as Vec3);
  const T = sc.target;
  const texture =
    T.type === 'pattern'
      ? patternTexture({ size: T.size, pixels: T.pixels!, seed: T.seed! })
      : checkerboardTexture({ squareSize: T.squareSize, columns: T.columns, rows: T.rows, pixelsPerSquare: T.pixelsPerSquare! });
  const scene: PlaneScene = { type: 'plane', z: T.z, image: texture.image, x0: texture.x0 + cxw, y0: texture.y0 + cyw, dx: texture.dx };
  const medium = { nWater, nAir, supersample: cam.supersample!, edge: 'clamp' as const };
  const distorted = renderThroughSurface(trueSurface, camera, pose, scene, medium);
  const domain = { xMin: -half, xMax: half, yMin: -half, yMax: half };
  const truth =
    sc.correction!.reference === 'none'
      ? renderThroughSurface(null, camera, pose, scene, medium)
      : renderThroughSurface(createPlaneSurface({ domain }), camera, pose, scene, medium);
  const t3 = now();
  const correction: CorrectionOptions = { mode: sc.correction!.mode!, reference: sc.correction!.reference!, nWater, nAir };
  if (sc.correction!.mode === 'fast') correction.meshStep = sc.correction!.meshStep!;
  const setup: PipelineSetup = {
    sensor: { geometry, light, view, reference },
    scene: { camera, pose, target: { type: 'plane', z: T.z } },
  };
  return {
    scenario: sc,
    light,
    sea,
    trueSurface,
    sensor: { geometry, view, reference },
    sensorRender,
    sensorFrame: sensorRender.image,
    camera,
    pose,
    scene,
    texture,
    sceneImage: distorted.image,
    sceneMask: distorted.mask,
    truthImage: truth.image,
    truthMask: truth.mask,
    setup,
    options: {
      measure: { reconstruct: { refine: S.refinementPasses! > 0, maxIterations: Math.max(1, S.refinementPasses!) } },
      correction,
    },
    timings: { sea: t1 - t0, sensor: t2 - t1, scene: t3 - t2 },
  };
}
