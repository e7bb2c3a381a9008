/**
 * Bench cases of the sensor-geometry, modal and scattered integrators. The peers script
 * has no counterpart for these, so they are timed on their own (no ratio).
 *
 * integrate.southwell: N × N apertures on the unit square, slopes of
 *   h = exp(−((x−0.1)² + (y+0.05)²)/0.08) + 0.3 sin 3x cos 2y sampled at the apertures,
 *   a centred disc footprint of radius 0.48 with 3 % of apertures dropped (seed 11).
 * integrate.zernike: N × N grid over a disc, 36 Noll terms of a random expansion (seed 9).
 * integrate.scattered: an N × N grid on the unit square, 4 N² random sample points (seed 7)
 *   of h = sin 2x cos 3y + 0.5 xy.
 * error: RMS height error (piston removed) over the reported samples, metres.
 */
import type { BenchCase } from '../case.js';
import { createGrid, createRng, gridFromFunction, type Grid } from '../../src/core/index.js';
import { integrateSouthwell } from '../../src/integrate/zonal.js';
import { evaluateZernike, integrateZernike } from '../../src/integrate/modal.js';
import { integrateScattered } from '../../src/integrate/scattered.js';
import type { IntegrationResult } from '../../src/integrate/types.js';

function rmsError(r: IntegrationResult, truth: (x: number, y: number) => number): number {
  const h = r.height;
  let mean = 0;
  let n = 0;
  for (let k = 0; k < h.data.length; k++) {
    if (!r.mask[k]) continue;
    mean += truth(h.x0 + (k % h.width) * h.dx, h.y0 + Math.floor(k / h.width) * h.dy) - h.data[k]!;
    n++;
  }
  mean /= n;
  let s = 0;
  for (let k = 0; k < h.data.length; k++) {
    if (!r.mask[k]) continue;
    s += (truth(h.x0 + (k % h.width) * h.dx, h.y0 + Math.floor(k / h.width) * h.dy) - h.data[k]! - mean) ** 2;
  }
  return Math.sqrt(s / n);
}

const g = (x: number, y: number): number => Math.exp(-((x - 0.1) ** 2 + (y + 0.05) ** 2) / 0.08);
const f1 = (x: number, y: number): number => g(x, y) + 0.3 * Math.sin(3 * x) * Math.cos(2 * y);
const f1x = (x: number, y: number): number => ((-2 * (x - 0.1)) / 0.08) * g(x, y) + 0.9 * Math.cos(3 * x) * Math.cos(2 * y);
const f1y = (x: number, y: number): number => ((-2 * (y + 0.05)) / 0.08) * g(x, y) - 0.6 * Math.sin(3 * x) * Math.sin(2 * y);

export const cases: BenchCase[] = [
  {
    name: 'integrate.southwell',
    size: 128,
    quickSize: 16,
    prepare(n: number) {
      const spec = { width: n, height: n, dx: 1 / (n - 1), x0: -0.5, y0: -0.5 };
      const p = gridFromFunction(spec, f1x);
      const q = gridFromFunction(spec, f1y);
      const mask = new Uint8Array(n * n);
      const rng = createRng(11);
      for (let k = 0; k < n * n; k++) {
        const x = -0.5 + (k % n) * spec.dx;
        const y = -0.5 + Math.floor(k / n) * spec.dx;
        mask[k] = Math.hypot(x, y) <= 0.48 && rng.random() >= 0.03 ? 1 : 0;
      }
      let iterations = 0;
      return {
        run: () => integrateSouthwell(p, q, { mask }),
        error: (r: unknown) => {
          iterations = (r as IntegrationResult).iterations;
          return rmsError(r as IntegrationResult, f1);
        },
        notes: (ms: number) => `${iterations} PCG iterations, ${((n * n) / ms / 1000).toFixed(2)} M apertures/s`,
      };
    },
  },
  {
    name: 'integrate.zernike',
    size: 128,
    quickSize: 16,
    prepare(n: number) {
      const terms = 36;
      const c = new Float64Array(terms);
      const rng = createRng(9);
      for (let t = 1; t < terms; t++) c[t] = rng.normal(0, 1e-6);
      const dx = 2 / (n - 1);
      const xs = new Float64Array(n * n);
      const ys = new Float64Array(n * n);
      const mask = new Uint8Array(n * n);
      for (let k = 0; k < n * n; k++) {
        xs[k] = -1 + (k % n) * dx;
        ys[k] = -1 + Math.floor(k / n) * dx;
        mask[k] = Math.hypot(xs[k]!, ys[k]!) <= 1 ? 1 : 0;
      }
      const disc = { center: [0, 0] as [number, number], radius: 1 };
      const e = evaluateZernike(c, xs, ys, disc);
      const spec = { width: n, height: n, dx, x0: -1, y0: -1 };
      const p: Grid = createGrid(spec, e.p);
      const q: Grid = createGrid(spec, e.q);
      return {
        run: () => integrateZernike(p, q, { mask, terms, ...disc }),
        error: (r: unknown) => {
          const res = r as IntegrationResult & { coefficients: Float64Array };
          let worst = 0;
          for (let t = 1; t < terms; t++) worst = Math.max(worst, Math.abs(res.coefficients[t]! - c[t]!));
          return worst;
        },
      };
    },
  },
  {
    name: 'integrate.scattered',
    size: 129,
    quickSize: 9,
    prepare(n: number) {
      const m = 4 * n * n;
      const rng = createRng(7);
      const x = new Float64Array(m);
      const y = new Float64Array(m);
      const p = new Float64Array(m);
      const q = new Float64Array(m);
      for (let s = 0; s < m; s++) {
        x[s] = rng.random();
        y[s] = rng.random();
        p[s] = 2 * Math.cos(2 * x[s]!) * Math.cos(3 * y[s]!) + 0.5 * y[s]!;
        q[s] = -3 * Math.sin(2 * x[s]!) * Math.sin(3 * y[s]!) + 0.5 * x[s]!;
      }
      let iterations = 0;
      return {
        run: () => integrateScattered({ x, y, p, q }, { width: n, height: n, dx: 1 / (n - 1) }, { region: 'grid' }),
        error: (r: unknown) => {
          iterations = (r as IntegrationResult).iterations;
          return rmsError(r as IntegrationResult, (a, b) => Math.sin(2 * a) * Math.cos(3 * b) + 0.5 * a * b);
        },
        notes: (ms: number) => `${iterations} PCG iterations, ${(m / ms / 1000).toFixed(2)} M samples/s`,
      };
    },
  },
];
