import { describe, expect, it } from 'vitest';
import { createGrid, createRng } from '../../src/core/index.js';
import { integrateLeastSquares } from '../../src/integrate/index.js';
import { discMask, peaks, relErrorUpToPiston, sample } from './fixtures.js';

// Iteratively reweighted least squares (Huber 1964; Holland & Welsch 1977): gross
// outliers in a few slope samples are down-weighted and reported; the clean fit is
// nearly recovered.
function corrupted(seed: number) {
  const n = 96;
  const d = 6 / (n - 1);
  const s = sample(peaks, n, n, d, d, -3, -3);
  const rng = createRng(seed);
  for (let k = 0; k < n * n; k++) {
    s.p.data[k] = s.p.data[k]! + rng.normal(0, 0.05);
    s.q.data[k] = s.q.data[k]! + rng.normal(0, 0.05);
  }
  const noisyP = s.p.data.slice();
  const noisyQ = s.q.data.slice();
  const outliers = new Uint8Array(n * n);
  for (let t = 0; t < Math.round(0.02 * n * n); t++) {
    const k = rng.integer(n * n);
    outliers[k] = 1;
    if (rng.random() < 0.5) s.p.data[k] = s.p.data[k]! + (rng.random() < 0.5 ? -3 : 3);
    else s.q.data[k] = s.q.data[k]! + (rng.random() < 0.5 ? -3 : 3);
  }
  return { ...s, outliers, n, noisyP, noisyQ };
}

describe('robust least squares (IRLS)', () => {
  const c = corrupted(9);
  const mask = discMask(c.n, c.n, 45);
  const clean = sample(peaks, c.n, c.n, 6 / (c.n - 1), 6 / (c.n - 1), -3, -3);
  const plain = integrateLeastSquares(c.p, c.q, { mask });
  const huber = integrateLeastSquares(c.p, c.q, { mask, robust: 'huber' });
  const tukey = integrateLeastSquares(c.p, c.q, { mask, robust: { loss: 'tukey', maxIterations: 15 } });
  const ePlain = relErrorUpToPiston(plain.height.data, clean.h.data, mask);
  const eHuber = relErrorUpToPiston(huber.height.data, clean.h.data, mask);
  const eTukey = relErrorUpToPiston(tukey.height.data, clean.h.data, mask);
  // the same noisy slopes without the outliers: the best a robust fit can hope for
  const noiseOnly = integrateLeastSquares(createGrid(c.p, c.noisyP), createGrid(c.q, c.noisyQ), { mask });
  const eNoise = relErrorUpToPiston(noiseOnly.height.data, clean.h.data, mask);

  it('Huber and Tukey both beat plain least squares; Tukey rejects the outliers almost entirely', () => {
    expect(eHuber).toBeLessThan(0.6 * ePlain);
    expect(eTukey).toBeLessThan(0.4 * ePlain);
    expect(eTukey).toBeLessThan(1.5 * eNoise);
  });

  it('reports the distrusted samples: nearly every outlier, few others', () => {
    const R = tukey.robust!;
    expect(R.loss).toBe('tukey');
    expect(R.threshold).toBe(4.685);
    expect(R.rounds).toBeGreaterThan(0);
    let hit = 0;
    let total = 0;
    let falsePos = 0;
    let valid = 0;
    for (let k = 0; k < c.n * c.n; k++) {
      if (!mask[k]) {
        expect(R.distrusted[k]).toBe(0);
        continue;
      }
      valid++;
      if (c.outliers[k]) {
        total++;
        if (R.distrusted[k]) hit++;
      } else if (R.distrusted[k]) falsePos++;
    }
    expect(hit / total).toBeGreaterThan(0.95);
    expect(falsePos / valid).toBeLessThan(0.03);
    // the robust scale is near the injected noise (σ = 0.05 per slope)
    expect(R.scale).toBeGreaterThan(0.02);
    expect(R.scale).toBeLessThan(0.1);
    for (const v of R.weightsP.data) expect(v >= 0 && v <= 1).toBe(true);
  });

  it('on clean data the robust fit equals the plain fit closely', () => {
    const r = integrateLeastSquares(clean.p, clean.q, { mask, robust: 'huber' });
    const p = integrateLeastSquares(clean.p, clean.q, { mask });
    expect(relErrorUpToPiston(r.height.data, p.height.data, mask)).toBeLessThan(0.05);
    expect(r.height.data.every(Number.isFinite)).toBe(true);
  });
});
