import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/index.js';
import { blurClamped, gaussianKernel1d } from '../../src/metrics/filter.js';

describe('internal separable Gaussian blur', () => {
  it('equals the direct 2-D convolution with the normalised Gaussian and clamped borders (definition)', () => {
    const rng = createRng(21);
    for (const [W, H, sigma] of [
      [37, 20, 1.5],
      [8, 9, 1.5],
      [11, 12, 1.5],
      [40, 30, 1.0],
      [5, 30, 2.5],
    ] as const) {
      const r = Math.ceil(3 * sigma);
      const g = gaussianKernel1d(sigma, r);
      expect(g.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 14);
      const a = new Float32Array(W * H).map(() => rng.random());
      const out = new Float32Array(W * H);
      blurClamped(a, W, H, g, new Float32Array(W * H), out);
      let norm = 0;
      for (let b = -r; b <= r; b++) for (let c = -r; c <= r; c++) norm += Math.exp(-(b * b + c * c) / (2 * sigma * sigma));
      let err = 0;
      for (let j = 0; j < H; j++) {
        for (let i = 0; i < W; i++) {
          let s = 0;
          for (let b = -r; b <= r; b++) {
            for (let c = -r; c <= r; c++) {
              const x = Math.min(W - 1, Math.max(0, i + c));
              const y = Math.min(H - 1, Math.max(0, j + b));
              const w = Math.exp(-(b * b + c * c) / (2 * sigma * sigma));
              s += w * a[y * W + x]!;
            }
          }
          err = Math.max(err, Math.abs(s / norm - out[j * W + i]!));
        }
      }
      expect(err).toBeLessThan(1e-6); // Float32 storage
    }
  });
});
