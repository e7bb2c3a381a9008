import { describe, expect, it } from 'vitest';
import { createGrid } from '../../src/core/index.js';
import { integrateFrankotChellappa, prepareFrankotChellappa } from '../../src/integrate/index.js';
import { gaussian, relErrorUpToPiston, sample, sinusoid } from './fixtures.js';

// A band-limited periodic field on one period: Frankot & Chellappa (1988) project onto
// the Fourier basis, which represents it exactly (analytic gradient, so the only error
// is rounding).
function periodicCase(w: number, h: number) {
  const k1 = 2 * Math.PI * 3;
  const k2 = 2 * Math.PI * 2;
  const s = sinusoid(0.01, k1, k2, 0.4);
  const t = sinusoid(0.004, 2 * Math.PI * 5, 2 * Math.PI * 1);
  const a = sample(s, w, h, 1 / w, 1 / h);
  const b = sample(t, w, h, 1 / w, 1 / h);
  const add = (g1: typeof a.h, g2: typeof a.h) => createGrid(g1, g1.data.map((v, k) => v + g2.data[k]!));
  return { h: add(a.h, b.h), p: add(a.p, b.p), q: add(a.q, b.q) };
}

describe('integrateFrankotChellappa', () => {
  it.each([
    [64, 64],
    [32, 16],
    [48, 30],
    [37, 21],
    [1, 16],
  ])('recovers a periodic band-limited surface to rounding on %i × %i (Frankot & Chellappa 1988)', (w, h) => {
    const c = periodicCase(w, h);
    if (w === 1) {
      // one column: only the y part is periodic on this grid
      const s = sample(sinusoid(0.01, 0, 2 * Math.PI * 2, Math.PI / 2), 1, h, 1, 1 / h);
      const r = integrateFrankotChellappa(s.p, s.q);
      expect(relErrorUpToPiston(r.height.data, s.h.data)).toBeLessThan(1e-12);
      return;
    }
    const r = integrateFrankotChellappa(c.p, c.q);
    expect(relErrorUpToPiston(r.height.data, c.h.data)).toBeLessThan(1e-12);
    expect(r.iterations).toBe(0);
    expect(r.converged).toBe(true);
    let mean = 0;
    for (const v of r.height.data) mean += v;
    expect(Math.abs(mean / (w * h))).toBeLessThan(1e-15);
  });

  it('keeps the grid geometry and fills `out`', () => {
    const c = periodicCase(16, 16);
    const p = createGrid({ width: 16, height: 16, dx: 1 / 16, x0: 3, y0: -2 }, c.p.data);
    const q = createGrid({ width: 16, height: 16, dx: 1 / 16, x0: 3, y0: -2 }, c.q.data);
    const out = new Float64Array(256);
    const r = integrateFrankotChellappa(p, q, { out });
    expect(r.height.data).toBe(out);
    expect(r.height.x0).toBe(3);
    expect(r.height.y0).toBe(-2);
  });

  it('a Gaussian bump far from the edges is recovered closely (effectively periodic)', () => {
    const s = sample(gaussian(0.01, 0.5, 0.5, 0.06), 64, 64, 1 / 64);
    const r = integrateFrankotChellappa(s.p, s.q);
    expect(relErrorUpToPiston(r.height.data, s.h.data)).toBeLessThan(1e-8);
  });

  it('prepared form gives the same heights frame after frame', () => {
    const c = periodicCase(32, 24);
    const solver = prepareFrankotChellappa({ width: 32, height: 24, dx: 1 / 32, dy: 1 / 24 });
    const a = solver.solve(c.p, c.q).height.data.slice();
    const b = solver.solve(c.p, c.q).height.data;
    const one = integrateFrankotChellappa(c.p, c.q).height.data;
    for (let k = 0; k < a.length; k++) {
      expect(a[k]).toBe(b[k]);
      expect(a[k]).toBe(one[k]);
    }
  });
});
