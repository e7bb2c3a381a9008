import { describe, expect, it } from 'vitest';
import { createImage, createRng, Status } from '../../src/core/index.js';
import { createApertureArray, createPlaneView, createSensorGeometry, detectSpots, estimateBackground, renderSpotFrame } from '../../src/sensor/index.js';
import type { SpotTrace } from '../../src/sensor/index.js';
import { createCollimatedLight } from '../../src/sun/index.js';

const PIXEL = 1e-4; // m on the plane

/** A trace holding spots at chosen plane positions (what the renderer reads). */
function fakeTrace(xs: number[], ys: number[]): SpotTrace {
  const n = xs.length;
  const arr = createApertureArray({ pitch: 0.01, columns: n, rows: 1, apertureDiameter: 0.001 });
  const geometry = createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: 0.05 });
  const dirs = new Float64Array(3 * n);
  for (let k = 0; k < n; k++) dirs[3 * k + 2] = -1;
  return {
    geometry,
    x: Float64Array.from(xs),
    y: Float64Array.from(ys),
    crossings: new Float64Array(3 * n),
    directions: dirs,
    pathToPlane: new Float64Array(n).fill(0.05),
    status: new Uint8Array(n),
  };
}

/** A 20 × 20 grid of Gaussian spots at random sub-pixel positions on a 400 × 400 frame. */
function gaussianField(seed: number, photons: number, sigmaPx: number, background: number, readNoise: number, side = 20) {
  const rng = createRng(seed);
  const xs: number[] = [], ys: number[] = [];
  const sp = 400 / side;
  for (let j = 0; j < side; j++) {
    for (let i = 0; i < side; i++) {
      xs.push((-200 + sp / 2 + sp * i + rng.uniform(-0.5, 0.5)) * PIXEL);
      ys.push((-200 + sp / 2 + sp * j + rng.uniform(-0.5, 0.5)) * PIXEL);
    }
  }
  const tr = fakeTrace(xs, ys);
  const view = createPlaneView({ width: 400, height: 400, pixelSize: PIXEL });
  const fr = renderSpotFrame(tr, createCollimatedLight([0, 0, 1]), view, {
    gaussianSigma: sigmaPx * PIXEL,
    photonsPerSpot: photons,
    background,
    readNoise,
    saturation: 1e12,
    supersample: 5,
    seed,
  });
  return fr;
}

function rmsError(fr: ReturnType<typeof gaussianField>, spots: ReturnType<typeof detectSpots>): { rms: number; found: number } {
  let se = 0, m = 0;
  const c = fr.centres;
  for (let s = 0; s < spots.count; s++) {
    let best = Infinity;
    for (let k = 0; k < c.length / 2; k++) best = Math.min(best, (spots.x[s]! - c[2 * k]!) ** 2 + (spots.y[s]! - c[2 * k + 1]!) ** 2);
    se += best;
    m++;
  }
  // Per-axis RMS error.
  return { rms: Math.sqrt(se / m / 2), found: m };
}

