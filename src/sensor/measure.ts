/**
 * The measurement chain on one frame: pixels → spots → matches → slopes → heights.
 *
 * @module
 */
import { checkImage, checkOptions, isMeniscusError, Status, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';
import type { GuideLight } from '../sun/index.js';
import { detectSpots } from './detect.js';
import type { DetectSpotsOptions, SpotList } from './detect.js';
import { referenceSpots } from './forward.js';
import type { SensorGeometry } from './geometry.js';
import { matchSpots } from './match.js';
import type { MatchSpotsOptions, SpotMatch, SpotReference } from './match.js';
import { reconstructSurface } from './refine.js';
import type { ReconstructOptions, Reconstruction } from './refine.js';
import { aperturePositions } from './slopes.js';
import { pixelsToPlane } from './view.js';
import type { PlaneSpots, PlaneView } from './view.js';

/** Everything fixed about a sensor while frames come in. */
export interface SensorSetup {
  /** The sensor's geometry. */
  readonly geometry: SensorGeometry;
  /** The guide light. */
  readonly light: GuideLight;
  /** How the camera sees the plane. */
  readonly view: PlaneView;
  /** The flat-water reference; computed from geometry and light when absent. */
  readonly reference?: SpotReference;
}

/** Options of {@link measureFrame}. */
export interface MeasureFrameOptions {
  /**
   * Spot detection. With `detect.windows` (for example around the previous frame's
   * spots), the frame is searched again in full when the windows yield fewer than 90 % as
   * many spots as there are windows (a warning says so). @defaultValue `{}` (automatic
   * background and threshold, iterative centroid, the whole frame)
   */
  detect?: DetectSpotsOptions;
  /** Matching. @defaultValue `{ method: 'grow' }` */
  match?: MatchSpotsOptions;
  /** Integration and refinement. @defaultValue `{}` (refinement on) */
  reconstruct?: ReconstructOptions;
}

/** What happened to one frame, in numbers. */
export interface FrameDiagnostics {
  /** Spots found by the detector. */
  readonly spotsFound: number;
  /** Spots paired with an aperture. */
  readonly spotsMatched: number;
  /** Spots refused: components outside the size limits, extra and ambiguous spots. */
  readonly spotsRejected: number;
  /** Apertures with a reference but no spot. */
  readonly aperturesMissing: number;
  /** Apertures flagged ambiguous. */
  readonly aperturesAmbiguous: number;
  /** Slope samples integrated. */
  readonly slopesUsed: number;
  /** RMS slope residual of the integration (unitless), NaN without a surface. */
  readonly rmsResidual: number;
  /** Refinement passes run. */
  readonly iterations: number;
  /** Largest height change of the last refinement pass, metres (NaN without refinement). */
  readonly change: number;
  /** Milliseconds spent in each stage. */
  readonly timings: { readonly detect: number; readonly match: number; readonly reconstruct: number; readonly total: number };
  /** Plain-language notes (detector warnings, why no surface was made). */
  readonly warnings: readonly string[];
}

/** The result of {@link measureFrame}. */
export interface FrameMeasurement {
  /** Detected spots (pixels). */
  readonly spots: SpotList;
  /** Spots on the plane (metres). */
  readonly planeSpots: PlaneSpots;
  /** Spot ↔ aperture pairing. */
  readonly match: SpotMatch;
  /** Heights and slopes, or `null` when too few apertures gave a slope. */
  readonly reconstruction: Reconstruction | null;
  /** Counts, residual, iterations, timings, warnings. */
  readonly diagnostics: FrameDiagnostics;
}

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/**
 * Run the measurement chain on one frame: detect the spots, map them to the plane,
 * match them to apertures, turn them into slopes and integrate them into a height map
 * (with refinement unless switched off).
 *
 * @param frame - The camera frame.
 * @param setup - Geometry, guide light, view (and optionally a precomputed reference).
 * @param options - Options of each stage.
 * @returns Spots, matches, the reconstruction (or `null` with a warning when fewer than
 *   3 apertures gave a slope, e.g. an empty or saturated frame) and diagnostics.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for malformed input.
 * @see {@link detectSpots}, {@link matchSpots}, {@link slopesFromSpots}, {@link reconstructSurface}.
 * @example
 * ```ts
 * const m = measureFrame(frame, { geometry, light, view });
 * m.reconstruction?.height; m.diagnostics.spotsMatched;
 * ```
 */
export function measureFrame(frame: Image, setup: SensorSetup, options?: MeasureFrameOptions): FrameMeasurement {
  const fn = 'measureFrame';
  checkImage(fn, 'frame', frame, true);
  if (setup === null || typeof setup !== 'object' || setup.geometry === undefined || setup.light === undefined || setup.view === undefined) {
    typeError(fn, 'setup', setup, 'a SensorSetup { geometry, light, view, reference? }');
  }
  const o = checkOptions(fn, options);
  const t0 = now();
  let spots = detectSpots(frame, o.detect);
  const windowNote: string[] = [];
  const win = o.detect?.windows;
  if (win !== undefined && spots.count < 0.9 * win.x.length) {
    windowNote.push(`the search windows held ${spots.count} spot(s) for ${win.x.length} window(s): the whole frame was searched`);
    spots = detectSpots(frame, { ...o.detect, windows: undefined });
  }
  const t1 = now();
  const planeSpots = pixelsToPlane(setup.geometry, setup.view, spots.x, spots.y, spots.sigmaX, spots.sigmaY);
  const reference = setup.reference ?? referenceSpots(setup.geometry, setup.light);
  // Spots the plane mapping cannot place are kept out of matching.
  let keep = 0;
  for (let k = 0; k < spots.count; k++) if (planeSpots.status[k] === Status.ok) keep++;
  const idx = new Int32Array(keep);
  const mx = new Float64Array(keep), my = new Float64Array(keep);
  for (let k = 0, i = 0; k < spots.count; k++) {
    if (planeSpots.status[k] !== Status.ok) continue;
    idx[i] = k;
    mx[i] = planeSpots.x[k]!;
    my[i] = planeSpots.y[k]!;
    i++;
  }
  const sub = matchSpots({ x: mx, y: my }, reference, o.match ?? {});
  // Back to spot indices of the full list.
  const spotOfAperture = sub.spotOfAperture.map((s) => (s >= 0 ? idx[s]! : -1));
  const apertureOfSpot = new Int32Array(spots.count).fill(-1);
  const spotStatus = new Uint8Array(spots.count).fill(Status.outside);
  for (let i = 0; i < keep; i++) {
    apertureOfSpot[idx[i]!] = sub.apertureOfSpot[i]!;
    spotStatus[idx[i]!] = sub.spotStatus[i]!;
  }
  const match: SpotMatch = { ...sub, spotOfAperture, apertureOfSpot, spotStatus, extra: sub.extra + (spots.count - keep) };
  const t2 = now();
  const warnings = [...windowNote, ...spots.warnings];
  let reconstruction: Reconstruction | null = null;
  try {
    reconstruction = reconstructSurface(setup.geometry, setup.light, aperturePositions(planeSpots, spotOfAperture), o.reconstruct);
  } catch (e) {
    if (!(isMeniscusError(e) && e.fn === 'reconstructSurface' && e.parameter === 'spots')) throw e;
    warnings.push(`only ${sub.matched} aperture(s) were matched to a spot: too few for a height map`);
  }
  const t3 = now();
  let ambiguousSpots = 0;
  for (let k = 0; k < spots.count; k++) if (spotStatus[k] === Status.ambiguous) ambiguousSpots++;
  let slopesUsed = 0;
  if (reconstruction) for (let k = 0; k < reconstruction.samples.count; k++) if (reconstruction.samples.status[k] === Status.ok) slopesUsed++;
  const diagnostics: FrameDiagnostics = {
    spotsFound: spots.count,
    spotsMatched: sub.matched,
    spotsRejected: spots.rejected + match.extra + ambiguousSpots,
    aperturesMissing: sub.missing,
    aperturesAmbiguous: sub.ambiguous,
    slopesUsed,
    rmsResidual: reconstruction ? reconstruction.integration.rmsResidual : NaN,
    iterations: reconstruction ? reconstruction.iterations : 0,
    change: reconstruction && reconstruction.changes.length > 0 ? reconstruction.changes[reconstruction.changes.length - 1]! : NaN,
    timings: { detect: t1 - t0, match: t2 - t1, reconstruct: t3 - t2, total: t3 - t0 },
    warnings,
  };
  return { spots, planeSpots, match, reconstruction, diagnostics };
}
