/**
 * Benchmarks of the metrics area (no numpy peer in ../shared/peers/peers.py for these).
 *
 * metrics.ssim: SSIM of two size² one-channel images, x = 0.5 + 0.25·(−1)^(u+v) and
 *   y = 0.5·x, whose mean SSIM has a closed form (see test/metrics/similarity.test.ts);
 *   error = |SSIM − closed form|.
 * metrics.ssim.masked: the same with a mask holding out every third pixel; error = 0
 *   when the score lies in [−1, 1] (reported as the distance outside that range).
 * metrics.corners: corner detection on a size² rendered checkerboard (29 × 29 inner
 *   corners of 32 px under a rotation, mild perspective and a 2 px sinusoidal warp of
 *   wavelength max(200, size/5) px);
 *   error = RMS corner displacement against the rendered truth, pixels.
 */
import { createImage } from '../../src/core/index.js';
import { cornerDisplacement, detectCheckerboardCorners, ssim } from '../../src/metrics/index.js';
import type { CheckerboardDetection, SsimResult } from '../../src/metrics/index.js';
import { renderBoard, tiltedHomography } from '../../test/metrics/render-board.js';
import type { BenchCase } from '../case.js';

function period2(n: number, scale: number) {
  const d = new Float32Array(n * n);
  for (let v = 0; v < n; v++) for (let u = 0; u < n; u++) d[v * n + u] = scale * (0.5 + 0.25 * (-1) ** (u + v));
  return createImage(n, n, 1, d);
}

function period2Closed(scale: number): number {
  let g = 0;
  let eps = 0;
  for (let k = -5; k <= 5; k++) g += Math.exp(-(k * k) / 4.5);
  for (let k = -5; k <= 5; k++) eps += ((-1) ** Math.abs(k) * Math.exp(-(k * k) / 4.5)) / g;
  const C1 = 0.01 ** 2;
  const C2 = 0.03 ** 2;
  const varX = 0.0625 * (1 - eps ** 4);
  const cs = (2 * scale * varX + C2) / ((1 + scale * scale) * varX + C2);
  return (
    [0.5 + 0.25 * eps * eps, 0.5 - 0.25 * eps * eps].reduce(
      (s, mu) => s + ((2 * scale * mu * mu + C1) / ((1 + scale * scale) * mu * mu + C1)) * cs,
      0,
    ) / 2
  );
}

export const cases: BenchCase[] = [
  {
    name: 'metrics.ssim',
    size: 1024,
    quickSize: 64,
    iterations: 9,
    prepare(n) {
      const a = period2(n, 1);
      const b = period2(n, 0.5);
      const expected = period2Closed(0.5);
      return {
        run: () => ssim(a, b),
        error: (r) => Math.abs((r as SsimResult).ssim - expected),
        notes: (ms) => `${((n * n) / (ms * 1e3)).toFixed(1)} Mpixel/s`,
      };
    },
  },
  {
    name: 'metrics.ssim.masked',
    size: 1024,
    quickSize: 64,
    iterations: 9,
    prepare(n) {
      const a = period2(n, 1);
      const b = period2(n, 0.5);
      const mask = new Uint8Array(n * n).fill(1);
      for (let k = 0; k < mask.length; k += 3) mask[k] = 0;
      return {
        run: () => ssim(a, b, { mask }),
        error: (r) => {
          const s = (r as SsimResult).ssim;
          return Math.max(0, s - 1, -1 - s);
        },
      };
    },
  },
  {
    name: 'metrics.corners',
    size: 1024,
    quickSize: 256,
    iterations: 7,
    prepare(n) {
      const square = 32;
      const per = Math.floor(n / square) - 3;
      const c = n / 2;
      const r = renderBoard({
        width: n,
        height: n,
        columns: per,
        rows: per,
        square,
        origin: [c - (square * (per + 1)) / 2 + 0.3, c - (square * (per + 1)) / 2 + 0.7],
        homography: tiltedHomography(0.1, c, c, 0.1 / n, 0.05 / n),
        warp: { amplitude: 2, wavelength: Math.max(200, n / 5) },
        ss: 144,
      });
      return {
        run: () => detectCheckerboardCorners(r.image),
        error: (d) => {
          const det = d as CheckerboardDetection;
          return det.count === per * per ? cornerDisplacement(det, r.corners).rms : Infinity;
        },
        notes: (ms) => `${per * per} corners, ${((n * n) / (ms * 1e3)).toFixed(1)} Mpixel/s`,
      };
    },
  },
];
