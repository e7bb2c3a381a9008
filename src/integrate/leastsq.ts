/**
 * Masked, weighted least-squares integration with known heights, Tikhonov terms and a
 * robust (IRLS) option, solved by multigrid-preconditioned conjugate gradients.
 *
 * @module
 */
import {
  checkAllocation,
  checkFinite,
  checkGrid,
  checkInteger,
  checkNonNegative,
  checkOneOf,
  checkOptions,
  checkPositive,
  checkSameShape,
  createGrid,
  rangeError,
  typeError,
  LIMITS,
} from '../core/index.js';
import type { Grid, GridSpec, Mask } from '../core/index.js';
import { checkSlopes, checkWeights, outBuffer } from './common.js';
import { Multigrid, paddedLayout } from './multigrid.js';
import { createPcgWorkspace, pcg, type PcgWorkspace } from './pcg.js';
import type { IntegrationResult, PieceInfo, ProgressCallback } from './types.js';

/** A height known independently of the slopes (a wave gauge, a pressure sensor, a pinned edge). */
export interface KnownHeight {
  /** Column of the sample (0 … width − 1). */
  readonly i: number;
  /** Row of the sample (0 … height − 1). */
  readonly j: number;
  /** The known height, metres. */
  readonly height: number;
  /**
   * Weight of the constraint `weight · (h[i,j] − height)²` beside the slope pairs, which
   * each carry `((h_b − h_a)/d − s)²` with weight 1 (unitless slopes), so `weight` is in
   * 1/m². Larger pins harder. @defaultValue `1000 / (dx · dy)` (a firm pin)
   */
  readonly weight?: number;
}

/** The robust losses of {@link RobustOptions}. */
export type RobustLoss = 'huber' | 'tukey';

/** Robust fitting by iteratively reweighted least squares. */
export interface RobustOptions {
  /** The loss. @defaultValue 'huber' */
  loss?: RobustLoss;
  /**
   * Tuning constant in units of the robust residual scale (1.4826 × median absolute
   * residual). @defaultValue 1.345 for Huber, 4.685 for Tukey (95 % efficiency at the
   * normal, common practice after Holland & Welsch 1977)
   */
  threshold?: number;
  /** Reweighting rounds at most. @defaultValue 10 */
  maxIterations?: number;
  /** Stop when no sample weight changes by more than this. @defaultValue 1e-3 */
  tolerance?: number;
}

/** Set-up options of the least-squares integrator: everything that stays fixed across frames. */
export interface LeastSquaresSetup {
  /** Valid samples (1) and holes (0). @defaultValue all valid */
  mask?: Mask;
  /**
   * Per-sample confidence of the slopes (≥ 0, e.g. 1/σ²), same size as the slopes.
   * A pair of samples a, b enters with the weighted mean slope `(w_a s_a + w_b s_b)/(w_a + w_b)`
   * and weight `(w_a + w_b)/2`, so a zero-weight sample still gets its height from its
   * neighbours' slopes. @defaultValue all 1
   */
  weights?: Grid;
  /** Heights known at a few samples, fused as weighted constraints. */
  knownHeights?: readonly KnownHeight[];
  /**
   * Weight λ (1/m²) of the zero-order Tikhonov term `λ Σ (h − prior)²` over every valid
   * sample. With λ > 0 every piece is anchored (no piston is removed). @defaultValue 0
   * (or `1e-3 / (dx · dy)` when a `prior` is given)
   */
  priorWeight?: number;
  /**
   * Weight μ (m²) of the second-order smoothness term
   * `μ Σ ((h[i−1] − 2h[i] + h[i+1]) / dx²)²` (and likewise along y) over every three
   * consecutive valid samples. The multigrid preconditioner models the slope and
   * zero-order terms only, so a large μ slows convergence. @defaultValue 0
   */
  smoothness?: number;
  /** Robust reweighting of outlying slopes (a loss name or full options). @defaultValue none */
  robust?: RobustLoss | RobustOptions;
  /**
   * Stop when the normal-equation residual ‖r‖/‖b‖ falls below this. At the default the
   * iteration error is already far below the second-order error of the pair model on
   * smooth surfaces; ask for less (e.g. 1e-12) when comparing solvers to many digits.
   * @defaultValue 1e-6
   */
  tolerance?: number;
  /** Conjugate-gradient iteration cap (per solve, per reweighting round). @defaultValue 500 */
  maxIterations?: number;
}

/** Options of {@link integrateLeastSquares}. */
export interface LeastSquaresOptions extends LeastSquaresSetup {
  /** Surface that the zero-order Tikhonov term pulls towards, metres. @defaultValue 0 everywhere */
  prior?: Grid;
  /** Starting heights for the iteration (e.g. the previous frame). @defaultValue 0 */
  initialGuess?: Grid;
  /** Called every conjugate-gradient iteration; return `false` to stop. */
  onProgress?: ProgressCallback;
  /** Buffer (length `width × height`) to receive the heights. */
  out?: Float64Array;
}

