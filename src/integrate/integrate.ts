/**
 * The single front door of the integrators: `integrate(p, q, { method, … })` and its
 * prepared form for video, `prepareIntegrator(spec, { method, … })`.
 *
 * @module
 */
import { checkOneOf, checkOptions, createGrid, typeError } from '../core/index.js';
import type { Grid, GridSpec, Mask } from '../core/index.js';
import { integrateDctPoisson, prepareDctPoisson } from './dct.js';
import { integrateFrankotChellappa, prepareFrankotChellappa } from './frankot.js';
import {
  integrateLeastSquares,
  prepareLeastSquares,
  type KnownHeight,
  type RobustLoss,
  type RobustOptions,
} from './leastsq.js';
import { integrateLegendre, integrateZernike } from './modal.js';
import { integrateFried, integrateHudgin, integrateSouthwell } from './zonal.js';
import type { IntegrationResult, ProgressCallback } from './types.js';

/** The methods of {@link integrate}. */
export type IntegrationMethod =
  | 'frankot-chellappa'
  | 'dct-poisson'
  | 'least-squares'
  | 'southwell'
  | 'fried'
  | 'hudgin'
  | 'zernike'
  | 'legendre';

/** Every method name, in documentation order. */
export const INTEGRATION_METHODS: readonly IntegrationMethod[] = [
  'frankot-chellappa',
  'dct-poisson',
  'least-squares',
  'southwell',
  'fried',
  'hudgin',
  'zernike',
  'legendre',
];

/**
 * Options of {@link integrate}. Each method reads the options it documents and refuses
 * the ones it cannot honour (with a {@link core!MeniscusTypeError} naming the option), so a
 * mask is never silently ignored.
 */
export interface IntegrateOptions {
  /** The method. @defaultValue 'least-squares' */
  method?: IntegrationMethod;
  /** Valid samples (1) and holes (0). Not for 'frankot-chellappa' and 'dct-poisson' (full rectangle only). */
  mask?: Mask;
  /** Per-sample slope weights ≥ 0 ('least-squares', 'southwell', 'fried', 'hudgin'). */
  weights?: Grid;
  /** Known heights ('least-squares'). */
  knownHeights?: readonly KnownHeight[];
  /** Prior surface of the zero-order Tikhonov term ('least-squares'). */
  prior?: Grid;
  /** Weight of the zero-order Tikhonov term, 1/m² ('least-squares'). */
  priorWeight?: number;
  /** Weight of the second-order smoothness term, m² ('least-squares'). */
  smoothness?: number;
  /** Robust reweighting ('least-squares'). */
  robust?: RobustLoss | RobustOptions;
  /** Relative residual at which the iteration stops (iterative methods). */
  tolerance?: number;
  /** Iteration cap (iterative methods). */
  maxIterations?: number;
  /** Progress callback (iterative methods); return `false` to stop. */
  onProgress?: ProgressCallback;
  /** Starting heights ('least-squares'). */
  initialGuess?: Grid;
  /** Number of Noll terms ('zernike'). */
  terms?: number;
  /** Disc centre `[x, y]`, metres ('zernike'). */
  center?: [number, number];
  /** Disc radius, metres ('zernike'). */
  radius?: number;
  /** Largest total degree ('legendre'). */
  order?: number;
  /** Output buffer ('frankot-chellappa', 'dct-poisson', 'least-squares'). */
  out?: Float64Array;
}

const ALL_KEYS = [
  'mask',
  'weights',
  'knownHeights',
  'prior',
  'priorWeight',
  'smoothness',
  'robust',
  'tolerance',
  'maxIterations',
  'onProgress',
  'initialGuess',
  'terms',
  'center',
  'radius',
  'order',
  'out',
] as const;

type Key = (typeof ALL_KEYS)[number];

const ACCEPTS: Record<IntegrationMethod, readonly Key[]> = {
  'frankot-chellappa': ['out'],
  'dct-poisson': ['out'],
  'least-squares': [
    'mask',
    'weights',
    'knownHeights',
    'prior',
    'priorWeight',
    'smoothness',
    'robust',
    'tolerance',
    'maxIterations',
    'onProgress',
    'initialGuess',
    'out',
  ],
  southwell: ['mask', 'weights', 'tolerance', 'maxIterations', 'onProgress'],
  fried: ['mask', 'weights', 'tolerance', 'maxIterations', 'onProgress'],
  hudgin: ['mask', 'weights', 'tolerance', 'maxIterations', 'onProgress'],
  zernike: ['mask', 'terms', 'center', 'radius'],
  legendre: ['mask', 'order'],
};

