/**
 * Slopes → heights, with the refinement loop: the single pass assumes every ray crossed
 * the surface at the mean level; refinement re-traces each ray to the reconstructed
 * surface, re-solves its normal at the true crossing point and integrates again.
 *
 * @module
 */
import { checkBoolean, checkInteger, checkOneOf, checkOptions, checkPositive, createGrid, rangeError, typeError } from '../core/index.js';
import type { Grid, GridSpec, Mask } from '../core/index.js';
import { integrateScattered } from '../integrate/index.js';
import type { ScatteredResult } from '../integrate/index.js';
import { createGridSurface } from '../surface/index.js';
import type { GuideLight } from '../sun/index.js';
import type { SensorGeometry } from './geometry.js';
import { samplesFor } from './sample-data.js';
import { slopesFromSpots } from './slopes.js';
import type { ApertureSpots, SlopeSamples } from './slopes.js';

/** Relative residual at which each pass's integration stops (see the comment at its use). */
const SOLVER_TOLERANCE = 1e-8;

/** Options of {@link reconstructSurface}. */
export interface ReconstructOptions {
  /**
   * The height grid. By default it covers the crossing points of the first pass with a
   * spacing of one pitch and a margin of one node.
   */
  grid?: GridSpec;
  /** Thin-plate smoothness of the scattered integrator (see `integrateScattered`). @defaultValue 0.01 */
  smoothness?: number;
  /** Run the refinement loop. @defaultValue true */
  refine?: boolean;
  /** Largest number of refinement passes. @defaultValue 5 */
  maxIterations?: number;
  /** Stop when the largest height change of a pass falls below this, metres. @defaultValue 1e-7 */
  tolerance?: number;
  /** Weight each slope by its inverse variance (when the spots carried covariances). @defaultValue true */
  weighted?: boolean;
  /**
   * The integrator's slope model (see `integrateScattered`'s `model`). `'smooth'` changes
   * continuously as the refined crossing points move, so the loop settles; with
   * `'bilinear'` a crossing that moves over a cell edge changes its equation abruptly and
   * noisy frames can make the loop alternate between two states. @defaultValue 'smooth'
   */
  slopeModel?: 'bilinear' | 'smooth';
}

/** The result of {@link reconstructSurface}. */
export interface Reconstruction {
  /** Heights on the grid, metres, zero mean over the valid nodes (slopes carry no piston). */
  readonly height: Grid;
  /**
   * Nodes that data reach (corners of grid cells holding a slope sample); the other
   * nodes of `height` are held by the integrator's smoothness term only.
   */
  readonly mask: Mask;
  /** The single-pass heights (crossings at the mean level), for comparison. */
  readonly firstPass: Grid;
  /** The slope samples of the last pass. */
  readonly samples: SlopeSamples;
  /** The integrator's last result (residual, solver iterations). */
  readonly integration: ScatteredResult;
  /** Refinement passes run (0 without refinement). */
  readonly iterations: number;
  /** Largest height change of each pass, metres. */
  readonly changes: readonly number[];
  /** Whether the last change fell below the tolerance (true without refinement). */
  readonly converged: boolean;
}


/**
 * Integrate slopes measured by the sensor into heights, refining the crossing points.
 *
 * Pass 0 finds each ray's crossing at the mean level and integrates the slopes there
 * (scattered-point least squares). Each refinement pass builds a bicubic surface from the
 * heights, re-traces every ray (aperture → up) to it, re-solves the normal with the
 * guide light's direction at the new crossing, and integrates again (its solver started
 * from the previous heights); it stops when the largest height change is below
 * `tolerance` or after `maxIterations` passes. The integrator's smooth slope model (see
 * {@link ReconstructOptions.slopeModel}) makes each pass depend continuously on the
 * crossing points, so the loop contracts (each pass shrinks the change by an order of
 * magnitude on typical seas) instead of alternating when a crossing sits on a cell edge.
 *
 * @param geometry - The sensor.
 * @param light - The guide light.
 * @param spots - Spot positions per aperture (see {@link aperturePositions}).
 * @param options - Grid, smoothness, refinement controls.
 * @returns Heights, the single-pass heights, the last slope samples and the loop's report.
 * @throws {@link core!MeniscusRangeError} when fewer than 3 apertures give a slope, or for bad
 *   options; {@link core!MeniscusTypeError} for malformed input.
 * @see Moisy, F., Rabaud, M. & Salsac, K. (2009), "A synthetic Schlieren method for the
 *   measurement of the topography of a liquid interface", Experiments in Fluids 46, 1021
 *   (the error of assuming the mean level, and its correction);
 *   Southwell, W. H. (1980), "Wave-front estimation from wave-front slope measurements",
 *   JOSA 70(8), 998.
 * @example
 * ```ts
 * const r = reconstructSurface(geometry, light, perAperture, { maxIterations: 3 });
 * r.height, r.iterations, r.changes;
 * ```
 */
