/**
 * Zonal wavefront reconstructors for slope sensors: heights from slopes measured on a
 * regular square (or rectangular) array of apertures, in the three classic geometries.
 *
 * ```
 *  Southwell (1980)          Fried (1977)               Hudgin (1977)
 *  h and (p, q) together     h at the corners           h at the points, p between
 *                            of each aperture           columns, q between rows
 *   ●───●───●                 ○───○───○                  ●─p─●─p─●
 *   │   │   │                 │ ● │ ● │                  q   q   q
 *   ●───●───●                 ○───○───○                  ●─p─●─p─●
 *  ● = h, p, q               ○ = h, ● = p, q            ● = h
 * ```
 *
 * Axes follow the grid (`x` along columns `i`, `y` along rows `j`, `p = ∂h/∂x`,
 * `q = ∂h/∂y`, spacing `dx`, `dy` in metres, slopes unitless, heights in metres). Each
 * method assembles its least-squares normal equations on a small stencil and solves
 * them by preconditioned conjugate gradients (incomplete-Cholesky preconditioner), so
 * the work is a few hundred passes over the grid at most; the sensor grids these serve
 * are small (≤ ~256² apertures).
 *
 * @module
 */
import { createGrid, rangeError, type Grid, type Mask } from '../core/index.js';
import type { IntegrationResult, PieceInfo, ProgressCallback } from './types.js';
import { readZonalInput, type ZonalInput } from './zonal-input.js';
import {
  addEquation,
  createStencilMatrix,
  removeLabelMeans,
  solveStencil,
  stencilComponents,
  type StencilMatrix,
} from './zonal-sparse.js';

/** Options every zonal reconstructor takes. */
export interface ZonalOptions {
  /**
   * Which slope samples exist (1) and which are missing apertures (0); same size as `p`.
   * Where the mask is 0 the slope values are not read (NaN allowed). @defaultValue all valid
   */
  mask?: Mask;
  /**
   * Per-sample weights ≥ 0 (for example inverse slope variances), same size as `p`;
   * a weight of 0 drops the sample. @defaultValue all 1
   */
  weights?: Grid;
  /** PCG stops when ‖r‖ ≤ tolerance · ‖b‖ on the normal equations. @defaultValue 1e-10 */
  tolerance?: number;
  /** PCG iteration cap. @defaultValue 2000 */
  maxIterations?: number;
  /** Called every PCG iteration with (iteration, relative residual); return `false` to stop. */
  onProgress?: ProgressCallback;
}

/** What {@link integrateFried} returns: the common result plus the count of unseen modes. */
export interface FriedResult extends IntegrationResult {
  /**
   * Number of unseen non-piston modes ("waffle" modes) of the aperture layout: the
   * number of independent height patterns, beyond one piston per piece, that leave every
   * Fried slope unchanged (1 per piece for a full rectangle: the checkerboard
   * `(−1)^(i+j)`). They are fixed by the minimum-norm choice (see {@link integrateFried}).
   */
  readonly waffleModes: number;
}

function solveAndPack(
  A: StencilMatrix,
  rhs: Float64Array,
  labels: Int32Array,
  count: number,
  input: ZonalInput,
  spec: { width: number; height: number; dx: number; dy: number; x0: number; y0: number },
  pieceLabels: Int32Array,
  pieceCount: number,
  residual: (h: Float64Array) => { sum: number; n: number },
): { result: IntegrationResult; h: Float64Array } {
  const { x, result } = solveStencil(A, rhs, labels, count, input);
  // piston: zero mean on each piece (already true for the minimum-norm solution up to
  // rounding; the removed constants are reported)
  const n = x.length;
  const sums = new Float64Array(pieceCount + 1);
  const counts = new Float64Array(pieceCount + 1);
  for (let k = 0; k < n; k++) {
    sums[pieceLabels[k]!]! += x[k]!;
    counts[pieceLabels[k]!]! += 1;
  }
  const pieces: PieceInfo[] = [];
  for (let l = 1; l <= pieceCount; l++) {
    pieces.push({ label: l, samples: counts[l]!, piston: counts[l]! > 0 ? -sums[l]! / counts[l]! : 0 });
  }
  removeLabelMeans(x, pieceLabels, pieceCount, sums, counts);
  const mask = new Uint8Array(n);
  for (let k = 0; k < n; k++) mask[k] = pieceLabels[k]! > 0 ? 1 : 0;
  const r = residual(x);
  return {
    h: x,
    result: {
      height: createGrid(spec, x),
      mask,
      rmsResidual: r.n > 0 ? Math.sqrt(r.sum / r.n) : 0,
      iterations: result.iterations,
      converged: result.converged,
      relativeResidual: result.relativeResidual,
      pieces,
    },
  };
}

