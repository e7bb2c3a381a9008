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
 * lexicographic Gauss–Seidel, two forward sweeps before and two backward sweeps after
 * the coarse correction (the adjoint order), so the V-cycle is a symmetric
 * preconditioner for conjugate gradients. The sweeps, the residual and the transfers of
 * a level run in one pass over its rows (a wavefront two rows deep). The coarsest level
 * (at most 3 × 3) is solved by symmetric Gauss–Seidel sweeps. Cost: O(N) a cycle.
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

  constructor(w: number, h: number, settings: MgSettings = { sweeps: 2, coarseSweeps: 20 }) {
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

  /** Apply level 0's operator, `out = A z`, and return `z · out` (padding excluded). */
  applyDot(z: Float64Array, out: Float64Array): number {
    return applyLevel(this.levels[0]!, z, out);
  }

  /**
   * One V-cycle from a zero guess: `x ≈ A⁻¹ b` on level 0. Returns `b · x` over the
   * grid (the padding of `b` and `x` is neither read nor written).
   */
  vcycle(b: Float64Array, x: Float64Array): number {
    return this.cycle(0, b, x);
  }

  private cycle(l: number, b: Float64Array, x: Float64Array): number {
    const L = this.levels[l]!;
    if (l === this.levels.length - 1) {
      clearGrid(L, x);
      for (let s = 0; s < this.settings.coarseSweeps; s++) gsForward(L, b, x);
      for (let s = 0; s < this.settings.coarseSweeps; s++) gsBackward(L, b, x);
      return gridDot(L, b, x);
    }
    const C = this.levels[l + 1]!;
    const nu = this.settings.sweeps;
    if (nu === 2) {
      presmoothRestrict2(L, b, x, C, C.b);
      this.cycle(l + 1, C.b, C.x);
      return prolongSmooth2(C, C.x, L, b, x);
    }
    clearGrid(L, x);
    for (let s = 0; s < nu; s++) gsForward(L, b, x);
    residual(L, b, x, L.r);
    restrict(L, L.r, C, C.b);
    this.cycle(l + 1, C.b, C.x);
    prolongAdd(C, C.x, L, x);
    for (let s = 0; s < nu; s++) gsBackward(L, b, x);
    return gridDot(L, b, x);
  }
}

function clearGrid(L: MgLevel, x: Float64Array): void {
  x.fill(0, L.off, L.off + L.w * L.h);
}

function gridDot(L: MgLevel, a: Float64Array, c: Float64Array): number {
  const end = L.off + L.w * L.h;
  let s = 0;
  for (let k = L.off; k < end; k++) s += a[k]! * c[k]!;
  return s;
}

/*
 * The Gauss–Seidel kernels below share three habits, all for speed in JavaScript engines:
 * the left (or, backward, right) neighbour's new value is carried in a local, so the
 * chain from one update to the next is one multiply and one add; a hole (invD = 0) is
 * not skipped but multiplied by zero, so it comes out 0 without a branch; and a row
 * starts with that carried neighbour at 0, which is exact because the edge weight
 * across a row end is zero.
 */

/**
 * Two forward Gauss–Seidel sweeps from x = 0, the residual and its restriction, in one
 * pass: step j sweeps row j for the first time, row j − 1 for the second time, and
 * restricts the residual of row j − 2, which is final by then. The first sweep reads no
 * neighbour ahead of it (they are still 0). The second stores its change δ in `L.r`;
 * after it, the residual at k is only the pull of the changes made ahead of k since k
 * was updated: `r_k = ex_k δ_{k+1} + ey_k δ_{k+w}`. Every entry of x on the grid is
 * written, so x needs no clearing.
 */
