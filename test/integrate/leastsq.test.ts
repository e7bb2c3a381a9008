import { describe, expect, it } from 'vitest';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { createGrid, createRng, type Grid, type Mask } from '../../src/core/index.js';
import {
  integrateDctPoisson,
  integrateLeastSquares,
  prepareLeastSquares,
  type KnownHeight,
} from '../../src/integrate/index.js';
import { discMask, gaussian, maxDiffUpToPiston, peaks, relErrorUpToPiston, sample } from './fixtures.js';

interface DenseTerms {
  weights?: Float64Array;
  known?: KnownHeight[];
  prior?: Float64Array;
  priorWeight?: number;
  smoothness?: number;
}

/**
 * The documented least-squares model written out as a dense matrix and solved by the
 * minimum-norm SVD least-squares solution of ml-matrix (a general-purpose reference
 * library); the minimum-norm solution has zero mean on every unanchored piece, the
 * integrator's piston convention.
 */
function denseReference(p: Grid, q: Grid, mask: Mask, t: DenseTerms): Float64Array {
  const { width: w, height: h, dx, dy } = p;
  const idx = new Int32Array(w * h).fill(-1);
  let nv = 0;
  for (let k = 0; k < w * h; k++) if (mask[k]) idx[k] = nv++;
  const rows: number[][] = [];
  const rhs: number[] = [];
  const W = (k: number) => (t.weights ? t.weights[k]! : 1);
  const addRow = (coef: Array<[number, number]>, b: number, weight: number) => {
    const r = new Array<number>(nv).fill(0);
    const s = Math.sqrt(weight);
    for (const [k, c] of coef) r[idx[k]!] = r[idx[k]!]! + s * c;
    rows.push(r);
    rhs.push(s * b);
  };
  for (let j = 0; j < h; j++) {
    for (let i = 0; i < w; i++) {
      const k = j * w + i;
      if (!mask[k]) continue;
      if (i + 1 < w && mask[k + 1]) {
        const a = W(k);
        const c = W(k + 1);
        if (a + c > 0) addRow([[k, -1 / dx], [k + 1, 1 / dx]], (a * p.data[k]! + c * p.data[k + 1]!) / (a + c), (a + c) / 2);
      }
      if (j + 1 < h && mask[k + w]) {
        const a = W(k);
        const c = W(k + w);
        if (a + c > 0) addRow([[k, -1 / dy], [k + w, 1 / dy]], (a * q.data[k]! + c * q.data[k + w]!) / (a + c), (a + c) / 2);
      }
      if (t.smoothness) {
        if (i + 2 < w && mask[k + 1] && mask[k + 2]) {
          addRow([[k, 1 / dx ** 2], [k + 1, -2 / dx ** 2], [k + 2, 1 / dx ** 2]], 0, t.smoothness);
        }
        if (j + 2 < h && mask[k + w] && mask[k + 2 * w]) {
          addRow([[k, 1 / dy ** 2], [k + w, -2 / dy ** 2], [k + 2 * w, 1 / dy ** 2]], 0, t.smoothness);
        }
      }
      if (t.priorWeight) addRow([[k, 1]], t.prior ? t.prior[k]! : 0, t.priorWeight);
    }
  }
  for (const kh of t.known ?? []) addRow([[kh.j * w + kh.i, 1]], kh.height, kh.weight!);
  const A = new Matrix(rows);
  const b = Matrix.columnVector(rhs);
  const z = new SingularValueDecomposition(A, { autoTranspose: true }).solve(b);
  const out = new Float64Array(w * h);
  for (let k = 0; k < w * h; k++) if (idx[k]! >= 0) out[k] = z.get(idx[k]!, 0);
  return out;
}

function relDiff(a: Float64Array, b: Float64Array): number {
  let e = 0;
  let s = 0;
  for (let k = 0; k < a.length; k++) {
    e += (a[k]! - b[k]!) ** 2;
    s += b[k]! ** 2;
  }
  return Math.sqrt(e / s);
}

