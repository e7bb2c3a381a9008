/**
 * Sparse symmetric matrices whose couplings stay within a small box of offsets on a
 * grid (the normal equations of the zonal and scattered integrators), with an
 * incomplete-Cholesky preconditioner and a PCG driver that keeps the iterates out of the
 * matrix's null space (constant heights on each coupled piece). Internal.
 *
 * @module
 * @internal
 */
import { pcg, type PcgResult } from './pcg.js';
import type { ProgressCallback } from './types.js';

/**
 * A symmetric `n × n` matrix, `n = width × height`, whose row `k` (node `(i, j)`) couples
 * only to nodes `(i + di, j + dj)` with `|di|, |dj| ≤ radius`. Coefficient of offset `o`
 * in row `k` is `coef[k * size + o]`, offsets in row-major order of `(dj, di)`, so the
 * offsets `o < center` are exactly the columns before `k` in the natural node order.
 *
 * @internal
 */
export interface StencilMatrix {
  readonly width: number;
  readonly height: number;
  readonly radius: number;
  /** Box side `2·radius + 1`. */
  readonly side: number;
  /** Offsets a row: `side²`. */
  readonly size: number;
  /** Index of the diagonal offset. */
  readonly center: number;
  readonly coef: Float64Array;
  readonly di: Int32Array;
  readonly dj: Int32Array;
  /** Linear index offset `dj·width + di` of each offset. */
  readonly off: Int32Array;
}

/** @internal */
export function createStencilMatrix(width: number, height: number, radius: number): StencilMatrix {
  const side = 2 * radius + 1;
  const size = side * side;
  const di = new Int32Array(size);
  const dj = new Int32Array(size);
  const off = new Int32Array(size);
  for (let o = 0; o < size; o++) {
    di[o] = (o % side) - radius;
    dj[o] = Math.floor(o / side) - radius;
    off[o] = dj[o]! * width + di[o]!;
  }
  return {
    width,
    height,
    radius,
    side,
    size,
    center: radius * side + radius,
    coef: new Float64Array(width * height * size),
    di,
    dj,
    off,
  };
}

/** Scratch of {@link addEquation} for equations of up to 16 nodes. */
const EQ_KEYS = new Int32Array(16);

/**
 * Add `w · c cᵀ` for one least-squares equation `Σ_t c_t h[nodes_t] ≈ s` (and `w c s`
 * to `rhs`). Nodes must lie within the box of each other.
 *
 * @internal
 */
export function addEquation(
  A: StencilMatrix,
  rhs: Float64Array,
  nodes: Int32Array,
  c: Float64Array,
  count: number,
  w: number,
  s: number,
): void {
  const { width, side, size, radius, coef } = A;
  // Each node's box key j·side + i, once: the slot of node b in row a is then
  // key(b) − key(a) + centre, with no division in the double loop.
  const key = count <= EQ_KEYS.length ? EQ_KEYS : new Int32Array(count);
  for (let t = 0; t < count; t++) {
    const a = nodes[t]!;
    const i = a % width;
    key[t] = ((a - i) / width) * side + i;
  }
  const centre = radius * side + radius;
  for (let t = 0; t < count; t++) {
    const a = nodes[t]!;
    const wc = w * c[t]!;
    rhs[a]! += wc * s;
    const base = a * size + centre - key[t]!;
    for (let u = 0; u < count; u++) coef[base + key[u]!]! += wc * c[u]!;
  }
}

/**
 * `out = A v`, returning `v · out` (summed in index order, as a separate pass would).
 * Interior rows skip the bounds checks. @internal
 */
export function applyStencil(A: StencilMatrix, v: Float64Array, out: Float64Array): number {
  const { width, height, size, coef, di, dj, off, radius } = A;
  const fast = radius === 2 && width >= 5;
  let dot = 0;
  for (let j = 0; j < height; j++) {
    const inner = j >= radius && j < height - radius;
    if (fast && j > 2 && j < height - 3) {
      dot = stencilRow5(coef, v, out, width, j, dot);
      continue;
    }
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      const base = k * size;
      let s = 0;
      if (inner && i >= radius && i < width - radius) {
        for (let o = 0; o < size; o++) s += coef[base + o]! * v[k + off[o]!]!;
      } else {
        for (let o = 0; o < size; o++) {
          const c = coef[base + o]!;
          if (c === 0) continue;
          const ii = i + di[o]!;
          const jj = j + dj[o]!;
          if (ii < 0 || ii >= width || jj < 0 || jj >= height) continue;
          s += c * v[k + off[o]!]!;
        }
      }
      out[k] = s;
      dot += v[k]! * s;
    }
  }
  return dot;
}

