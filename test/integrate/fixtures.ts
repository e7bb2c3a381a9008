/**
 * Analytic test surfaces with exact gradients, and small helpers shared by the
 * integrator tests.
 */
import { createGrid, type Grid, type Mask } from '../../src/core/index.js';

/** A surface h(x, y) with its exact gradient. */
export interface Surface {
  h(x: number, y: number): number;
  p(x: number, y: number): number;
  q(x: number, y: number): number;
}

/** Gaussian bump A·exp(−((x−a)² + (y−b)²)/(2s²)); gradient by calculus. */
export function gaussian(A: number, a: number, b: number, s: number): Surface {
  const g = (x: number, y: number) => A * Math.exp(-((x - a) ** 2 + (y - b) ** 2) / (2 * s * s));
  return { h: g, p: (x, y) => (-(x - a) / (s * s)) * g(x, y), q: (x, y) => (-(y - b) / (s * s)) * g(x, y) };
}

/** Tilted plane c + a·x + b·y. */
export function plane(a: number, b: number, c = 0): Surface {
  return { h: (x, y) => c + a * x + b * y, p: () => a, q: () => b };
}

/** Separable sinusoid A·sin(kx·x + φ)·cos(ky·y). */
export function sinusoid(A: number, kx: number, ky: number, phase = 0): Surface {
  return {
    h: (x, y) => A * Math.sin(kx * x + phase) * Math.cos(ky * y),
    p: (x, y) => A * kx * Math.cos(kx * x + phase) * Math.cos(ky * y),
    q: (x, y) => -A * ky * Math.sin(kx * x + phase) * Math.sin(ky * y),
  };
}

/**
 * The classic `peaks` test function of MATLAB's documentation ("peaks: example function
 * of two variables"):
 * z = 3(1−x)² e^{−x²−(y+1)²} − 10(x/5 − x³ − y⁵) e^{−x²−y²} − ⅓ e^{−(x+1)²−y²},
 * usually shown on [−3, 3]². Gradient by calculus (checked against finite differences
 * in the tests).
 */
export const peaks: Surface = {
  h(x, y) {
    return (
      3 * (1 - x) ** 2 * Math.exp(-x * x - (y + 1) ** 2) -
      10 * (x / 5 - x ** 3 - y ** 5) * Math.exp(-x * x - y * y) -
      (1 / 3) * Math.exp(-((x + 1) ** 2) - y * y)
    );
  },
  p(x, y) {
    const e1 = Math.exp(-x * x - (y + 1) ** 2);
    const e2 = Math.exp(-x * x - y * y);
    const e3 = Math.exp(-((x + 1) ** 2) - y * y);
    const t = x / 5 - x ** 3 - y ** 5;
    return (-6 * (1 - x) - 6 * x * (1 - x) ** 2) * e1 - 10 * e2 * (0.2 - 3 * x * x - 2 * x * t) + (2 / 3) * (x + 1) * e3;
  },
  q(x, y) {
    const e1 = Math.exp(-x * x - (y + 1) ** 2);
    const e2 = Math.exp(-x * x - y * y);
    const e3 = Math.exp(-((x + 1) ** 2) - y * y);
    const t = x / 5 - x ** 3 - y ** 5;
    return -6 * (1 - x) ** 2 * (y + 1) * e1 - 10 * e2 * (-5 * y ** 4 - 2 * y * t) + (2 / 3) * y * e3;
  },
};

/** Sampled heights and slopes of a surface on a grid. */
export interface Sampled {
  h: Grid;
  p: Grid;
  q: Grid;
}

export function sample(s: Surface, width: number, height: number, dx: number, dy = dx, x0 = 0, y0 = 0): Sampled {
  const spec = { width, height, dx, dy, x0, y0 };
  const h = createGrid(spec);
  const p = createGrid(spec);
  const q = createGrid(spec);
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      const x = x0 + i * dx;
      const y = y0 + j * dy;
      const k = j * width + i;
      h.data[k] = s.h(x, y);
      p.data[k] = s.p(x, y);
      q.data[k] = s.q(x, y);
    }
  }
  return { h, p, q };
}

