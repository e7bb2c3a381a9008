/**
 * Preconditioned conjugate gradients for symmetric positive (semi-)definite systems,
 * matrix-free. Internal building block of the least-squares integrators.
 *
 * @module
 * @internal
 */
import type { ProgressCallback } from './types.js';

/** @internal */
export interface PcgOptions {
  /** Stop when ‖r‖ ≤ tolerance · ‖b‖. */
  tolerance: number;
  /** Iteration cap. */
  maxIterations: number;
  /** Called every iteration; return false to stop. */
  onProgress?: ProgressCallback | undefined;
  /**
   * Optional work vectors (each at least `b.length` long) reused across calls, so a
   * prepared solver allocates nothing per frame. Allocated per call when absent.
   */
  workspace?: PcgWorkspace | undefined;
  /**
   * Optional fused form of `applyA`: writes `A v` into `out` and returns `v · out`,
   * saving the separate pass for the dot product.
   */
  applyADot?: ((v: Float64Array, out: Float64Array) => number) | undefined;
}

/** Reusable PCG work vectors. @internal */
export interface PcgWorkspace {
  r: Float64Array;
  z: Float64Array;
  p: Float64Array;
  q: Float64Array;
}

/**
 * Allocate a {@link PcgWorkspace} for systems of `n` unknowns.
 *
 * @internal
 */
export function createPcgWorkspace(n: number): PcgWorkspace {
  return { r: new Float64Array(n), z: new Float64Array(n), p: new Float64Array(n), q: new Float64Array(n) };
}

/** @internal */
export interface PcgResult {
  iterations: number;
  relativeResidual: number;
  converged: boolean;
}

/**
 * Solve `A x = b` by PCG. `x` holds the initial guess and receives the solution.
 * `applyA(v, out)` writes `A v` into `out`; `applyM(r, z)` writes the preconditioned
 * residual `M⁻¹ r` into `z` (identity when null) and may return `r · z` to spare the
 * solver that dot product. Work buffers are allocated once.
 *
 * @see Hestenes, M. R. & Stiefel, E. (1952), "Methods of conjugate gradients for solving
 *   linear systems", J. Res. Nat. Bur. Standards 49(6), 409–436.
 * @internal
 */
export function pcg(
  applyA: (v: Float64Array, out: Float64Array) => void,
  b: Float64Array,
  x: Float64Array,
  applyM: ((r: Float64Array, z: Float64Array) => number | void) | null,
  opts: PcgOptions,
): PcgResult {
  const n = b.length;
  const ws = opts.workspace;
  const ok = ws !== undefined && ws.r.length >= n && ws.z.length >= n && ws.p.length >= n && ws.q.length >= n;
  const r = ok ? ws.r.subarray(0, n) : new Float64Array(n);
  const z = ok ? ws.z.subarray(0, n) : new Float64Array(n);
  const p = ok ? ws.p.subarray(0, n) : new Float64Array(n);
  const q = ok ? ws.q.subarray(0, n) : new Float64Array(n);
  if (ok) {
    // the operator and preconditioner may leave entries they do not own untouched
    q.fill(0);
    z.fill(0);
  }
  let bb = 0;
  for (let i = 0; i < n; i++) bb += b[i]! * b[i]!;
  const bnorm = Math.sqrt(bb);
  if (bnorm === 0) {
    x.fill(0);
    return { iterations: 0, relativeResidual: 0, converged: true };
  }
  // x = 0 (the usual cold start) needs no product: r = b
  let zeroStart = true;
  for (let i = 0; i < n; i++) {
    if (x[i] !== 0) {
      zeroStart = false;
      break;
    }
  }
  let rr = 0;
  if (zeroStart) {
    r.set(b);
    rr = bb;
  } else {
    applyA(x, q);
    for (let i = 0; i < n; i++) {
      const v = b[i]! - q[i]!;
      r[i] = v;
      rr += v * v;
    }
  }
  let rel = Math.sqrt(rr) / bnorm;
  if (rel <= opts.tolerance) return { iterations: 0, relativeResidual: rel, converged: true };
  const precondition = (): number => {
    if (!applyM) {
      z.set(r);
      return rr;
    }
    const got = applyM(r, z);
    if (typeof got === 'number') return got;
    let s = 0;
    for (let i = 0; i < n; i++) s += r[i]! * z[i]!;
    return s;
  };
  const fused = opts.applyADot;
  let rz = precondition();
  p.set(z);
  let it = 0;
  while (it < opts.maxIterations) {
    let pq = 0;
    if (fused) pq = fused(p, q);
    else {
      applyA(p, q);
      for (let i = 0; i < n; i++) pq += p[i]! * q[i]!;
    }
    if (!(pq > 0)) break; // breakdown: A not positive definite along p (or exact solve)
    const alpha = rz / pq;
    rr = 0;
    for (let i = 0; i < n; i++) {
      x[i]! += alpha * p[i]!;
      const v = r[i]! - alpha * q[i]!;
      r[i] = v;
      rr += v * v;
    }
    it++;
    rel = Math.sqrt(rr) / bnorm;
    if (opts.onProgress && opts.onProgress(it, rel) === false) break;
    if (rel <= opts.tolerance) return { iterations: it, relativeResidual: rel, converged: true };
    const rzNew = precondition();
    const beta = rzNew / rz;
    rz = rzNew;
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
  }
  return { iterations: it, relativeResidual: rel, converged: rel <= opts.tolerance };
}
