import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/index.js';
import { integrateDctPoisson, integrateFrankotChellappa, integrateLeastSquares } from '../../src/integrate/index.js';
import { gaussian, observedOrder, peaks, plane, relErrorUpToPiston, sample, sinusoid, type Surface } from './fixtures.js';

describe('the peaks fixture (formula from the MATLAB documentation of `peaks`)', () => {
  it('its analytic gradient matches central finite differences', () => {
    const rng = createRng(5);
    const e = 1e-5;
    for (let t = 0; t < 50; t++) {
      const x = rng.uniform(-3, 3);
      const y = rng.uniform(-3, 3);
      expect(peaks.p(x, y)).toBeCloseTo((peaks.h(x + e, y) - peaks.h(x - e, y)) / (2 * e), 6);
      expect(peaks.q(x, y)).toBeCloseTo((peaks.h(x, y + e) - peaks.h(x, y - e)) / (2 * e), 6);
    }
  });
  it('takes its documented values at the origin: peaks(0, 0) = 3e^{-1} − e^{-1}/3', () => {
    expect(peaks.h(0, 0)).toBeCloseTo(3 * Math.exp(-1) - Math.exp(-1) / 3, 14);
  });
});

/** Error on [−3, 3]² sampled with n points per side. */
function errorAt(n: number, surf: Surface, solve: (s: ReturnType<typeof sample>, n: number) => Float64Array, mask?: (n: number) => Uint8Array): number {
  const d = 6 / (n - 1);
  const s = sample(surf, n, n, d, d, -3, -3);
  const m = mask?.(n);
  return relErrorUpToPiston(solve(s, n), s.h.data, m);
}

/** Disc of radius 2.8 about the origin with a round hole of radius 0.7 at (1, 0.9), in world units. */
function holedDisc(n: number): Uint8Array {
  const d = 6 / (n - 1);
  const m = new Uint8Array(n * n);
  for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) {
    const x = -3 + i * d;
    const y = -3 + j * d;
    m[j * n + i] = x * x + y * y <= 2.8 * 2.8 && (x - 1) ** 2 + (y - 0.9) ** 2 > 0.49 ? 1 : 0;
  }
  return m;
}

const surfaces: Array<[string, Surface]> = [
  ['peaks', peaks],
  ['Gaussian bump', gaussian(1, 0.4, -0.5, 0.9)],
  ['separable sinusoid', sinusoid(0.5, 1.1, 0.8, 0.3)],
];

describe('second-order convergence of the forward-difference methods (observed on 3 grids)', () => {
  it.each(surfaces)('DCT Poisson, %s: error falls as dx²', (_, surf) => {
    const e = [33, 65, 129].map((n) => errorAt(n, surf, (s) => integrateDctPoisson(s.p, s.q).height.data));
    const o1 = observedOrder(e[0]!, e[1]!, 2);
    const o2 = observedOrder(e[1]!, e[2]!, 2);
    expect(Math.abs(o1 - 2)).toBeLessThan(0.2);
    expect(Math.abs(o2 - 2)).toBeLessThan(0.2);
  });

  it.each(surfaces)('masked least squares on a holed disc, %s: error falls as dx²', (_, surf) => {
    const e = [33, 65, 129].map((n) =>
      errorAt(n, surf, (s, nn) => integrateLeastSquares(s.p, s.q, { mask: holedDisc(nn), tolerance: 1e-12 }).height.data, holedDisc),
    );
    const o1 = observedOrder(e[0]!, e[1]!, 2);
    const o2 = observedOrder(e[1]!, e[2]!, 2);
    expect(Math.abs(o1 - 2)).toBeLessThan(0.25);
    expect(Math.abs(o2 - 2)).toBeLessThan(0.25);
  });

  it('a tilted plane is exact for both (the pair model has no truncation error on it)', () => {
    const s = sample(plane(0.3, -0.7, 2), 17, 11, 0.2, 0.3, -1, 4);
    const a = integrateDctPoisson(s.p, s.q).height.data;
    const b = integrateLeastSquares(s.p, s.q, { mask: holedDisc(17).subarray(0, 17 * 11), tolerance: 1e-13 });
    expect(relErrorUpToPiston(a, s.h.data)).toBeLessThan(1e-12);
    expect(relErrorUpToPiston(b.height.data, s.h.data, b.mask)).toBeLessThan(1e-10);
  });
});

describe('Frankot–Chellappa converges spectrally on a smooth periodic surface (Frankot & Chellappa 1988)', () => {
  it('h = 0.1·exp(sin 2πx + cos 2πy): error falls faster than any power of dx', () => {
    const surf: Surface = {
      h: (x, y) => 0.1 * Math.exp(Math.sin(2 * Math.PI * x) + Math.cos(2 * Math.PI * y)),
      p: (x, y) => 0.1 * 2 * Math.PI * Math.cos(2 * Math.PI * x) * Math.exp(Math.sin(2 * Math.PI * x) + Math.cos(2 * Math.PI * y)),
      q: (x, y) => -0.1 * 2 * Math.PI * Math.sin(2 * Math.PI * y) * Math.exp(Math.sin(2 * Math.PI * x) + Math.cos(2 * Math.PI * y)),
    };
    const e = [8, 16, 32].map((n) => {
      const s = sample(surf, n, n, 1 / n);
      return relErrorUpToPiston(integrateFrankotChellappa(s.p, s.q).height.data, s.h.data);
    });
    expect(observedOrder(e[0]!, e[1]!, 2)).toBeGreaterThan(6);
    expect(e[2]!).toBeLessThan(1e-12);
  });
});