function presmoothRestrict2(L: MgLevel, b: Float64Array, x: Float64Array, C: MgLevel, bc: Float64Array): void {
  const ex = L.ex;
  const ey = L.ey;
  const invD = L.invD;
  const dl = L.r;
  const off = L.off;
  const w = L.w;
  const h = L.h;
  const W = C.w;
  const offc = C.off;
  bc.fill(0, offc, offc + W * C.h);
  for (let j = 0; j <= h + 1; j++) {
    if (j < h) {
      // first sweep of row j
      const row = off + j * w;
      const end = row + w;
      let xl = 0;
      let exl = 0;
      for (let k = row; k < end; k++) {
        const inv = invD[k]!;
        const exr = ex[k]!;
        const v = (b[k]! + ey[k - w]! * x[k - w]!) * inv + exl * inv * xl;
        x[k] = v;
        xl = v;
        exl = exr;
      }
    }
    if (j >= 1 && j <= h) {
      // second sweep of row j − 1
      const row = off + (j - 1) * w;
      const end = row + w;
      let xl = 0;
      let exl = 0;
      for (let k = row; k < end; k++) {
        const inv = invD[k]!;
        const exr = ex[k]!;
        const v = (b[k]! + exr * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv + exl * inv * xl;
        dl[k] = v - x[k]!;
        x[k] = v;
        xl = v;
        exl = exr;
      }
    }
    if (j >= 2) {
      // residual of row j − 2, summed over 2 × 2 blocks
      const m = j - 2;
      const row = off + m * w;
      let k = row;
      let K = offc + (m >> 1) * W;
      for (const end = row + w - 1; k < end; k += 2, K++) {
        const r0 = ex[k]! * dl[k + 1]! + ey[k]! * dl[k + w]!;
        const r1 = ex[k + 1]! * dl[k + 2]! + ey[k + 1]! * dl[k + 1 + w]!;
        bc[K] = bc[K]! + r0 + r1;
      }
      if (k < row + w) bc[K] = bc[K]! + ex[k]! * dl[k + 1]! + ey[k]! * dl[k + w]!;
    }
  }
}

/**
 * Add the prolonged coarse correction and run two backward Gauss–Seidel sweeps, in one
 * pass from the last row up: step j corrects row j − 1, sweeps row j for the first time
 * and row j + 1 for the second time. Returns `b · x` of the final x.
 */
function prolongSmooth2(C: MgLevel, xc: Float64Array, L: MgLevel, b: Float64Array, x: Float64Array): number {
  const ex = L.ex;
  const ey = L.ey;
  const invD = L.invD;
  const off = L.off;
  const w = L.w;
  const h = L.h;
  const W = C.w;
  const offc = C.off;
  let dot = 0;
  for (let j = h; j >= -1; j--) {
    if (j >= 1) {
      // coarse correction of row j − 1
      const m = j - 1;
      const row = off + m * w;
      let k = row;
      let K = offc + (m >> 1) * W;
      for (const end = row + w - 1; k < end; k += 2, K++) {
        const v = xc[K]!;
        x[k] = x[k]! + v;
        x[k + 1] = x[k + 1]! + v;
      }
      if (k < row + w) x[k] = x[k]! + xc[K]!;
    }
    // first backward sweep of row j, second of row j + 1 (whose b·x goes into the dot)
    if (j >= 0 && j < h) gsRowBackward(ex, ey, invD, b, x, off + j * w, w, 0);
    if (j + 1 < h) dot = gsRowBackward(ex, ey, invD, b, x, off + (j + 1) * w, w, dot);
  }
  return dot;
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

/** out = A z on one level; returns z · out (over the grid). @internal */
export function applyLevel(L: MgLevel, z: Float64Array, out: Float64Array): number {
  const ex = L.ex;
  const ey = L.ey;
  const d = L.d;
  const off = L.off;
  const w = L.w;
  const end = off + w * L.h;
  let dot = 0;
  let zl = z[off - 1]!;
  let z0 = z[off]!;
  let exl = ex[off - 1]!;
  for (let k = off; k < end; k++) {
    const zr = z[k + 1]!;
    const exr = ex[k]!;
    const v = d[k]! * z0 - (exl * zl + exr * zr) - (ey[k - w]! * z[k - w]! + ey[k]! * z[k + w]!);
    out[k] = v;
    dot += z0 * v;
    zl = z0;
    z0 = zr;
    exl = exr;
  }
  return dot;
}

function gsForward(L: MgLevel, b: Float64Array, x: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  for (let j = 0; j < h; j++) {
    const row = off + j * w;
    let xl = 0;
    let exl = 0;
    for (let k = row; k < row + w; k++) {
      const inv = invD[k]!;
      const exr = ex[k]!;
      const v = (b[k]! + exr * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv + exl * inv * xl;
      x[k] = v;
      xl = v;
      exl = exr;
    }
  }
}

function gsBackward(L: MgLevel, b: Float64Array, x: Float64Array): void {
  const { ex, ey, invD, off, w, h } = L;
  for (let j = h - 1; j >= 0; j--) gsRowBackward(ex, ey, invD, b, x, off + j * w, w, 0);
}

/**
 * One backward Gauss–Seidel sweep of the padded row starting at `row` (`w` samples, right
 * to left, the new value on the right carried in a register). Returns `dot` plus Σ b·x
 * over the row, added in order (the V-cycle's last sweep hands the total to the conjugate
 * gradients).
 */
function gsRowBackward(ex: Float64Array, ey: Float64Array, invD: Float64Array, b: Float64Array, x: Float64Array, row: number, w: number, dot: number): number {
  let xr = 0;
  let exr = 0;
  for (let k = row + w - 1; k >= row; k--) {
    const inv = invD[k]!;
    const exl = ex[k - 1]!;
    const bk = b[k]!;
    const v = (bk + exl * x[k - 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * inv + exr * inv * xr;
    x[k] = v;
    xr = v;
    exr = exl;
    dot += bk * v;
  }
  return dot;
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
  const { w, h, off } = F;
  const W = C.w;
  const offc = C.off;
  for (let j = 0; j < h; j++) {
    const rowF = off + j * w;
    const rowC = offc + (j >> 1) * W;
    for (let i = 0; i < w; i++) {
      const k = rowF + i;
      x[k] = x[k]! + xc[rowC + (i >> 1)]!;
    }
  }
}