/**
 * An incomplete Cholesky factor `L` in the box layout of its matrix (lower offsets and
 * diagonal), with the reciprocals of its diagonal and, for radius 2, its lower part
 * transposed (row `k` holds the entries of column `k` below the diagonal, in the order of
 * the offsets `o < 12`: the entry of row `k − off[o]`).
 *
 * @internal
 */
export interface CholeskyFactor {
  readonly L: Float64Array;
  readonly rdiag: Float64Array;
  readonly lt: Float64Array | null;
}

/**
 * Diagonal shifts `α` tried in turn by `incompleteCholesky`: the factor is of
 * `A + α·diag(A)`. The last is large enough for the thin-plate and gradient stencils to be
 * diagonally dominant (an H-matrix, whose incomplete factor exists).
 */
const IC_SHIFTS = [0, 1e-3, 1e-2, 0.05, 0.2, 1, 4];

/**
 * Incomplete Cholesky factor `L` (lower offsets and diagonal of the box pattern, returned
 * as a {@link CholeskyFactor}) with `A + α·diag(A) ≈ L Lᵀ`, for the smallest shift `α` in
 * `IC_SHIFTS` at which the factorisation does not break down. Rows with a zero diagonal
 * (unused nodes) get `L_kk = 1`. A pivot in `[0, 1e-6 · A_kk)` (the last node of each
 * singular piece, zero up to rounding) is replaced by `A_kk`, which keeps the
 * preconditioner positive definite.
 *
 * Breakdown: for matrices that are not M-matrices (the thin-plate penalty of the
 * scattered integrator over a region without data, whose 13-point biharmonic stencil has
 * positive off-diagonals) the unshifted incomplete factor can meet a negative pivot, and
 * the entries of the following rows then grow without bound (to overflow and NaN). A
 * pivot below `−1e-6 · A_kk`, or a non-finite entry, rejects the factor and the next
 * shift is tried; with every shift failing, the diagonal (Jacobi) factor is returned.
 *
 * @see Meijerink, J. A. & van der Vorst, H. A. (1977), "An iterative solution method for
 *   linear systems of which the coefficient matrix is a symmetric M-matrix", Mathematics
 *   of Computation 31(137), 148–162.
 * @see Manteuffel, T. A. (1980), "An incomplete factorization technique for positive
 *   definite linear systems", Mathematics of Computation 34(150), 473–497 (the diagonal
 *   shift that restores the factor's existence).
 * @internal
 */
export function incompleteCholesky(A: StencilMatrix): CholeskyFactor {
  const L = new Float64Array(A.coef.length);
  const pairs = icPairs(A);
  let ok = false;
  for (const shift of IC_SHIFTS) {
    if (icFactor(A, pairs, 1 + shift, L)) {
      ok = true;
      break;
    }
    L.fill(0);
  }
  const { size, center, coef } = A;
  const n = A.width * A.height;
  if (!ok) {
    for (let k = 0; k < n; k++) {
      const akk = coef[k * size + center]!;
      L[k * size + center] = akk > 0 ? Math.sqrt(akk) : 1;
    }
  }
  const rdiag = new Float64Array(n);
  for (let k = 0; k < n; k++) rdiag[k] = 1 / L[k * size + center]!;
  // Radius 2: the factor's columns as rows (lt[12k + o] = L[k − off[o]][o], the entry that
  // row k − off[o] > k has for column k), so the backward sweep reads them in order.
  let lt: Float64Array | null = null;
  if (A.radius === 2) {
    lt = new Float64Array(12 * n);
    const { off } = A;
    for (let k = 0; k < n; k++) {
      for (let o = 0; o < 12; o++) {
        const m = k - off[o]!;
        if (m < n) lt[12 * k + o] = L[m * 25 + o]!;
      }
    }
  }
  return { L, rdiag, lt };
}

