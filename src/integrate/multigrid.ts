/**
 * Geometric multigrid for weighted 5-point graph Laplacians on a masked regular grid,
 * used as the preconditioner of the masked least-squares integrator.
 *
 * Every level stores the operator `A z = D ∘ z − Σ edges w · z_neighbour` through its
 * horizontal edge weights `ex` (sample `k` to `k + 1`), vertical edge weights `ey`
 * (sample `k` to `k + width`) and an extra diagonal `dg` (Tikhonov and known-height
 * terms). Arrays are *padded*: sample `(i, j)` sits at index `off + j·width + i` with
 * `off = width + 1`, and every array is `width·height + 2·width + 2` long, so the stencil
 * reads `k − 1`, `k + 1`, `k − width`, `k + width` without boundary tests (the weights
 * of edges that leave the grid are zero).
 *
 * Coarsening aggregates 2 × 2 blocks. A coarse edge carries half the sum of the fine
 * edges that cross between its two blocks, which is the aggregation (piecewise-constant)
 * Galerkin operator scaled to the right energy for smooth error (equivalently, the
 * coarse correction over-corrected by 2); the extra diagonal is summed. Restriction sums
 * a block, prolongation copies a block's value to its samples (R = Pᵀ). Smoothing is
 * lexicographic Gauss–Seidel, forward before and backward after the coarse correction,
 * so the V-cycle is a symmetric preconditioner for conjugate gradients. The coarsest
 * level (at most 3 × 3) is solved by symmetric Gauss–Seidel sweeps. Cost: O(N) a cycle.
 *
 * @see Briggs, W. L., Henson, V. E. & McCormick, S. F. (2000), "A Multigrid Tutorial",
 *   2nd ed., SIAM (V-cycle, Galerkin coarse operators, chapters 3 and 8).
 * @see Braess, D. (1995), "Towards algebraic multigrid for elliptic problems of second
 *   order", Computing 55, 379–393 (aggregation with over-correction).
 * @module
 * @internal
 */

/** One level of the hierarchy. @internal */
export interface MgLevel {
  readonly w: number;
  readonly h: number;
  /** Offset of sample (0, 0) in the padded arrays. */
  readonly off: number;
  /** Padded length. */
  readonly len: number;
  readonly ex: Float64Array;
  readonly ey: Float64Array;
  readonly dg: Float64Array;
  /** Full diagonal: incident edge weights + dg. */
  readonly d: Float64Array;
  /** 1 / d, or 0 where d = 0 (holes, samples without any term). */
  readonly invD: Float64Array;
  /** Right-hand side and solution work vectors (coarse levels only). */
  readonly b: Float64Array;
  readonly x: Float64Array;
  readonly r: Float64Array;
}

/** Padded length and offset of a `w × h` grid. @internal */
export function paddedLayout(w: number, h: number): { off: number; len: number } {
  return { off: w + 1, len: w * h + 2 * w + 2 };
}

function newLevel(w: number, h: number): MgLevel {
  const { off, len } = paddedLayout(w, h);
  return {
    w,
    h,
    off,
    len,
    ex: new Float64Array(len),
    ey: new Float64Array(len),
    dg: new Float64Array(len),
    d: new Float64Array(len),
    invD: new Float64Array(len),
    b: new Float64Array(len),
    x: new Float64Array(len),
    r: new Float64Array(len),
  };
}

/** Recompute `d` and `invD` of a level from its edges and extra diagonal. @internal */
export function finishDiagonal(L: MgLevel): void {
  const { ex, ey, dg, d, invD, off, w, h } = L;
  const end = off + w * h;
  for (let k = off; k < end; k++) {
    const v = ex[k]! + ex[k - 1]! + ey[k]! + ey[k - w]! + dg[k]!;
    d[k] = v;
    invD[k] = v > 0 ? 1 / v : 0;
  }
}

/** Options of the cycle. @internal */
export interface MgSettings {
  /** Gauss–Seidel sweeps before and after the coarse correction. */
  sweeps: number;
  /** Symmetric sweeps on the coarsest level. */
  coarseSweeps: number;
}

/**
 * The hierarchy. Level 0 shares its arrays with the caller, who fills `ex`, `ey`, `dg`
 * and calls {@link Multigrid.rebuild} whenever they change.
 *
 * @internal
 */
export class Multigrid {
  readonly levels: MgLevel[];
  readonly settings: MgSettings;