/** RMS of (a − mean a) − (b − mean b) over the mask, divided by the RMS of (b − mean b). */
export function relErrorUpToPiston(a: Float64Array, b: Float64Array, mask?: Mask): number {
  let ma = 0;
  let mb = 0;
  let c = 0;
  for (let k = 0; k < a.length; k++) {
    if (mask && mask[k] === 0) continue;
    ma += a[k]!;
    mb += b[k]!;
    c++;
  }
  ma /= c;
  mb /= c;
  let e = 0;
  let s = 0;
  for (let k = 0; k < a.length; k++) {
    if (mask && mask[k] === 0) continue;
    e += (a[k]! - ma - (b[k]! - mb)) ** 2;
    s += (b[k]! - mb) ** 2;
  }
  return Math.sqrt(e / Math.max(s, 1e-300));
}

/** Max |a − b| over the mask after removing each one's mean. */
export function maxDiffUpToPiston(a: Float64Array, b: Float64Array, mask?: Mask): number {
  let ma = 0;
  let mb = 0;
  let c = 0;
  for (let k = 0; k < a.length; k++) {
    if (mask && mask[k] === 0) continue;
    ma += a[k]!;
    mb += b[k]!;
    c++;
  }
  ma /= c;
  mb /= c;
  let m = 0;
  for (let k = 0; k < a.length; k++) {
    if (mask && mask[k] === 0) continue;
    m = Math.max(m, Math.abs(a[k]! - ma - (b[k]! - mb)));
  }
  return m;
}

/** A disc mask (radius r samples about the centre) with an optional round hole. */
export function discMask(width: number, height: number, r: number, hole?: { ci: number; cj: number; r: number }): Mask {
  const m = new Uint8Array(width * height);
  const ci = (width - 1) / 2;
  const cj = (height - 1) / 2;
  for (let j = 0; j < height; j++) {
    for (let i = 0; i < width; i++) {
      let v = (i - ci) ** 2 + (j - cj) ** 2 <= r * r ? 1 : 0;
      if (hole && (i - hole.ci) ** 2 + (j - hole.cj) ** 2 <= hole.r * hole.r) v = 0;
      m[j * width + i] = v;
    }
  }
  return m;
}

/** Observed order of convergence from errors on grids refined by `ratio`. */
export function observedOrder(e1: number, e2: number, ratio: number): number {
  return Math.log(e1 / e2) / Math.log(ratio);
}

/**
 * Slopes that fit a height map exactly under the forward-difference model
 * (p_i + p_{i+1})/2 = (h_{i+1} − h_i)/dx, built pair by pair along each row (p of the
 * first column chosen freely) and likewise along each column for q.
 */
export function exactPairSlopes(h: Grid, start = 0): { p: Grid; q: Grid } {
  const { width: w, height: H, dx, dy } = h;
  const p = createGrid(h);
  const q = createGrid(h);
  const d = h.data;
  for (let j = 0; j < H; j++) {
    p.data[j * w] = start;
    for (let i = 0; i + 1 < w; i++) {
      const k = j * w + i;
      p.data[k + 1] = (2 * (d[k + 1]! - d[k]!)) / dx - p.data[k]!;
    }
  }
  for (let i = 0; i < w; i++) {
    q.data[i] = start;
    for (let j = 0; j + 1 < H; j++) {
      const k = j * w + i;
      q.data[k + w] = (2 * (d[k + w]! - d[k]!)) / dy - q.data[k]!;
    }
  }
  return { p, q };
}

export function allFinite(a: ArrayLike<number>): boolean {
  for (let k = 0; k < a.length; k++) if (!Number.isFinite(a[k]!)) return false;
  return true;
}