/** Copy the options a method accepts; refuse any other that is set. */
function pick(fn: string, method: IntegrationMethod, o: Record<string, unknown>): Record<string, unknown> {
  const ok = ACCEPTS[method];
  const picked: Record<string, unknown> = {};
  for (const key of ALL_KEYS) {
    const v = o[key];
    if (v === undefined) continue;
    if (!ok.includes(key)) typeError(fn, `options.${key}`, v, `undefined: method '${method}' does not use it`);
    picked[key] = v;
  }
  return picked;
}

function run(method: IntegrationMethod, p: Grid, q: Grid, o: Record<string, unknown>): IntegrationResult {
  switch (method) {
    case 'frankot-chellappa':
      return integrateFrankotChellappa(p, q, o);
    case 'dct-poisson':
      return integrateDctPoisson(p, q, o);
    case 'least-squares':
      return integrateLeastSquares(p, q, o);
    case 'southwell':
      return integrateSouthwell(p, q, o);
    case 'fried':
      return integrateFried(p, q, o);
    case 'hudgin':
      return integrateHudgin(p, q, o);
    case 'zernike':
      return integrateZernike(p, q, o);
    case 'legendre':
      return integrateLegendre(p, q, o);
  }
}

/**
 * Integrate slopes into heights by the chosen method. Every method keeps the
 * conventions of the module (`p = ∂h/∂x`, `q = ∂h/∂y`, sample `(i, j)` at
 * `x0 + i·dx`, `y0 + j·dy`, metres) and returns an {@link IntegrationResult}; the named
 * functions return richer results.
 *
 * | method | boundary / domain | cost |
 * | --- | --- | --- |
 * | `'frankot-chellappa'` | periodic, full rectangle | O(N log N) |
 * | `'dct-poisson'` | natural (Neumann), full rectangle | O(N log N) |
 * | `'least-squares'` | natural, any mask, weights, known heights, robust | O(N) per iteration, few iterations |
 * | `'southwell'`, `'hudgin'` | zonal sensor geometries, any mask | iterative |
 * | `'fried'` | heights on the (w+1)×(h+1) corner grid | iterative |
 * | `'zernike'`, `'legendre'` | modal fits on a disc / rectangle | O(N · modes²) |
 *
 * @param p - Slopes ∂h/∂x (unitless).
 * @param q - Slopes ∂h/∂y, same size and geometry.
 * @param options - See {@link IntegrateOptions}.
 * @returns The method's result.
 * @throws {@link core!MeniscusRangeError} for an unknown method; otherwise what the method throws;
 *   {@link core!MeniscusTypeError} for an option the method does not use.
 * @see Frankot & Chellappa (1988), IEEE TPAMI 10(4), 439; Simchony, Chellappa & Shao
 *   (1990), IEEE TPAMI 12(5), 435; Harker & O'Leary (2008, 2011), CVPR; Southwell (1980),
 *   JOSA 70, 998; Fried (1977), JOSA 67, 370; Hudgin (1977), JOSA 67, 375.
 * @example
 * ```ts
 * const r = integrate(p, q, { method: 'least-squares', mask, robust: 'huber' });
 * console.log(r.rmsResidual, r.iterations);
 * ```
 */
export function integrate(p: Grid, q: Grid, options?: IntegrateOptions): IntegrationResult {
  const fn = 'integrate';
  const o = checkOptions(fn, options) as Record<string, unknown>;
  const method = o.method === undefined ? 'least-squares' : checkOneOf(fn, 'options.method', o.method, INTEGRATION_METHODS);
  return run(method, p, q, pick(fn, method, o));
}

/** Options of {@link prepareIntegrator}: the fixed part of {@link IntegrateOptions}, plus `warmStart`. */
export interface PrepareIntegratorOptions extends Omit<IntegrateOptions, 'out' | 'prior' | 'initialGuess' | 'onProgress'> {
  /** 'least-squares': start each frame from the previous frame's heights. @defaultValue false */
  warmStart?: boolean;
}

