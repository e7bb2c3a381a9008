import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/index.js';
import { Multigrid, type MgLevel } from '../../src/integrate/multigrid.js';

/** A random weighted 5-point operator with holes (zero edges) and a little extra diagonal. */
function randomHierarchy(w: number, h: number, seed: number): Multigrid {
  const rng = createRng(seed);
  const mg = new Multigrid(w, h);
  const F = mg.fine;
  const valid = new Uint8Array(w * h).map(() => (rng.random() < 0.1 ? 0 : 1));
  for (let j = 0; j < h; j++) {
    for (let i = 0; i < w; i++) {
      const s = j * w + i;
      const k = F.off + s;
      if (!valid[s]) continue;
      if (i + 1 < w && valid[s + 1]) F.ex[k] = 0.5 + rng.random();
      if (j + 1 < h && valid[s + w]) F.ey[k] = 0.5 + rng.random();
      if (rng.random() < 0.02) F.dg[k] = rng.random();
    }
  }
  mg.rebuild();
  return mg;
}

function randomVector(L: MgLevel, seed: number): Float64Array {
  const rng = createRng(seed);
  const v = new Float64Array(L.len);
  for (let k = L.off; k < L.off + L.w * L.h; k++) v[k] = L.invD[k] === 0 ? 0 : rng.random() - 0.5;
  return v;
}

const dot = (a: Float64Array, b: Float64Array) => a.reduce((s, v, k) => s + v * b[k]!, 0);

/** Textbook V-cycle (Briggs, Henson & McCormick 2000, ch. 3): two forward sweeps, residual, sum-restriction, recursion, copy-prolongation, two backward sweeps. */
function referenceCycle(mg: Multigrid, l: number, b: Float64Array, x: Float64Array): void {
  const L = mg.levels[l]!;
  const { ex, ey, invD, d, off, w, h } = L;
  const sweep = (forward: boolean) => {
    for (let t = 0; t < w * h; t++) {
      const k = forward ? off + t : off + w * h - 1 - t;
      if (invD[k] === 0) continue;
      x[k] = (b[k]! + ex[k - 1]! * x[k - 1]! + ex[k]! * x[k + 1]! + ey[k - w]! * x[k - w]! + ey[k]! * x[k + w]!) * invD[k]!;
    }
  };
  x.fill(0);
  const last = l === mg.levels.length - 1;
  const nu = last ? mg.settings.coarseSweeps : mg.settings.sweeps;
  for (let s = 0; s < nu; s++) sweep(true);
  if (!last) {
    const C = mg.levels[l + 1]!;
    const bc = new Float64Array(C.len);
    const xc = new Float64Array(C.len);
    for (let j = 0; j < h; j++) {
      for (let i = 0; i < w; i++) {
        const k = off + j * w + i;
        const r = b[k]! - (d[k]! * x[k]! - ex[k - 1]! * x[k - 1]! - ex[k]! * x[k + 1]! - ey[k - w]! * x[k - w]! - ey[k]! * x[k + w]!);
        const K = C.off + (j >> 1) * C.w + (i >> 1);
        bc[K] = bc[K]! + r;
      }
    }
    referenceCycle(mg, l + 1, bc, xc);
    for (let j = 0; j < h; j++) {
      for (let i = 0; i < w; i++) {
        const k = off + j * w + i;
        if (invD[k] !== 0) x[k] = x[k]! + xc[C.off + (j >> 1) * C.w + (i >> 1)]!;
      }
    }
  }
  for (let s = 0; s < nu; s++) sweep(false);
}

describe('multigrid V-cycle (preconditioner of the least-squares integrator)', () => {
  const shapes: Array<[number, number]> = [[17, 13], [32, 32], [1, 9], [9, 1], [5, 2]];

  it('matches a textbook V-cycle with two Gauss–Seidel sweeps (Briggs, Henson & McCormick 2000)', () => {
    for (const [w, h] of shapes) {
      const mg = randomHierarchy(w, h, w * 31 + h);
      const b = randomVector(mg.fine, 5);
      const x = new Float64Array(mg.fine.len);
      const ref = new Float64Array(mg.fine.len);
      const bx = mg.vcycle(b, x);
      referenceCycle(mg, 0, b, ref);
      const scale = Math.max(...ref.map(Math.abs));
      for (let k = 0; k < ref.length; k++) expect(Math.abs(x[k]! - ref[k]!)).toBeLessThan(1e-12 * scale);
      expect(bx).toBeCloseTo(dot(b, x), 12);
    }
  });

  it('is symmetric and positive, as conjugate gradients need (Hestenes & Stiefel 1952: M must be SPD)', () => {
    for (const [w, h] of shapes) {
      const mg = randomHierarchy(w, h, w * 7 + h);
      const a = randomVector(mg.fine, 1);
      const c = randomVector(mg.fine, 2);
      const Ma = new Float64Array(mg.fine.len);
      const Mc = new Float64Array(mg.fine.len);
      mg.vcycle(a, Ma);
      mg.vcycle(c, Mc);
      const lhs = dot(c, Ma);
      const rhs = dot(a, Mc);
      expect(Math.abs(lhs - rhs)).toBeLessThan(1e-12 * Math.sqrt(dot(a, Ma) * dot(c, Mc)));
      expect(dot(a, Ma)).toBeGreaterThan(0);
    }
  });
});
