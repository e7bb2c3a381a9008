import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Matrix, pseudoInverse } from 'ml-matrix';
import { createGrid, createRng, gridFromFunction, MeniscusRangeError, MeniscusTypeError, type Grid } from '../../src/core/index.js';
import { integrateFried, integrateHudgin, integrateSouthwell } from '../../src/integrate/zonal.js';

// ---------------------------------------------------------------------------------------
// Analytic test surfaces with exact gradients (analytic derivatives, checked below by
// central differences). `peaks` is the classic test function of numerical-software
// demonstrations (common practice).
interface Surface {
  name: string;
  f: (x: number, y: number) => number;
  fx: (x: number, y: number) => number;
  fy: (x: number, y: number) => number;
  /** square domain [lo, hi]² */
  lo: number;
  hi: number;
}
const gauss = (x: number, y: number): number => Math.exp(-((x - 0.1) ** 2 + (y + 0.05) ** 2) / 0.08);
const surfaces: Surface[] = [
  {
    name: 'Gaussian bump',
    f: gauss,
    fx: (x, y) => ((-2 * (x - 0.1)) / 0.08) * gauss(x, y),
    fy: (x, y) => ((-2 * (y + 0.05)) / 0.08) * gauss(x, y),
    lo: -0.5,
    hi: 0.5,
  },
  {
    name: 'separable sinusoid',
    f: (x, y) => Math.sin(3 * x) * Math.cos(2 * y),
    fx: (x, y) => 3 * Math.cos(3 * x) * Math.cos(2 * y),
    fy: (x, y) => -2 * Math.sin(3 * x) * Math.sin(2 * y),
    lo: -1,
    hi: 1,
  },
  {
    name: 'peaks',
    f: (x, y) =>
      3 * (1 - x) ** 2 * Math.exp(-(x ** 2) - (y + 1) ** 2) -
      10 * (x / 5 - x ** 3 - y ** 5) * Math.exp(-(x ** 2) - y ** 2) -
      Math.exp(-((x + 1) ** 2) - y ** 2) / 3,
    fx: (x, y) =>
      3 * Math.exp(-(x ** 2) - (y + 1) ** 2) * (-2 * (1 - x) - 2 * x * (1 - x) ** 2) -
      10 * Math.exp(-(x ** 2) - y ** 2) * (1 / 5 - 3 * x ** 2 - 2 * x * (x / 5 - x ** 3 - y ** 5)) +
      ((2 * (x + 1)) / 3) * Math.exp(-((x + 1) ** 2) - y ** 2),
    fy: (x, y) =>
      3 * (1 - x) ** 2 * Math.exp(-(x ** 2) - (y + 1) ** 2) * (-2 * (y + 1)) -
      10 * Math.exp(-(x ** 2) - y ** 2) * (-5 * y ** 4 - 2 * y * (x / 5 - x ** 3 - y ** 5)) +
      ((2 * y) / 3) * Math.exp(-((x + 1) ** 2) - y ** 2),
    lo: -3,
    hi: 3,
  },
];

/** RMS of (truth − estimate) over the mask after removing the mean difference (piston). */
function rmsError(h: Grid, mask: Uint8Array, f: (x: number, y: number) => number): number {
  let mean = 0;
  let n = 0;
  for (let j = 0; j < h.height; j++)
    for (let i = 0; i < h.width; i++) {
      const k = j * h.width + i;
      if (!mask[k]) continue;
      mean += f(h.x0 + i * h.dx, h.y0 + j * h.dy) - h.data[k]!;
      n++;
    }
  mean /= n;
  let s = 0;
  for (let j = 0; j < h.height; j++)
    for (let i = 0; i < h.width; i++) {
      const k = j * h.width + i;
      if (!mask[k]) continue;
      const e = f(h.x0 + i * h.dx, h.y0 + j * h.dy) - h.data[k]! - mean;
      s += e * e;
    }
  return Math.sqrt(s / n);
}