  constructor(w: number, h: number, settings: MgSettings = { sweeps: 1, coarseSweeps: 20 }) {
    this.settings = settings;
    const levels: MgLevel[] = [newLevel(w, h)];
    let cw = w;
    let ch = h;
    while (cw > 3 || ch > 3) {
      cw = Math.ceil(cw / 2);
      ch = Math.ceil(ch / 2);
      levels.push(newLevel(cw, ch));
    }
    this.levels = levels;
  }

  /** The finest level (the caller fills its `ex`, `ey`, `dg`). */
  get fine(): MgLevel {
    return this.levels[0]!;
  }

  /** Recompute every diagonal and every coarse operator from level 0. */
  rebuild(): void {
    finishDiagonal(this.levels[0]!);
    for (let l = 1; l < this.levels.length; l++) coarsen(this.levels[l - 1]!, this.levels[l]!);
  }

  /** Apply level 0's operator: `out = A z` (padding of `out` is left untouched). */
  apply(z: Float64Array, out: Float64Array): void {
    applyLevel(this.levels[0]!, z, out);
  }

  /** One V-cycle from a zero guess: `x ≈ A⁻¹ b` on level 0. */
  vcycle(b: Float64Array, x: Float64Array): void {
    this.cycle(0, b, x);
  }

  private cycle(l: number, b: Float64Array, x: Float64Array): void {
    const L = this.levels[l]!;
    if (l === this.levels.length - 1) {
      x.fill(0);
      for (let s = 0; s < this.settings.coarseSweeps; s++) gsForward(L, b, x);
      for (let s = 0; s < this.settings.coarseSweeps; s++) gsBackward(L, b, x);
      return;
    }
    const C = this.levels[l + 1]!;
    const nu = this.settings.sweeps;
    if (nu === 1) {
      // fused: zero-start forward sweep, residual and restriction in one pass
      presmoothRestrict(L, b, x, C, C.b);
      this.cycle(l + 1, C.b, C.x);
      prolongSmooth(C, C.x, L, b, x);
      return;
    }
    x.fill(0);
    for (let s = 0; s < nu; s++) gsForward(L, b, x);
    residual(L, b, x, L.r);
    restrict(L, L.r, C, C.b);
    this.cycle(l + 1, C.b, C.x);
    prolongAdd(C, C.x, L, x);
    for (let s = 0; s < nu; s++) gsBackward(L, b, x);
  }
}

/**
 * One forward Gauss–Seidel sweep from x = 0, with the residual restricted on the fly.
 * From a zero start, after the sweep the residual at k is only the pull of the two
 * neighbours updated after k: `r_k = ex_k x_{k+1} + ey_k x_{k+w}`. Row j − 1's residual
 * is complete once row j is swept, so both happen in the same pass. Every entry of x in
 * the grid range is written (0 where invD = 0), so x needs no clearing.
 */
function presmoothRestrict(L: MgLevel, b: Float64Array, x: Float64Array, C: MgLevel, bc: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  const W = C.w;
  const offc = C.off;
  bc.fill(0);
  for (let j = 0; j < h; j++) {
    const row = off + j * w;
    const end = row + w;
    if (j === 0) {
      for (let k = row; k < end; k++) x[k] = (b[k]! + ex[k - 1]! * x[k - 1]!) * invD[k]!;
      continue;
    }
    const rowC = offc + ((j - 1) >> 1) * W;
    for (let k = row, i = 0; k < end; k++, i++) {
      const v = (b[k]! + ex[k - 1]! * x[k - 1]! + ey[k - w]! * x[k - w]!) * invD[k]!;
      x[k] = v;
      const u = k - w; // row j − 1: final now
      const K = rowC + (i >> 1);
      bc[K] = bc[K]! + ex[u]! * x[u + 1]! + ey[u]! * v;
    }
  }
  // last row: only the right neighbour was updated after each sample
  const row = off + (h - 1) * w;
  const rowC = offc + ((h - 1) >> 1) * W;
  for (let k = row, i = 0; k < row + w; k++, i++) {
    const K = rowC + (i >> 1);
    bc[K] = bc[K]! + ex[k]! * x[k + 1]!;
  }
}

/**
 * Add the prolonged coarse correction and run one backward Gauss–Seidel sweep, in one
 * pass from the last row up: row j − 1 is corrected just before row j is swept (the
 * sweep of row j reads it).
 */
