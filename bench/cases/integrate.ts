/**
 * Benchmarks of the integrators, with the inputs of the numpy/scipy peer
 * (`../shared/peers/peers.py`, cases integrate.*): same surfaces, sizes, masks (the
 * 5 % random removals drawn from the core seeded generator) and error figure (RMS height
 * error after removing the mean, over the valid samples, divided by the RMS height).
 * The two transform solvers are timed after five untimed calls (their steady state, as a
 * per-frame caller sees it; V8 is still optimising their kernels over the first calls),
 * over eleven runs, since their times swing with the garbage collector.
 */
import { createGrid, createRng, type Grid, type Mask } from '../../src/core/index.js';
import {
  integrateDctPoisson,
  integrateFrankotChellappa,
  integrateLeastSquares,
  prepareLeastSquares,
  type IntegrationResult,
} from '../../src/integrate/index.js';
import type { BenchCase } from '../case.js';

function relError(z: Float64Array, h: Float64Array, mask?: Mask): number {
  let mz = 0;
  let mh = 0;
  let c = 0;
  for (let k = 0; k < z.length; k++) {
    if (mask && !mask[k]) continue;
    mz += z[k]!;
    mh += h[k]!;
    c++;
  }
  mz /= c;
  mh /= c;
  let e = 0;
  let s = 0;
  for (let k = 0; k < z.length; k++) {
    if (mask && !mask[k]) continue;
    e += (z[k]! - mz - (h[k]! - mh)) ** 2;
    s += (h[k]! - mh) ** 2;
  }
  return Math.sqrt(e / s);
}

/** The peer's periodic surface on the unit square, x = i/n. */
function periodicSurface(n: number): { h: Float64Array; p: Grid; q: Grid } {
  const k1 = 2 * Math.PI * 3;
  const k2 = 2 * Math.PI * 5;
  const k3 = 2 * Math.PI * 7;
  const h = new Float64Array(n * n);
  const p = createGrid({ width: n, height: n, dx: 1 / n });
  const q = createGrid({ width: n, height: n, dx: 1 / n });
  for (let j = 0; j < n; j++) {
    const Y = j / n;
    for (let i = 0; i < n; i++) {
      const X = i / n;
      const k = j * n + i;
      h[k] = 0.01 * Math.sin(k1 * X) * Math.cos(k2 * Y) + 0.004 * Math.cos(k3 * (X + Y));
      p.data[k] = 0.01 * k1 * Math.cos(k1 * X) * Math.cos(k2 * Y) - 0.004 * k3 * Math.sin(k3 * (X + Y));
      q.data[k] = -0.01 * k2 * Math.sin(k1 * X) * Math.sin(k2 * Y) - 0.004 * k3 * Math.sin(k3 * (X + Y));
    }
  }
  return { h, p, q };
}

/** The peer's non-periodic surface, x = linspace(0, 1, n). */
function nonperiodicSurface(n: number): { h: Float64Array; p: Grid; q: Grid } {
  const d = 1 / (n - 1);
  const h = new Float64Array(n * n);
  const p = createGrid({ width: n, height: n, dx: d });
  const q = createGrid({ width: n, height: n, dx: d });
  for (let j = 0; j < n; j++) {
    const Y = j * d;
    for (let i = 0; i < n; i++) {
      const X = i * d;
      const k = j * n + i;
      const g = Math.exp(-((X - 0.4) ** 2 + (Y - 0.6) ** 2) / 0.02);
      h[k] = 0.02 * g + 0.01 * X - 0.005 * Y + 0.003 * Math.sin(9 * X) * Math.cos(5 * Y);
      p.data[k] = 0.02 * g * ((-2 * (X - 0.4)) / 0.02) + 0.01 + 0.003 * 9 * Math.cos(9 * X) * Math.cos(5 * Y);
      q.data[k] = 0.02 * g * ((-2 * (Y - 0.6)) / 0.02) - 0.005 - 0.003 * 5 * Math.sin(9 * X) * Math.sin(5 * Y);
    }
  }
  return { h, p, q };
}