/**
 * For each lower offset o, the pairs (o1, o2) with o1 < o lower and d(o1) − d(o) = d(o2)
 * inside the box: L_ik −= L_i,m · L_k,m for m = i + d(o1) = k + d(o2).
 */
function icPairs(A: StencilMatrix): number[][] {
  const { center, di, dj, side, radius } = A;
  const pairs: number[][] = [];
  for (let o = 0; o < center; o++) {
    const list: number[] = [];
    for (let o1 = 0; o1 < o; o1++) {
      const ddi = di[o1]! - di[o]!;
      const ddj = dj[o1]! - dj[o]!;
      if (Math.abs(ddi) > radius || Math.abs(ddj) > radius) continue;
      const o2 = (ddj + radius) * side + (ddi + radius);
      if (o2 >= center) continue;
      list.push(o1, o2);
    }
    pairs.push(list);
  }
  return pairs;
}

/**
 * One incomplete factorisation of `A` with its diagonal scaled by `diagScale` (≥ 1),
 * into `L` (zeroed). Returns `false` on breakdown (see `incompleteCholesky`).
 */
function icFactor(A: StencilMatrix, pairs: readonly number[][], diagScale: number, L: Float64Array): boolean {
  const { width, height, size, center, coef, di, dj, off, radius } = A;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      const base = k * size;
      const akk = coef[base + center]!;
      if (!(akk > 0)) {
        L[base + center] = 1;
        continue;
      }
      const dkk = diagScale * akk;
      let diag = dkk;
      // every lower offset of a node `radius` or more from the left, right and top edges
      // lies in the grid: no bounds tests there
      const inner = i >= radius && i < width - radius && j >= radius;
      for (let o = 0; o < center; o++) {
        if (!inner) {
          const ii = i + di[o]!;
          const jj = j + dj[o]!;
          if (ii < 0 || ii >= width || jj < 0 || jj >= height) continue;
        }
        const c = k + off[o]!;
        const cbase = c * size;
        let s = coef[base + o]!;
        const list = pairs[o]!;
        if (inner) {
          for (let t = 0; t < list.length; t += 2) s -= L[base + list[t]!]! * L[cbase + list[t + 1]!]!;
        } else {
          for (let t = 0; t < list.length; t += 2) {
            const o1 = list[t]!;
            const i1 = i + di[o1]!;
            const j1 = j + dj[o1]!;
            if (i1 < 0 || i1 >= width || j1 < 0 || j1 >= height) continue;
            s -= L[base + o1]! * L[cbase + list[t + 1]!]!;
          }
        }
        if (s === 0) continue;
        const l = s / L[cbase + center]!;
        L[base + o] = l;
        diag -= l * l;
      }
      if (!(diag >= -1e-6 * dkk) || !Number.isFinite(diag)) return false;
      L[base + center] = Math.sqrt(diag >= 1e-6 * dkk ? diag : dkk);
    }
  }
  return true;
}

/**
 * One row `j` (at least 3 rows from the top and bottom) of `out = A v` for a radius-2
 * stencil, unrolled. Columns near the left and right edges read wrapped neighbours of the
 * adjacent rows, whose coefficients are zero (equations only couple nodes of the grid),
 * so they need no bounds tests; `v` must be finite. Adds `v_k · out_k` of the row, in
 * order, to `dot` and returns it.
 */
