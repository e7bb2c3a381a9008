import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createGrid, gridFromFunction, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  createGaussianSurface,
  createGridSurface,
  createPlaneSurface,
  createSinusoidSurface,
  surfaceNormal,
} from '../../src/surface/index.js';
import type { Surface } from '../../src/surface/index.js';

const g2 = new Float64Array(2);

// A biquadratic: Keys cubic convolution (a = -1/2) reproduces polynomials of degree
// <= 2 exactly in each axis, and so does its boundary rule f(-1) = 3f0 - 3f1 + f2
// (Keys 1981, IEEE Trans. ASSP 29(6), §III and eq. (25)).
const quad = (x: number, y: number): number => 0.3 + 0.2 * x - 0.1 * y + 0.05 * x * x - 0.07 * x * y + 0.04 * y * y + 0.01 * x * x * y * y;
const quadGrad = (x: number, y: number): [number, number] => [
  0.2 + 0.1 * x - 0.07 * y + 0.02 * x * y * y,
  -0.1 - 0.07 * x + 0.08 * y + 0.02 * x * x * y,
];

describe('createGridSurface (bicubic)', () => {
  const spec = { width: 9, height: 7, dx: 0.5, dy: 0.4, x0: -1, y0: 0.5 };
  const s = createGridSurface(gridFromFunction(spec, quad));

  it('reproduces a biquadratic exactly, edges included (Keys 1981: third-order kernel and boundary rule)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (a, b) => {
        const x = s.bounds.xMin + a * (s.bounds.xMax - s.bounds.xMin);
        const y = s.bounds.yMin + b * (s.bounds.yMax - s.bounds.yMin);
        const h = s.heightGradient(x, y, g2);
        const [p, q] = quadGrad(x, y);
        expect(h).toBeCloseTo(quad(x, y), 12);
        expect(g2[0]).toBeCloseTo(p, 11);
        expect(g2[1]).toBeCloseTo(q, 11);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('converges at third order on a smooth field (Keys 1981: O(h^3) interpolation error)', () => {
    const f = (x: number, y: number): number => Math.sin(3 * x) * Math.cos(2 * y);
    const err = (n: number): number => {
      const d = 1 / (n - 1);
      const sf = createGridSurface(gridFromFunction({ width: n, height: n, dx: d }, f));
      let e = 0;
      for (let k = 0; k < 500; k++) {
        const x = 0.2 + 0.6 * ((k * 0.618034) % 1);
        const y = 0.2 + 0.6 * ((k * 0.414214) % 1);
        e = Math.max(e, Math.abs(sf.height(x, y) - f(x, y)));
      }
      return e;
    };
    const ratio = err(17) / err(33);
    expect(ratio).toBeGreaterThan(6); // 8 for exact third order
    expect(ratio).toBeLessThan(20);
  });

  it('has continuous slopes across cell edges (C1)', () => {
    const sf = createGridSurface(gridFromFunction({ width: 12, height: 12, dx: 0.1 }, (x, y) => Math.sin(7 * x + 3 * y)));
    const a = new Float64Array(2);
    const b = new Float64Array(2);
    for (let i = 1; i < 11; i++) {
      const x = i * 0.1;
      const y = 0.537;
      // 2e-12 apart: a continuous slope (|p| <= 7, |p'| <= 49) differs by < 1e-10.
      const ha = sf.heightGradient(x - 1e-12, y, a);
      const hb = sf.heightGradient(x + 1e-12, y, b);
      expect(Math.abs(ha - hb)).toBeLessThan(1e-10);
      expect(Math.abs(a[0]! - b[0]!)).toBeLessThan(1e-9);
      expect(Math.abs(a[1]! - b[1]!)).toBeLessThan(1e-9);
    }
  });

  it.each(['bicubic', 'bspline'] as const)('%s: gives a gradient that is the derivative of its height, and respects its own bounds', (interpolation) => {
    const rough = createGrid({ width: 20, height: 16, dx: 0.01 });
    for (let k = 0; k < rough.data.length; k++) rough.data[k] = Math.sin(k * 12.9898) * 0.003;
    const sf = createGridSurface(rough, { interpolation });
    fc.assert(
      fc.property(fc.double({ min: 0.001, max: 0.999, noNaN: true }), fc.double({ min: 0.001, max: 0.999, noNaN: true }), (a, b) => {
        const x = a * sf.bounds.xMax;
        const y = b * sf.bounds.yMax;
        const e = 1e-7;
        const h = sf.heightGradient(x, y, g2);
        const fdx = (sf.height(x + e, y) - sf.height(x - e, y)) / (2 * e);
        const fdy = (sf.height(x, y + e) - sf.height(x, y - e)) / (2 * e);
        expect(Math.abs(g2[0]! - fdx)).toBeLessThan(1e-5);
        expect(Math.abs(g2[1]! - fdy)).toBeLessThan(1e-5);
        expect(h).toBeGreaterThanOrEqual(sf.bounds.zMin);
        expect(h).toBeLessThanOrEqual(sf.bounds.zMax);
        expect(Math.hypot(g2[0]!, g2[1]!)).toBeLessThanOrEqual(sf.maxSlope);
      }),
      { seed: 42, numRuns: 300 },
    );
  });

  it('clamps outside the domain: height and slopes of the nearest domain point', () => {
    const h = s.heightGradient(s.bounds.xMin - 3, 0.9, g2);
    expect(h).toBeCloseTo(quad(s.bounds.xMin, 0.9), 12);
    expect(g2[0]).toBeCloseTo(quadGrad(s.bounds.xMin, 0.9)[0], 11);
    expect(g2[1]).toBeCloseTo(quadGrad(s.bounds.xMin, 0.9)[1], 11);
    const h2 = s.heightGradient(s.bounds.xMax + 1, s.bounds.yMax + 1, g2);
    expect(h2).toBeCloseTo(quad(s.bounds.xMax, s.bounds.yMax), 12);
    expect(g2[0]).toBeCloseTo(quadGrad(s.bounds.xMax, s.bounds.yMax)[0], 11);
  });

  it('copies its samples', () => {
    const g = gridFromFunction({ width: 4, height: 4 }, () => 1);
    const sf = createGridSurface(g);
    g.data.fill(5);
    expect(sf.height(1.5, 1.5)).toBeCloseTo(1, 14);
  });

  it('refuses bad grids and options with the library errors', () => {
    expect(() => createGridSurface(createGrid({ width: 1, height: 5 }))).toThrow(MeniscusRangeError);
    const bad = createGrid({ width: 3, height: 3 });
    bad.data[4] = NaN;
    expect(() => createGridSurface(bad)).toThrow(MeniscusRangeError);
    expect(() => createGridSurface({} as never)).toThrow(MeniscusTypeError);
    expect(() => createGridSurface(createGrid({ width: 3, height: 3 }), { interpolation: 'nearest' as never })).toThrow(MeniscusRangeError);
  });
});

describe('createGridSurface (bicubic), large grids', () => {
  // Grids beyond 65 536 cells are evaluated from the samples' weights instead of
  // per-cell power-basis coefficients; Keys' kernel is local, so inside a sub-grid both
  // must give the same interpolant.
  it('agrees with the per-cell coefficient form on a sub-grid (interior cells)', () => {
    const f = (x: number, y: number): number => 0.002 * Math.sin(40 * x + 7 * y) + 0.001 * Math.cos(23 * y - 5 * x);
    const big = createGridSurface(gridFromFunction({ width: 300, height: 300, dx: 0.004 }, f));
    const small = createGridSurface(gridFromFunction({ width: 40, height: 40, dx: 0.004 }, f));
    const a = new Float64Array(2), b = new Float64Array(2);
    for (let k = 0; k < 400; k++) {
      const x = 0.02 + 0.11 * ((k * 0.618034) % 1), y = 0.02 + 0.11 * ((k * 0.414214) % 1);
      const ha = big.heightGradient(x, y, a), hb = small.heightGradient(x, y, b);
      expect(Math.abs(ha - hb)).toBeLessThan(1e-15);
      expect(Math.abs(a[0]! - b[0]!)).toBeLessThan(1e-12);
      expect(Math.abs(a[1]! - b[1]!)).toBeLessThan(1e-12);
    }
  });
});

describe('createGridSurface (bspline)', () => {
  const opts = { interpolation: 'bspline' } as const;
  it('passes through every sample and reproduces planes exactly (natural cubic spline: de Boor 1978, ch. IV)', () => {
    const g = createGrid({ width: 9, height: 7, dx: 0.1, dy: 0.2, x0: -0.3, y0: 0.1 });
    for (let k = 0; k < g.data.length; k++) g.data[k] = Math.sin(k * 12.9898) * 0.01;
    const sf = createGridSurface(g, opts);
    for (let j = 0; j < 7; j++) for (let i = 0; i < 9; i++) expect(sf.height(-0.3 + 0.1 * i, 0.1 + 0.2 * j)).toBeCloseTo(g.data[j * 9 + i]!, 14);
    const plane = createGridSurface(gridFromFunction({ width: 6, height: 5, dx: 0.05 }, (x, y) => 0.01 + 0.2 * x - 0.3 * y), opts);
    for (let k = 0; k < 200; k++) {
      const x = 0.25 * ((k * 0.618034) % 1), y = 0.2 * ((k * 0.414214) % 1);
      const h = plane.heightGradient(x, y, g2);
      expect(h).toBeCloseTo(0.01 + 0.2 * x - 0.3 * y, 14);
      expect(g2[0]).toBeCloseTo(0.2, 13);
      expect(g2[1]).toBeCloseTo(-0.3, 13);
    }
  });

  it('converges at fourth order inside the domain (cubic spline interpolation: O(h^4), de Boor 1978)', () => {
    const f = (x: number, y: number): number => Math.sin(3 * x) * Math.cos(2 * y);
    const err = (n: number): number => {
      const d = 1 / (n - 1);
      const sf = createGridSurface(gridFromFunction({ width: n, height: n, dx: d }, f), opts);
      let e = 0;
      for (let k = 0; k < 500; k++) {
        const x = 0.3 + 0.4 * ((k * 0.618034) % 1);
        const y = 0.3 + 0.4 * ((k * 0.414214) % 1);
        e = Math.max(e, Math.abs(sf.height(x, y) - f(x, y)));
      }
      return e;
    };
    const ratio = err(17) / err(33);
    expect(ratio).toBeGreaterThan(12); // 16 for exact fourth order
    expect(ratio).toBeLessThan(24);
  });

  it('has continuous curvature across cell edges (C2), unlike the C1 Keys interpolant', () => {
    const g = gridFromFunction({ width: 12, height: 12, dx: 0.1 }, (x, y) => Math.sin(7 * x + 3 * y));
    const jump = (sf: Surface): number => {
      // Second derivative along x from the analytic slopes, just left and right of each cell edge.
      const a = new Float64Array(2), b = new Float64Array(2), c = new Float64Array(2), d = new Float64Array(2);
      let worst = 0;
      for (let i = 2; i < 10; i++) {
        const x = i * 0.1, e = 1e-7;
        sf.gradient(x - 2 * e, 0.537, a);
        sf.gradient(x - e, 0.537, b);
        sf.gradient(x + e, 0.537, c);
        sf.gradient(x + 2 * e, 0.537, d);
        worst = Math.max(worst, Math.abs((d[0]! - c[0]!) / e - (b[0]! - a[0]!) / e));
      }
      return worst;
    };
    expect(jump(createGridSurface(g, opts))).toBeLessThan(1e-3);
    expect(jump(createGridSurface(g))).toBeGreaterThan(1); // Keys: the curvature jumps at cell edges
  });

});

describe('createGridSurface (bilinear)', () => {
  it('is exact for a bilinear field a + bx + cy + dxy (common practice: definition of bilinear interpolation)', () => {
    const f = (x: number, y: number): number => 1 - 0.5 * x + 0.25 * y + 0.125 * x * y;
    const s = createGridSurface(gridFromFunction({ width: 5, height: 6, dx: 0.3 }, f), { interpolation: 'bilinear' });
    for (let k = 0; k < 50; k++) {
      const x = 1.2 * ((k * 0.618) % 1);
      const y = 1.5 * ((k * 0.414) % 1);
      expect(s.heightGradient(x, y, g2)).toBeCloseTo(f(x, y), 13);
      expect(g2[0]).toBeCloseTo(-0.5 + 0.125 * y, 12);
      expect(g2[1]).toBeCloseTo(0.25 + 0.125 * x, 12);
      expect(Math.hypot(g2[0]!, g2[1]!)).toBeLessThanOrEqual(s.maxSlope);
    }
  });
});

describe('analytic surfaces', () => {
  const domain = { xMin: -1, xMax: 1, yMin: -1, yMax: 1 };
  const surfaces: [string, Surface][] = [
    ['plane', createPlaneSurface({ height: 0.1, slopeX: 0.2, slopeY: -0.3, domain })],
    [
      'sinusoids',
      createSinusoidSurface({
        components: [
          { amplitude: 0.01, kx: 20, ky: 5, phase: 0.3, omega: 14 },
          { amplitude: -0.004, kx: -7, ky: 31, omega: 17.4 },
        ],
        time: 0.37,
        domain,
      }),
    ],
    [
      'gaussian bumps',
      createGaussianSurface({
        bumps: [
          { amplitude: 0.05, x: 0.1, y: -0.2, sigmaX: 0.1, sigmaY: 0.2 },
          { amplitude: -0.02, x: -0.4, y: 0.3, sigmaX: 0.05 },
        ],
        height: -0.01,
        domain,
      }),
    ],
  ];
  for (const [name, s] of surfaces) {
    it(`${name}: gradient is the derivative of the height; bounds hold`, () => {
      fc.assert(
        fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), (x, y) => {
          const e = 1e-6;
          const h = s.heightGradient(x, y, g2);
          expect(h).toBe(s.height(x, y));
          const fdx = (s.height(x + e, y) - s.height(x - e, y)) / (2 * e);
          const fdy = (s.height(x, y + e) - s.height(x, y - e)) / (2 * e);
          expect(Math.abs(g2[0]! - fdx)).toBeLessThan(1e-6);
          expect(Math.abs(g2[1]! - fdy)).toBeLessThan(1e-6);
          expect(h).toBeGreaterThanOrEqual(s.bounds.zMin - 1e-15);
          expect(h).toBeLessThanOrEqual(s.bounds.zMax + 1e-15);
          expect(Math.hypot(g2[0]!, g2[1]!)).toBeLessThanOrEqual(s.maxSlope + 1e-15);
        }),
        { seed: 42, numRuns: 200 },
      );
    });
  }

  it('a travelling sinusoid moves at its phase speed omega/k (Airy 1845: linear progressive wave)', () => {
    const k = 2 * Math.PI / 0.1;
    const omega = 25;
    const at = (t: number): Surface => createSinusoidSurface({ components: [{ amplitude: 0.003, kx: k, omega }], time: t, domain });
    const c = omega / k;
    const s0 = at(0);
    const s1 = at(0.013);
    for (const x of [-0.3, 0, 0.21]) expect(s1.height(x + c * 0.013, 0.4)).toBeCloseTo(s0.height(x, 0.4), 14);
  });

  it('normal convention n = (-p, -q, 1)/sqrt(1 + p^2 + q^2) (DESIGN.md)', () => {
    const s = createPlaneSurface({ slopeX: 1, domain });
    const n = surfaceNormal(s, 0, 0);
    expect(n[0]).toBeCloseTo(-Math.SQRT1_2, 15);
    expect(n[1]).toBe(-0);
    expect(n[2]).toBeCloseTo(Math.SQRT1_2, 15);
  });

  it('refuses bad input', () => {
    expect(() => createPlaneSurface({} as never)).toThrow(MeniscusRangeError);
    expect(() => createPlaneSurface({ domain: { xMin: 1, xMax: 0, yMin: 0, yMax: 1 } })).toThrow(MeniscusRangeError);
    expect(() => createPlaneSurface({ height: NaN, domain })).toThrow(MeniscusRangeError);
    expect(() => createSinusoidSurface({ components: [], domain })).toThrow(MeniscusTypeError);
    expect(() => createGaussianSurface({ bumps: [{ amplitude: 1, x: 0, y: 0, sigmaX: 0 }], domain })).toThrow(MeniscusRangeError);
  });
});