/** Disc of radius 0.45 n, 5 % of pixels removed at random (seed 7), largest 4-connected piece. */
function peerMask(n: number): Mask {
  const rng = createRng(7);
  const m = new Uint8Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const inDisc = (i - n / 2 + 0.5) ** 2 + (j - n / 2 + 0.5) ** 2 <= (0.45 * n) ** 2;
      const keep = rng.random() >= 0.05; // drawn for every pixel, in row-major order
      m[j * n + i] = inDisc && keep ? 1 : 0;
    }
  }
  const label = new Int32Array(n * n);
  const stack = new Int32Array(n * n);
  let best = 0;
  let bestSize = 0;
  let next = 0;
  for (let s = 0; s < n * n; s++) {
    if (!m[s] || label[s]) continue;
    next++;
    let top = 0;
    let size = 0;
    stack[top++] = s;
    label[s] = next;
    while (top > 0) {
      const k = stack[--top]!;
      size++;
      const i = k % n;
      const nb = [i > 0 ? k - 1 : -1, i + 1 < n ? k + 1 : -1, k - n, k + n];
      for (const t of nb) {
        if (t >= 0 && t < n * n && m[t] && !label[t]) {
          label[t] = next;
          stack[top++] = t;
        }
      }
    }
    if (size > bestSize) {
      bestSize = size;
      best = next;
    }
  }
  for (let s = 0; s < n * n; s++) m[s] = label[s] === best ? 1 : 0;
  return m;
}

const mib = (bytes: number) => (bytes / 2 ** 20).toFixed(1);

export const cases: BenchCase[] = [
  {
    name: 'integrate.fft-periodic',
    size: 1024,
    quickSize: 64,
    warmup: 5,
    iterations: 11,
    prepare(n) {
      const { h, p, q } = periodicSurface(n);
      return {
        run: () => integrateFrankotChellappa(p, q),
        error: (r) => relError((r as IntegrationResult).height.data, h),
      };
    },
  },
  {
    name: 'integrate.dct-neumann',
    size: 1024,
    quickSize: 64,
    warmup: 5,
    iterations: 11,
    prepare(n) {
      const { h, p, q } = nonperiodicSurface(n);
      return {
        run: () => integrateDctPoisson(p, q),
        error: (r) => relError((r as IntegrationResult).height.data, h),
      };
    },
  },
  {
    name: 'integrate.lsq-masked',
    size: 512,
    quickSize: 48,
    iterations: 3,
    prepare(n) {
      const { h, p, q } = nonperiodicSurface(n);
      const mask = peerMask(n);
      let its = 0;
      return {
        run: () => {
          const r = integrateLeastSquares(p, q, { mask });
          its = r.iterations;
          return r;
        },
        error: (r) => relError((r as IntegrationResult).height.data, h, mask),
        notes: (ms) => `${its} PCG iterations, ${((mask.reduce((a, v) => a + v, 0) / ms) * 1e-3).toFixed(2)} M samples/s`,
      };
    },
  },
  {
    name: 'integrate.lsq-masked.prepared',
    size: 512,
    quickSize: 48,
    prepare(n) {
      const { h, p, q } = nonperiodicSurface(n);
      const mask = peerMask(n);
      const t0 = performance.now();
      const solver = prepareLeastSquares(p, { mask });
      const setupMs = performance.now() - t0;
      const out = new Float64Array(n * n);
      return {
        run: () => solver.solve(p, q, { out }),
        error: (r) => relError((r as IntegrationResult).height.data, h, mask),
        notes: () => `set-up ${setupMs.toFixed(1)} ms (not in the per-frame time)`,
      };
    },
  },
  {
    // Peak memory of the DCT solver on 2048²: with the garbage collector exposed (V8
    // flag set at run time), collect, read process.memoryUsage().arrayBuffers, run the
    // solver once and read it again before anything is collected. Every typed array the
    // solver allocates (output, mask, transform plans and tiles) is counted, whether it
    // is kept or already garbage, so the difference bounds its peak from above.
    name: 'integrate.dct-neumann.memory',
    size: 2048,
    quickSize: 64,
    iterations: 1,
    async prepare(n) {
      const { h, p, q } = nonperiodicSurface(n);
      const inputBytes = p.data.byteLength + q.data.byteLength;
      const v8 = await import('node:v8');
      const vm = await import('node:vm');
      v8.setFlagsFromString('--expose-gc');
      const gc = vm.runInNewContext('gc') as () => void;
      gc();
      const before = process.memoryUsage().arrayBuffers;
      const r = integrateDctPoisson(p, q);
      const during = process.memoryUsage().arrayBuffers;
      const extra = during - before;
      const note = `inputs p, q ${mib(inputBytes)} MiB; solver's arrays ${mib(extra)} MiB = ${(extra / inputBytes).toFixed(2)}× the inputs (output ${mib(r.height.data.byteLength)} MiB of it)`;
      return {
        run: () => integrateDctPoisson(p, q),
        error: (res) => relError((res as IntegrationResult).height.data, h),
        notes: () => note,
      };
    },
  },
];
