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
 * residual `M⁻¹ r` into `z` (identity when null). Work buffers are allocated once.
 *
 * @see Hestenes, M. R. & Stiefel, E. (1952), "Methods of conjugate gradients for solving
 *   linear systems", J. Res. Nat. Bur. Standards 49(6), 409–436.
 * @internal
 */
export function pcg(
  applyA: (v: Float64Array, out: Float64Array) => void,
  b: Float64Array,
  x: Float64Array,
  applyM: ((r: Float64Array, z: Float64Array) => void) | null,
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
  let bnorm = 0;
  for (let i = 0; i < n; i++) bnorm += b[i]! * b[i]!;
  bnorm = Math.sqrt(bnorm);
  if (bnorm === 0) {
    x.fill(0);
    return { iterations: 0, relativeResidual: 0, converged: true };
  }
  applyA(x, q);
  let rr = 0;
  for (let i = 0; i < n; i++) {
    const v = b[i]! - q[i]!;
    r[i] = v;
    rr += v * v;
  }
  let rel = Math.sqrt(rr) / bnorm;
  if (rel <= opts.tolerance) return { iterations: 0, relativeResidual: rel, converged: true };
  if (applyM) applyM(r, z);
  else z.set(r);
  let rz = 0;
  for (let i = 0; i < n; i++) rz += r[i]! * z[i]!;
  p.set(z);
  let it = 0;
  while (it < opts.maxIterations) {
    applyA(p, q);
    let pq = 0;
    for (let i = 0; i < n; i++) pq += p[i]! * q[i]!;
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
    if (applyM) applyM(r, z);
    else z.set(r);
    let rzNew = 0;
    for (let i = 0; i < n; i++) rzNew += r[i]! * z[i]!;
    const beta = rzNew / rz;
    rz = rzNew;
    for (let i = 0; i < n; i++) p[i] = z[i]! + beta * p[i]!;
  }
  return { iterations: it, relativeResidual: rel, converged: rel <= opts.tolerance };
}