type Method = 'southwell' | 'fried' | 'hudgin';
/** Sample the slopes where each geometry measures them and reconstruct. */
function reconstruct(method: Method, s: Surface, N: number, tolerance = 1e-10) {
  const d = (s.hi - s.lo) / (N - 1);
  const spec = { width: N, height: N, dx: d, x0: s.lo, y0: s.lo };
  if (method === 'southwell') {
    return integrateSouthwell(gridFromFunction(spec, s.fx), gridFromFunction(spec, s.fy), { tolerance });
  }
  if (method === 'hudgin') {
    // p[i,j] at the midpoint of the link to the right, q[i,j] of the link below
    return integrateHudgin(
      gridFromFunction(spec, (x, y) => s.fx(x + d / 2, y)),
      gridFromFunction(spec, (x, y) => s.fy(x, y + d / 2)),
      { tolerance },
    );
  }
  // Fried: N−1 subapertures a side, slopes at their centres, heights on the N-corner grid
  const sub = { width: N - 1, height: N - 1, dx: d, x0: s.lo + d / 2, y0: s.lo + d / 2 };
  return integrateFried(gridFromFunction(sub, s.fx), gridFromFunction(sub, s.fy), { tolerance });
}

describe('analytic surfaces', () => {
  it('the test gradients match central differences of the test surfaces (self-check)', () => {
    for (const s of surfaces) {
      for (const [x, y] of [
        [0.13, -0.27],
        [-0.4, 0.31],
      ] as const) {
        const e = 1e-6;
        expect(s.fx(x, y)).toBeCloseTo((s.f(x + e, y) - s.f(x - e, y)) / (2 * e), 6);
        expect(s.fy(x, y)).toBeCloseTo((s.f(x, y + e) - s.f(x, y - e)) / (2 * e), 6);
      }
    }
  });

  for (const method of ['southwell', 'fried', 'hudgin'] as const) {
    it(`${method}: a tilted plane is recovered to rounding (analytic: the difference model is exact for planes)`, () => {
      const plane: Surface = { name: 'plane', f: (x, y) => 0.02 * x - 0.035 * y, fx: () => 0.02, fy: () => -0.035, lo: 0, hi: 0.1 };
      const r = reconstruct(method, plane, 17, 1e-15);
      expect(rmsError(r.height, r.mask, plane.f)).toBeLessThan(1e-15);
      expect(r.rmsResidual).toBeLessThan(1e-14);
    });

    for (const s of surfaces) {
      it(`${method}: ${s.name} error falls at second order under refinement (Southwell 1980; Fried 1977; Hudgin 1977: central-difference models)`, () => {
        const sizes = s.name === 'peaks' ? [33, 65, 129] : [17, 33, 65];
        const errs = sizes.map((N) => {
          const r = reconstruct(method, s, N);
          expect(r.converged).toBe(true);
          return rmsError(r.height, r.mask, s.f);
        });
        // observed order between successive halvings of the spacing (d ratio = 2 exactly)
        const o1 = Math.log2(errs[0]! / errs[1]!);
        const o2 = Math.log2(errs[1]! / errs[2]!);
        expect(o1).toBeGreaterThan(1.8);
        expect(o1).toBeLessThan(2.25);
        expect(o2).toBeGreaterThan(1.9);
        expect(o2).toBeLessThan(2.15);
        // and the finest error is small against the surface's range
        expect(errs[2]!).toBeLessThan(2e-3 * (s.name === 'peaks' ? 8 : 1));
      });
    }
  }

  it('fried: heights on the corner grid, shifted by half a cell; one waffle mode on a rectangle', () => {
    const spec = { width: 6, height: 4, dx: 0.01, dy: 0.02, x0: 1, y0: 2 };
    const r = integrateFried(gridFromFunction(spec, () => 0.01), gridFromFunction(spec, () => 0.02));
    expect(r.height.width).toBe(7);
    expect(r.height.height).toBe(5);
    expect(r.height.x0).toBeCloseTo(0.995, 15);
    expect(r.height.y0).toBeCloseTo(1.99, 15);
    expect(r.waffleModes).toBe(1);
  });
});

