import { describe, expect, it } from 'vitest';
import { createGrid } from '../../src/core/index.js';
import {
  INTEGRATION_METHODS,
  integrate,
  integrateDctPoisson,
  integrateFried,
  integrateLeastSquares,
  integrateLegendre,
  integrateSouthwell,
  integrateZernike,
  integrabilityMap,
  prepareIntegrator,
  slopeResidual,
} from '../../src/integrate/index.js';
import { allFinite, discMask, gaussian, peaks, relErrorUpToPiston, sample } from './fixtures.js';

const n = 32;
const s = sample(gaussian(0.02, 0.05, -0.03, 0.3), n, n, 1 / 32, 1 / 32, -0.5, -0.5);
const mask = discMask(n, n, 15);

describe('integrate (front door)', () => {
  it('dispatches every method and returns finite heights', () => {
    for (const method of INTEGRATION_METHODS) {
      const full = method === 'frankot-chellappa' || method === 'dct-poisson';
      const r = integrate(s.p, s.q, { method, ...(full ? {} : { mask }) });
      expect(allFinite(r.height.data)).toBe(true);
      expect(r.height.width).toBe(method === 'fried' ? n + 1 : n);
    }
  });

  it('gives exactly what the named functions give', () => {
    const same = (a: Float64Array, b: Float64Array) => a.every((v, k) => v === b[k]);
    expect(same(integrate(s.p, s.q, { method: 'dct-poisson' }).height.data, integrateDctPoisson(s.p, s.q).height.data)).toBe(true);
    expect(same(integrate(s.p, s.q, { mask }).height.data, integrateLeastSquares(s.p, s.q, { mask }).height.data)).toBe(true);
    expect(same(integrate(s.p, s.q, { method: 'southwell', mask }).height.data, integrateSouthwell(s.p, s.q, { mask }).height.data)).toBe(true);
    expect(same(integrate(s.p, s.q, { method: 'fried', mask }).height.data, integrateFried(s.p, s.q, { mask }).height.data)).toBe(true);
    expect(same(integrate(s.p, s.q, { method: 'zernike', mask, terms: 15 }).height.data, integrateZernike(s.p, s.q, { mask, terms: 15 }).height.data)).toBe(true);
    expect(same(integrate(s.p, s.q, { method: 'legendre', order: 4 }).height.data, integrateLegendre(s.p, s.q, { order: 4 }).height.data)).toBe(true);
  });

  it('least squares and Southwell both recover the bump on the disc', () => {
    for (const method of ['least-squares', 'southwell'] as const) {
      const r = integrate(s.p, s.q, { method, mask });
      expect(relErrorUpToPiston(r.height.data, s.h.data, mask)).toBeLessThan(0.02);
    }
  });
});

describe('prepareIntegrator', () => {
  it('every method: the prepared solve equals the one-shot integrate', () => {
    for (const method of INTEGRATION_METHODS) {
      const full = method === 'frankot-chellappa' || method === 'dct-poisson';
      const opts = full ? { method } : { method, mask };
      const solver = prepareIntegrator(s.p, opts);
      expect(solver.method).toBe(method);
      const a = solver.solve(s.p, s.q).height.data;
      const b = integrate(s.p, s.q, opts).height.data;
      for (let k = 0; k < a.length; k++) expect(a[k]).toBeCloseTo(b[k]!, 12);
    }
  });

  it('least-squares frames can carry a prior and known heights', () => {
    const solver = prepareIntegrator(s.p, { method: 'least-squares', mask, priorWeight: 1e-6 });
    const r = solver.solve(s.p, s.q, { prior: s.h, knownHeights: [{ i: 16, j: 16, height: 0.5 }] });
    expect(r.height.data[16 * n + 16]).toBeCloseTo(0.5, 3);
  });

  it('writes into a caller buffer', () => {
    const out = new Float64Array(n * n);
    const solver = prepareIntegrator(s.p, { method: 'dct-poisson' });
    expect(solver.solve(s.p, s.q, { out }).height.data).toBe(out);
  });
});

describe('integrabilityMap (curl; analytic values from vector calculus)', () => {
  it('a rotational field p = −y, q = x has curl ∂p/∂y − ∂q/∂x = −2 everywhere', () => {
    const spec = { width: 6, height: 5, dx: 0.3, dy: 0.2, x0: -1, y0: 2 };
    const p = createGrid(spec);
    const q = createGrid(spec);
    for (let j = 0; j < 5; j++) for (let i = 0; i < 6; i++) {
      p.data[j * 6 + i] = -(2 + j * 0.2);
      q.data[j * 6 + i] = -1 + i * 0.3;
    }
    const c = integrabilityMap(p, q);
    expect(c.curl.width).toBe(5);
    expect(c.curl.height).toBe(4);
    expect(c.curl.x0).toBeCloseTo(-0.85, 14);
    for (const v of c.curl.data) expect(v).toBeCloseTo(-2, 12);
    expect(c.rms).toBeCloseTo(2, 12);
  });

  it('the exact gradient of a quadratic has zero curl; a hole removes its cells', () => {
    const quad = { h: (x: number, y: number) => x * x + x * y - 2 * y * y, p: (x: number, y: number) => 2 * x + y, q: (x: number, y: number) => x - 4 * y };
    const g = sample(quad, 7, 7, 0.1);
    const m = new Uint8Array(49).fill(1);
    m[24] = 0;
    const c = integrabilityMap(g.p, g.q, { mask: m });
    expect(c.maxAbs).toBeLessThan(1e-12);
    expect(c.mask.reduce((a, v) => a + v, 0)).toBe(36 - 4);
  });
});

describe('slopeResidual', () => {
  it('vanishes inside for a quadratic (central differences are exact there) and is dx·h_xx/2 at the edges (Taylor)', () => {
    const quad = { h: (x: number, y: number) => 3 * x * x + y, p: (x: number) => 6 * x, q: () => 1 };
    const g = sample(quad, 8, 6, 0.1);
    const r = slopeResidual(g.h, g.p, g.q);
    for (let j = 0; j < 6; j++) {
      for (let i = 1; i < 7; i++) expect(r.p.data[j * 8 + i]).toBeCloseTo(0, 12);
      expect(r.p.data[j * 8]).toBeCloseTo((0.1 * 6) / 2, 12);
      expect(r.p.data[j * 8 + 7]).toBeCloseTo((-0.1 * 6) / 2, 12);
    }
    expect(r.pairRms).toBeCloseTo(0, 12);
  });

  it('pairRms equals the rmsResidual an integrator reports', () => {
    const g = sample(peaks, 20, 20, 0.3, 0.3, -3, -3);
    const rr = integrateDctPoisson(g.p, g.q);
    expect(slopeResidual(rr.height, g.p, g.q).pairRms).toBeCloseTo(rr.rmsResidual, 14);
  });
});