function prolongSmooth(C: MgLevel, xc: Float64Array, L: MgLevel, b: Float64Array, x: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  const W = C.w;
  const offc = C.off;
  const correct = (j: number): void => {
    const row = off + j * w;
    const rowC = offc + (j >> 1) * W;
    for (let k = row, i = 0; k < row + w; k++, i++) {
      if (invD[k] !== 0) x[k] = x[k]! + xc[rowC + (i >> 1)]!;
    }
  };
  correct(h - 1);
  for (let j = h - 1; j >= 0; j--) {
    if (j > 0) correct(j - 1);
    const row = off + j * w;
    for (let k = row + w - 1; k >= row; k--) {
      const inv = invD[k]!;
      if (inv === 0) continue;
      x[k] =
        (b[k]! + ex[k - 1]! * x[k - 1]! + ex[k]! * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv;
    }
  }
}

function coarsen(F: MgLevel, C: MgLevel): void {
  const { w, h, off } = F;
  const W = C.w;
  const offc = C.off;
  C.ex.fill(0);
  C.ey.fill(0);
  C.dg.fill(0);
  const fex = F.ex;
  const fey = F.ey;
  const fdg = F.dg;
  const cex = C.ex;
  const cey = C.ey;
  const cdg = C.dg;
  for (let j = 0; j < h; j++) {
    const rowF = off + j * w;
    const rowC = offc + (j >> 1) * W;
    const crossY = (j & 1) === 1 && j + 1 < h;
    for (let i = 0; i < w; i++) {
      const k = rowF + i;
      const K = rowC + (i >> 1);
      cdg[K] = cdg[K]! + fdg[k]!;
      if ((i & 1) === 1) cex[K] = cex[K]! + 0.5 * fex[k]!; // zero at i = w − 1 already
      if (crossY) cey[K] = cey[K]! + 0.5 * fey[k]!;
    }
  }
  finishDiagonal(C);
}

/** out = A z on one level. @internal */
export function applyLevel(L: MgLevel, z: Float64Array, out: Float64Array): void {
  const { ex, ey, d, off, w, h } = L;
  const end = off + w * h;
  for (let k = off; k < end; k++) {
    out[k] =
      d[k]! * z[k]! -
      ex[k - 1]! * z[k - 1]! -
      ex[k]! * z[k + 1]! -
      ey[k - w]! * z[k - w]! -
      ey[k]! * z[k + w]!;
  }
}

function gsForward(L: MgLevel, b: Float64Array, x: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  const end = off + w * h;
  for (let k = off; k < end; k++) {
    const inv = invD[k]!;
    if (inv === 0) continue;
    x[k] =
      (b[k]! + ex[k - 1]! * x[k - 1]! + ex[k]! * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv;
  }
}

function gsBackward(L: MgLevel, b: Float64Array, x: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  const end = off + w * h;
  for (let k = end - 1; k >= off; k--) {
    const inv = invD[k]!;
    if (inv === 0) continue;
    x[k] =
      (b[k]! + ex[k - 1]! * x[k - 1]! + ex[k]! * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv;
  }
}

function residual(L: MgLevel, b: Float64Array, x: Float64Array, r: Float64Array): void {
  const { ex, ey, d, off, w, h } = L;
  const end = off + w * h;
  for (let k = off; k < end; k++) {
    r[k] =
      b[k]! -
      (d[k]! * x[k]! - ex[k - 1]! * x[k - 1]! - ex[k]! * x[k + 1]! - ey[k - w]! * x[k - w]! - ey[k]! * x[k + w]!);
  }
}

function restrict(F: MgLevel, r: Float64Array, C: MgLevel, bc: Float64Array): void {
  const { w, h, off } = F;
  const W = C.w;
  const offc = C.off;
  bc.fill(0);
  for (let j = 0; j < h; j++) {
    const rowF = off + j * w;
    const rowC = offc + (j >> 1) * W;
    for (let i = 0; i < w; i++) {
      const K = rowC + (i >> 1);
      bc[K] = bc[K]! + r[rowF + i]!;
    }
  }
}

function prolongAdd(C: MgLevel, xc: Float64Array, F: MgLevel, x: Float64Array): void {
  const { w, h, off, invD } = F;
  const W = C.w;
  const offc = C.off;
  for (let j = 0; j < h; j++) {
    const rowF = off + j * w;
    const rowC = offc + (j >> 1) * W;
    for (let i = 0; i < w; i++) {
      const k = rowF + i;
      if (invD[k] !== 0) x[k] = x[k]! + xc[rowC + (i >> 1)]!;
    }
  }
}
