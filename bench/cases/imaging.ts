/**
 * Benchmarks of the imaging area.
 *
 * rectify (peer in ../shared/peers/peers.py): an N × N image from a pinhole camera with a
 *   60° field looking straight up from 0.5 m below the mean surface, through a 64 × 64
 *   height field (smoothed Gaussian noise, about 4 mm RMS, spanning 1.2× the footprint of
 *   the view at the mean level) interpolated by the cubic B-spline, as the peer's
 *   `map_coordinates(order=3)` does, to a scene plane 10 m above the camera; n 1.333 →
 *   1.0. Here this is the exact-mode correction (every pixel traced: surface hit by
 *   safeguarded Newton, vector Snell law, the scene point, its flat-water pixel, the map
 *   inverted on one-pixel triangles and the image sampled bilinearly). The camera rays are
 *   prepared outside the timing, as the peer's directions are.
 *   error: 0, as the peer (the figure is time; the accuracy of the exact mode is checked
 *   in test/imaging against closed-form refraction and rendered truth). Seven timed runs
 *   after three untimed ones (the compiler's warm-up, which a caller correcting a
 *   sequence pays once).
 * rectify.fast: the same image in the fast mode (mesh of 8 px, quadratic map: the linear
 *   inverse plus its second-order term from the mesh's second differences); error: RMS
 *   difference of its map from the exact mode's, pixels (over pixels both cover, off
 *   folds). Each frame reuses the previous result's buffers (`options.reuse`), as a
 *   video caller does, and the timing starts after five untimed frames.
 */
import { createGrid, createImage, createRng } from '../../src/core/index.js';
import type { Grid } from '../../src/core/index.js';
import { PinholeCamera, createCameraPose } from '../../src/camera/index.js';
import { createGridSurface } from '../../src/surface/index.js';
import { prepareCorrection } from '../../src/imaging/index.js';
import type { CorrectionResult, PreparedCorrection } from '../../src/imaging/index.js';
import type { Surface } from '../../src/surface/index.js';
import type { BenchCase } from '../case.js';

/** Gaussian filter of a square array, reflecting at the edges (as scipy.ndimage, truncate 4). */
function gaussianFilter(a: Float64Array, g: number, sigma: number): Float64Array {
  const r = Math.ceil(4 * sigma);
  const k = new Float64Array(2 * r + 1);
  let s = 0;
  for (let i = -r; i <= r; i++) s += k[i + r] = Math.exp(-(i * i) / (2 * sigma * sigma));
  for (let i = 0; i < k.length; i++) k[i]! /= s;
  const refl = (i: number): number => {
    for (;;) {
      if (i < 0) i = -i - 1;
      else if (i >= g) i = 2 * g - i - 1;
      else return i;
    }
  };
  const tmp = new Float64Array(g * g), out = new Float64Array(g * g);
  for (let j = 0; j < g; j++) for (let i = 0; i < g; i++) {
    let v = 0;
    for (let t = -r; t <= r; t++) v += k[t + r]! * a[j * g + refl(i + t)]!;
    tmp[j * g + i] = v;
  }
  for (let j = 0; j < g; j++) for (let i = 0; i < g; i++) {
    let v = 0;
    for (let t = -r; t <= r; t++) v += k[t + r]! * tmp[refl(j + t) * g + i]!;
    out[j * g + i] = v;
  }
  return out;
}

interface RectifyInputs {
  camera: PinholeCamera;
  surface: Surface;
  heights: Grid;
  image: ReturnType<typeof createImage>;
  exact: PreparedCorrection;
  fast: PreparedCorrection;
}

const cache = new Map<number, RectifyInputs>();

function inputs(n: number): RectifyInputs {
  const hit = cache.get(n);
  if (hit) return hit;
  const rng = createRng(3);
  const depth = 0.5, H = 10;
  const half = depth * Math.tan(Math.PI / 6) * 1.2;
  const g = 64;
  const noise = new Float64Array(g * g);
  for (let k = 0; k < noise.length; k++) noise[k] = rng.normal();
  const hs = gaussianFilter(noise, g, 3);
  for (let k = 0; k < hs.length; k++) hs[k]! *= 0.004 * 10;
  const heights = createGrid({ width: g, height: g, dx: (2 * half) / (g - 1), x0: -half, y0: -half }, hs);
  const surface = createGridSurface(heights, { interpolation: 'bspline' });
  const image = createImage(n, n);
  for (let k = 0; k < image.data.length; k++) image.data[k] = rng.uniform();
  const f = n / 2 / Math.tan(Math.PI / 6);
  const camera = new PinholeCamera({ model: 'pinhole', fx: f, fy: f, cx: n / 2 - 0.5, cy: n / 2 - 0.5, width: n, height: n });
  const pose = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, -depth]);
  const medium = { nWater: 1.333, nAir: 1.0 };
  const target = { type: 'plane', z: H - depth } as const;
  const exact = prepareCorrection(camera, pose, target, { ...medium, mode: 'exact' });
  const fast = prepareCorrection(camera, pose, target, { ...medium, mode: 'fast', meshStep: 8, meshInterpolation: 'quadratic' });
  const r = { camera, surface, heights, image, exact, fast };
  cache.set(n, r);
  return r;
}

function mapDifference(a: CorrectionResult, b: CorrectionResult): number {
  let se = 0, m = 0;
  for (let p = 0; p < a.mask.length; p++) {
    if (a.mask[p] !== 1 || b.mask[p] !== 1 || a.folds.mask[p] === 1 || b.folds.mask[p] === 1) continue;
    se += (a.map[2 * p]! - b.map[2 * p]!) ** 2 + (a.map[2 * p + 1]! - b.map[2 * p + 1]!) ** 2;
    m++;
  }
  return m > 0 ? Math.sqrt(se / m) : NaN;
}

const rectify: BenchCase = {
  name: 'rectify',
  size: 1024,
  quickSize: 128,
  iterations: 7,
  warmup: 3,
  prepare(n: number) {
    const inp = inputs(n);
    return {
      run: () => inp.exact.correct(inp.image, inp.surface),
      error: (result: unknown) => ((result as CorrectionResult).valid > 0 ? 0 : NaN),
      notes: (ms: number) => `${((n * n) / ms / 1000).toFixed(2)} M px/s`,
    };
  },
};

let exactForFast: CorrectionResult | null = null;

const rectifyFast: BenchCase = {
  name: 'rectify.fast',
  size: 1024,
  quickSize: 128,
  iterations: 20,
  warmup: 5,
  prepare(n: number) {
    const inp = inputs(n);
    const t0 = performance.now();
    exactForFast = inp.exact.correct(inp.image, inp.surface);
    const exactMs = performance.now() - t0;
    let prev: CorrectionResult | undefined;
    return {
      run: () => (prev = inp.fast.correct(inp.image, inp.surface, prev ? { reuse: prev } : undefined)),
      error: (result: unknown) => mapDifference(result as CorrectionResult, exactForFast!),
      notes: (ms: number) => `${(ms / exactMs).toFixed(3)} of one exact run (${exactMs.toFixed(0)} ms, unwarmed)`,
    };
  },
};

export const cases: BenchCase[] = [rectify, rectifyFast];