/**
 * Southwell (1980) zonal reconstruction: heights and slopes co-located at the apertures
 * of a regular grid, linked by the averaged-slope difference equations
 *
 * `(h[i+1,j] − h[i,j]) / dx = (p[i,j] + p[i+1,j]) / 2`,
 * `(h[i,j+1] − h[i,j]) / dy = (q[i,j] + q[i,j+1]) / 2`,
 *
 * one for every pair of neighbouring valid apertures, solved in the least-squares
 * sense. A sample's weight `w` gives each pair the harmonic mean `2 wa wb / (wa + wb)`
 * (the inverse variance of the averaged slope, scaled so equal weights give `w`), so a
 * zero weight drops both pairs an aperture takes part in.
 *
 * Heights come back on the slopes' grid (same `dx`, `dy`, `x0`, `y0`). Each 4-connected
 * piece of apertures gets zero mean height (its piston, which slopes cannot see);
 * `pieces` lists them. An aperture with no usable neighbour is not reconstructed (mask
 * 0, height 0). `rmsResidual` is the RMS over the pair equations of
 * (height difference / spacing − averaged slope). The model is second-order accurate:
 * on a smooth surface the height error falls as `dx²`.
 *
 * Cost: assembly O(n); each PCG iteration O(n) (a 5-point stencil and its incomplete
 * Cholesky factor); iterations grow with the grid's side (measured at the default 1e-10:
 * about 70 for 64², 270 for 256² apertures).
 *
 * @param p - x-slopes `∂h/∂x` at the apertures (unitless).
 * @param q - y-slopes `∂h/∂y`, same grid as `p`.
 * @param options - Mask, weights and solver controls.
 * @returns Heights (metres) on the apertures, with diagnostics.
 * @throws {@link core!MeniscusTypeError} for grids of different sizes or wrong types.
 * @throws {@link core!MeniscusRangeError} for different spacing or origin, non-finite slopes at
 *   valid samples, negative or non-finite weights, a mask with no valid sample, all
 *   weights zero, or no pair of neighbouring usable apertures.
 * @see Southwell, W. H. (1980), "Wave-front estimation from wave-front slope
 *   measurements", J. Opt. Soc. Am. 70(8), 998–1006, Eq. (9)–(11) (the averaged-slope
 *   model and its least-squares solution).
 * @example
 * ```ts
 * const spec = { width: 32, height: 32, dx: 0.001 };
 * const p = gridFromFunction(spec, (x) => 0.01);   // a tilt along x
 * const q = gridFromFunction(spec, () => 0);
 * const r = integrateSouthwell(p, q);
 * r.height.data[1] - r.height.data[0];             // ≈ 1e-5 m
 * ```
 */
export function integrateSouthwell(p: Grid, q: Grid, options?: ZonalOptions): IntegrationResult {
  const fn = 'integrateSouthwell';
  const input = readZonalInput(fn, p, q, options);
  const { width, height, dx, dy } = p;
  const { use, w } = input;
  const pd = p.data;
  const qd = q.data;
  const n = width * height;
  const A = createStencilMatrix(width, height, 1);
  const rhs = new Float64Array(n);
  const nodes = new Int32Array(2);
  const cx = new Float64Array([-1 / dx, 1 / dx]);
  const cy = new Float64Array([-1 / dy, 1 / dy]);
  let equations = 0;
  const pairWeight = (a: number, b: number): number => (2 * w[a]! * w[b]!) / (w[a]! + w[b]!);
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const a = j * width + i;
      if (!use[a]) continue;
      if (i + 1 < width && use[a + 1]) {
        nodes[0] = a;
        nodes[1] = a + 1;
        addEquation(A, rhs, nodes, cx, 2, pairWeight(a, a + 1), 0.5 * (pd[a]! + pd[a + 1]!));
        equations++;
      }
      if (j + 1 < height && use[a + width]) {
        nodes[0] = a;
        nodes[1] = a + width;
        addEquation(A, rhs, nodes, cy, 2, pairWeight(a, a + width), 0.5 * (qd[a]! + qd[a + width]!));
        equations++;
      }
    }
  }
  if (equations === 0) rangeErrorNoPairs(fn);
  const { labels, count } = stencilComponents(A);
  const residual = (h: Float64Array): { sum: number; n: number } => {
    let sum = 0;
    let m = 0;
    for (let j = 0; j < height; j++) {
      for (let i = 0; i < width; i++) {
        const a = j * width + i;
        if (!use[a]) continue;
        if (i + 1 < width && use[a + 1]) {
          const e = (h[a + 1]! - h[a]!) / dx - 0.5 * (pd[a]! + pd[a + 1]!);
          sum += e * e;
          m++;
        }
        if (j + 1 < height && use[a + width]) {
          const e = (h[a + width]! - h[a]!) / dy - 0.5 * (qd[a]! + qd[a + width]!);
          sum += e * e;
          m++;
        }
      }
    }
    return { sum, n: m };
  };
  return solveAndPack(A, rhs, labels, count, input, p, labels, count, residual).result;
}