// ---------------------------------------------------------------------------------------
// Dense reference: the same least-squares equations, written as a dense matrix and solved
// by ml-matrix's SVD pseudo-inverse (a general-purpose reference library). The minimum-norm
// solution has zero mean on every piece (and, for Fried, on every diagonal sub-lattice),
// which is exactly the convention of the iterative solvers.
function holeyMask(w: number, h: number, seed: number, holes: number): Uint8Array {
  const m = new Uint8Array(w * h).fill(1);
  const rng = createRng(seed);
  for (let t = 0; t < holes; t++) m[rng.integer(w * h)] = 0;
  return m;
}
function denseSolve(rows: number[][], rhs: number[], n: number): Float64Array {
  const A = new Matrix(rows.length, n);
  rows.forEach((r, i) => r.forEach((v, j) => A.set(i, j, v)));
  const x = pseudoInverse(A).mmul(Matrix.columnVector(rhs));
  return Float64Array.from(x.getColumn(0));
}
function randomGrid(w: number, h: number, seed: number, spec: { dx: number; dy: number }): Grid {
  const g = createGrid({ width: w, height: h, ...spec });
  createRng(seed).fillNormal(g.data);
  return g;
}
function relDiff(a: Float64Array, b: Float64Array, mask: Uint8Array): number {
  let num = 0;
  let den = 0;
  for (let k = 0; k < a.length; k++) {
    if (!mask[k]) continue;
    num += (a[k]! - b[k]!) ** 2;
    den += b[k]! ** 2;
  }
  return Math.sqrt(num / den);
}