function stencilRow5(coef: Float64Array, v: Float64Array, out: Float64Array, w: number, j: number, dot: number): number {
  const w2 = 2 * w;
  let k = j * w;
  const end = k + w;
  // the 5 × 5 window of v, slid one column a node: five loads a node instead of 25
  let a0 = v[k - w2 - 2]!, a1 = v[k - w2 - 1]!, a2 = v[k - w2]!, a3 = v[k - w2 + 1]!;
  let b0 = v[k - w - 2]!, b1 = v[k - w - 1]!, b2 = v[k - w]!, b3 = v[k - w + 1]!;
  let c0 = v[k - 2]!, c1 = v[k - 1]!, c2 = v[k]!, c3 = v[k + 1]!;
  let d0 = v[k + w - 2]!, d1 = v[k + w - 1]!, d2 = v[k + w]!, d3 = v[k + w + 1]!;
  let e0 = v[k + w2 - 2]!, e1 = v[k + w2 - 1]!, e2 = v[k + w2]!, e3 = v[k + w2 + 1]!;
  for (; k < end; k++) {
    const b = k * 25, q = k + 2;
    const a4 = v[q - w2]!, b4 = v[q - w]!, c4 = v[q]!, d4 = v[q + w]!, e4 = v[q + w2]!;
    const s =
      coef[b]! * a0 + coef[b + 1]! * a1 + coef[b + 2]! * a2 + coef[b + 3]! * a3 + coef[b + 4]! * a4 +
      (coef[b + 5]! * b0 + coef[b + 6]! * b1 + coef[b + 7]! * b2 + coef[b + 8]! * b3 + coef[b + 9]! * b4) +
      (coef[b + 10]! * c0 + coef[b + 11]! * c1 + coef[b + 12]! * c2 + coef[b + 13]! * c3 + coef[b + 14]! * c4) +
      (coef[b + 15]! * d0 + coef[b + 16]! * d1 + coef[b + 17]! * d2 + coef[b + 18]! * d3 + coef[b + 19]! * d4) +
      (coef[b + 20]! * e0 + coef[b + 21]! * e1 + coef[b + 22]! * e2 + coef[b + 23]! * e3 + coef[b + 24]! * e4);
    out[k] = s;
    dot += c2 * s;
    a0 = a1; a1 = a2; a2 = a3; a3 = a4;
    b0 = b1; b1 = b2; b2 = b3; b3 = b4;
    c0 = c1; c1 = c2; c2 = c3; c3 = c4;
    d0 = d1; d1 = d2; d2 = d3; d3 = d4;
    e0 = e1; e1 = e2; e2 = e3; e3 = e4;
  }
  return dot;
}

/**
 * `z = (L Lᵀ)⁻¹ r`: the forward sweep `L y = r`, then the backward sweep `Lᵀ z = y`, both
 * row by row (each entry gathered from entries already final, in place), multiplying by
 * the diagonal's reciprocals. For radius 2, rows 3 or more from the top and bottom are
 * unrolled (the factor's entries for neighbours outside the grid are zero, so wrapped
 * neighbours need no bounds tests; `r` must be finite), with the term of the neighbour
 * just before (after) last, which keeps the sweep's dependency chain to one product. @internal
 */