describe('heightGradientMany (the batch form of heightGradient)', () => {
  // Contract of Surface.heightGradientMany: exactly the numbers of heightGradient, point by
  // point (the ray kernels switch between the two forms).
  const f = (x: number, y: number): number => 0.002 * Math.sin(40 * x + 7 * y) + 0.001 * Math.cos(23 * y - 5 * x);
  const cases: [string, Surface][] = [
    ['bicubic', createGridSurface(gridFromFunction({ width: 30, height: 20, dx: 0.004 }, f))],
    ['bspline', createGridSurface(gridFromFunction({ width: 30, height: 20, dx: 0.004 }, f), { interpolation: 'bspline' })],
    ['bilinear', createGridSurface(gridFromFunction({ width: 30, height: 20, dx: 0.004 }, f), { interpolation: 'bilinear' })],
    ['bicubic, large grid (weights form)', createGridSurface(gridFromFunction({ width: 300, height: 300, dx: 0.004 }, f))],
  ];
  for (const [name, s] of cases) {
    it(`${name}: equals heightGradient bit for bit, outside the domain too (clamped)`, () => {
      expect(typeof s.heightGradientMany).toBe('function');
      const n = 257;
      const xy = new Float64Array(2 * n);
      for (let k = 0; k < n; k++) {
        xy[2 * k] = -0.01 + 0.14 * ((k * 0.618034) % 1);
        xy[2 * k + 1] = -0.01 + 0.1 * ((k * 0.414214) % 1);
      }
      const before = xy.slice();
      const out = new Float64Array(3 * n);
      s.heightGradientMany!(xy, n, out);
      expect(xy).toEqual(before); // input not mutated
      const g = new Float64Array(2);
      for (let k = 0; k < n; k++) {
        const h = s.heightGradient(xy[2 * k]!, xy[2 * k + 1]!, g);
        expect(out[3 * k]).toBe(h);
        expect(out[3 * k + 1]).toBe(g[0]);
        expect(out[3 * k + 2]).toBe(g[1]);
      }
    });
  }

  it('refuses bad arguments by name, once a call', () => {
    const s = cases[0]![1];
    const xy = new Float64Array(8), out = new Float64Array(12);
    expect(() => s.heightGradientMany!([0, 0] as never, 1, out)).toThrow(/xy/);
    expect(() => s.heightGradientMany!(xy, 5, out)).toThrow(MeniscusRangeError); // 4 points in xy
    expect(() => s.heightGradientMany!(xy, 1.5, out)).toThrow(/\bn\b/);
    expect(() => s.heightGradientMany!(xy, 4, new Float64Array(11))).toThrow(/out\.length/);
    expect(() => s.heightGradientMany!(xy, 4, [] as never)).toThrow(MeniscusTypeError);
    s.heightGradientMany!(xy, 0, new Float64Array(0)); // nothing asked, nothing written
  });

  it('is optional: surfaces without it are accepted; a non-function is refused by name', async () => {
    const { checkSurface } = await import('../../src/surface/index.js');
    const plane = createPlaneSurface({ slopeX: 0.1, domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } });
    expect(plane.heightGradientMany).toBeUndefined();
    expect(checkSurface('f', 'surface', plane)).toBe(plane);
    expect(() => checkSurface('f', 'surface', { ...plane, heightGradientMany: 3 })).toThrow(/surface\.heightGradientMany/);
  });
});