export function reconstructSurface(geometry: SensorGeometry, light: GuideLight, spots: ApertureSpots, options?: ReconstructOptions): Reconstruction {
  const fn = 'reconstructSurface';
  const o = checkOptions(fn, options);
  const refine = o.refine === undefined ? true : checkBoolean(fn, 'options.refine', o.refine);
  const maxIt = o.maxIterations === undefined ? 5 : checkInteger(fn, 'options.maxIterations', o.maxIterations, 0, 1000);
  const tol = o.tolerance === undefined ? 1e-7 : checkPositive(fn, 'options.tolerance', o.tolerance);
  const weighted = o.weighted === undefined ? true : checkBoolean(fn, 'options.weighted', o.weighted);
  const smoothness = o.smoothness === undefined ? 0.01 : checkPositive(fn, 'options.smoothness', o.smoothness);
  const model = o.slopeModel === undefined ? 'smooth' : checkOneOf(fn, 'options.slopeModel', o.slopeModel, ['bilinear', 'smooth'] as const);
  let samples = slopesFromSpots(geometry, light, spots);
  let data = samplesFor(samples, weighted);
  if (data.used < 3) rangeError(fn, 'spots', `${data.used} apertures with a slope`, 'at least 3 apertures with a matched spot');
  let spec: GridSpec;
  if (o.grid !== undefined) {
    if (o.grid === null || typeof o.grid !== 'object') typeError(fn, 'options.grid', o.grid, 'a GridSpec');
    spec = o.grid;
  } else {
    const d = geometry.apertures.pitch;
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
    for (let i = 0; i < data.used; i++) {
      x0 = Math.min(x0, data.x[i]!);
      x1 = Math.max(x1, data.x[i]!);
      y0 = Math.min(y0, data.y[i]!);
      y1 = Math.max(y1, data.y[i]!);
    }
    spec = { width: Math.max(2, Math.ceil((x1 - x0) / d) + 3), height: Math.max(2, Math.ceil((y1 - y0) / d) + 3), dx: d, dy: d, x0: x0 - d, y0: y0 - d };
  }
  // Refinement passes start the solver from the previous heights. The solver's tolerance
  // leaves height errors near 1e-10 m on sensor grids (4e-11 m from the solution at 1e-9 on
  // the tank scenario at 1024², in 61 instead of 71 iterations over its four passes), far
  // below the loop's tolerance.
  const integ = (s: typeof data, start?: Float64Array): ScatteredResult =>
    integrateScattered(s, spec, { smoothness, region: 'grid', model, tolerance: SOLVER_TOLERANCE, initialGuess: start });
  // Nodes at the corners of grid cells holding a sample: the ones data reach.
  const supported = (s: typeof data, g: Grid): Mask => {
    const m = new Uint8Array(g.width * g.height);
    for (let i = 0; i < s.used; i++) {
      const ci = Math.floor((s.x[i]! - g.x0) / g.dx), cj = Math.floor((s.y[i]! - g.y0) / g.dy);
      if (ci < 0 || cj < 0 || ci >= g.width - 1 || cj >= g.height - 1) continue;
      const k = cj * g.width + ci;
      m[k] = m[k + 1] = m[k + g.width] = m[k + g.width + 1] = 1;
    }
    return m;
  };
  let result = integ(data);
  const firstPass = createGrid(result.height, result.height.data, true);
  const changes: number[] = [];
  let converged = true;
  if (refine && maxIt > 0) {
    converged = false;
    for (let it = 0; it < maxIt; it++) {
      const surf = createGridSurface(result.height);
      const next = slopesFromSpots(geometry, light, spots, { surface: surf });
      const nd = samplesFor(next, weighted);
      if (nd.used < 3) break;
      const r = integ(nd, result.height.data);
      let change = 0;
      const a = r.height.data, b = result.height.data;
      const sm = supported(nd, r.height);
      for (let k = 0; k < a.length; k++) if (sm[k]) change = Math.max(change, Math.abs(a[k]! - b[k]!));
      changes.push(change);
      result = r;
      samples = next;
      data = nd;
      if (change < tol) {
        converged = true;
        break;
      }
    }
  }
  return { height: result.height, mask: supported(data, result.height), firstPass, samples, integration: result, iterations: changes.length, changes, converged };
}