export function applyCholesky(A: StencilMatrix, F: CholeskyFactor, r: Float64Array, z: Float64Array): void {
  const { width, height, size, center, di, dj, off, radius } = A;
  const { L, rdiag: rd, lt } = F;
  const fast = radius === 2 && width >= 5 && lt !== null;
  const w = width, w2 = 2 * width;
  // forward: L y = r (y stored in z)
  for (let j = 0; j < height; j++) {
    if (fast && j > 2 && j < height - 3) {
      // the final entries of the two rows above and the two just before, slid along the row
      let k = j * w;
      const end = k + w;
      let a0 = z[k - w2 - 2]!, a1 = z[k - w2 - 1]!, a2 = z[k - w2]!, a3 = z[k - w2 + 1]!;
      let b0 = z[k - w - 2]!, b1 = z[k - w - 1]!, b2 = z[k - w]!, b3 = z[k - w + 1]!;
      let c0 = z[k - 2]!, c1 = z[k - 1]!;
      for (; k < end; k++) {
        const b = k * 25, q = k + 2;
        const a4 = z[q - w2]!, b4 = z[q - w]!;
        const s =
          r[k]! -
          (L[b]! * a0 + L[b + 1]! * a1 + L[b + 2]! * a2 + L[b + 3]! * a3 + L[b + 4]! * a4) -
          (L[b + 5]! * b0 + L[b + 6]! * b1 + L[b + 7]! * b2 + L[b + 8]! * b3 + L[b + 9]! * b4) -
          L[b + 10]! * c0;
        const zk = (s - L[b + 11]! * c1) * rd[k]!;
        z[k] = zk;
        a0 = a1; a1 = a2; a2 = a3; a3 = a4;
        b0 = b1; b1 = b2; b2 = b3; b3 = b4;
        c0 = c1; c1 = zk;
      }
      continue;
    }
    const inner = j >= radius && j < height - radius;
    for (let i = 0; i < width; i++) {
      const k = j * width + i;
      const base = k * size;
      let s = r[k]!;
      if (inner && i >= radius && i < width - radius) {
        for (let o = 0; o < center; o++) s -= L[base + o]! * z[k + off[o]!]!;
      } else {
        for (let o = 0; o < center; o++) {
          const l = L[base + o]!;
          if (l === 0) continue;
          const ii = i + di[o]!;
          const jj = j + dj[o]!;
          if (ii < 0 || ii >= width || jj < 0 || jj >= height) continue;
          s -= l * z[k + off[o]!]!;
        }
      }
      z[k] = s * rd[k]!;
    }
  }
  // backward: Lᵀ x = y, x_k = (y_k − Σ_m L_mk x_m) / L_kk over the later rows m = k − off[o]
  // that couple to k, in place
  for (let j = height - 1; j >= 0; j--) {
    if (fast && j > 2 && j < height - 3) {
      // the final entries of the two rows below and the two just after, slid along the row
      let k = j * w + w - 1;
      const end = j * w;
      let a0 = z[k + w2 + 2]!, a1 = z[k + w2 + 1]!, a2 = z[k + w2]!, a3 = z[k + w2 - 1]!;
      let b0 = z[k + w + 2]!, b1 = z[k + w + 1]!, b2 = z[k + w]!, b3 = z[k + w - 1]!;
      let c0 = z[k + 2]!, c1 = z[k + 1]!;
      for (; k >= end; k--) {
        const c = 12 * k, q = k - 2;
        const a4 = z[q + w2]!, b4 = z[q + w]!;
        const s =
          z[k]! -
          (lt[c]! * a0 + lt[c + 1]! * a1 + lt[c + 2]! * a2 + lt[c + 3]! * a3 + lt[c + 4]! * a4) -
          (lt[c + 5]! * b0 + lt[c + 6]! * b1 + lt[c + 7]! * b2 + lt[c + 8]! * b3 + lt[c + 9]! * b4) -
          lt[c + 10]! * c0;
        const xk = (s - lt[c + 11]! * c1) * rd[k]!;
        z[k] = xk;
        a0 = a1; a1 = a2; a2 = a3; a3 = a4;
        b0 = b1; b1 = b2; b2 = b3; b3 = b4;
        c0 = c1; c1 = xk;
      }
      continue;
    }
    for (let i = width - 1; i >= 0; i--) {
      const k = j * width + i;
      let s = z[k]!;
      for (let o = 0; o < center; o++) {
        const ii = i - di[o]!;
        const jj = j - dj[o]!;
        if (ii < 0 || ii >= width || jj < 0 || jj >= height) continue;
        const m = k - off[o]!;
        const l = L[m * size + o]!;
        if (l !== 0) s -= l * z[m]!;
      }
      z[k] = s * rd[k]!;
    }
  }
}

/**
 * Connected components of the nodes with a positive diagonal, joined where an
 * off-diagonal coefficient is non-zero (or by a caller-given union). Labels are 1-based
 * in scan order of each component's first node; 0 marks unused nodes.
 *
 * @internal
 */
export function stencilComponents(A: StencilMatrix): { labels: Int32Array; count: number } {
  const { width, height, size, center, coef, di, dj, off } = A;
  const n = width * height;
  const labels = new Int32Array(n);
  const stack = new Int32Array(n);
  let count = 0;
  for (let s = 0; s < n; s++) {
    if (labels[s] !== 0 || !(coef[s * size + center]! > 0)) continue;
    count++;
    let top = 0;
    stack[top++] = s;
    labels[s] = count;
    while (top > 0) {
      const k = stack[--top]!;
      const i = k % width;
      const j = (k - i) / width;
      const base = k * size;
      for (let o = 0; o < size; o++) {
        if (o === center || coef[base + o] === 0) continue;
        const ii = i + di[o]!;
        const jj = j + dj[o]!;
        if (ii < 0 || ii >= width || jj < 0 || jj >= height) continue;
        const m = k + off[o]!;
        if (labels[m] === 0) {
          labels[m] = count;
          stack[top++] = m;
        }
      }
    }
  }
  return { labels, count };
}