describe('agreement with a dense least-squares solve (ml-matrix)', () => {
  const W = 9;
  const H = 8;
  const geo = { dx: 0.5, dy: 0.7 };
  const p = randomGrid(W, H, 1, geo);
  const q = randomGrid(W, H, 2, geo);
  const weights = createGrid({ width: W, height: H, ...geo });
  createRng(3).fillUniform(weights.data, 0.2, 2);
  const mask = holeyMask(W, H, 4, 14);
  // cut the grid so that it has two pieces
  for (let j = 0; j < H; j++) mask[j * W + 6] = 0;

  it('southwell, with holes, two pieces and weights: 1e-8 relative', () => {
    const r = integrateSouthwell(p, q, { mask, weights, tolerance: 1e-14, maxIterations: 5000 });
    const rows: number[][] = [];
    const rhs: number[] = [];
    const w = weights.data;
    for (let j = 0; j < H; j++)
      for (let i = 0; i < W; i++) {
        const a = j * W + i;
        if (!mask[a]) continue;
        for (const [b, d, s] of [
          [i + 1 < W ? a + 1 : -1, geo.dx, p.data],
          [j + 1 < H ? a + W : -1, geo.dy, q.data],
        ] as const) {
          if (b < 0 || !mask[b]) continue;
          const sw = Math.sqrt((2 * w[a]! * w[b]!) / (w[a]! + w[b]!));
          const row = new Array(W * H).fill(0);
          row[a] = -sw / d;
          row[b] = sw / d;
          rows.push(row);
          rhs.push((sw * (s[a]! + s[b]!)) / 2);
        }
      }
    const ref = denseSolve(rows, rhs, W * H);
    expect(r.converged).toBe(true);
    expect(r.pieces!.length).toBeGreaterThanOrEqual(2);
    expect(relDiff(r.height.data, ref, r.mask)).toBeLessThan(1e-8);
  });

  it('hudgin, with holes and weights: 1e-8 relative', () => {
    const r = integrateHudgin(p, q, { mask, weights, tolerance: 1e-14, maxIterations: 5000 });
    const rows: number[][] = [];
    const rhs: number[] = [];
    for (let j = 0; j < H; j++)
      for (let i = 0; i < W; i++) {
        const a = j * W + i;
        if (!mask[a]) continue;
        for (const [b, d, s] of [
          [i + 1 < W ? a + 1 : -1, geo.dx, p.data],
          [j + 1 < H ? a + W : -1, geo.dy, q.data],
        ] as const) {
          if (b < 0 || !mask[b]) continue;
          const sw = Math.sqrt(weights.data[a]!);
          const row = new Array(W * H).fill(0);
          row[a] = -sw / d;
          row[b] = sw / d;
          rows.push(row);
          rhs.push(sw * s[a]!);
        }
      }
    const ref = denseSolve(rows, rhs, W * H);
    expect(relDiff(r.height.data, ref, r.mask)).toBeLessThan(1e-8);
  });

  for (const g of [geo, { dx: 0.5, dy: 0.5 }]) {
    it(`fried, with holes and weights (dx ${g.dx}, dy ${g.dy}): 1e-8 relative to the minimum-norm dense solution`, () => {
      const pp = randomGrid(W, H, 5, g);
      const qq = randomGrid(W, H, 6, g);
      const ww = createGrid({ width: W, height: H, ...g }, weights.data);
      const r = integrateFried(pp, qq, { mask, weights: ww, tolerance: 1e-14, maxIterations: 5000 });
      const cw = W + 1;
      const n = cw * (H + 1);
      const rows: number[][] = [];
      const rhs: number[] = [];
      for (let j = 0; j < H; j++)
        for (let i = 0; i < W; i++) {
          const a = j * W + i;
          if (!mask[a]) continue;
          const sw = Math.sqrt(ww.data[a]!);
          const c = j * cw + i;
          const rp = new Array(n).fill(0);
          const rq = new Array(n).fill(0);
          rp[c] = -sw / (2 * g.dx);
          rp[c + 1] = sw / (2 * g.dx);
          rp[c + cw] = -sw / (2 * g.dx);
          rp[c + cw + 1] = sw / (2 * g.dx);
          rq[c] = -sw / (2 * g.dy);
          rq[c + 1] = -sw / (2 * g.dy);
          rq[c + cw] = sw / (2 * g.dy);
          rq[c + cw + 1] = sw / (2 * g.dy);
          rows.push(rp, rq);
          rhs.push(sw * pp.data[a]!, sw * qq.data[a]!);
        }
      const ref = denseSolve(rows, rhs, n);
      expect(r.converged).toBe(true);
      expect(r.waffleModes).toBeGreaterThanOrEqual(1);
      expect(relDiff(r.height.data, ref, r.mask)).toBeLessThan(1e-8);
    });
  }
});