function rangeErrorNoPairs(fn: string): never {
  return rangeError(fn, 'options.mask', 'no pair of neighbouring usable samples', 'at least two neighbouring valid samples with weights > 0');
}

/**
 * Hudgin (1977) zonal reconstruction: heights at the grid points, each slope the
 * difference of two neighbouring heights,
 *
 * `(h[i+1,j] − h[i,j]) / dx = p[i,j]`, `(h[i,j+1] − h[i,j]) / dy = q[i,j]`,
 *
 * so `p[i,j]` refers to the midpoint `x0 + (i + ½)·dx` of the link to the right of
 * sample `(i, j)` and `q[i,j]` to the midpoint `y0 + (j + ½)·dy` of the link below it.
 * The last column of `p` and the last row of `q` are not read (pad them with anything).
 * The mask marks valid height points; a link is used when both of its ends are valid and
 * the weight of its first end is positive (`weights[i,j]` weighs `p[i,j]` and `q[i,j]`).
 * This is the forward-difference model, solved in the least-squares sense; with slopes
 * measured at the link midpoints it is second-order accurate.
 *
 * Heights come back on the points' grid, zero mean on each 4-connected piece; points
 * without a used link are not reconstructed (mask 0). `rmsResidual` is the RMS over the
 * used links of (height difference / spacing − slope).
 *
 * Cost: as {@link integrateSouthwell}.
 *
 * @param p - x-slopes on the links to the right of each point (unitless).
 * @param q - y-slopes on the links below each point, same grid as `p`.
 * @param options - Mask (of height points), weights and solver controls.
 * @returns Heights (metres) at the points.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} as {@link integrateSouthwell}.
 * @see Hudgin, R. H. (1977), "Wave-front reconstruction for compensated imaging",
 *   J. Opt. Soc. Am. 67(3), 375–378 (the difference geometry).
 * @example
 * ```ts
 * const spec = { width: 16, height: 16, dx: 0.002 };
 * const p = gridFromFunction(spec, (x) => 2 * (x + 0.001)); // h = x², slope at link midpoints
 * const q = gridFromFunction(spec, () => 0);
 * const r = integrateHudgin(p, q);
 * ```
 */