/** The mean of the entries of `v` labelled 1 (0 when there are none). */
function labelOneMean(v: Float64Array, labels: Int32Array): number {
  let sum = 0, cnt = 0;
  for (let k = 0; k < v.length; k++) {
    if (labels[k] === 1) {
      sum += v[k]!;
      cnt++;
    }
  }
  return cnt > 0 ? sum / cnt : 0;
}

/** Subtract the mean of each label's entries (label 0 entries are zeroed). @internal */
export function removeLabelMeans(v: Float64Array, labels: Int32Array, count: number, sums: Float64Array, counts: Float64Array): void {
  const n = v.length;
  if (count === 1) {
    // One piece (the common case): the sums stay in registers.
    const mean = labelOneMean(v, labels);
    for (let k = 0; k < n; k++) v[k] = labels[k] === 0 ? 0 : v[k]! - mean;
    return;
  }
  sums.fill(0);
  counts.fill(0);
  for (let k = 0; k < n; k++) {
    const l = labels[k]!;
    sums[l]! += v[k]!;
    counts[l]! += 1;
  }
  for (let l = 1; l <= count; l++) if (counts[l]! > 0) sums[l] = sums[l]! / counts[l]!;
  for (let k = 0; k < n; k++) {
    const l = labels[k]!;
    v[k] = l === 0 ? 0 : v[k]! - sums[l]!;
  }
}

/**
 * {@link removeLabelMeans} on `z`, returning `r · z` afterwards (in index order): for one
 * label the subtraction and the product share a pass.
 */
function projectDot(z: Float64Array, r: Float64Array, labels: Int32Array, count: number, sums: Float64Array, counts: Float64Array): number {
  const n = z.length;
  let rz = 0;
  if (count === 1) {
    const mean = labelOneMean(z, labels);
    for (let k = 0; k < n; k++) {
      const v = labels[k] === 0 ? 0 : z[k]! - mean;
      z[k] = v;
      rz += r[k]! * v;
    }
    return rz;
  }
  removeLabelMeans(z, labels, count, sums, counts);
  for (let k = 0; k < n; k++) rz += r[k]! * z[k]!;
  return rz;
}

/** @internal */
export interface StencilSolveOptions {
  tolerance: number;
  maxIterations: number;
  onProgress?: ProgressCallback | undefined;
}

/**
 * Solve the consistent, symmetric positive semi-definite system `A x = b` whose null
 * space is spanned by the indicator vectors of `labels` (constant on each piece). PCG
 * with an incomplete-Cholesky preconditioner whose output is projected onto the
 * complement of the null space, so that from `x = 0` the iterates converge to the
 * minimum-norm solution (zero mean on every label). An `initial` guess (copied, not
 * changed) only shortens the iterations: the null-space part it adds is removed at the end.
 *
 * @see Kaasschieter, E. F. (1988), "Preconditioned conjugate gradients for solving
 *   singular systems", J. Computational and Applied Mathematics 24, 265–275.
 * @internal
 */
export function solveStencil(
  A: StencilMatrix,
  b: Float64Array,
  labels: Int32Array,
  count: number,
  opts: StencilSolveOptions,
  initial?: Float64Array,
): { x: Float64Array; result: PcgResult } {
  const n = b.length;
  const sums = new Float64Array(count + 1);
  const counts = new Float64Array(count + 1);
  // b is orthogonal to the null space in exact arithmetic; remove rounding residue
  const bb = b.slice();
  removeLabelMeans(bb, labels, count, sums, counts);
  const F = incompleteCholesky(A);
  const x = initial === undefined ? new Float64Array(n) : initial.slice();
  const product = (v: Float64Array, out: Float64Array): number => applyStencil(A, v, out);
  const result = pcg(
    product,
    bb,
    x,
    (r, z) => {
      applyCholesky(A, F, r, z);
      return projectDot(z, r, labels, count, sums, counts);
    },
    { ...opts, applyADot: product },
  );
  removeLabelMeans(x, labels, count, sums, counts);
  return { x, result };
}