describe('detectSpots', () => {
  it('photon-limited precision: the best estimator is within 1.5 × σ_spot/√N at high signal (Thomas et al. 2006, MNRAS 371, 323; Mortensen et al. 2010, Nature Methods 7, 377)', () => {
    const N = 20000, sigma = 1.5;
    const fr = gaussianField(5, N, sigma, 0, 0);
    const limit = sigma / Math.sqrt(N);
    const res: Record<string, number> = {};
    for (const method of ['thresholded', 'windowed', 'iterative', 'gaussian'] as const) {
      const s = detectSpots(fr.image, { method, background: 0, noise: 0, threshold: 5 });
      expect(s.count).toBe(400);
      res[method] = rmsError(fr, s).rms / limit;
    }
    const best = Math.min(...Object.values(res));
    expect(best).toBeLessThan(1.5);
    // The windowed and fitted estimators use the whole spot: close to the limit.
    expect(res.gaussian!).toBeLessThan(1.5);
    expect(res.windowed!).toBeLessThan(1.5);
  });

  it('the reported per-spot uncertainty matches the scatter of the centres (within 30 %)', () => {
    const fr = gaussianField(8, 5000, 2, 10, 2);
    for (const method of ['windowed', 'iterative', 'gaussian'] as const) {
      const s = detectSpots(fr.image, { method });
      const { rms } = rmsError(fr, s);
      let mean = 0;
      for (let k = 0; k < s.count; k++) mean += (s.sigmaX[k]! ** 2 + s.sigmaY[k]! ** 2) / 2;
      const predicted = Math.sqrt(mean / s.count);
      expect(rms / predicted).toBeGreaterThan(0.7);
      expect(rms / predicted).toBeLessThan(1.3);
    }
  });

  it('auto background and noise recover the rendered background (20 e⁻ Poisson + 3 e⁻ read ⇒ σ = √29)', () => {
    const fr = gaussianField(9, 5000, 2, 20, 3, 10);
    const b = estimateBackground(fr.image);
    expect(b.level).toBeCloseTo(20, 0);
    expect(b.noise).toBeGreaterThan(0.9 * Math.sqrt(29));
    expect(b.noise).toBeLessThan(1.1 * Math.sqrt(29));
  });

  it('per-spot flux, peak, size and SNR agree with the rendered Gaussians', () => {
    const fr = gaussianField(3, 50000, 2, 0, 0);
    const s = detectSpots(fr.image, { method: 'gaussian', background: 0, noise: 0, threshold: 2 });
    for (let k = 0; k < s.count; k++) {
      expect(s.size[k]).toBeGreaterThan(1.9);
      expect(s.size[k]).toBeLessThan(2.1);
      expect(s.flux[k]).toBeGreaterThan(0.95 * 50000);
      expect(s.peak[k]).toBeGreaterThan(0.8 * 50000 / (2 * Math.PI * 4));
      expect(s.snr[k]).toBeGreaterThan(200);
      expect(s.status[k]).toBe(Status.ok);
    }
  });

  it('saturated spots are flagged; a saturated frame gives a warning and no spots', () => {
    const fr = gaussianField(4, 1e6, 2, 0, 0);
    const sat = 5000;
    const img = createImage(400, 400, 1, fr.image.data.map((v) => Math.min(v, sat)));
    const s = detectSpots(img, { saturation: sat, background: 0, noise: 0, threshold: 50 });
    expect(s.count).toBe(400);
    expect(s.saturated.every((v) => v === 1)).toBe(true);
    expect(s.status.every((v) => v === Status.saturated)).toBe(true);
    const full = createImage(64, 64, 1, new Float32Array(64 * 64).fill(65535));
    const r = detectSpots(full, { saturation: 65535 });
    expect(r.count).toBe(0);
    expect(r.warnings.join(' ')).toMatch(/saturated/);
  });

  it('an empty frame and a frame of pure noise give no spots and say why', () => {
    const empty = createImage(32, 32);
    const a = detectSpots(empty);
    expect(a.count).toBe(0);
    expect(a.warnings.join(' ')).toMatch(/uniform/);
    const rng = createRng(2);
    const noisy = createImage(128, 128, 1, Float32Array.from({ length: 128 * 128 }, () => 100 + rng.normal(0, 3)));
    const b = detectSpots(noisy);
    expect(b.count).toBe(0);
    expect(b.warnings.length).toBeGreaterThan(0);
  });

  it('the peers recipe (64 × 64 Gaussian spots, σ 2 px, peak 1000, noise 2): thresholded centroid error below 0.05 px (common practice)', () => {
    const n = 512, g = 16, pitch = n / g;
    const rng = createRng(11);
    const img = createImage(n, n);
    img.data.fill(20);
    const cx: number[] = [], cy: number[] = [];
    for (let j = 0; j < g; j++) for (let i = 0; i < g; i++) {
      cx.push((i + 0.5) * pitch + rng.uniform(-0.2, 0.2) * pitch);
      cy.push((j + 0.5) * pitch + rng.uniform(-0.2, 0.2) * pitch);
    }
    for (let k = 0; k < cx.length; k++) {
      const x0 = cx[k]!, y0 = cy[k]!;
      for (let v = Math.max(0, Math.round(y0) - 8); v <= Math.min(n - 1, Math.round(y0) + 8); v++)
        for (let u = Math.max(0, Math.round(x0) - 8); u <= Math.min(n - 1, Math.round(x0) + 8); u++)
          img.data[v * n + u]! += 1000 * Math.exp(-((u - x0) ** 2 + (v - y0) ** 2) / 8);
    }
    for (let k = 0; k < img.data.length; k++) img.data[k]! += rng.normal(0, 2);
    for (const method of ['thresholded', 'iterative', 'gaussian'] as const) {
      const s = method === 'thresholded' ? detectSpots(img, { background: 20, threshold: 100, method }) : detectSpots(img, { method });
      expect(s.count).toBe(g * g);
      let se = 0;
      for (let k = 0; k < s.count; k++) {
        const t = Math.floor(s.y[k]! / pitch) * g + Math.floor(s.x[k]! / pitch);
        se += (s.x[k]! - cx[t]!) ** 2 + (s.y[k]! - cy[t]!) ** 2;
      }
      expect(Math.sqrt(se / s.count)).toBeLessThan(method === 'thresholded' ? 0.05 : 0.01);
    }
  });

  it('bad input: non-finite pixels, wrong options', () => {
    const img = createImage(16, 16);
    img.data[40] = NaN;
    expect(() => detectSpots(img)).toThrow(/frame\.data\[40\]/);
    const ok = createImage(16, 16);
    expect(() => detectSpots(ok, { method: 'magic' as never })).toThrow(/method/);
    expect(() => detectSpots(ok, { connectivity: 6 as never })).toThrow(/connectivity/);
    expect(() => detectSpots({ width: 2, height: 2, channels: 1, data: new Float32Array(3) })).toThrow(/frame\.data/);
  });

  it('4- and 8-connectivity: diagonal neighbours join only under 8', () => {
    const img = createImage(8, 8);
    for (const [u, v] of [[2, 2], [3, 3], [2, 3], [5, 5], [6, 6]] as const) img.data[v * 8 + u] = 100;
    expect(detectSpots(img, { background: 0, threshold: 10, connectivity: 8, minPixels: 1, method: 'thresholded' }).count).toBe(2);
    expect(detectSpots(img, { background: 0, threshold: 10, connectivity: 4, minPixels: 1, method: 'thresholded' }).count).toBe(3);
  });
});