export function integrateHudgin(p: Grid, q: Grid, options?: ZonalOptions): IntegrationResult {
  const fn = 'integrateHudgin';
  const mask = options?.mask;
  const w0 = p?.width;
  const h0 = p?.height;
  // only the slopes on used links are read; validity of neighbours is checked after the mask
  const valid = (k: number): boolean => mask === undefined || mask[k] === 1;
  const input = readZonalInput(
    fn,
    p,
    q,
    options,
    (i, j) => i + 1 < w0 && valid(j * w0 + i + 1),
    (i, j) => j + 1 < h0 && valid((j + 1) * w0 + i),
  );
  const { width, height, dx, dy } = p;
  const { use, w } = input;
  const pd = p.data;
  const qd = q.data;
  const n = width * height;
  const A = createStencilMatrix(width, height, 1);
  const rhs = new Float64Array(n);
  const nodes = new Int32Array(2);
  const cx = new Float64Array([-1 / dx, 1 / dx]);
  const cy = new Float64Array([-1 / dy, 1 / dy]);
  let equations = 0;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const a = j * width + i;
      if (!use[a]) continue;
      if (i + 1 < width && valid(a + 1)) {
        nodes[0] = a;
        nodes[1] = a + 1;
        addEquation(A, rhs, nodes, cx, 2, w[a]!, pd[a]!);
        equations++;
      }
      if (j + 1 < height && valid(a + width)) {
        nodes[0] = a;
        nodes[1] = a + width;
        addEquation(A, rhs, nodes, cy, 2, w[a]!, qd[a]!);
        equations++;
      }
    }
  }
  if (equations === 0) rangeErrorNoPairs(fn);
  const { labels, count } = stencilComponents(A);
  const residual = (h: Float64Array): { sum: number; n: number } => {
    let sum = 0;
    let m = 0;
    for (let j = 0; j < height; j++) {
      for (let i = 0; i < width; i++) {
        const a = j * width + i;
        if (!use[a]) continue;
        if (i + 1 < width && valid(a + 1)) {
          const e = (h[a + 1]! - h[a]!) / dx - pd[a]!;
          sum += e * e;
          m++;
        }
        if (j + 1 < height && valid(a + width)) {
          const e = (h[a + width]! - h[a]!) / dy - qd[a]!;
          sum += e * e;
          m++;
        }
      }
    }
    return { sum, n: m };
  };
  return solveAndPack(A, rhs, labels, count, input, p, labels, count, residual).result;
}

/** Union–find with path halving. */
function find(parent: Int32Array, a: number): number {
  while (parent[a] !== a) {
    parent[a] = parent[parent[a]!]!;
    a = parent[a]!;
  }
  return a;
}
function union(parent: Int32Array, a: number, b: number): void {
  const ra = find(parent, a);
  const rb = find(parent, b);
  if (ra !== rb) parent[Math.max(ra, rb)] = Math.min(ra, rb);
}
/** 1-based labels in scan order for the nodes with `used`, from a union–find forest. */
function relabel(parent: Int32Array, used: Uint8Array): { labels: Int32Array; count: number } {
  const n = parent.length;
  const labels = new Int32Array(n);
  const map = new Int32Array(n);
  let count = 0;
  for (let k = 0; k < n; k++) {
    if (!used[k]) continue;
    const r = find(parent, k);
    if (map[r] === 0) map[r] = ++count;
    labels[k] = map[r]!;
  }
  return { labels, count };
}

/**
 * Fried (1977) zonal reconstruction: heights at the four corners of each square
 * subaperture, the subaperture's slopes the averages of the differences along its two
 * edges,
 *
 * `p[i,j] = ((h[i+1,j] + h[i+1,j+1]) − (h[i,j] + h[i,j+1])) / (2 dx)`,
 * `q[i,j] = ((h[i,j+1] + h[i+1,j+1]) − (h[i,j] + h[i+1,j])) / (2 dy)`,
 *
 * with `h` on the corner grid, solved in the least-squares sense over the valid
 * subapertures (weights per subaperture).
 *
 * **Corner grid.** For `W × H` slope samples the heights come back on a
 * `(W + 1) × (H + 1)` grid with the same spacing and its origin shifted by half a cell:
 * `x0 − dx/2`, `y0 − dy/2`; corner `(i, j)` is the top-left corner of subaperture
 * `(i, j)`. Corners that touch no usable subaperture are not reconstructed (mask 0).
 *
 * **Waffle.** The slopes of a subaperture vanish exactly when its diagonal corners are
 * equal (`h[i,j] = h[i+1,j+1]`, `h[i+1,j] = h[i,j+1]`), so the corners split into
 * "diagonal sub-lattices" and any height constant on each of them is unseen: beyond the
 * piston this is the checkerboard "waffle" mode `(−1)^(i+j)` on a full rectangle (more
 * such modes where apertures touch only at a corner). This reconstructor fixes every
 * unseen mode by the minimum-norm choice: each sub-lattice has zero mean, so the result
 * has no waffle component at all; {@link FriedResult.waffleModes} says how many were
 * removed. Noise that looks like a slowly modulated waffle is only weakly seen and is
 * amplified, as in any Fried reconstructor.
 *
 * Heights have zero mean on each piece of corners joined by subapertures. `rmsResidual`
 * is the RMS over the used p and q equations of (model slope − measured slope). Second
 * order accurate on smooth surfaces.
 *
 * Cost: assembly O(n); each PCG iteration O(n) with a 9-point stencil; iterations grow
 * with the grid's side (about 110 for 64², 390 for 256² subapertures at 1e-10).
 *
 * @param p - x-slopes of the subapertures (unitless), `W × H`.
 * @param q - y-slopes of the subapertures, same grid as `p`.
 * @param options - Mask (of subapertures), weights and solver controls.
 * @returns Heights (metres) on the `(W + 1) × (H + 1)` corner grid.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} as {@link integrateSouthwell}
 *   (a single valid subaperture is enough here).
 * @see Fried, D. L. (1977), "Least-square fitting a wave-front distortion estimate to an
 *   array of phase-difference measurements", J. Opt. Soc. Am. 67(3), 370–375 (the
 *   geometry and its least-squares solution).
 * @see Hudgin, R. H. (1977), "Wave-front reconstruction for compensated imaging",
 *   J. Opt. Soc. Am. 67(3), 375–378 (discussion of the unseen modes of such geometries).
 * @example
 * ```ts
 * const spec = { width: 8, height: 8, dx: 0.005 };
 * const r = integrateFried(gridFromFunction(spec, () => 0.01), gridFromFunction(spec, () => 0));
 * r.height.width;       // 9
 * r.height.x0;          // -0.0025
 * r.waffleModes;        // 1
 * ```
 */
