import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/index.js';
import { applyCholesky, applyStencil, createStencilMatrix, incompleteCholesky, type StencilMatrix } from '../../src/integrate/zonal-sparse.js';

/**
 * A random symmetric radius-`r` box stencil on a `w × h` grid, couplings only between nodes
 * of the grid, diagonally dominant (so positive definite and its incomplete factor exists).
 */
function randomStencil(w: number, h: number, radius: number, seed: number): StencilMatrix {
  const rng = createRng(seed);
  const A = createStencilMatrix(w, h, radius);
  const { size, center, di, dj, off, coef } = A;
  const n = w * h;
  for (let k = 0; k < n; k++) {
    const i = k % w, j = (k - i) / w;
    for (let o = 0; o < center; o++) {
      const ii = i + di[o]!, jj = j + dj[o]!;
      if (ii < 0 || ii >= w || jj < 0 || jj >= h) continue;
      const c = rng.uniform(-1, 1);
      const m = k + off[o]!;
      coef[k * size + o] = c;
      coef[m * size + (size - 1 - o)] = c; // the mirrored offset in row m
    }
  }
  for (let k = 0; k < n; k++) {
    let s = 0;
    for (let o = 0; o < size; o++) if (o !== center) s += Math.abs(coef[k * size + o]!);
    coef[k * size + center] = s + 0.5 + rng.random();
  }
  return A;
}

/** Dense `A v` from the box layout (the plain definition). */
function denseApply(A: StencilMatrix, v: Float64Array): Float64Array {
  const { width: w, height: h, size, di, dj, off, coef } = A;
  const out = new Float64Array(w * h);
  for (let k = 0; k < w * h; k++) {
    const i = k % w, j = (k - i) / w;
    for (let o = 0; o < size; o++) {
      const ii = i + di[o]!, jj = j + dj[o]!;
      if (ii < 0 || ii >= w || jj < 0 || jj >= h) continue;
      out[k]! += coef[k * size + o]! * v[k + off[o]!]!;
    }
  }
  return out;
}

/** `L Lᵀ z` for the factor's box layout (lower offsets and diagonal), by definition. */
function factorProduct(A: StencilMatrix, L: Float64Array, z: Float64Array): Float64Array {
  const { width: w, height: h, size, center, di, dj, off } = A;
  const n = w * h;
  const y = new Float64Array(n); // y = Lᵀ z: y_m = Σ_k L_km z_k
  for (let k = 0; k < n; k++) {
    const i = k % w, j = (k - i) / w;
    y[k]! += L[k * size + center]! * z[k]!;
    for (let o = 0; o < center; o++) {
      const ii = i + di[o]!, jj = j + dj[o]!;
      if (ii < 0 || ii >= w || jj < 0 || jj >= h) continue;
      y[k + off[o]!]! += L[k * size + o]! * z[k]!;
    }
  }
  const x = new Float64Array(n); // x = L y
  for (let k = 0; k < n; k++) {
    const i = k % w, j = (k - i) / w;
    let s = L[k * size + center]! * y[k]!;
    for (let o = 0; o < center; o++) {
      const ii = i + di[o]!, jj = j + dj[o]!;
      if (ii < 0 || ii >= w || jj < 0 || jj >= h) continue;
      s += L[k * size + o]! * y[k + off[o]!]!;
    }
    x[k] = s;
  }
  return x;
}

// The unrolled paths (radius 2, rows three or more from the edges, wrapped neighbours
// at the row ends) against the plain definitions of the products: linear algebra
// identities, no outside data needed.
describe('box-stencil kernels', () => {
  for (const [w, h, radius] of [[9, 12, 2], [5, 8, 2], [7, 6, 1], [4, 9, 2]] as const) {
    it(`applyStencil equals the dense product and returns v · Av (${w}×${h}, radius ${radius})`, () => {
      const A = randomStencil(w, h, radius, 11 + w);
      const rng = createRng(5);
      const v = new Float64Array(w * h).map(() => rng.uniform(-1, 1));
      const out = new Float64Array(w * h);
      const dot = applyStencil(A, v, out);
      const ref = denseApply(A, v);
      for (let k = 0; k < ref.length; k++) expect(out[k]).toBeCloseTo(ref[k]!, 12);
      let vo = 0;
      for (let k = 0; k < ref.length; k++) vo += v[k]! * out[k]!;
      expect(dot).toBe(vo); // v · Av, summed in index order
    });

    it(`applyCholesky solves L Lᵀ z = r for the incomplete factor (${w}×${h}, radius ${radius})`, () => {
      const A = randomStencil(w, h, radius, 3 + h);
      const F = incompleteCholesky(A);
      const rng = createRng(8);
      const r = new Float64Array(w * h).map(() => rng.uniform(-1, 1));
      const r0 = r.slice();
      const z = new Float64Array(w * h);
      applyCholesky(A, F, r, z);
      expect(r).toEqual(r0); // the right-hand side is not modified
      const back = factorProduct(A, F.L, z);
      for (let k = 0; k < r.length; k++) expect(back[k]).toBeCloseTo(r[k]!, 11);
      for (let k = 0; k < r.length; k++) expect(F.rdiag[k]).toBe(1 / F.L[k * A.size + A.center]!);
    });
  }
});