/** Per-frame options of a {@link PreparedLeastSquares}. */
export interface LeastSquaresFrameOptions {
  /** Surface that the zero-order Tikhonov term pulls towards (needs `priorWeight` > 0 at set-up, or a prior at set-up). */
  prior?: Grid;
  /** This frame's known heights (positions may differ from set-up; then the operator is rebuilt, O(N)). */
  knownHeights?: readonly KnownHeight[];
  /** Starting heights; overrides `warmStart`. */
  initialGuess?: Grid;
  /** Called every conjugate-gradient iteration; return `false` to stop. */
  onProgress?: ProgressCallback;
  /** Buffer (length `width × height`) to receive the heights. */
  out?: Float64Array;
}

/** What the robust option found. */
export interface RobustReport {
  /** The loss used. */
  readonly loss: RobustLoss;
  /** The tuning constant used (in units of `scale`). */
  readonly threshold: number;
  /** The robust residual scale (1.4826 × median |residual| of the plain fit), unitless. */
  readonly scale: number;
  /** Reweighting rounds performed. */
  readonly rounds: number;
  /** Final robust weight (0 … 1) of each sample's `p`. */
  readonly weightsP: Grid;
  /** Final robust weight (0 … 1) of each sample's `q`. */
  readonly weightsQ: Grid;
  /** 1 where a valid sample's `p` or `q` weight ended below 0.5: the distrusted slopes. */
  readonly distrusted: Mask;
}

/** The result of {@link integrateLeastSquares}. */
export interface LeastSquaresResult extends IntegrationResult {
  /** Every independent piece with its piston (0 for anchored pieces). */
  readonly pieces: readonly PieceInfo[];
  /** Piece label of each sample (1-based, 0 outside the mask), row-major. */
  readonly labels: Int32Array;
  /** Present when the robust option ran. */
  readonly robust?: RobustReport;
}

/**
 * A least-squares integrator set up once for a grid, mask, weights and terms
 * (operator, multigrid hierarchy, piece labels, work vectors), to integrate frame after
 * frame. Create with {@link prepareLeastSquares}.
 */
export interface PreparedLeastSquares {
  /** Grid width the solver was prepared for. */
  readonly width: number;
  /** Grid height the solver was prepared for. */
  readonly height: number;
  /**
   * Integrate one frame. With `warmStart` at set-up, the previous frame's heights start
   * the iteration.
   *
   * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for bad grids or options.
   */
  solve(p: Grid, q: Grid, options?: LeastSquaresFrameOptions): LeastSquaresResult;
}

/** Options of {@link prepareLeastSquares}. */
export interface PrepareLeastSquaresOptions extends LeastSquaresSetup {
  /** Start each frame from the previous frame's heights. @defaultValue false */
  warmStart?: boolean;
}

interface Known {
  k: number; // padded index
  height: number;
  weight: number;
}

interface RobustConf {
  loss: RobustLoss;
  threshold: number;
  maxIterations: number;
  tolerance: number;
}

/** 1.4826 × the median of the first `count` values (sorted in place: a scratch array). */
function madScale(vals: Float64Array, count: number): number {
  if (count === 0) return 0;
  const a = vals.subarray(0, count);
  a.sort();
  const m = count >> 1;
  const med = count % 2 === 1 ? a[m]! : 0.5 * (a[m - 1]! + a[m]!);
  return 1.4826 * med;
}

/**
 * Smallest robust factor of a pair: a pair between distrusted samples keeps this much
 * of its weight, so that a sample whose slopes are all rejected still takes its height
 * from its neighbours instead of falling out as a piece of its own.
 */
const ROBUST_FLOOR = 1e-2;

/** The operator, its hierarchy and the per-frame machinery. @internal */
class LsqSystem {
  readonly w: number;
  readonly h: number;
  readonly n: number;
  readonly dx: number;
  readonly dy: number;
  readonly off: number;
  readonly len: number;
  readonly mask: Mask;
  readonly validP: Uint8Array; // padded validity
  readonly baseW: Float64Array | null;
  readonly uP: Float64Array;
  readonly uQ: Float64Array;
  readonly fx: Float64Array; // fraction of the pair slope from sample k (x pairs)
  readonly fy: Float64Array;
  readonly mg: Multigrid;
  readonly priorWeight: number;
  readonly smoothness: number;
  readonly tolerance: number;
  readonly maxIterations: number;
  readonly robust: RobustConf | null;
  known: Known[];
  readonly labels: Int32Array;
  pieceCount = 0;
  pieceSamples: Int32Array = new Int32Array(1);
  pieceAnchored: Uint8Array = new Uint8Array(1);
  readonly b: Float64Array;
  readonly x: Float64Array;
  readonly tmp: Float64Array;
  readonly ws: PcgWorkspace;
  private readonly parent: Int32Array;

  constructor(
    w: number,
    h: number,
    dx: number,
    dy: number,
    mask: Mask,
    weights: Float64Array | null,
    known: Known[],
    priorWeight: number,
    smoothness: number,
    robust: RobustConf | null,
    tolerance: number,
    maxIterations: number,
  ) {
    this.w = w;
    this.h = h;
    this.n = w * h;
    this.dx = dx;
    this.dy = dy;
    const { off, len } = paddedLayout(w, h);
    this.off = off;
    this.len = len;
    this.mask = mask;
    this.validP = new Uint8Array(len);
    for (let s = 0; s < this.n; s++) this.validP[off + s] = mask[s]!;
    this.baseW = weights;
    this.uP = new Float64Array(this.n).fill(1);
    this.uQ = new Float64Array(this.n).fill(1);
    this.fx = new Float64Array(len);
    this.fy = new Float64Array(len);
    this.mg = new Multigrid(w, h);
    this.priorWeight = priorWeight;
    this.smoothness = smoothness;
    this.robust = robust;
    this.tolerance = tolerance;
    this.maxIterations = maxIterations;
    this.known = known;
    this.labels = new Int32Array(this.n);
    this.parent = new Int32Array(this.n);
    this.b = new Float64Array(len);
    this.x = new Float64Array(len);
    this.tmp = smoothness > 0 ? new Float64Array(len) : new Float64Array(0);
    this.ws = createPcgWorkspace(len);
    this.rebuild();
  }

