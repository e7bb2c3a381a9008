import { describe, expect, it } from 'vitest';
import { createGrid, createRng, gridFromFunction, MeniscusRangeError, MeniscusTypeError, type Grid } from '../../src/core/index.js';
import {
  evaluateLegendre,
  evaluateZernike,
  integrateLegendre,
  integrateZernike,
  legendreModes,
  MAX_ZERNIKE_TERMS,
  zernikeMode,
  zernikeNoll,
} from '../../src/integrate/modal.js';

/** Gauss–Legendre nodes and weights on [−1, 1] by Newton's method on P_n (common practice). */
function gaussLegendre(n: number): { x: number[]; w: number[] } {
  const x: number[] = [];
  const w: number[] = [];
  for (let i = 1; i <= n; i++) {
    let t = Math.cos((Math.PI * (i - 0.25)) / (n + 0.5));
    let dp = 0;
    for (let it = 0; it < 100; it++) {
      let p0 = 1;
      let p1 = t;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * t * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (t * p1 - p0)) / (t * t - 1);
      const dt = p1 / dp;
      t -= dt;
      if (Math.abs(dt) < 1e-16) break;
    }
    x.push(t);
    w.push(2 / ((1 - t * t) * dp * dp));
  }
  return { x, w };
}

describe('Zernike polynomials (Noll 1976, JOSA 66, 207)', () => {
  it('Noll index → (n, m) as in Noll 1976 Table I', () => {
    const table: Array<[number, number]> = [
      [0, 0], [1, 1], [1, -1], [2, 0], [2, -2], [2, 2], [3, -1], [3, 1], [3, -3], [3, 3],
      [4, 0], [4, 2], [4, -2], [4, 4], [4, -4], [5, 1], [5, -1], [5, 3], [5, -3], [5, 5], [5, -5], [6, 0],
    ];
    table.forEach(([n, m], t) => expect(zernikeNoll(t + 1)).toEqual({ n, m }));
    // every (n, m) pair appears exactly once up to radial order 20
    const seen = new Set<string>();
    for (let j = 1; j <= MAX_ZERNIKE_TERMS; j++) {
      const { n, m } = zernikeNoll(j);
      expect((n - Math.abs(m)) % 2).toBe(0);
      seen.add(`${n},${m}`);
    }
    expect(seen.size).toBe(MAX_ZERNIKE_TERMS);
    expect(() => zernikeNoll(0)).toThrow(MeniscusRangeError);
    expect(() => zernikeNoll(2.5)).toThrow(MeniscusRangeError);
  });

  it('known polynomials of Noll 1976 Table I', () => {
    const known: Array<[number, (r: number, t: number) => number]> = [
      [1, () => 1],
      [2, (r, t) => 2 * r * Math.cos(t)],
      [3, (r, t) => 2 * r * Math.sin(t)],
      [4, (r) => Math.sqrt(3) * (2 * r * r - 1)],
      [5, (r, t) => Math.sqrt(6) * r * r * Math.sin(2 * t)],
      [6, (r, t) => Math.sqrt(6) * r * r * Math.cos(2 * t)],
      [7, (r, t) => Math.sqrt(8) * (3 * r ** 3 - 2 * r) * Math.sin(t)],
      [8, (r, t) => Math.sqrt(8) * (3 * r ** 3 - 2 * r) * Math.cos(t)],
      [9, (r, t) => Math.sqrt(8) * r ** 3 * Math.sin(3 * t)],
      [10, (r, t) => Math.sqrt(8) * r ** 3 * Math.cos(3 * t)],
      [11, (r) => Math.sqrt(5) * (6 * r ** 4 - 6 * r * r + 1)],
      [12, (r, t) => Math.sqrt(10) * (4 * r ** 4 - 3 * r * r) * Math.cos(2 * t)],
      [13, (r, t) => Math.sqrt(10) * (4 * r ** 4 - 3 * r * r) * Math.sin(2 * t)],
      [22, (r) => Math.sqrt(7) * (20 * r ** 6 - 30 * r ** 4 + 12 * r * r - 1)],
    ];
    for (const [j, z] of known) {
      for (const [r, t] of [
        [0, 0],
        [0.3, 0.4],
        [0.77, -2.1],
        [1, 2.5],
      ] as const) {
        expect(zernikeMode(j, r * Math.cos(t), r * Math.sin(t)).value).toBeCloseTo(z(r, t), 13);
      }
    }
  });

  it('analytic gradients match central differences, also at the centre', () => {
    const e = 1e-6;
    for (let j = 1; j <= 45; j++) {
      for (const [x, y] of [
        [0, 0],
        [0.31, -0.52],
        [-0.7, 0.1],
      ] as const) {
        const g = zernikeMode(j, x, y);
        const fx = (zernikeMode(j, x + e, y).value - zernikeMode(j, x - e, y).value) / (2 * e);
        const fy = (zernikeMode(j, x, y + e).value - zernikeMode(j, x, y - e).value) / (2 * e);
        expect(Math.abs(g.dx - fx)).toBeLessThan(1e-6);
        expect(Math.abs(g.dy - fy)).toBeLessThan(1e-6);
      }
    }
  });

  it('modes 1…66 are orthonormal over the unit disc, (1/π)∫∫ Zi Zj = δij (Gauss–Legendre × trapezoid quadrature)', () => {
    const J = 66; // radial orders ≤ 10
    const gl = gaussLegendre(16);
    const nt = 48;
    const G = new Float64Array(J * J);
    const c = new Float64Array(J);
    for (let a = 0; a < gl.x.length; a++) {
      const r = (gl.x[a]! + 1) / 2;
      const wr = (gl.w[a]! / 2) * r;
      for (let b = 0; b < nt; b++) {
        const t = (2 * Math.PI * b) / nt;
        for (let j = 0; j < J; j++) c[j] = zernikeMode(j + 1, r * Math.cos(t), r * Math.sin(t)).value;
        const w = (wr * (2 * Math.PI)) / nt / Math.PI;
        for (let i = 0; i < J; i++) for (let j = 0; j < J; j++) G[i * J + j]! += w * c[i]! * c[j]!;
      }
    }
    let worst = 0;
    for (let i = 0; i < J; i++) for (let j = 0; j < J; j++) worst = Math.max(worst, Math.abs(G[i * J + j]! - (i === j ? 1 : 0)));
    expect(worst).toBeLessThan(1e-12);
  });
});