export function integrateFried(p: Grid, q: Grid, options?: ZonalOptions): FriedResult {
  const fn = 'integrateFried';
  const input = readZonalInput(fn, p, q, options);
  const { width, height, dx, dy } = p;
  const { use, w } = input;
  const pd = p.data;
  const qd = q.data;
  const cw = width + 1;
  const ch = height + 1;
  const nc = cw * ch;
  const A = createStencilMatrix(cw, ch, 1);
  const rhs = new Float64Array(nc);
  const nodes = new Int32Array(4);
  const cx = new Float64Array([-1, 1, -1, 1]).map((v) => v / (2 * dx));
  const cy = new Float64Array([-1, -1, 1, 1]).map((v) => v / (2 * dy));
  const diag = new Int32Array(nc);
  const whole = new Int32Array(nc);
  for (let k = 0; k < nc; k++) {
    diag[k] = k;
    whole[k] = k;
  }
  const usedCorner = new Uint8Array(nc);
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const a = j * width + i;
      if (!use[a]) continue;
      const c00 = j * cw + i;
      nodes[0] = c00;
      nodes[1] = c00 + 1;
      nodes[2] = c00 + cw;
      nodes[3] = c00 + cw + 1;
      addEquation(A, rhs, nodes, cx, 4, w[a]!, pd[a]!);
      addEquation(A, rhs, nodes, cy, 4, w[a]!, qd[a]!);
      union(diag, c00, c00 + cw + 1);
      union(diag, c00 + 1, c00 + cw);
      union(whole, c00, c00 + 1);
      union(whole, c00, c00 + cw);
      union(whole, c00, c00 + cw + 1);
      for (let t = 0; t < 4; t++) usedCorner[nodes[t]!] = 1;
    }
  }
  const sub = relabel(diag, usedCorner);
  const pieces = relabel(whole, usedCorner);
  const residual = (h: Float64Array): { sum: number; n: number } => {
    let sum = 0;
    let m = 0;
    for (let j = 0; j < height; j++) {
      for (let i = 0; i < width; i++) {
        const a = j * width + i;
        if (!use[a]) continue;
        const c = j * cw + i;
        const h00 = h[c]!;
        const h10 = h[c + 1]!;
        const h01 = h[c + cw]!;
        const h11 = h[c + cw + 1]!;
        const ep = (h10 + h11 - h00 - h01) / (2 * dx) - pd[a]!;
        const eq = (h01 + h11 - h00 - h10) / (2 * dy) - qd[a]!;
        sum += ep * ep + eq * eq;
        m += 2;
      }
    }
    return { sum, n: m };
  };
  const spec = { width: cw, height: ch, dx, dy, x0: p.x0 - dx / 2, y0: p.y0 - dy / 2 };
  const { result } = solveAndPack(A, rhs, sub.labels, sub.count, input, spec, pieces.labels, pieces.count, residual);
  return { ...result, waffleModes: sub.count - pieces.count };
}