  /** Recompute pair weights and targets, the diagonal, the hierarchy and the pieces. */
  rebuild(): void {
    const { w, h, off, validP, baseW, uP, uQ, fx, fy } = this;
    const F = this.mg.fine;
    const ex = F.ex;
    const ey = F.ey;
    const dg = F.dg;
    ex.fill(0);
    ey.fill(0);
    dg.fill(0);
    fx.fill(0);
    fy.fill(0);
    const ix2 = 1 / (this.dx * this.dx);
    const iy2 = 1 / (this.dy * this.dy);
    for (let j = 0; j < h; j++) {
      for (let i = 0; i < w; i++) {
        const s = j * w + i;
        const k = off + s;
        if (validP[k] === 0) continue;
        const ws = baseW ? baseW[s]! : 1;
        if (i + 1 < w && validP[k + 1] === 1) {
          const c = baseW ? baseW[s + 1]! : 1;
          const t = ws + c;
          if (t > 0) {
            ex[k] = 0.5 * t * ix2 * Math.max(uP[s]! * uP[s + 1]!, ROBUST_FLOOR);
            fx[k] = ws / t;
          }
        }
        if (j + 1 < h && validP[k + w] === 1) {
          const c = baseW ? baseW[s + w]! : 1;
          const t = ws + c;
          if (t > 0) {
            ey[k] = 0.5 * t * iy2 * Math.max(uQ[s]! * uQ[s + w]!, ROBUST_FLOOR);
            fy[k] = ws / t;
          }
        }
      }
    }
    if (this.priorWeight > 0) {
      for (let s = 0; s < this.n; s++) if (validP[off + s] === 1) dg[off + s] = this.priorWeight;
    }
    for (const kn of this.known) dg[kn.k] = dg[kn.k]! + kn.weight;
    if (this.smoothness > 0) {
      // a sample held only by smoothness triples (all its pairs at zero weight) gets
      // the triples' diagonal in the preconditioner, so the iteration reaches it
      const cx = (6 * this.smoothness) / (this.dx * this.dx * this.dx * this.dx);
      const cy = (6 * this.smoothness) / (this.dy * this.dy * this.dy * this.dy);
      for (let k = off; k < off + this.n; k++) {
        if (validP[k] === 0) continue;
        if (ex[k]! + ex[k - 1]! + ey[k]! + ey[k - w]! + dg[k]! > 0) continue;
        if (validP[k - 1] === 1 || validP[k + 1] === 1) dg[k] = dg[k]! + cx;
        if (validP[k - w] === 1 || validP[k + w] === 1) dg[k] = dg[k]! + cy;
      }
    }
    this.mg.rebuild();
    this.label();
  }

  private find(a: number): number {
    const par = this.parent;
    while (par[a] !== a) {
      par[a] = par[par[a]!]!;
      a = par[a]!;
    }
    return a;
  }