function pupil(N: number, holes = 0, seed = 1): { spec: { width: number; height: number; dx: number; x0: number; y0: number }; mask: Uint8Array; xs: Float64Array; ys: Float64Array } {
  const dx = 0.02 / (N - 1); // a 2 cm sensor
  const spec = { width: N, height: N, dx, x0: 0.1, y0: -0.05 };
  const xs = new Float64Array(N * N);
  const ys = new Float64Array(N * N);
  const mask = new Uint8Array(N * N);
  const c = 0.1 + 0.01;
  const cy = -0.05 + 0.01;
  for (let k = 0; k < N * N; k++) {
    xs[k] = spec.x0 + (k % N) * dx;
    ys[k] = spec.y0 + Math.floor(k / N) * dx;
    mask[k] = Math.hypot(xs[k]! - c, ys[k]! - cy) <= 0.01 * (1 + 1e-12) ? 1 : 0;
  }
  const rng = createRng(seed);
  for (let t = 0; t < holes; t++) mask[rng.integer(N * N)] = 0;
  return { spec, mask, xs, ys };
}
const asGrid = (spec: { width: number; height: number; dx: number; x0: number; y0: number }, data: Float64Array): Grid =>
  createGrid({ ...spec, dy: spec.dx }, data);

describe('integrateZernike', () => {
  it('recovers a surface made of known Zernike coefficients from its analytic slopes to ~1e-10 (Noll 1976 modes)', () => {
    const { spec, mask, xs, ys } = pupil(40, 60);
    const terms = 36;
    const c = new Float64Array(terms);
    const rng = createRng(9);
    for (let t = 1; t < terms; t++) c[t] = rng.normal(0, 1e-6); // micrometres of aberration
    const disc = { center: [0.11, -0.04] as [number, number], radius: 0.01 };
    const e = evaluateZernike(c, xs, ys, disc);
    const r = integrateZernike(asGrid(spec, e.p), asGrid(spec, e.q), { mask, terms, ...disc });
    let worst = 0;
    for (let t = 1; t < terms; t++) worst = Math.max(worst, Math.abs(r.coefficients[t]! - c[t]!));
    expect(worst / 1e-6).toBeLessThan(1e-10);
    expect(r.rmsResidual).toBeLessThan(1e-14);
    // heights: truth minus its mean over the used samples
    let mean = 0;
    let n = 0;
    for (let k = 0; k < mask.length; k++) if (r.mask[k]) (mean += e.height[k]!), n++;
    mean /= n;
    for (let k = 0; k < mask.length; k++) {
      if (r.mask[k]) expect(Math.abs(r.height.data[k]! - (e.height[k]! - mean))).toBeLessThan(1e-16);
      else expect(r.height.data[k]).toBe(0);
    }
    // the piston coefficient reproduces the zero-mean height
    const back = evaluateZernike(r.coefficients, xs, ys, r.disc);
    for (let k = 0; k < mask.length; k++) if (r.mask[k]) expect(back.height[k]).toBeCloseTo(r.height.data[k]!, 16);
  });

  it('default disc: grid centre and the farthest valid sample', () => {
    const { spec, mask, xs, ys } = pupil(21);
    const c = new Float64Array([0, 1e-6, -2e-6, 3e-7]);
    const e = evaluateZernike(c, xs, ys, { center: [0.11, -0.04], radius: 0.01 });
    const r = integrateZernike(asGrid(spec, e.p), asGrid(spec, e.q), { mask, terms: 4 });
    expect(r.disc.center[0]).toBeCloseTo(0.11, 14);
    expect(r.disc.radius).toBeCloseTo(0.01, 14);
    for (let t = 1; t < 4; t++) expect(r.coefficients[t]! / 1e-6).toBeCloseTo(c[t]! / 1e-6, 10);
  });

  it('a smooth non-polynomial surface (Gaussian bump) converges as terms are added', () => {
    const { spec, mask } = pupil(48);
    const f = (x: number, y: number): number => 1e-6 * Math.exp(-(((x - 0.112) ** 2 + (y + 0.041) ** 2) / 0.006 ** 2));
    const p = gridFromFunction({ ...spec, dy: spec.dx }, (x, y) => (-2 * (x - 0.112) / 0.006 ** 2) * f(x, y));
    const q = gridFromFunction({ ...spec, dy: spec.dx }, (x, y) => (-2 * (y + 0.041) / 0.006 ** 2) * f(x, y));
    const errs = [10, 28, 66].map((terms) => {
      const r = integrateZernike(p, q, { mask, terms });
      let mean = 0;
      let n = 0;
      for (let k = 0; k < mask.length; k++) {
        if (!r.mask[k]) continue;
        const x = spec.x0 + (k % 48) * spec.dx;
        const y = spec.y0 + Math.floor(k / 48) * spec.dx;
        mean += f(x, y) - r.height.data[k]!;
        n++;
      }
      mean /= n;
      let s = 0;
      for (let k = 0; k < mask.length; k++) {
        if (!r.mask[k]) continue;
        const x = spec.x0 + (k % 48) * spec.dx;
        const y = spec.y0 + Math.floor(k / 48) * spec.dx;
        s += (f(x, y) - r.height.data[k]! - mean) ** 2;
      }
      return Math.sqrt(s / n);
    });
    expect(errs[1]!).toBeLessThan(errs[0]! / 3);
    expect(errs[2]!).toBeLessThan(errs[1]! / 3);
    expect(errs[2]!).toBeLessThan(1e-9); // < 0.1 % of the 1 µm bump
  });

  it('bad input: too few samples, modes not determined, NaN, shapes, options', () => {
    const { spec, mask, xs, ys } = pupil(9);
    const e = evaluateZernike(new Float64Array([0, 1e-6]), xs, ys, { center: [0.11, -0.04], radius: 0.01 });
    const p = asGrid(spec, e.p);
    const q = asGrid(spec, e.q);
    const few = new Uint8Array(81);
    few[40] = 1;
    few[41] = 1;
    few[31] = 1;
    expect(() => integrateZernike(p, q, { mask: few, terms: 21 })).toThrow(/at least 10 valid samples/);
    // samples on one line cannot see modes that vary only across it
    const line = new Uint8Array(81);
    for (let i = 0; i < 9; i++) line[36 + i] = 1;
    expect(() => integrateZernike(p, q, { mask: line, terms: 10 })).toThrow(/determine all 10 modes/);
    const pn = asGrid(spec, e.p.slice());
    pn.data[0] = NaN;
    expect(() => integrateZernike(pn, q)).toThrow(/p\.data\[0\]/);
    expect(integrateZernike(pn, q, { mask, terms: 3 }).coefficients[1]! / 1e-6).toBeCloseTo(1, 10);
    expect(() => integrateZernike(p, createGrid({ width: 8, height: 9 }))).toThrow(MeniscusTypeError);
    expect(() => integrateZernike(p, q, { mask: new Uint8Array(81) })).toThrow(/no valid sample/);
    expect(() => integrateZernike(p, q, { terms: 1 })).toThrow(/terms/);
    expect(() => integrateZernike(p, q, { terms: MAX_ZERNIKE_TERMS + 1 })).toThrow(/terms/);
    expect(() => integrateZernike(p, q, { radius: 0 })).toThrow(/radius/);
    expect(() => integrateZernike(p, q, { center: [1] as unknown as [number, number] })).toThrow(/center/);
    expect(() => evaluateZernike(new Float64Array(3), new Float64Array(2), new Float64Array(3), { center: [0, 0], radius: 1 })).toThrow(
      MeniscusTypeError,
    );
  });
});