/** Per-frame options of a {@link PreparedIntegrator}. */
export interface IntegratorFrameOptions {
  /** Output buffer (methods that write heights on the slopes' grid). */
  out?: Float64Array;
  /** 'least-squares': this frame's prior surface. */
  prior?: Grid;
  /** 'least-squares': this frame's known heights. */
  knownHeights?: readonly KnownHeight[];
  /** 'least-squares': starting heights. */
  initialGuess?: Grid;
  /** Iterative methods: progress callback. */
  onProgress?: ProgressCallback;
}

/** An integrator set up once for a grid, mask and method; see {@link prepareIntegrator}. */
export interface PreparedIntegrator {
  /** The method. */
  readonly method: IntegrationMethod;
  /** Grid width. */
  readonly width: number;
  /** Grid height. */
  readonly height: number;
  /**
   * Integrate one frame.
   *
   * @throws What the method throws for bad input.
   */
  solve(p: Grid, q: Grid, options?: IntegratorFrameOptions): IntegrationResult;
}

/**
 * Set up an integrator once for a grid geometry, mask and method, then integrate frame
 * after frame. 'frankot-chellappa' and 'dct-poisson' keep their transform plans and
 * work arrays; 'least-squares' keeps its operator, multigrid hierarchy, piece labels
 * and work vectors (and, with `warmStart`, starts each frame from the last one). The
 * zonal and modal methods have no prepared state of their own here: their prepared
 * form checks the options once and calls the named function per frame.
 *
 * @param spec - Grid geometry of the slopes.
 * @param options - See {@link PrepareIntegratorOptions}.
 * @returns The prepared integrator.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} for bad geometry or options.
 * @see Briggs, Henson & McCormick (2000), "A Multigrid Tutorial", SIAM (set-up once,
 *   solve many).
 * @example
 * ```ts
 * const solver = prepareIntegrator({ width: 256, height: 256, dx: 2e-3 }, { method: 'least-squares', mask });
 * for (const f of frames) show(solver.solve(f.p, f.q).height);
 * ```
 */
export function prepareIntegrator(spec: GridSpec, options?: PrepareIntegratorOptions): PreparedIntegrator {
  const fn = 'prepareIntegrator';
  const o = checkOptions(fn, options) as Record<string, unknown>;
  const method = o.method === undefined ? 'least-squares' : checkOneOf(fn, 'options.method', o.method, INTEGRATION_METHODS);
  for (const key of ['out', 'prior', 'initialGuess', 'onProgress'] as const) {
    if (o[key] !== undefined) typeError(fn, `options.${key}`, o[key], 'undefined here: give it per frame to solve()');
  }
  const { warmStart, ...rest } = o;
  const fixed = pick(fn, method, rest);
  if (warmStart !== undefined && method !== 'least-squares') {
    typeError(fn, 'options.warmStart', warmStart, `undefined: method '${method}' does not use it`);
  }
  const geometry = createGrid(spec);
  const width = geometry.width;
  const height = geometry.height;
  const sfn = 'PreparedIntegrator.solve';
  if (method === 'frankot-chellappa' || method === 'dct-poisson') {
    const solver = method === 'dct-poisson' ? prepareDctPoisson(spec) : prepareFrankotChellappa(spec);
    return {
      method,
      width,
      height,
      solve(p, q, frame) {
        const f = checkOptions(sfn, frame) as Record<string, unknown>;
        for (const key of ['prior', 'knownHeights', 'initialGuess', 'onProgress'] as const) {
          if (f[key] !== undefined) typeError(sfn, `options.${key}`, f[key], `undefined: method '${method}' does not use it`);
        }
        return solver.solve(p, q, f.out === undefined ? undefined : { out: f.out as Float64Array });
      },
    };
  }
  if (method === 'least-squares') {
    const solver = prepareLeastSquares(spec, { ...fixed, ...(warmStart === undefined ? {} : { warmStart: warmStart as boolean }) });
    return { method, width, height, solve: (p, q, frame) => solver.solve(p, q, frame) };
  }
  // zonal and modal methods: call the named function per frame with the fixed options
  return {
    method,
    width,
    height,
    solve(p, q, frame) {
      const f = checkOptions(sfn, frame) as Record<string, unknown>;
      for (const key of ['out', 'prior', 'knownHeights', 'initialGuess'] as const) {
        if (f[key] !== undefined) typeError(sfn, `options.${key}`, f[key], `undefined: method '${method}' does not use it`);
      }
      const perFrame = f.onProgress === undefined ? {} : pick(sfn, method, { onProgress: f.onProgress });
      return run(method, p, q, { ...fixed, ...perFrame });
    },
  };
}