  private union(a: number, b: number): void {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra !== rb) {
      if (ra < rb) this.parent[rb] = ra;
      else this.parent[ra] = rb;
    }
  }

  /** Connected pieces of the graph of weighted pairs (and smoothness triples). */
  private label(): void {
    const { w, h, n, off, validP } = this;
    const F = this.mg.fine;
    const par = this.parent;
    for (let s = 0; s < n; s++) par[s] = s;
    const smooth = this.smoothness > 0;
    for (let j = 0; j < h; j++) {
      for (let i = 0; i < w; i++) {
        const s = j * w + i;
        const k = off + s;
        if (validP[k] === 0) continue;
        if (F.ex[k]! > 0) this.union(s, s + 1);
        if (F.ey[k]! > 0) this.union(s, s + w);
        // a smoothness triple couples its three samples even across zero-weight pairs
        if (smooth && i + 2 < w && validP[k + 1] === 1 && validP[k + 2] === 1) {
          this.union(s, s + 1);
          this.union(s + 1, s + 2);
        }
        if (smooth && j + 2 < h && validP[k + w] === 1 && validP[k + 2 * w] === 1) {
          this.union(s, s + w);
          this.union(s + w, s + 2 * w);
        }
      }
    }
    const labels = this.labels;
    labels.fill(0);
    let count = 0;
    const rootLabel = new Int32Array(n); // label of a root, 0 = unassigned
    for (let s = 0; s < n; s++) {
      if (validP[off + s] === 0) continue;
      const r = this.find(s);
      let l = rootLabel[r]!;
      if (l === 0) {
        l = ++count;
        rootLabel[r] = l;
      }
      labels[s] = l;
    }
    this.pieceCount = count;
    this.pieceSamples = new Int32Array(count + 1);
    this.pieceAnchored = new Uint8Array(count + 1);
    for (let s = 0; s < n; s++) this.pieceSamples[labels[s]!]!++;
    if (this.priorWeight > 0) this.pieceAnchored.fill(1);
    for (const kn of this.known) this.pieceAnchored[labels[kn.k - off]!] = 1;
  }

  /** Assemble the right-hand side for one frame. */
  assemble(p: Float64Array, q: Float64Array, prior: Float64Array | null): void {
    const { w, h, off, fx, fy, b, dx, dy } = this;
    const F = this.mg.fine;
    const ex = F.ex;
    const ey = F.ey;
    b.fill(0);
    for (let j = 0; j < h; j++) {
      const row = off + j * w;
      const end = row + w - 1;
      for (let k = row; k < end; k++) {
        const e = ex[k]!;
        if (e === 0) continue;
        const s = k - off;
        const f = fx[k]!;
        const c = e * dx * (f * p[s]! + (1 - f) * p[s + 1]!);
        b[k] = b[k]! - c;
        b[k + 1] = b[k + 1]! + c;
      }
    }
    const endY = off + (h - 1) * w;
    for (let k = off; k < endY; k++) {
      const e = ey[k]!;
      if (e === 0) continue;
      const s = k - off;
      const f = fy[k]!;
      const c = e * dy * (f * q[s]! + (1 - f) * q[s + w]!);
      b[k] = b[k]! - c;
      b[k + w] = b[k + w]! + c;
    }
    if (this.priorWeight > 0 && prior) {
      const lam = this.priorWeight;
      const validP = this.validP;
      for (let s = 0; s < this.n; s++) {
        const k = off + s;
        if (validP[k] === 1) b[k] = b[k]! + lam * prior[s]!;
      }
    }
    for (const kn of this.known) b[kn.k] = b[kn.k]! + kn.weight * kn.height;
  }

  /** A = slope Laplacian + diagonal (+ smoothness), matrix-free. */
  applyA = (z: Float64Array, out: Float64Array): void => {
    this.mg.apply(z, out);
    if (this.smoothness > 0) this.applySmooth(z, out);
  };

  private applySmooth(z: Float64Array, out: Float64Array): void {
    const { w, h, off, validP } = this;
    const c = this.tmp;
    const end = off + w * h;
    const sx = this.smoothness / (this.dx * this.dx * this.dx * this.dx);
    const sy = this.smoothness / (this.dy * this.dy * this.dy * this.dy);
    c.fill(0);
    for (let j = 0; j < h; j++) {
      const row = off + j * w;
      for (let k = row + 1; k < row + w - 1; k++) {
        if (validP[k - 1] === 1 && validP[k] === 1 && validP[k + 1] === 1) c[k] = z[k - 1]! - 2 * z[k]! + z[k + 1]!;
      }
    }
    for (let k = off; k < end; k++) {
      if (validP[k] === 1) out[k] = out[k]! + sx * (c[k - 1]! - 2 * c[k]! + c[k + 1]!);
    }
    c.fill(0);
    for (let k = off + w; k < end - w; k++) {
      if (validP[k - w] === 1 && validP[k] === 1 && validP[k + w] === 1) c[k] = z[k - w]! - 2 * z[k]! + z[k + w]!;
    }
    for (let k = off; k < end; k++) {
      if (validP[k] === 1) out[k] = out[k]! + sy * (c[k - w]! - 2 * c[k]! + c[k + w]!);
    }
  }

  private applyM = (r: Float64Array, z: Float64Array): number => this.mg.vcycle(r, z);

  private applyADot = (z: Float64Array, out: Float64Array): number => this.mg.applyDot(z, out);

  /** PCG on the current operator; x holds the start and receives the solution. */
  iterate(onProgress: ProgressCallback | undefined): { iterations: number; relativeResidual: number; converged: boolean } {
    // samples without any term stay at 0
    const x = this.x;
    const invD = this.mg.fine.invD;
    for (let k = this.off; k < this.off + this.n; k++) if (invD[k] === 0) x[k] = 0;
    return pcg(this.applyA, this.b, x, this.applyM, {
      tolerance: this.tolerance,
      maxIterations: this.maxIterations,
      onProgress,
      workspace: this.ws,
      applyADot: this.smoothness > 0 ? undefined : this.applyADot,
    });
  }

  /** Remove each free piece's mean; returns the pistons by label. */
  piston(): Float64Array {
    const { n, off, labels, x } = this;
    const sums = new Float64Array(this.pieceCount + 1);
    for (let s = 0; s < n; s++) {
      const l = labels[s]!;
      if (l !== 0) sums[l] = sums[l]! + x[off + s]!;
    }
    const pist = new Float64Array(this.pieceCount + 1);
    for (let l = 1; l <= this.pieceCount; l++) {
      if (this.pieceAnchored[l] === 0) {
        const v = -sums[l]! / this.pieceSamples[l]!;
        pist[l] = v === 0 ? 0 : v; // no −0
      }
    }
    for (let s = 0; s < n; s++) {
      const l = labels[s]!;
      if (l !== 0) x[off + s] = x[off + s]! + pist[l]!;
    }
    return pist;
  }

  /** RMS of the weighted-pair model residual over the used pairs (x and y pooled). */
  pairRms(p: Float64Array, q: Float64Array): number {
    const { w, h, off, fx, fy, x, dx, dy } = this;
    const F = this.mg.fine;
    let sum = 0;
    let count = 0;
    for (let j = 0; j < h; j++) {
      const row = off + j * w;
      for (let k = row; k < row + w; k++) {
        const s = k - off;
        if (F.ex[k]! > 0) {
          const f = fx[k]!;
          const e = (x[k + 1]! - x[k]!) / dx - (f * p[s]! + (1 - f) * p[s + 1]!);
          sum += e * e;
          count++;
        }
        if (F.ey[k]! > 0) {
          const f = fy[k]!;
          const e = (x[k + w]! - x[k]!) / dy - (f * q[s]! + (1 - f) * q[s + w]!);
          sum += e * e;
          count++;
        }
      }
    }
    return count > 0 ? Math.sqrt(sum / count) : 0;
  }

  /**
   * Per-sample residual of the fitted slope (the central difference of the heights
   * inside the mask, one-sided at an edge or hole, minus the given slope) into rp, rq;
   * NaN where no neighbour exists along that axis.
   */
  sampleResiduals(p: Float64Array, q: Float64Array, rp: Float64Array, rq: Float64Array): void {
    const { w, h, off, validP, x, dx, dy } = this;
    for (let j = 0; j < h; j++) {
      for (let i = 0; i < w; i++) {
        const s = j * w + i;
        const k = off + s;
        if (validP[k] === 0) {
          rp[s] = NaN;
          rq[s] = NaN;
          continue;
        }
        const l = i > 0 && validP[k - 1] === 1;
        const r = i + 1 < w && validP[k + 1] === 1;
        if (l && r) rp[s] = (x[k + 1]! - x[k - 1]!) / (2 * dx) - p[s]!;
        else if (r) rp[s] = (x[k + 1]! - x[k]!) / dx - p[s]!;
        else if (l) rp[s] = (x[k]! - x[k - 1]!) / dx - p[s]!;
        else rp[s] = NaN;
        const u = j > 0 && validP[k - w] === 1;
        const d = j + 1 < h && validP[k + w] === 1;
        if (u && d) rq[s] = (x[k + w]! - x[k - w]!) / (2 * dy) - q[s]!;
        else if (d) rq[s] = (x[k + w]! - x[k]!) / dy - q[s]!;
        else if (u) rq[s] = (x[k]! - x[k - w]!) / dy - q[s]!;
        else rq[s] = NaN;
      }
    }
  }

  /** Replace the known heights; rebuild when positions or weights changed. */
  setKnown(known: Known[]): void {
    const same =
      known.length === this.known.length &&
      known.every((kn, t) => kn.k === this.known[t]!.k && kn.weight === this.known[t]!.weight);
    this.known = known;
    if (!same) this.rebuild();
  }

  /** One complete solve (with the robust loop when configured). */
  solve(
    p: Float64Array,
    q: Float64Array,
    prior: Float64Array | null,
    guess: Float64Array | null,
    onProgress: ProgressCallback | undefined,
    out: Float64Array,
    geometry: Grid,
  ): LeastSquaresResult {
    const { off, n } = this;
    const x = this.x;
    if (guess) {
      x.fill(0);
      for (let s = 0; s < n; s++) if (this.mask[s] === 1) x[off + s] = guess[s]!;
    }
    let totalIt = 0;
    let robustReport: RobustReport | undefined;
    let st: { iterations: number; relativeResidual: number; converged: boolean };
    if (this.robust) {
      const R = this.robust;
      this.uP.fill(1);
      this.uQ.fill(1);
      this.rebuild();
      this.assemble(p, q, prior);
      st = this.iterate(onProgress);
      totalIt += st.iterations;
      const rp = new Float64Array(n);
      const rq = new Float64Array(n);
      const absVals = new Float64Array(2 * n);
      let slopeRms = 0;
      let slopeCount = 0;
      for (let s = 0; s < n; s++) {
        if (this.mask[s] === 1) {
          slopeRms += p[s]! * p[s]! + q[s]! * q[s]!;
          slopeCount += 2;
        }
      }
      slopeRms = Math.sqrt(slopeRms / Math.max(1, slopeCount));
      let scale = 0;
      let rounds = 0;
      for (let round = 0; round < R.maxIterations; round++) {
        this.sampleResiduals(p, q, rp, rq);
        let m = 0;
        for (let s = 0; s < n; s++) {
          const a = rp[s]!;
          const c = rq[s]!;
          if (a === a) absVals[m++] = Math.abs(a);
          if (c === c) absVals[m++] = Math.abs(c);
        }
        // the scale is estimated once, from the plain fit, and then held: re-estimating
        // it from ever better-fitting residuals lets it shrink round after round
        if (round === 0) scale = Math.max(madScale(absVals, m), 1e-9 * slopeRms, 1e-300);
        const cut = R.threshold * scale;
        let change = 0;
        for (let s = 0; s < n; s++) {
          const a = rp[s]!;
          const c = rq[s]!;
          const wp = a === a ? robustWeight(R.loss, Math.abs(a), cut) : 1;
          const wq = c === c ? robustWeight(R.loss, Math.abs(c), cut) : 1;
          change = Math.max(change, Math.abs(wp - this.uP[s]!), Math.abs(wq - this.uQ[s]!));
          this.uP[s] = wp;
          this.uQ[s] = wq;
        }
        rounds++;
        this.rebuild();
        this.assemble(p, q, prior);
        st = this.iterate(onProgress);
        totalIt += st.iterations;
        if (change <= R.tolerance) break;
      }
      const distrusted = new Uint8Array(n);
      for (let s = 0; s < n; s++) {
        if (this.mask[s] === 1 && (this.uP[s]! < 0.5 || this.uQ[s]! < 0.5)) distrusted[s] = 1;
      }
      robustReport = {
        loss: R.loss,
        threshold: R.threshold,
        scale,
        rounds,
        weightsP: createGrid(geometry, this.uP.slice()),
        weightsQ: createGrid(geometry, this.uQ.slice()),
        distrusted,
      };
    } else {
      this.assemble(p, q, prior);
      st = this.iterate(onProgress);
      totalIt = st.iterations;
    }
    const pist = this.piston();
    for (let s = 0; s < n; s++) out[s] = this.mask[s] === 1 ? x[off + s]! : 0;
    const pieces: PieceInfo[] = [];
    for (let l = 1; l <= this.pieceCount; l++) {
      pieces.push({ label: l, samples: this.pieceSamples[l]!, piston: pist[l]! });
    }
    const result: LeastSquaresResult = {
      height: createGrid(geometry, out),
      mask: this.mask.slice(),
      rmsResidual: this.pairRms(p, q),
      iterations: totalIt,
      converged: st.converged,
      relativeResidual: st.relativeResidual,
      pieces,
      labels: this.labels.slice(),
      ...(robustReport ? { robust: robustReport } : {}),
    };
    return result;
  }
}

