import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createImage, createRng, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import type { Image } from '../../src/core/index.js';
import { meanSquaredError, psnr, ssim } from '../../src/metrics/index.js';

const K1 = 0.01; // Wang, Bovik, Sheikh & Simoncelli (2004), IEEE TIP 13(4), 600 (the constants of their experiments)
const K2 = 0.03; // same source

function image(w: number, h: number, f: (u: number, v: number, c: number) => number, channels = 1): Image {
  const d = new Float32Array(w * h * channels);
  for (let v = 0; v < h; v++) for (let u = 0; u < w; u++) for (let c = 0; c < channels; c++) d[(v * w + u) * channels + c] = f(u, v, c);
  return createImage(w, h, channels, d);
}

function randomImage(w: number, h: number, seed: number, channels = 1): Image {
  const rng = createRng(seed);
  return image(w, h, () => rng.random(), channels);
}

/** The normalised 11×11 circular-symmetric Gaussian window of σ = 1.5 (Wang et al. 2004), built directly in 2-D. */
function window2d(sigma = 1.5, r = 5): number[][] {
  const w: number[][] = [];
  let s = 0;
  for (let b = -r; b <= r; b++) {
    const row: number[] = [];
    for (let a = -r; a <= r; a++) {
      const v = Math.exp(-(a * a + b * b) / (2 * sigma * sigma));
      row.push(v);
      s += v;
    }
    w.push(row);
  }
  return w.map((row) => row.map((v) => v / s));
}

/**
 * SSIM straight from its definition, Wang et al. (2004) equations (14)–(16) for the
 * windowed statistics and (13) for the index, averaged over the 'valid' window centres
 * (equation (17)) — equation numbers from memory; a direct 2-D window per pixel, in
 * double precision.
 */
function ssimByDefinition(a: Image, b: Image, L = 1, mask?: Uint8Array): number {
  const w = window2d();
  const C1 = (K1 * L) ** 2;
  const C2 = (K2 * L) ** 2;
  let sum = 0;
  let n = 0;
  for (let v = 5; v < a.height - 5; v++) {
    for (let u = 5; u < a.width - 5; u++) {
      if (mask && mask[v * a.width + u] !== 1) continue;
      let W = 0;
      let mx = 0;
      let my = 0;
      for (let q = -5; q <= 5; q++) {
        for (let p = -5; p <= 5; p++) {
          const k = (v + q) * a.width + (u + p);
          if (mask && mask[k] !== 1) continue;
          const wt = w[q + 5]![p + 5]!;
          W += wt;
          mx += wt * a.data[k]!;
          my += wt * b.data[k]!;
        }
      }
      mx /= W;
      my /= W;
      let sx = 0;
      let sy = 0;
      let sxy = 0;
      for (let q = -5; q <= 5; q++) {
        for (let p = -5; p <= 5; p++) {
          const k = (v + q) * a.width + (u + p);
          if (mask && mask[k] !== 1) continue;
          const wt = w[q + 5]![p + 5]! / W;
          sx += wt * (a.data[k]! - mx) ** 2;
          sy += wt * (b.data[k]! - my) ** 2;
          sxy += wt * (a.data[k]! - mx) * (b.data[k]! - my);
        }
      }
      sum += ((2 * mx * my + C1) * (2 * sxy + C2)) / ((mx * mx + my * my + C1) * (sx + sy + C2));
      n++;
    }
  }
  return sum / n;
}

