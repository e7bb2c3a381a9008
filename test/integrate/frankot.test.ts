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

// The projection written out from its definition (Frankot & Chellappa 1988, eq. 21 with
// the spectral derivative symbols i·ωx, i·ωy): Ĥ = −i(ωx P̂ + ωy Q̂)/(ωx² + ωy²), the
// DFTs summed directly (O(N²), small grids), the Nyquist term of the odd symbols set to 0
// as the solver documents. Checks every storage path: powers of two, Bluestein lengths,
// odd widths (whose output columns do not pair up) and one-sample-wide strips.
describe('integrateFrankotChellappa against the projection summed from the DFT definition', () => {
  function dft2(re: Float64Array, im: Float64Array, w: number, h: number, sg: number): [Float64Array, Float64Array] {
    const Or = new Float64Array(w * h);
    const Oi = new Float64Array(w * h);
    for (let ky = 0; ky < h; ky++) {
      for (let kx = 0; kx < w; kx++) {
        let sr = 0;
        let si = 0;
        for (let y = 0; y < h; y++) {
          for (let x = 0; x < w; x++) {
            const a = sg * 2 * Math.PI * (((kx * x) % w) / w + ((ky * y) % h) / h);
            const c = Math.cos(a);
            const s = Math.sin(a);
            const vr = re[y * w + x]!;
            const vi = im[y * w + x]!;
            sr += vr * c - vi * s;
            si += vr * s + vi * c;
          }
        }
        Or[ky * w + kx] = sr;
        Oi[ky * w + kx] = si;
      }
    }
    return [Or, Oi];
  }
  const omega = (k: number, n: number, d: number) => (2 * Math.PI * (k <= (n - 1) >> 1 ? k : k - n)) / (n * d);

  it.each([
    [8, 8],
    [16, 4],
    [9, 6],
    [7, 5],
    [12, 10],
    [5, 16],
    [1, 8],
    [8, 1],
  ])('%i × %i', (w, h) => {
    const dx = 0.3;
    const dy = 0.45;
    const p = createGrid({ width: w, height: h, dx, dy });
    const q = createGrid({ width: w, height: h, dx, dy });
    for (let k = 0; k < w * h; k++) {
      p.data[k] = Math.sin(1.3 * k + 0.2) + 0.1;
      q.data[k] = Math.cos(0.7 * k * k + 0.5);
    }
    const zero = new Float64Array(w * h);
    const [Pr, Pi] = dft2(p.data, zero, w, h, -1);
    const [Qr, Qi] = dft2(q.data, zero, w, h, -1);
    const Hr = new Float64Array(w * h);
    const Hi = new Float64Array(w * h);
    for (let ky = 0; ky < h; ky++) {
      for (let kx = 0; kx < w; kx++) {
        const wx = omega(kx, w, dx);
        const wy = omega(ky, h, dy);
        const ax = 2 * kx === w ? 0 : wx;
        const ay = 2 * ky === h ? 0 : wy;
        const den = wx * wx + wy * wy;
        if (den === 0) continue;
        const k = ky * w + kx;
        // −i (ax P + ay Q) / den
        const sr = ax * Pr[k]! + ay * Qr[k]!;
        const si = ax * Pi[k]! + ay * Qi[k]!;
        Hr[k] = si / den;
        Hi[k] = -sr / den;
      }
    }
    const [zr] = dft2(Hr, Hi, w, h, 1);
    const ref = zr.map((v) => v / (w * h));
    const got = integrateFrankotChellappa(p, q).height.data;
    let e = 0;
    let s = 0;
    for (let k = 0; k < w * h; k++) {
      e = Math.max(e, Math.abs(got[k]! - ref[k]!));
      s = Math.max(s, Math.abs(ref[k]!));
    }
    expect(e / s).toBeLessThan(1e-12);
  });
});