describe('Legendre modes (Abramowitz & Stegun 1964, ch. 22)', () => {
  const rect = { xMin: -1, xMax: 1, yMin: -1, yMax: 1 };
  it('mode order and known values: P2 = (3t² − 1)/2, P3 = (5t³ − 3t)/2 (A&S 22.3.8), orthonormal scaling √(2a+1)', () => {
    expect(legendreModes(2)).toEqual([
      [0, 0],
      [1, 0],
      [0, 1],
      [2, 0],
      [1, 1],
      [0, 2],
    ]);
    const modes = legendreModes(3);
    const idx30 = modes.findIndex(([a, b]) => a === 3 && b === 0);
    const idx21 = modes.findIndex(([a, b]) => a === 2 && b === 1);
    const c = new Float64Array(modes.length);
    c[idx30] = 1;
    const x = 0.37;
    const y = -0.62;
    const e = evaluateLegendre(c, 3, new Float64Array([x]), new Float64Array([y]), rect);
    expect(e.height[0]).toBeCloseTo(Math.sqrt(7) * ((5 * x ** 3 - 3 * x) / 2), 14);
    expect(e.p[0]).toBeCloseTo(Math.sqrt(7) * ((15 * x * x - 3) / 2), 13);
    c.fill(0);
    c[idx21] = 1;
    const e2 = evaluateLegendre(c, 3, new Float64Array([x]), new Float64Array([y]), rect);
    expect(e2.height[0]).toBeCloseTo(Math.sqrt(5 * 3) * ((3 * x * x - 1) / 2) * y, 14);
    expect(e2.q[0]).toBeCloseTo(Math.sqrt(15) * ((3 * x * x - 1) / 2), 13);
  });

  it('modes up to degree 10 are orthonormal over the rectangle (Gauss–Legendre quadrature, A&S 22.2.10)', () => {
    const order = 10;
    const modes = legendreModes(order);
    const J = modes.length;
    const gl = gaussLegendre(12);
    const G = new Float64Array(J * J);
    const r2 = { xMin: 2, xMax: 5, yMin: -1, yMax: 0.5 };
    const c = new Float64Array(J);
    const vals: Float64Array[] = [];
    for (let t = 0; t < J; t++) {
      c.fill(0);
      c[t] = 1;
      const xs: number[] = [];
      const ys: number[] = [];
      for (const a of gl.x) for (const b of gl.x) (xs.push(3.5 + 1.5 * a), ys.push(-0.25 + 0.75 * b));
      vals.push(evaluateLegendre(c, order, Float64Array.from(xs), Float64Array.from(ys), r2).height);
    }
    const w: number[] = [];
    for (const a of gl.w) for (const b of gl.w) w.push((a * b) / 4);
    for (let i = 0; i < J; i++) for (let j = 0; j < J; j++) for (let k = 0; k < w.length; k++) G[i * J + j]! += w[k]! * vals[i]![k]! * vals[j]![k]!;
    let worst = 0;
    for (let i = 0; i < J; i++) for (let j = 0; j < J; j++) worst = Math.max(worst, Math.abs(G[i * J + j]! - (i === j ? 1 : 0)));
    expect(worst).toBeLessThan(1e-12);
  });

  it('integrateLegendre recovers a surface made of its modes to ~1e-10, with holes', () => {
    const W = 30;
    const H = 20;
    const spec = { width: W, height: H, dx: 0.01, dy: 0.015, x0: 1, y0: 2 };
    const order = 7;
    const rect = { xMin: 1, xMax: 1 + 29 * 0.01, yMin: 2, yMax: 2 + 19 * 0.015 };
    const modes = legendreModes(order);
    const c = new Float64Array(modes.length);
    createRng(5).fillNormal(c.subarray(1));
    const xs = new Float64Array(W * H);
    const ys = new Float64Array(W * H);
    for (let k = 0; k < W * H; k++) (xs[k] = 1 + (k % W) * 0.01), (ys[k] = 2 + Math.floor(k / W) * 0.015);
    const e = evaluateLegendre(c, order, xs, ys, rect);
    const mask = new Uint8Array(W * H).fill(1);
    const rng = createRng(6);
    for (let t = 0; t < 100; t++) mask[rng.integer(W * H)] = 0;
    const r = integrateLegendre(createGrid(spec, e.p), createGrid(spec, e.q), { mask, order });
    expect(r.rectangle.xMax).toBeCloseTo(rect.xMax, 14);
    let worst = 0;
    for (let t = 1; t < modes.length; t++) worst = Math.max(worst, Math.abs(r.coefficients[t]! - c[t]!));
    expect(worst).toBeLessThan(1e-10);
  });

  it('bad input', () => {
    const p = createGrid({ width: 1, height: 5 });
    expect(() => integrateLegendre(p, p)).toThrow(/at least 2/);
    const g = createGrid({ width: 4, height: 4 });
    expect(() => integrateLegendre(g, g, { order: 0 })).toThrow(/order/);
    const four = new Uint8Array(16);
    four.fill(1, 0, 4);
    expect(() => integrateLegendre(g, g, { order: 3, mask: four })).toThrow(/at least 5 valid samples/);
    // one row of samples cannot see the modes that vary only along y
    expect(() => integrateLegendre(g, g, { order: 2, mask: four })).toThrow(/determine all 6 modes/);
    expect(() => evaluateLegendre(new Float64Array(2), 1, new Float64Array(1), new Float64Array(1), rect)).toThrow(/length 3/);
    expect(() => evaluateLegendre(new Float64Array(3), 1, new Float64Array(1), new Float64Array(1), { ...rect, xMax: -1 })).toThrow(
      /xMax/,
    );
  });
});