function robustWeight(loss: RobustLoss, a: number, cut: number): number {
  if (loss === 'huber') return a <= cut ? 1 : cut / a;
  if (a >= cut) return 0;
  const t = a / cut;
  const u = 1 - t * t;
  return u * u;
}

/** Validated set-up. */
interface CheckedSetup {
  mask: Mask;
  weights: Float64Array | null;
  known: Known[];
  priorWeight: number;
  smoothness: number;
  robust: RobustConf | null;
  tolerance: number;
  maxIterations: number;
}

function checkKnown(fn: string, value: unknown, w: number, h: number, dx: number, dy: number, mask: Mask): Known[] {
  if (value === undefined) return [];
  if (!Array.isArray(value)) typeError(fn, 'options.knownHeights', value, 'an array of {i, j, height, weight?}');
  const off = w + 1;
  const out: Known[] = [];
  const seen = new Set<number>();
  value.forEach((kh: unknown, t: number) => {
    const name = `options.knownHeights[${t}]`;
    if (kh === null || typeof kh !== 'object') typeError(fn, name, kh, 'an object {i, j, height, weight?}');
    const o = kh as KnownHeight;
    const i = checkInteger(fn, `${name}.i`, o.i, 0, w - 1);
    const j = checkInteger(fn, `${name}.j`, o.j, 0, h - 1);
    const height = checkFinite(fn, `${name}.height`, o.height);
    const weight = o.weight === undefined ? 1000 / (dx * dy) : checkPositive(fn, `${name}.weight`, o.weight);
    const s = j * w + i;
    if (mask[s] !== 1) rangeError(fn, name, `(${i}, ${j})`, 'a sample inside the mask');
    if (seen.has(s)) rangeError(fn, name, `(${i}, ${j})`, 'a sample not already listed');
    seen.add(s);
    out.push({ k: off + s, height, weight });
  });
  return out;
}