describe('ssim (Wang, Bovik, Sheikh & Simoncelli 2004, IEEE TIP 13(4), 600)', () => {
  it('gives exactly 1 for identical images (eq. 13: S(x, x) = 1)', () => {
    const a = randomImage(40, 30, 1);
    const r = ssim(a, a);
    expect(r.ssim).toBe(1);
    expect(r.count).toBe(30 * 20); // 'valid' centres: (40 − 10) × (30 − 10)
  });

  it('matches eq. 13 in closed form for a constant image against the same constant plus an offset (σ = 0)', () => {
    // Zero variances: the contrast-structure factor is C2/C2 = 1, the luminance factor is
    // (2 μx μy + C1)/(μx² + μy² + C1) with C1 = (K1 L)².
    for (const [c, d, L] of [
      [0.375, 0.125, 1],
      [100, 20, 255],
      [0.5, -0.25, 1],
    ] as const) {
      const a = image(24, 20, () => c);
      const b = image(24, 20, () => c + d);
      const C1 = (K1 * L) ** 2;
      const expected = (2 * c * (c + d) + C1) / (c * c + (c + d) ** 2 + C1);
      expect(ssim(a, b, { dynamicRange: L }).ssim).toBeCloseTo(expected, 12);
    }
  });

  it('matches a closed form for a period-2 pattern, offset and scaled (analytic windowed statistics)', () => {
    // x = m + A·(−1)^(u+v). Under the separable normalised window the local mean is
    // m ± A ε² and the local variance A²(1 − ε⁴), with ε = Σ_k g_k (−1)^k of the 1-D kernel
    // (σ = 1.5, 11 taps). Offset y = x + d: contrast-structure factor 1. Scaled y = s·x:
    // luminance (2 s μ² + C1)/((1 + s²) μ² + C1), contrast (2 s σ² + C2)/((1 + s²) σ² + C2).
    let g = 0;
    let eps = 0;
    for (let k = -5; k <= 5; k++) g += Math.exp(-(k * k) / 4.5);
    for (let k = -5; k <= 5; k++) eps += ((-1) ** Math.abs(k) * Math.exp(-(k * k) / 4.5)) / g;
    const m = 0.5;
    const A = 0.25;
    const C1 = K1 ** 2;
    const C2 = K2 ** 2;
    const x = image(32, 32, (u, v) => m + A * (-1) ** (u + v));
    const varX = A * A * (1 - eps ** 4);
    const mus = [m + A * eps * eps, m - A * eps * eps]; // the two centre parities, equally many
    const d = 0.125;
    const yOff = image(32, 32, (u, v) => m + A * (-1) ** (u + v) + d);
    const offExpected = mus.reduce((s, mu) => s + (2 * mu * (mu + d) + C1) / (mu * mu + (mu + d) ** 2 + C1), 0) / 2;
    expect(ssim(x, yOff).ssim).toBeCloseTo(offExpected, 6);
    const sc = 0.5;
    const ySc = image(32, 32, (u, v) => sc * (m + A * (-1) ** (u + v)));
    const cs = (2 * sc * varX + C2) / ((1 + sc * sc) * varX + C2);
    const scExpected = mus.reduce((s, mu) => s + ((2 * sc * mu * mu + C1) / ((1 + sc * sc) * mu * mu + C1)) * cs, 0) / 2;
    expect(ssim(x, ySc).ssim).toBeCloseTo(scExpected, 6);
  });

  it('equals the definition computed with a direct 2-D window (eqs. 13–17, K1 = 0.01, K2 = 0.03, 11×11, σ = 1.5)', () => {
    const a = randomImage(37, 29, 2);
    const noise = randomImage(37, 29, 3);
    const b = image(37, 29, (u, v) => 0.7 * a.data[v * 37 + u]! + 0.3 * noise.data[v * 37 + u]!);
    const ref = ssimByDefinition(a, b);
    expect(ssim(a, b).ssim).toBeCloseTo(ref, 6);
    // The defaults are those constants: stating them changes nothing.
    expect(ssim(a, b, { k1: 0.01, k2: 0.03, sigma: 1.5, radius: 5 }).ssim).toBe(ssim(a, b).ssim);
    // And other constants give another value (the check above is sensitive to them).
    expect(Math.abs(ssim(a, b, { k2: 0.06 }).ssim - ref)).toBeGreaterThan(1e-3);
  });

  it('uses an 11 × 11 window: an impulse changes the map exactly within 5 pixels (Wang et al. 2004)', () => {
    const a = image(31, 31, () => 0.5);
    const b = image(31, 31, (u, v) => (u === 15 && v === 15 ? 0.9 : 0.5));
    const r = ssim(a, b, { map: true });
    const at = (u: number, v: number): number => r.map![v * 31 + u]!;
    expect(at(15 + 5, 15)).toBeLessThan(1);
    expect(at(15 + 5, 15 + 5)).toBeLessThan(1);
    expect(at(15 + 6, 15)).toBe(1);
    expect(at(15, 15 - 6)).toBe(1);
    expect(r.mapMask![0]).toBe(0);
    expect(r.mapMask![5 * 31 + 5]).toBe(1);
  });

  it('with a mask: statistics of valid pixels only, equal to the direct masked definition, blind to values outside', () => {
    const a = randomImage(30, 26, 4);
    const b = randomImage(30, 26, 5);
    const mask = new Uint8Array(30 * 26).fill(1);
    for (let v = 0; v < 26; v++) for (let u = 0; u < 30; u++) if ((u - 12) ** 2 + (v - 14) ** 2 < 30) mask[v * 30 + u] = 0;
    const r = ssim(a, b, { mask });
    expect(r.ssim).toBeCloseTo(ssimByDefinition(a, b, 1, mask), 6);
    const garbage = image(30, 26, (u, v) => (mask[v * 30 + u] ? b.data[v * 30 + u]! : NaN));
    expect(ssim(a, garbage, { mask }).ssim).toBe(r.ssim);
    // A full mask is the unmasked definition.
    expect(ssim(a, b, { mask: new Uint8Array(30 * 26).fill(1) }).ssim).toBeCloseTo(ssim(a, b).ssim, 12);
  });

  it('multi-channel: mean of per-channel scores, or the BT.709 luminance (ITU-R BT.709 weights)', () => {
    const a = randomImage(24, 24, 6, 3);
    const b = randomImage(24, 24, 7, 3);
    const plane = (im: Image, c: number): Image => image(24, 24, (u, v) => im.data[(v * 24 + u) * 3 + c]!);
    const per = [0, 1, 2].map((c) => ssim(plane(a, c), plane(b, c)).ssim);
    const r = ssim(a, b);
    expect(r.perChannel.length).toBe(3);
    for (let c = 0; c < 3; c++) expect(r.perChannel[c]).toBeCloseTo(per[c]!, 12);
    expect(r.ssim).toBeCloseTo((per[0]! + per[1]! + per[2]!) / 3, 12);
    const luma = (im: Image): Image =>
      image(24, 24, (u, v) => {
        const k = (v * 24 + u) * 3;
        return 0.2126 * im.data[k]! + 0.7152 * im.data[k + 1]! + 0.0722 * im.data[k + 2]!;
      });
    expect(ssim(a, b, { channelMode: 'luminance' }).ssim).toBeCloseTo(ssim(luma(a), luma(b)).ssim, 6);
  });

  it('is symmetric and bounded by 1 (Wang et al. 2004: symmetry, boundedness, unique maximum)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1e6 }), fc.integer({ min: 1, max: 1e6 }), (s1, s2) => {
        const a = randomImage(16, 16, s1);
        const b = randomImage(16, 16, s2);
        const ab = ssim(a, b).ssim;
        const ba = ssim(b, a).ssim;
        return Math.abs(ab - ba) < 1e-12 && ab <= 1 && ab >= -1;
      }),
      { seed: 42, numRuns: 50 },
    );
  });

  it('refuses bad input with the library error', () => {
    const a = randomImage(20, 20, 8);
    expect(() => ssim(a, randomImage(21, 20, 8))).toThrow(MeniscusTypeError);
    expect(() => ssim(a, randomImage(20, 20, 8, 3))).toThrow(MeniscusTypeError);
    expect(() => ssim(a, a, { mask: new Uint8Array(10) })).toThrow(MeniscusTypeError);
    expect(() => ssim(a, a, { dynamicRange: 0 })).toThrow(MeniscusRangeError);
    expect(() => ssim(a, a, { channelMode: 'hue' as never })).toThrow(MeniscusRangeError);
    expect(() => ssim(randomImage(10, 30, 1), randomImage(10, 30, 2))).toThrow(MeniscusRangeError);
    expect(() => ssim(a, a, { mask: new Uint8Array(400) })).toThrow(MeniscusRangeError); // no valid centre
    const nan = image(20, 20, (u) => (u === 3 ? NaN : 0.5));
    expect(() => ssim(a, nan)).toThrow(/b\.data\[/);
  });
});

