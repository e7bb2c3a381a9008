/**
 * Dense linear least squares for the modal fits: normal equations with column
 * equilibration, a Cholesky factor with a rank check, and one step of iterative
 * refinement on the original rows (which recovers most of the accuracy the normal
 * equations lose). Rows are produced on the fly, so memory is O(cols²). Internal.
 *
 * @module
 * @internal
 */

/** @internal */
export interface ModalLsqResult {
  /** The solution, `cols` long. */
  x: Float64Array;
  /** Smallest pivot of the equilibrated normal matrix (1 = orthogonal columns). */
  minPivot: number;
}

/**
 * Solve `min Σ_r (a_r · x − b_r)²`. `row(r, a)` fills row `r`'s coefficients into `a`
 * and returns `b_r`. Returns null when the equilibrated normal matrix has a pivot below
 * `rankTolerance` (the modes are not all determined by the rows).
 *
 * @see Björck, Å. (1996), Numerical Methods for Least Squares Problems, SIAM, §2.2
 *   (normal equations, scaling) and §2.9 (iterative refinement).
 * @internal
 */
export function solveModalLsq(
  rows: number,
  cols: number,
  row: (r: number, a: Float64Array) => number,
  rankTolerance = 1e-11,
): ModalLsqResult | null {
  const N = new Float64Array(cols * cols);
  const rhs = new Float64Array(cols);
  const a = new Float64Array(cols);
  for (let r = 0; r < rows; r++) {
    const b = row(r, a);
    for (let i = 0; i < cols; i++) {
      const ai = a[i]!;
      if (ai === 0) continue;
      rhs[i]! += ai * b;
      const base = i * cols;
      for (let k = i; k < cols; k++) N[base + k]! += ai * a[k]!;
    }
  }
  const scale = new Float64Array(cols);
  for (let i = 0; i < cols; i++) {
    const d = N[i * cols + i]!;
    if (!(d > 0)) return null;
    scale[i] = 1 / Math.sqrt(d);
  }
  // equilibrate and factor (upper triangle holds N; write the Cholesky factor R, N = RᵀR)
  const R = new Float64Array(cols * cols);
  for (let i = 0; i < cols; i++) for (let k = i; k < cols; k++) R[i * cols + k] = N[i * cols + k]! * scale[i]! * scale[k]!;
  let minPivot = Infinity;
  for (let i = 0; i < cols; i++) {
    let d = R[i * cols + i]!;
    for (let t = 0; t < i; t++) d -= R[t * cols + i]! * R[t * cols + i]!;
    if (d < minPivot) minPivot = d;
    if (!(d > rankTolerance)) return null;
    const rii = Math.sqrt(d);
    R[i * cols + i] = rii;
    for (let k = i + 1; k < cols; k++) {
      let s = R[i * cols + k]!;
      for (let t = 0; t < i; t++) s -= R[t * cols + i]! * R[t * cols + k]!;
      R[i * cols + k] = s / rii;
    }
  }
  const solve = (g: Float64Array): Float64Array => {
    // (S N S) y = S g, x = S y
    const y = new Float64Array(cols);
    for (let i = 0; i < cols; i++) {
      let s = g[i]! * scale[i]!;
      for (let t = 0; t < i; t++) s -= R[t * cols + i]! * y[t]!;
      y[i] = s / R[i * cols + i]!;
    }
    for (let i = cols - 1; i >= 0; i--) {
      let s = y[i]!;
      for (let k = i + 1; k < cols; k++) s -= R[i * cols + k]! * y[k]!;
      y[i] = s / R[i * cols + i]!;
    }
    for (let i = 0; i < cols; i++) y[i] = y[i]! * scale[i]!;
    return y;
  };
  const x = solve(rhs);
  // one refinement step: x += (AᵀA)⁻¹ Aᵀ (b − A x)
  const g = new Float64Array(cols);
  for (let r = 0; r < rows; r++) {
    const b = row(r, a);
    let res = b;
    for (let i = 0; i < cols; i++) res -= a[i]! * x[i]!;
    for (let i = 0; i < cols; i++) g[i]! += a[i]! * res;
  }
  const dx = solve(g);
  for (let i = 0; i < cols; i++) x[i]! += dx[i]!;
  return { x, minPivot };
}