function checkSetup(fn: string, o: LeastSquaresSetup & { prior?: Grid }, like: Grid, mask: Mask | null): CheckedSetup {
  const w = like.width;
  const h = like.height;
  const m = mask ?? new Uint8Array(w * h).fill(1);
  const weights = o.weights === undefined ? null : checkWeights(fn, 'options.weights', o.weights, like, mask).data;
  const known = checkKnown(fn, o.knownHeights, w, h, like.dx, like.dy, m);
  let priorWeight = 0;
  if (o.priorWeight !== undefined) priorWeight = checkNonNegative(fn, 'options.priorWeight', o.priorWeight);
  else if (o.prior !== undefined) priorWeight = 1e-3 / (like.dx * like.dy);
  const smoothness = o.smoothness === undefined ? 0 : checkNonNegative(fn, 'options.smoothness', o.smoothness);
  let robust: RobustConf | null = null;
  if (o.robust !== undefined) {
    const r: RobustOptions = typeof o.robust === 'string' ? { loss: o.robust } : checkOptions(fn, o.robust, 'options.robust');
    const loss = r.loss === undefined ? 'huber' : checkOneOf(fn, 'options.robust.loss', r.loss, ['huber', 'tukey'] as const);
    robust = {
      loss,
      threshold: r.threshold === undefined ? (loss === 'huber' ? 1.345 : 4.685) : checkPositive(fn, 'options.robust.threshold', r.threshold),
      maxIterations: r.maxIterations === undefined ? 10 : checkInteger(fn, 'options.robust.maxIterations', r.maxIterations, 1, 1000),
      tolerance: r.tolerance === undefined ? 1e-3 : checkNonNegative(fn, 'options.robust.tolerance', r.tolerance),
    };
  }
  let tolerance = 1e-6;
  if (o.tolerance !== undefined) {
    tolerance = checkFinite(fn, 'options.tolerance', o.tolerance);
    if (!(tolerance > 0 && tolerance < 1)) rangeError(fn, 'options.tolerance', tolerance, 'a number in (0, 1)');
  }
  const maxIterations =
    o.maxIterations === undefined ? 500 : checkInteger(fn, 'options.maxIterations', o.maxIterations, 1, LIMITS.maxIterations);
  return { mask: m, weights, known, priorWeight, smoothness, robust, tolerance, maxIterations };
}