describe('psnr and meanSquaredError (definition: PSNR = 10 log10(L² / MSE), common practice)', () => {
  it('gives 20 log10(L/δ) for a uniform error δ', () => {
    const a = randomImage(16, 12, 9);
    const b = image(16, 12, (u, v) => a.data[v * 16 + u]! + 0.125);
    expect(meanSquaredError(a, b)).toBeCloseTo(0.125 ** 2, 9);
    expect(psnr(a, b)).toBeCloseTo(20 * Math.log10(1 / 0.125), 5); // 18.0618 dB
    const c = image(16, 12, () => 100);
    const d = image(16, 12, () => 105);
    expect(psnr(c, d, { dynamicRange: 255 })).toBeCloseTo(20 * Math.log10(255 / 5), 9); // 34.1514 dB
  });

  it('is Infinity for identical images and pools channels (or scores luminance)', () => {
    const a = randomImage(8, 8, 10, 3);
    expect(psnr(a, a)).toBe(Infinity);
    // Error only in the red channel, 0.3: pooled MSE 0.09/3; luminance MSE (0.2126·0.3)².
    const b = image(8, 8, (u, v, c) => a.data[(v * 8 + u) * 3 + c]! + (c === 0 ? 0.25 : 0), 3);
    expect(meanSquaredError(a, b)).toBeCloseTo(0.0625 / 3, 8);
    expect(meanSquaredError(a, b, { channelMode: 'luminance' })).toBeCloseTo((0.2126 * 0.25) ** 2, 8);
  });

  it('honours a mask and ignores what lies outside it', () => {
    const a = image(10, 10, () => 0.5);
    const b = image(10, 10, (u) => (u < 5 ? 0.5 + 0.1 : NaN));
    const mask = new Uint8Array(100);
    for (let k = 0; k < 100; k++) mask[k] = k % 10 < 5 ? 1 : 0;
    expect(meanSquaredError(a, b, { mask })).toBeCloseTo(0.01, 8);
    expect(() => psnr(a, b)).toThrow(MeniscusRangeError);
    expect(() => psnr(a, a, { mask: new Uint8Array(100) })).toThrow(MeniscusRangeError);
    expect(() => psnr(a, image(10, 9, () => 0))).toThrow(MeniscusTypeError);
  });
});