/** Small noisy test problem with a ragged mask holding two pieces and holes. */
function smallProblem(seed: number, w = 9, h = 7, dx = 0.1, dy = 0.13) {
  const rng = createRng(seed);
  const s = sample(peaks, w, h, dx, dy, -0.4, -0.3);
  for (let k = 0; k < w * h; k++) {
    s.p.data[k] = s.p.data[k]! + rng.normal(0, 0.3);
    s.q.data[k] = s.q.data[k]! + rng.normal(0, 0.3);
  }
  const mask = new Uint8Array(w * h).fill(1);
  for (let j = 0; j < h; j++) mask[j * w + 4] = 0; // a full column gap: two pieces
  mask[1 * w + 1] = 0;
  mask[5 * w + 6] = 0; // holes
  mask[0] = 0;
  mask[w * h - 1] = 0; // ragged corners
  const weights = createGrid(s.p, new Float64Array(w * h).map(() => rng.uniform(0, 2)));
  weights.data[2 * w + 2] = 0; // a distrusted sample
  for (let k = 0; k < w * h; k++) if (!mask[k]) {
    s.p.data[k] = NaN;
    s.q.data[k] = NaN;
  }
  return { ...s, mask, weights };
}

describe('integrateLeastSquares against a dense least-squares solution (ml-matrix SVD)', () => {
  it('holes, two pieces, weights: agrees to 1e-8 relative', () => {
    const c = smallProblem(1);
    const r = integrateLeastSquares(c.p, c.q, { mask: c.mask, weights: c.weights, tolerance: 1e-13 });
    const ref = denseReference(c.p, c.q, c.mask, { weights: c.weights.data });
    expect(relDiff(r.height.data, ref)).toBeLessThan(1e-8);
    expect(r.converged).toBe(true);
    expect(r.pieces.length).toBe(2);
    expect(r.pieces.reduce((a, pc) => a + pc.samples, 0)).toBe(c.mask.reduce((a, v) => a + v, 0));
  });

  it('with known heights, a prior and smoothness: agrees to 1e-8 relative', () => {
    const c = smallProblem(2);
    const known: KnownHeight[] = [
      { i: 1, j: 3, height: 0.5, weight: 40 },
      { i: 7, j: 2, height: -0.2 },
    ];
    const prior = new Float64Array(c.p.data.length).map((_, k) => 0.1 * Math.sin(k));
    const opts = {
      mask: c.mask,
      weights: c.weights,
      knownHeights: known,
      prior: createGrid(c.p, prior),
      priorWeight: 0.3,
      smoothness: 2e-4,
      tolerance: 1e-13,
      maxIterations: 2000,
    };
    const r = integrateLeastSquares(c.p, c.q, opts);
    const ref = denseReference(c.p, c.q, c.mask, {
      weights: c.weights.data,
      known: known.map((k) => ({ ...k, weight: k.weight ?? 1000 / (c.p.dx * c.p.dy) })),
      prior,
      priorWeight: 0.3,
      smoothness: 2e-4,
    });
    expect(relDiff(r.height.data, ref)).toBeLessThan(1e-8);
    expect(r.pieces.every((pc) => pc.piston === 0)).toBe(true); // the prior anchors every piece
  });

  it('smoothness alone (no prior): agrees to 1e-8 relative', () => {
    const c = smallProblem(3, 8, 8, 0.2, 0.2);
    const r = integrateLeastSquares(c.p, c.q, { mask: c.mask, smoothness: 0.01, tolerance: 1e-13, maxIterations: 5000 });
    const ref = denseReference(c.p, c.q, c.mask, { smoothness: 0.01 });
    expect(relDiff(r.height.data, ref)).toBeLessThan(1e-8);
  });
});

