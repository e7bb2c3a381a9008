import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createGrid } from '../../src/core/index.js';
import { integrateDctPoisson, integrateFrankotChellappa, integrateLeastSquares } from '../../src/integrate/index.js';
import { exactPairSlopes, maxDiffUpToPiston } from './fixtures.js';

const gridArb = fc
  .record({ w: fc.integer({ min: 2, max: 9 }), h: fc.integer({ min: 2, max: 9 }), dx: fc.double({ min: 0.05, max: 3, noNaN: true }) })
  .chain(({ w, h, dx }) =>
    fc.record({
      w: fc.constant(w),
      h: fc.constant(h),
      dx: fc.constant(dx),
      heights: fc.array(fc.double({ min: -2, max: 2, noNaN: true }), { minLength: w * h, maxLength: w * h }),
      maskBits: fc.array(fc.boolean(), { minLength: w * h, maxLength: w * h }),
    }),
  );

/** Check each piece of the result against the truth up to that piece's own constant. */
function expectPiecewise(height: Float64Array, truth: Float64Array, labels: Int32Array, count: number, tol: number): void {
  for (let l = 1; l <= count; l++) {
    const m = Uint8Array.from(labels, (v) => (v === l ? 1 : 0));
    expect(maxDiffUpToPiston(height, truth, m)).toBeLessThan(tol);
  }
}

// Law (exact by construction): slopes that fit the forward-difference model exactly
// have zero least-squares residual, so every method built on that model returns the
// heights up to piston.
describe('integrating an exact discrete gradient returns the heights up to piston', () => {
  it('least squares on a random mask, every piece', () => {
    fc.assert(
      fc.property(gridArb, ({ w, h, dx, heights, maskBits }) => {
        const hg = createGrid({ width: w, height: h, dx, dy: dx * 0.7 }, Float64Array.from(heights));
        const { p, q } = exactPairSlopes(hg, 0.3);
        const mask = Uint8Array.from(maskBits, (b) => (b ? 1 : 0));
        if (!mask.some((v) => v === 1)) mask[0] = 1;
        const r = integrateLeastSquares(p, q, { mask, tolerance: 1e-13, maxIterations: 1000 });
        expectPiecewise(r.height.data, hg.data, r.labels, r.pieces.length, 1e-8);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('DCT Poisson on the full rectangle', () => {
    fc.assert(
      fc.property(gridArb, ({ w, h, dx, heights }) => {
        const hg = createGrid({ width: w, height: h, dx, dy: dx * 1.3 }, Float64Array.from(heights));
        const { p, q } = exactPairSlopes(hg, -0.2);
        const r = integrateDctPoisson(p, q);
        expect(maxDiffUpToPiston(r.height.data, hg.data)).toBeLessThan(1e-9);
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

/** A random trigonometric polynomial below Nyquist on one period, with its exact gradient. */
const trigArb = fc.record({
  w: fc.constantFrom(4, 6, 8, 12, 16),
  h: fc.constantFrom(4, 5, 8, 10, 16),
  modes: fc.array(
    fc.record({ a: fc.double({ min: -1, max: 1, noNaN: true }), b: fc.double({ min: -1, max: 1, noNaN: true }), kx: fc.integer({ min: -1, max: 1 }), ky: fc.integer({ min: -1, max: 1 }) }),
    { minLength: 1, maxLength: 4 },
  ),
  c: fc.double({ min: -5, max: 5, noNaN: true }),
});

describe('a constant added to the slopes', () => {
  it('changes nothing in Frankot–Chellappa on a periodic field (the zero frequency is discarded)', () => {
    fc.assert(
      fc.property(trigArb, ({ w, h, modes, c }) => {
        const spec = { width: w, height: h, dx: 1 / w, dy: 1 / h };
        const p = createGrid(spec);
        const q = createGrid(spec);
        for (let j = 0; j < h; j++) for (let i = 0; i < w; i++) {
          let sp = 0;
          let sq = 0;
          for (const m of modes) {
            const ph = 2 * Math.PI * (m.kx * i / w + m.ky * j / h);
            // h = a cos φ + b sin φ, φ = 2π(kx x + ky y)
            const dphi = -m.a * Math.sin(ph) + m.b * Math.cos(ph);
            sp += 2 * Math.PI * m.kx * dphi;
            sq += 2 * Math.PI * m.ky * dphi;
          }
          p.data[j * w + i] = sp;
          q.data[j * w + i] = sq;
        }
        const r0 = integrateFrankotChellappa(p, q).height.data;
        const p2 = createGrid(spec, p.data.map((v) => v + c));
        const q2 = createGrid(spec, q.data.map((v) => v - 0.5 * c));
        const r1 = integrateFrankotChellappa(p2, q2).height.data;
        for (let k = 0; k < w * h; k++) expect(Math.abs(r1[k]! - r0[k]!)).toBeLessThan(1e-12 * (1 + Math.abs(c)));
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('adds exactly the mean plane c·x + d·y in least squares and DCT Poisson', () => {
    fc.assert(
      fc.property(gridArb, fc.double({ min: -3, max: 3, noNaN: true }), fc.double({ min: -3, max: 3, noNaN: true }), ({ w, h, dx, heights, maskBits }, c, d) => {
        const spec = { width: w, height: h, dx, dy: dx, x0: 0.5, y0: -1 };
        const p = createGrid(spec, Float64Array.from(heights));
        const q = createGrid(spec, Float64Array.from(heights).reverse());
        const mask = Uint8Array.from(maskBits, (b) => (b ? 1 : 0));
        if (!mask.some((v) => v === 1)) mask[0] = 1;
        const planeH = new Float64Array(w * h);
        for (let j = 0; j < h; j++) for (let i = 0; i < w; i++) planeH[j * w + i] = c * (0.5 + i * dx) + d * (-1 + j * dx);
        const p2 = createGrid(spec, p.data.map((v) => v + c));
        const q2 = createGrid(spec, q.data.map((v) => v + d));
        const a = integrateLeastSquares(p, q, { mask, tolerance: 1e-13, maxIterations: 1000 });
        const b = integrateLeastSquares(p2, q2, { mask, tolerance: 1e-13, maxIterations: 1000 });
        const diff = b.height.data.map((v, k) => v - a.height.data[k]!);
        expectPiecewise(diff, planeH, a.labels, a.pieces.length, 1e-8 * (1 + Math.abs(c) + Math.abs(d)) * (1 + w * dx));
        const da = integrateDctPoisson(p, q).height.data;
        const db = integrateDctPoisson(p2, q2).height.data;
        expect(maxDiffUpToPiston(db.map((v, k) => v - da[k]!), planeH)).toBeLessThan(1e-9 * (1 + w * dx) * (1 + Math.abs(c) + Math.abs(d)));
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});