// ---------------------------------------------------------------------------------------
describe('properties (fast-check)', () => {
  const heightMap = fc
    .record({ w: fc.integer({ min: 2, max: 12 }), h: fc.integer({ min: 2, max: 12 }), seed: fc.integer({ min: 0, max: 1e6 }) })
    .map(({ w, h, seed }) => {
      const g = createGrid({ width: w, height: h, dx: 0.3, dy: 0.2 });
      createRng(seed).fillUniform(g.data, -1, 1);
      return { g, seed };
    });

  it('southwell: integrating the exact discrete Southwell gradient of a random height map returns it up to piston', () => {
    fc.assert(
      fc.property(heightMap, ({ g, seed }) => {
        const { width: W, height: H, dx, dy } = g;
        const h = g.data;
        // slopes whose neighbour averages equal the height differences: choose the first
        // column (row) freely and continue by p[i+1] = 2 (h[i+1] − h[i]) / dx − p[i]
        const rng = createRng(seed + 1);
        const p = createGrid(g);
        const q = createGrid(g);
        for (let j = 0; j < H; j++) {
          p.data[j * W] = rng.uniform(-1, 1);
          for (let i = 0; i + 1 < W; i++) p.data[j * W + i + 1] = (2 * (h[j * W + i + 1]! - h[j * W + i]!)) / dx - p.data[j * W + i]!;
        }
        for (let i = 0; i < W; i++) {
          q.data[i] = rng.uniform(-1, 1);
          for (let j = 0; j + 1 < H; j++) q.data[(j + 1) * W + i] = (2 * (h[(j + 1) * W + i]! - h[j * W + i]!)) / dy - q.data[j * W + i]!;
        }
        const r = integrateSouthwell(p, q, { tolerance: 1e-13 });
        let mean = 0;
        for (let k = 0; k < h.length; k++) mean += h[k]!;
        mean /= h.length;
        for (let k = 0; k < h.length; k++) expect(Math.abs(r.height.data[k]! - (h[k]! - mean))).toBeLessThan(1e-9);
        expect(r.rmsResidual).toBeLessThan(1e-9);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('fried: integrating the exact Fried gradient returns the heights up to piston and waffle', () => {
    fc.assert(
      fc.property(heightMap, ({ g }) => {
        const { width: CW, height: CH, dx, dy } = g; // corner grid
        const W = CW - 1;
        const H = CH - 1;
        const h = g.data;
        const p = createGrid({ width: W, height: H, dx, dy });
        const q = createGrid({ width: W, height: H, dx, dy });
        for (let j = 0; j < H; j++)
          for (let i = 0; i < W; i++) {
            const c = j * CW + i;
            p.data[j * W + i] = (h[c + 1]! + h[c + CW + 1]! - h[c]! - h[c + CW]!) / (2 * dx);
            q.data[j * W + i] = (h[c + CW]! + h[c + CW + 1]! - h[c]! - h[c + 1]!) / (2 * dy);
          }
        const r = integrateFried(p, q, { tolerance: 1e-13 });
        // remove the mean of each checkerboard sub-lattice (piston and waffle) from the truth
        const sum = [0, 0];
        const cnt = [0, 0];
        for (let j = 0; j < CH; j++) for (let i = 0; i < CW; i++) (sum[(i + j) % 2]! += h[j * CW + i]!), cnt[(i + j) % 2]!++;
        for (let j = 0; j < CH; j++)
          for (let i = 0; i < CW; i++) {
            const k = j * CW + i;
            const t = h[k]! - sum[(i + j) % 2]! / cnt[(i + j) % 2]!;
            expect(Math.abs(r.height.data[k]! - t)).toBeLessThan(1e-9);
          }
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

// ---------------------------------------------------------------------------------------
// Noise propagation. Published figures (Fried 1977, JOSA 67, 370; Noll 1978, JOSA 68,
// 139; Southwell 1980, JOSA 70, 998) give the reconstructed-height error variance for
// white slope noise as a + b ln N; their coefficients are not quoted here (from memory
// only; their normalisations differ). What is checked: (1) the Monte Carlo variance agrees
// with the exact expectation σ²‖R‖²_F / N² of the same linear estimator computed with
// ml-matrix's pseudo-inverse; (2) the growth is logarithmic, with slope consistent with the
// lattice Green's-function value b = 1/(2π) per ln(side) derived from the spectrum of the
// Neumann Laplacian: mean variance = σ²d²/N² Σ_k 1/λ_k, λ_k ≈ (π/N)²|k|², and the lattice
// sum over a quarter plane gives (N²/π²)(π/2) ln N, i.e. (ln N)/(2π). (Southwell's
// neighbour averaging only damps high frequencies and leaves b unchanged.)
describe('noise propagation (Southwell geometry, unit spacing, unit slope noise)', () => {
  function monteCarlo(N: number, trials: number, seed: number): { mean: number; se: number } {
    const rng = createRng(seed);
    const p = createGrid({ width: N, height: N });
    const q = createGrid({ width: N, height: N });
    const v: number[] = [];
    for (let t = 0; t < trials; t++) {
      rng.fillNormal(p.data);
      rng.fillNormal(q.data);
      const r = integrateSouthwell(p, q, { tolerance: 1e-9 });
      let s = 0;
      for (const e of r.height.data) s += e * e; // truth is 0 and the result has zero mean
      v.push(s / (N * N));
    }
    const mean = v.reduce((a, b) => a + b, 0) / trials;
    const sd = Math.sqrt(v.reduce((a, b) => a + (b - mean) ** 2, 0) / (trials - 1));
    return { mean, se: sd / Math.sqrt(trials) };
  }
  const Ns = [8, 16, 32];
  const mc = Ns.map((N, t) => monteCarlo(N, 300, 100 + t));

  it('Monte Carlo variance matches the exact expectation of the estimator (ml-matrix pseudo-inverse)', () => {
    for (const [t, N] of [8, 16].entries()) {
      // dense: equations E h = S n with S the averaging of neighbouring noise samples
      const n = N * N;
      const E: number[][] = [];
      const S: number[][] = [];
      for (let j = 0; j < N; j++)
        for (let i = 0; i < N; i++) {
          const a = j * N + i;
          for (const [b, comp] of [
            [i + 1 < N ? a + 1 : -1, 0],
            [j + 1 < N ? a + N : -1, 1],
          ] as const) {
            if (b < 0) continue;
            const e = new Array(n).fill(0);
            e[a] = -1;
            e[b] = 1;
            E.push(e);
            const s = new Array(2 * n).fill(0);
            s[comp * n + a] = 0.5;
            s[comp * n + b] = 0.5;
            S.push(s);
          }
        }
      const R = pseudoInverse(new Matrix(E)).mmul(new Matrix(S));
      const exact = R.norm('frobenius') ** 2 / n;
      const m = mc[t]!;
      expect(Math.abs(m.mean - exact)).toBeLessThan(3.5 * m.se);
    }
  });

  it('the error variance grows as a + b ln N with b near 1/(2π), not linearly in N', () => {
    const x = Ns.map(Math.log);
    const y = mc.map((m) => m.mean);
    const mx = x.reduce((a, b) => a + b) / 3;
    const my = y.reduce((a, b) => a + b) / 3;
    const sxx = x.reduce((a, b) => a + (b - mx) ** 2, 0);
    const weightsB = x.map((xi) => (xi - mx) / sxx);
    const b = weightsB.reduce((a, wi, i) => a + wi * y[i]!, 0);
    const seB = Math.sqrt(weightsB.reduce((a, wi, i) => a + wi * wi * mc[i]!.se ** 2, 0));
    // finite-size corrections O(1/N) raise the slope over small N by a few hundredths: the
    // exact expectation of this estimator (sum of squared impulse responses, computed once
    // during development) rises by 0.130, 0.121, 0.116 per doubling over N = 6…48, i.e. a
    // local slope of 0.188, 0.174, 0.167 approaching 1/(2π) = 0.159 from above
    expect(b).toBeGreaterThan(1 / (2 * Math.PI) - 3 * seB);
    expect(b).toBeLessThan(1 / (2 * Math.PI) + 0.05 + 3 * seB);
    // logarithmic: equal increments per doubling (linear growth in N would double them)
    const inc1 = y[1]! - y[0]!;
    const inc2 = y[2]! - y[1]!;
    expect(inc2 / inc1).toBeLessThan(1.5);
    expect(y[2]! / y[0]!).toBeLessThan(2.5); // N grew 4×
  });
});

// ---------------------------------------------------------------------------------------
describe('bad input and edge cases', () => {
  const spec = { width: 5, height: 4 };
  const p = createGrid(spec);
  const q = createGrid(spec);

  it('shape mismatch is a type error naming q', () => {
    expect(() => integrateSouthwell(p, createGrid({ width: 4, height: 4 }))).toThrow(MeniscusTypeError);
    expect(() => integrateFried(p, createGrid({ width: 4, height: 4 }))).toThrow(/q/);
    expect(() => integrateSouthwell(p, createGrid({ ...spec, dx: 2 }))).toThrow(MeniscusRangeError);
  });
  it('NaN without a mask is an error naming the sample; with a mask marking it, it is a hole', () => {
    const pn = createGrid(spec);
    pn.data[7] = NaN;
    expect(() => integrateSouthwell(pn, q)).toThrow(/p\.data\[7\]/);
    const mask = new Uint8Array(20).fill(1);
    mask[7] = 0;
    const r = integrateSouthwell(pn, q, { mask });
    expect(r.mask[7]).toBe(0);
    expect(Array.from(r.height.data).every(Number.isFinite)).toBe(true);
  });
  it('a mask with no valid sample, and all weights zero, are range errors', () => {
    expect(() => integrateSouthwell(p, q, { mask: new Uint8Array(20) })).toThrow(/no valid sample/);
    expect(() => integrateFried(p, q, { weights: createGrid(spec) })).toThrow(/weights/);
    expect(() => integrateHudgin(p, q, { mask: new Uint8Array(20) })).toThrow(MeniscusRangeError);
  });
  it('isolated apertures (no usable neighbour) are not reconstructed; none at all is an error', () => {
    const mask = new Uint8Array(20);
    mask[0] = 1;
    mask[12] = 1;
    expect(() => integrateSouthwell(p, q, { mask })).toThrow(/neighbouring/);
    mask[1] = 1;
    const r = integrateSouthwell(p, q, { mask });
    expect(r.mask[12]).toBe(0);
    expect(r.mask[0]).toBe(1);
    expect(r.pieces!.length).toBe(1);
  });
  it('negative or NaN weights, bad masks and bad solver options are refused', () => {
    const w = createGrid(spec);
    w.data.fill(1);
    w.data[3] = -1;
    expect(() => integrateSouthwell(p, q, { weights: w })).toThrow(/weights/);
    expect(() => integrateSouthwell(p, q, { mask: new Uint8Array(3) })).toThrow(MeniscusTypeError);
    expect(() => integrateSouthwell(p, q, { tolerance: NaN })).toThrow(/tolerance/);
    expect(() => integrateSouthwell(p, q, { maxIterations: 0 })).toThrow(/maxIterations/);
  });
  it('hudgin does not read the last column of p and last row of q', () => {
    const pn = createGrid(spec);
    const qn = createGrid(spec);
    for (let j = 0; j < 4; j++) pn.data[j * 5 + 4] = NaN;
    for (let i = 0; i < 5; i++) qn.data[15 + i] = NaN;
    const r = integrateHudgin(pn, qn);
    expect(r.converged).toBe(true);
    expect(Array.from(r.height.data).every(Number.isFinite)).toBe(true);
  });
  it('the progress callback sees each iteration and can stop the solve', () => {
    const big = { width: 40, height: 40 };
    const pp = gridFromFunction(big, (x, y) => Math.sin(x / 5) * Math.cos(y / 7));
    const qq = gridFromFunction(big, (x, y) => Math.cos(x / 3));
    const seen: number[] = [];
    const r = integrateSouthwell(pp, qq, { onProgress: (it) => (seen.push(it), it < 3) });
    expect(seen).toEqual([1, 2, 3]);
    expect(r.iterations).toBe(3);
    expect(r.converged).toBe(false);
    expect(r.relativeResidual).toBeGreaterThan(1e-10);
  });
  it('inputs are not mutated', () => {
    const pp = gridFromFunction(spec, (x, y) => x - y);
    const copy = pp.data.slice();
    integrateSouthwell(pp, q);
    integrateFried(pp, q);
    integrateHudgin(pp, q);
    expect(Array.from(pp.data)).toEqual(Array.from(copy));
  });
});