describe('integrateLeastSquares', () => {
  it('on a full rectangle equals the DCT solution of the same model (Simchony, Chellappa & Shao 1990)', () => {
    const s = sample(peaks, 40, 28, 0.15, 0.2, -3, -2.8);
    const a = integrateLeastSquares(s.p, s.q, { tolerance: 1e-13 });
    const b = integrateDctPoisson(s.p, s.q);
    expect(relDiff(a.height.data, b.height.data)).toBeLessThan(1e-9);
    expect(a.rmsResidual).toBeCloseTo(b.rmsResidual, 12);
  });

  it('every piece gets its own zero-mean piston; the pistons are reported', () => {
    const w = 40;
    const h = 20;
    const s = sample(gaussian(1, 1, 0.5, 0.4), w, h, 0.05);
    const mask = new Uint8Array(w * h).fill(1);
    for (let j = 0; j < h; j++) mask[j * w + 19] = 0;
    const r = integrateLeastSquares(s.p, s.q, { mask });
    expect(r.pieces.length).toBe(2);
    for (const pc of r.pieces) {
      let sum = 0;
      for (let k = 0; k < w * h; k++) if (r.labels[k] === pc.label) sum += r.height.data[k]!;
      expect(Math.abs(sum / pc.samples)).toBeLessThan(1e-14);
    }
    expect(r.pieces.map((pc) => pc.samples)).toEqual([380, 400]); // columns 0–18 and 20–39
    // each piece is the true surface up to its own constant
    for (const label of [1, 2]) {
      const m = Uint8Array.from(r.labels, (l) => (l === label ? 1 : 0));
      // second-order error of the pair model on this grid: (dx/σ)² ≈ 0.016 of a unit bump, well under that
      expect(maxDiffUpToPiston(r.height.data, s.h.data, m)).toBeLessThan(5e-3);
    }
    expect(r.height.data[19]).toBe(0);
    expect(r.mask[19]).toBe(0);
  });

  it('known heights fix the level of their piece (a gauge), the other piece keeps zero mean', () => {
    const w = 24;
    const h = 12;
    const surf = gaussian(0.05, 0.6, 0.5, 0.3);
    const s = sample(surf, w, h, 0.05);
    const mask = new Uint8Array(w * h).fill(1);
    for (let j = 0; j < h; j++) mask[j * w + 12] = 0;
    const gauge = { i: 3, j: 6, height: s.h.data[6 * w + 3]! + 0.2 }; // level offset by 0.2 m
    const r = integrateLeastSquares(s.p, s.q, { mask, knownHeights: [gauge] });
    const left = r.pieces.find((pc) => pc.label === r.labels[6 * w + 3])!;
    expect(left.piston).toBe(0);
    expect(r.height.data[6 * w + 3]).toBeCloseTo(gauge.height, 4);
    // left piece follows the true surface + 0.2 absolutely
    for (let j = 0; j < h; j++) for (let i = 0; i < 12; i++) {
      expect(r.height.data[j * w + i]! - s.h.data[j * w + i]!).toBeCloseTo(0.2, 3);
    }
    const right = r.pieces.find((pc) => pc.label === r.labels[6 * w + 20])!;
    expect(right.piston).not.toBe(0);
  });

  it('a strong prior pulls the heights onto it; a weak one barely moves them', () => {
    const s = sample(peaks, 16, 16, 0.3, 0.3, -2.4, -2.4);
    const prior = createGrid(s.p, s.h.data.map((v) => v + 1));
    const strong = integrateLeastSquares(s.p, s.q, { prior, priorWeight: 1e6 });
    for (let k = 0; k < 256; k++) expect(strong.height.data[k]).toBeCloseTo(prior.data[k]!, 3);
    const weak = integrateLeastSquares(s.p, s.q, { prior, priorWeight: 1e-9 });
    const free = integrateLeastSquares(s.p, s.q);
    expect(maxDiffUpToPiston(weak.height.data, free.height.data)).toBeLessThan(1e-6);
  });

  it('multigrid-preconditioned CG needs about the same iterations at every size (linear cost)', () => {
    const its: number[] = [];
    for (const n of [32, 64, 128, 256]) {
      const s = sample(peaks, n, n, 6 / (n - 1), 6 / (n - 1), -3, -3);
      const mask = discMask(n, n, 0.45 * n, { ci: 0.3 * n, cj: 0.6 * n, r: 0.08 * n });
      const r = integrateLeastSquares(s.p, s.q, { mask });
      expect(r.converged).toBe(true);
      its.push(r.iterations);
    }
    expect(Math.max(...its)).toBeLessThanOrEqual(Math.min(...its) + 8);
    expect(Math.max(...its)).toBeLessThan(40);
  });

  it('reports progress every iteration and stops when the callback returns false', () => {
    const s = sample(peaks, 64, 64, 0.1, 0.1, -3, -3);
    const seen: number[] = [];
    const r = integrateLeastSquares(s.p, s.q, {
      onProgress: (it, rel) => {
        seen.push(it);
        expect(rel).toBeGreaterThan(0);
        return it < 3;
      },
    });
    expect(seen).toEqual([1, 2, 3]);
    expect(r.iterations).toBe(3);
    expect(r.converged).toBe(false);
    expect(r.relativeResidual).toBeGreaterThan(1e-8);
  });

  it('an iteration cap that is too small gives converged: false, not an error', () => {
    const s = sample(peaks, 64, 64, 0.1, 0.1, -3, -3);
    const r = integrateLeastSquares(s.p, s.q, { maxIterations: 2 });
    expect(r.converged).toBe(false);
    expect(r.iterations).toBe(2);
    expect(r.height.data.every(Number.isFinite)).toBe(true);
  });
});