function checkFieldOnMask(fn: string, parameter: string, value: unknown, like: Grid, mask: Mask): Float64Array {
  const g = checkGrid(fn, parameter, value, true);
  checkSameShape(fn, parameter, g, like, false);
  const d = g.data;
  for (let s = 0; s < d.length; s++) {
    if (mask[s] === 1 && !Number.isFinite(d[s]!)) rangeError(fn, `${parameter}.data[${s}]`, d[s], 'a finite number inside the mask');
  }
  return d;
}

function checkProgress(fn: string, value: unknown): ProgressCallback | undefined {
  if (value !== undefined && typeof value !== 'function') typeError(fn, 'options.onProgress', value, 'a function or undefined');
  return value as ProgressCallback | undefined;
}

function systemFor(like: Grid, c: CheckedSetup): LsqSystem {
  return new LsqSystem(
    like.width,
    like.height,
    like.dx,
    like.dy,
    c.mask,
    c.weights,
    c.known,
    c.priorWeight,
    c.smoothness,
    c.robust,
    c.tolerance,
    c.maxIterations,
  );
}

/**
 * Integrate slopes by weighted least squares on an arbitrary mask: holes, ragged edges
 * and several separate pieces.
 *
 * The model: every pair of 4-adjacent valid samples a → b along x asks for
 * `(h_b − h_a)/dx = (w_a p_a + w_b p_b)/(w_a + w_b)` with weight `(w_a + w_b)/2` (equal
 * weights: the mean of the two slopes, the model of {@link integrateDctPoisson}); pairs
 * along y likewise with `q`, `dy`. Known heights, a zero-order Tikhonov term towards a
 * prior surface and a second-order smoothness term can be added. The heights minimise
 * the weighted sum of squares; the normal equations (a weighted graph Laplacian) are
 * solved by conjugate gradients preconditioned with one multigrid V-cycle, whose cost
 * grows linearly with the number of samples. Iteration stops at
 * `‖r‖ ≤ tolerance · ‖b‖` or after `maxIterations`; the achieved ratio is returned
 * as `relativeResidual`, and `converged` says whether the tolerance was met.
 *
 * Boundary: none is imposed (natural boundary of least squares on the mask's own edge).
 * Pieces: each connected piece of the graph of weighted pairs is integrated on its own
 * and, unless a known height or a prior anchors it, shifted to zero mean (its `piston`
 * in `pieces`). A valid sample with no pair (a one-pixel piece) gets height 0.
 * Robust option: iteratively reweighted least squares; after each solve every sample's
 * `p` and `q` get a robust weight u ∈ [0, 1] from the Huber or Tukey loss of its
 * residual (fitted slope at the sample, a central difference of the heights, minus the
 * given slope) in units of the robust scale (1.4826 × median absolute residual of the
 * plain fit, then held fixed); each pair's weight is multiplied by
 * `max(u_a · u_b, 0.01)` and the problem is solved again, starting from the last
 * heights. The final weights and the distrusted samples (u < 0.5) are reported.
 *
 * @param p - Slopes ∂h/∂x at the samples (unitless); may hold NaN in holes of the mask.
 * @param q - Slopes ∂h/∂y at the samples, same size and geometry as `p`.
 * @param options - See {@link LeastSquaresOptions}.
 * @returns Heights (metres, 0 outside the mask) with diagnostics; see {@link LeastSquaresResult}.
 * @throws {@link core!MeniscusTypeError} for malformed grids, masks or options.
 * @throws {@link core!MeniscusRangeError} for non-finite slopes inside the mask, a mask with
 *   no valid sample, negative or all-zero weights, known heights outside the mask.
 * @see Harker, M. & O'Leary, P. (2008), "Least squares surface reconstruction from
 *   measured gradient fields", CVPR 2008; Harker, M. & O'Leary, P. (2011), "Least
 *   squares surface reconstruction from gradients: direct algebraic methods with
 *   spectral, Tikhonov, and constrained regularization", CVPR 2011.
 * @see Briggs, W. L., Henson, V. E. & McCormick, S. F. (2000), "A Multigrid Tutorial",
 *   2nd ed., SIAM.
 * @see Huber, P. J. (1964), "Robust estimation of a location parameter", Annals of
 *   Mathematical Statistics 35(1), 73–101; Holland, P. W. & Welsch, R. E. (1977),
 *   "Robust regression using iteratively reweighted least-squares", Communications in
 *   Statistics – Theory and Methods 6(9), 813–827.
 * @example
 * ```ts
 * const mask = createMask(64, 64);
 * mask[32 * 64 + 32] = 0; // a hole
 * const r = integrateLeastSquares(p, q, { mask, robust: 'tukey' });
 * r.height; r.pieces; r.robust?.distrusted;
 * ```
 */
