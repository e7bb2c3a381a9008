import { describe, expect, it } from 'vitest';
import { createRng, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import type { Grid } from '../../src/core/index.js';
import { integrateScattered } from '../../src/integrate/index.js';

// The slope models of the scattered integrator that the sensor's refinement relies on.
const f = (x: number, y: number): number => Math.sin(2 * x) * Math.cos(3 * y) + 0.5 * x * y;
const fx = (x: number, y: number): number => 2 * Math.cos(2 * x) * Math.cos(3 * y) + 0.5 * y;
const fy = (x: number, y: number): number => -3 * Math.sin(2 * x) * Math.sin(3 * y) + 0.5 * x;

function samplesOf(m: number, seed: number, gx = fx, gy = fy) {
  const rng = createRng(seed);
  const x = new Float64Array(m), y = new Float64Array(m), p = new Float64Array(m), q = new Float64Array(m);
  for (let s = 0; s < m; s++) {
    x[s] = rng.uniform(0, 1);
    y[s] = rng.uniform(0, 1);
    p[s] = gx(x[s]!, y[s]!);
    q[s] = gy(x[s]!, y[s]!);
  }
  return { x, y, p, q };
}
function rmsError(h: Grid, truth: (x: number, y: number) => number): number {
  const e: number[] = [];
  for (let j = 0; j < h.height; j++) for (let i = 0; i < h.width; i++) e.push(truth(h.x0 + i * h.dx, h.y0 + j * h.dy) - h.data[j * h.width + i]!);
  const mean = e.reduce((a, b) => a + b, 0) / e.length;
  return Math.sqrt(e.reduce((a, d) => a + (d - mean) ** 2, 0) / e.length);
}

describe("integrateScattered, model 'smooth'", () => {
  it('a tilted plane is recovered exactly (analytic: edge differences of a plane are its slopes)', () => {
    const plane = (x: number, y: number): number => 0.03 * x - 0.012 * y;
    const s = samplesOf(300, 1, () => 0.03, () => -0.012);
    const r = integrateScattered(s, { width: 12, height: 9, dx: 0.1, dy: 0.13 }, { region: 'grid', model: 'smooth', tolerance: 1e-15 });
    expect(rmsError(r.height, plane)).toBeLessThan(1e-13);
    expect(r.rmsResidual).toBeLessThan(1e-13);
  });

  it('converges at second order on a smooth analytic surface, as the bilinear model does (analytic surface)', () => {
    const run = (model: 'bilinear' | 'smooth'): number[] =>
      [9, 17, 33].map((G) => {
        const s = samplesOf(4 * G * G, 10 + G);
        const r = integrateScattered(s, { width: G, height: G, dx: 1 / (G - 1) }, { region: 'grid', model, smoothness: 1e-4 });
        expect(r.converged).toBe(true);
        return rmsError(r.height, f);
      });
    const sm = run('smooth'), bl = run('bilinear');
    expect(Math.log2(sm[0]! / sm[1]!)).toBeGreaterThan(1.8);
    expect(Math.log2(sm[1]! / sm[2]!)).toBeGreaterThan(1.8);
    // Dense random samples (4 a cell): both models reach the same accuracy, within 2×.
    for (let k = 0; k < 3; k++) expect(sm[k]!).toBeLessThan(2 * bl[k]!);
  });

  it('the fit changes continuously as a sample crosses a cell edge; the bilinear fit jumps (the cause of alternating refinement)', () => {
    const rng = createRng(5);
    const G = 8;
    // One sample per cell, noisy slopes: each cell's x-difference rests on its one sample.
    const m = (G - 1) * (G - 1);
    const x = new Float64Array(m), y = new Float64Array(m), p = new Float64Array(m), q = new Float64Array(m);
    for (let s = 0; s < m; s++) {
      x[s] = (s % (G - 1)) + rng.uniform(0.2, 0.8);
      y[s] = Math.floor(s / (G - 1)) + rng.uniform(0.2, 0.8);
      p[s] = rng.normal(0, 0.1);
      q[s] = rng.normal(0, 0.1);
    }
    const edge = 3; // move sample 2 of row 0 to just left / just right of the edge x = 3
    const jump = (model: 'bilinear' | 'smooth'): number => {
      const a = x.slice(), b = x.slice();
      a[2] = edge - 1e-9;
      b[2] = edge + 1e-9;
      const opts = { region: 'grid' as const, model, tolerance: 1e-13 };
      const ha = integrateScattered({ x: a, y, p, q }, { width: G, height: G, dx: 1 }, opts).height.data;
      const hb = integrateScattered({ x: b, y, p, q }, { width: G, height: G, dx: 1 }, opts).height.data;
      let d = 0;
      for (let k = 0; k < ha.length; k++) d = Math.max(d, Math.abs(ha[k]! - hb[k]!));
      return d;
    };
    expect(jump('smooth')).toBeLessThan(1e-6);
    expect(jump('bilinear')).toBeGreaterThan(1e-3);
  });

  it('an initial guess changes the iterations, not the solution', () => {
    const s = samplesOf(600, 3);
    const spec = { width: 17, height: 17, dx: 1 / 16 };
    const cold = integrateScattered(s, spec, { region: 'grid', model: 'smooth' });
    const near = cold.height.data.map((v, k) => v + 1e-3 * Math.sin(k) + 0.5);
    const warm = integrateScattered(s, spec, { region: 'grid', model: 'smooth', initialGuess: near });
    expect(warm.iterations).toBeLessThan(cold.iterations);
    for (let k = 0; k < near.length; k++) expect(Math.abs(warm.height.data[k]! - cold.height.data[k]!)).toBeLessThan(1e-8);
  });

  it('refuses a bad model or initial guess', () => {
    const s = samplesOf(20, 4);
    const spec = { width: 5, height: 5, dx: 0.25 };
    expect(() => integrateScattered(s, spec, { model: 'cubic' as never })).toThrow(MeniscusRangeError);
    expect(() => integrateScattered(s, spec, { initialGuess: new Float64Array(3) })).toThrow(MeniscusTypeError);
    expect(() => integrateScattered(s, spec, { initialGuess: new Float64Array(25).fill(NaN) })).toThrow(MeniscusRangeError);
  });
});