describe('prepareLeastSquares', () => {
  const n = 48;
  const mask = discMask(n, n, 22, { ci: 30, cj: 20, r: 5 });
  const a = sample(peaks, n, n, 0.12, 0.12, -2.8, -2.8);
  const b = sample(gaussian(1, 0, 0, 1), n, n, 0.12, 0.12, -2.8, -2.8);

  it('gives the same heights as the one-shot solver, frame after frame', () => {
    const solver = prepareLeastSquares(a.p, { mask });
    for (const f of [a, b, a]) {
      const one = integrateLeastSquares(f.p, f.q, { mask });
      const prep = solver.solve(f.p, f.q);
      expect(prep.iterations).toBe(one.iterations);
      for (let k = 0; k < n * n; k++) expect(prep.height.data[k]).toBeCloseTo(one.height.data[k]!, 13);
    }
  });

  it('warm start from the previous frame saves iterations on a similar frame', () => {
    const cold = prepareLeastSquares(a.p, { mask });
    const warm = prepareLeastSquares(a.p, { mask, warmStart: true });
    const next = sample(
      { h: (x, y) => peaks.h(x + 0.01, y), p: (x, y) => peaks.p(x + 0.01, y), q: (x, y) => peaks.q(x + 0.01, y) },
      n,
      n,
      0.12,
      0.12,
      -2.8,
      -2.8,
    );
    warm.solve(a.p, a.q);
    const rc = cold.solve(next.p, next.q);
    const rw = warm.solve(next.p, next.q);
    expect(rw.iterations).toBeLessThan(rc.iterations);
    expect(relErrorUpToPiston(rw.height.data, rc.height.data, mask)).toBeLessThan(1e-7);
  });

  it('per-frame known heights may move; the solver rebuilds and honours them', () => {
    const solver = prepareLeastSquares(a.p, { mask, knownHeights: [{ i: 24, j: 24, height: 1 }] });
    const r1 = solver.solve(a.p, a.q);
    expect(r1.height.data[24 * n + 24]).toBeCloseTo(1, 3);
    const r2 = solver.solve(a.p, a.q, { knownHeights: [{ i: 10, j: 24, height: -1 }] });
    expect(r2.height.data[24 * n + 10]).toBeCloseTo(-1, 3);
  });
});