export function integrateLeastSquares(p: Grid, q: Grid, options?: LeastSquaresOptions): LeastSquaresResult {
  const fn = 'integrateLeastSquares';
  const o = checkOptions(fn, options);
  const s = checkSlopes(fn, p, q, o.mask);
  const c = checkSetup(fn, o, s.p, s.mask);
  const prior = o.prior === undefined ? null : checkFieldOnMask(fn, 'options.prior', o.prior, s.p, c.mask);
  const guess = o.initialGuess === undefined ? null : checkFieldOnMask(fn, 'options.initialGuess', o.initialGuess, s.p, c.mask);
  const onProgress = checkProgress(fn, o.onProgress);
  const out = outBuffer(fn, o.out, s.p.width * s.p.height);
  checkAllocation(fn, 'p.width × p.height × 16', 16 * s.p.width * s.p.height);
  const sys = systemFor(s.p, c);
  return sys.solve(s.p.data, s.q.data, prior, guess, onProgress, out, s.p);
}

class PreparedLsq implements PreparedLeastSquares {
  readonly width: number;
  readonly height: number;
  private readonly sys: LsqSystem;
  private readonly like: Grid;
  private readonly warm: boolean;
  private hasPrevious = false;
  private readonly previous: Float64Array;

  constructor(like: Grid, sys: LsqSystem, warm: boolean) {
    this.width = like.width;
    this.height = like.height;
    this.like = like;
    this.sys = sys;
    this.warm = warm;
    this.previous = new Float64Array(warm ? like.width * like.height : 0);
  }

  solve(p: Grid, q: Grid, options?: LeastSquaresFrameOptions): LeastSquaresResult {
    const fn = 'PreparedLeastSquares.solve';
    const o = checkOptions(fn, options);
    const sys = this.sys;
    const s = checkSlopes(fn, p, q, sys.mask, 'the prepared mask');
    if (s.p.width !== this.width || s.p.height !== this.height) {
      typeError(fn, 'p', `${s.p.width}×${s.p.height}`, `a grid of ${this.width}×${this.height} samples (the prepared size)`);
    }
    if (s.p.dx !== this.like.dx || s.p.dy !== this.like.dy) {
      rangeError(fn, 'p', `dx ${s.p.dx}, dy ${s.p.dy}`, `the prepared spacing dx ${this.like.dx}, dy ${this.like.dy}`);
    }
    const prior = o.prior === undefined ? null : checkFieldOnMask(fn, 'options.prior', o.prior, s.p, sys.mask);
    if (prior && !(sys.priorWeight > 0)) {
      typeError(fn, 'options.prior', o.prior, 'undefined (prepare with priorWeight > 0 to use a prior)');
    }
    let guess = o.initialGuess === undefined ? null : checkFieldOnMask(fn, 'options.initialGuess', o.initialGuess, s.p, sys.mask);
    if (o.knownHeights !== undefined) {
      sys.setKnown(checkKnown(fn, o.knownHeights, this.width, this.height, s.p.dx, s.p.dy, sys.mask));
    }
    const onProgress = checkProgress(fn, o.onProgress);
    const out = outBuffer(fn, o.out, this.width * this.height);
    if (!guess && this.warm && this.hasPrevious) guess = this.previous;
    if (!guess) sys.x.fill(0);
    const r = sys.solve(s.p.data, s.q.data, prior, guess, onProgress, out, s.p);
    if (this.warm) {
      this.previous.set(out);
      this.hasPrevious = true;
    }
    return r;
  }
}

/**
 * Prepare a least-squares integrator for one grid, mask, weights and set of terms: the
 * operator, its multigrid hierarchy, the piece labels and every work vector are built
 * once; each frame then costs one right-hand side, the conjugate-gradient iterations and
 * the output (plus a rebuild per reweighting round with the robust option).
 *
 * @param spec - Grid geometry (`width`, `height`, `dx`, `dy`, origin).
 * @param options - The fixed part of {@link LeastSquaresOptions} plus `warmStart`.
 * @returns The prepared solver.
 * @throws {@link core!MeniscusRangeError} / {@link core!MeniscusTypeError} as {@link integrateLeastSquares}.
 * @see Harker, M. & O'Leary, P. (2008), "Least squares surface reconstruction from
 *   measured gradient fields", CVPR 2008.
 * @see Briggs, W. L., Henson, V. E. & McCormick, S. F. (2000), "A Multigrid Tutorial",
 *   2nd ed., SIAM.
 * @example
 * ```ts
 * const solver = prepareLeastSquares({ width: 256, height: 256, dx: 2e-3 }, { mask, warmStart: true });
 * for (const f of frames) heights.push(solver.solve(f.p, f.q).height);
 * ```
 */
export function prepareLeastSquares(spec: GridSpec, options?: PrepareLeastSquaresOptions): PreparedLeastSquares {
  const fn = 'prepareLeastSquares';
  const o = checkOptions(fn, options);
  const like = createGrid(spec);
  let mask: Mask | null = null;
  if (o.mask !== undefined) {
    mask = checkSlopes(fn, like, like, o.mask).mask;
  }
  checkAllocation(fn, 'spec.width × spec.height × 16', 16 * like.width * like.height);
  const c = checkSetup(fn, o, like, mask);
  const warm = o.warmStart === undefined ? false : o.warmStart === true ? true : o.warmStart === false ? false : typeError(fn, 'options.warmStart', o.warmStart, 'true or false');
  return new PreparedLsq(like, systemFor(like, c), warm);
}
