import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import { intersectSurface } from '../../src/surface/index.js';
import {
  cos2sSpreading,
  harbourSeaPreset,
  jonswapFromPeak,
  jonswapSpectrumFunction,
  prepareRandomSea,
  seaMoments,
  seaSurface,
  significantWaveHeight,
  slopeStatistics,
  synthesizeSea,
  tankSeaPreset,
  angularFrequency,
} from '../../src/waves/index.js';
import type { SeaSpectrum } from '../../src/waves/index.js';

const grid = { width: 64, height: 32, dx: 0.01, dy: 0.012, x0: 0.3, y0: -0.2 };
const sea: SeaSpectrum = {
  frequencySpectrum: jonswapFromPeakSpectrum(0.3, 0.01),
  spreading: (t) => cos2sSpreading(t, 3),
  meanDirection: 0.4,
  dispersion: { depth: 0.5 },
};
function jonswapFromPeakSpectrum(tp: number, hs: number): (w: number) => number {
  return jonswapSpectrumFunction(jonswapFromPeak({ peakPeriod: tp, significantHeight: hs }));
}

describe('prepareRandomSea', () => {
  const s = prepareRandomSea(grid, sea, { seed: 11 });
  const f = s.frame(0);

  for (const gr of [grid, { width: 16, height: 64, dx: 0.012, dy: 0.01 }]) it(`slopes are the exact spectral derivatives of the height on ${gr.width}×${gr.height} (a naive DFT of h, times i·k, as the reference)`, () => {
    // For a periodic band-limited field (Nyquist row and column empty) the derivative of
    // the trigonometric interpolant of h at the samples is exactly the synthesised slope.
    const { width: W, height: H, dx, dy } = gr;
    const f = prepareRandomSea(gr, sea, { seed: 11 }).frame(0.3);
    const h = f.height.data;
    const re = new Float64Array(W * H);
    const im = new Float64Array(W * H);
    for (let v = 0; v < H; v++) {
      for (let u = 0; u < W; u++) {
        let sr = 0;
        let si = 0;
        for (let j = 0; j < H; j++) {
          for (let i = 0; i < W; i++) {
            const a = -2 * Math.PI * (u * i / W + v * j / H);
            sr += h[j * W + i]! * Math.cos(a);
            si += h[j * W + i]! * Math.sin(a);
          }
        }
        re[v * W + u] = sr;
        im[v * W + u] = si;
      }
    }
    let err = 0;
    let scale = 0;
    for (const [jj, ii] of [[0, 0], [3, 7], [H - 1, W - 1], [H / 2, 5], [9, W / 2 + 1]] as const) {
      let p = 0;
      let q = 0;
      for (let v = 0; v < H; v++) {
        for (let u = 0; u < W; u++) {
          const kx = (2 * Math.PI * (u < W / 2 ? u : u - W)) / (W * dx);
          const ky = (2 * Math.PI * (v < H / 2 ? v : v - H)) / (H * dy);
          const a = 2 * Math.PI * (u * ii / W + v * jj / H);
          const cr = re[v * W + u]!;
          const ci = im[v * W + u]!;
          // Re(i k X e^{ia}) = −k (cr sin a + ci cos a)
          const t = -(cr * Math.sin(a) + ci * Math.cos(a)) / (W * H);
          p += kx * t;
          q += ky * t;
        }
      }
      err = Math.max(err, Math.abs(p - f.slopeX.data[jj * W + ii]!), Math.abs(q - f.slopeY.data[jj * W + ii]!));
      scale = Math.max(scale, Math.abs(p), Math.abs(q));
    }
    expect(scale).toBeGreaterThan(1e-3);
    expect(err).toBeLessThan(1e-12 * Math.max(1, scale) * W * H);
  });

  it('is periodic, has zero mean, the grid geometry, and is reproducible from its seed', () => {
    expect(f.height.dx).toBe(grid.dx);
    expect(f.height.dy).toBe(grid.dy);
    expect(f.height.x0).toBe(grid.x0);
    let sum = 0;
    for (const v of f.height.data) sum += v;
    expect(Math.abs(sum / f.height.data.length)).toBeLessThan(1e-15);
    const again = prepareRandomSea(grid, sea, { seed: 11 }).frame(0);
    expect(again.height.data).toEqual(f.height.data);
    const other = prepareRandomSea(grid, sea, { seed: 12 }).frame(0);
    expect(other.height.data).not.toEqual(f.height.data);
  });

  it('advances each component by its dispersion phase: a one-component sea travels at omega/k (Lamb 1932, §267)', () => {
    // A sea with energy in a single wavenumber bin (a narrow Gaussian around it).
    const W = 64;
    const dx = 0.01;
    const k = (2 * Math.PI * 5) / (W * dx);
    const w = angularFrequency(k);
    const single: SeaSpectrum = {
      frequencySpectrum: (om) => Math.exp(-(((om - w) / (0.002 * w)) ** 2)),
      spreading: (t) => (Math.abs(t) < 0.01 ? 50 : 0),
    };
    const sp = prepareRandomSea({ width: W, height: 4, dx }, single, { seed: 3, requirePeakResolved: false });
    const t = 0.0123;
    const a = sp.frame(0);
    const b = sp.frame(t);
    // h(x, t) = h(x − c t, 0) with c = ω/k: compare on the sampled lattice through the
    // exact phase shift of the single cosine.
    const c = w / k;
    const shift = c * t;
    for (let i = 0; i < W; i++) {
      const x = i * dx - shift;
      // Interpolate the single-wavenumber cosine exactly: a·cos(k x + φ).
      const h0 = a.height.data[0]!;
      const p0 = a.slopeX.data[0]!;
      const amp = Math.hypot(h0, p0 / k);
      const phi = Math.atan2(-p0 / k, h0);
      expect(Math.abs(b.height.data[i]! - amp * Math.cos(k * x + phi)) / amp).toBeLessThan(1e-12);
    }
  });

  it('reuses the out frame', () => {
    const g = s.frame(0.5, f);
    expect(g).toBe(f);
    expect(g.time).toBe(0.5);
    expect(() => s.frame(0, { ...f, height: { ...f.height, width: 3 } })).toThrow(MeniscusTypeError);
  });

  it('gives a surface the intersector accepts', () => {
    const surf = seaSurface(f);
    const hit = intersectSurface(surf, [0.6, 0, -1], [0, 0, 1]);
    expect(hit.status).toBe('ok');
  });

  it('refuses bad grids and seas with clear errors', () => {
    expect(() => prepareRandomSea({ ...grid, width: 48 }, sea)).toThrow(/power of two/);
    expect(() => prepareRandomSea({ ...grid, dx: -1 }, sea)).toThrow(MeniscusRangeError);
    // Peak wavenumber above Nyquist: spacing longer than half the peak wavelength.
    expect(() => prepareRandomSea({ width: 64, height: 64, dx: 0.1 }, sea)).toThrow(/alias/);
    // Domain shorter than the peak wavelength (about 0.14 m here).
    expect(() => prepareRandomSea({ width: 8, height: 8, dx: 0.01 }, sea)).toThrow(/peak wavelength/);
    expect(() => prepareRandomSea({ width: 8, height: 8, dx: 0.01 }, sea, { requirePeakResolved: false })).not.toThrow();
    expect(() => prepareRandomSea(grid, { ...sea, dispersion: { depth: -2 } })).toThrow(/depth/);
    expect(() => prepareRandomSea(grid, { ...sea, frequencySpectrum: () => -1 })).toThrow(MeniscusRangeError);
    expect(() => prepareRandomSea(grid, { ...sea, frequencySpectrum: () => 0 })).toThrow(/zero everywhere/);
    expect(() => prepareRandomSea(grid, { frequencySpectrum: 3 } as never)).toThrow(MeniscusTypeError);
  });
});

describe('realisations against the spectrum (Longuet-Higgins 1957: a linear random sea)', () => {
  it('Hs = 4√m0 and the mean-square slope agree with the spectrum within the sampling error', () => {
    const { grid: g, sea: s } = harbourSeaPreset();
    const small = { ...g, width: 128, height: 128, dx: 0.5, dy: 0.5 };
    const kN = Math.PI / small.dx;
    const kMin = (2 * Math.PI) / (small.width * small.dx);
    const moments = seaMoments(s, { kMin, kMax: kN });
    let zH = 0;
    let zS = 0;
    const seeds = 8;
    for (let seed = 1; seed <= seeds; seed++) {
      const sp = prepareRandomSea(small, s, { seed });
      const f = sp.frame(0);
      const hs = significantWaveHeight(f.height);
      const m0 = (hs / 4) ** 2;
      const st = slopeStatistics(f.slopeX, f.slopeY, { direction: s.meanDirection });
      // Each realisation within 4 standard deviations of its expectation.
      expect(Math.abs(m0 - sp.expected.m0)).toBeLessThan(4 * sp.expected.m0StandardDeviation);
      expect(Math.abs(st.meanSquareSlope - sp.expected.meanSquareSlope)).toBeLessThan(4 * sp.expected.meanSquareSlopeStandardDeviation);
      zH += (m0 - sp.expected.m0) / sp.expected.m0StandardDeviation;
      zS += (st.meanSquareSlope - sp.expected.meanSquareSlope) / sp.expected.meanSquareSlopeStandardDeviation;
      // The discrete spectrum on the grid against the continuous integral over the
      // resolved band: close (the grid samples the peak coarsely).
      expect(sp.expected.m0 / moments.m0).toBeGreaterThan(0.85);
      expect(sp.expected.m0 / moments.m0).toBeLessThan(1.15);
      expect(sp.expected.meanSquareSlope / moments.meanSquareSlope).toBeGreaterThan(0.9);
      expect(sp.expected.meanSquareSlope / moments.meanSquareSlope).toBeLessThan(1.1);
    }
    // The mean of the standardised deviations over independent seeds: |z̄| < 4/√n.
    expect(Math.abs(zH / seeds)).toBeLessThan(4 / Math.sqrt(seeds));
    expect(Math.abs(zS / seeds)).toBeLessThan(4 / Math.sqrt(seeds));
  });

  it('the along/across split matches the spectrum with a narrow spreading', () => {
    const { grid: g, sea: broad } = harbourSeaPreset();
    const s: SeaSpectrum = { ...broad, spreading: (t) => cos2sSpreading(t, 10) };
    const small = { ...g, width: 128, height: 128, dx: 0.5, dy: 0.5 };
    const sp = prepareRandomSea(small, s, { seed: 4 });
    const f = sp.frame(0);
    const st = slopeStatistics(f.slopeX, f.slopeY, { direction: s.meanDirection });
    const m = seaMoments(s, { kMin: (2 * Math.PI) / 64, kMax: Math.PI / 0.5 });
    expect(st.meanSquareSlopeAlong).toBeGreaterThan(st.meanSquareSlopeAcross);
    expect(sp.expected.meanSquareSlopeAlong / sp.expected.meanSquareSlope).toBeCloseTo(m.meanSquareSlopeAlong / m.meanSquareSlope, 1);
  });

  it('fixed amplitudes with one-sided spreading reproduce the discrete variance exactly', () => {
    const one: SeaSpectrum = { ...sea, spreading: (t) => (Math.abs(t) < Math.PI / 2 ? (2 / Math.PI) * Math.cos(t) ** 2 : 0), meanDirection: 0 };
    const sp = prepareRandomSea(grid, one, { seed: 2, amplitudes: 'fixed' });
    const f = sp.frame(0.7);
    expect(sp.expected.m0StandardDeviation).toBe(0);
    expect((significantWaveHeight(f.height) / 4) ** 2 / sp.expected.m0).toBeCloseTo(1, 12);
  });

  it('synthesizeSea equals prepare + frame; presets resolve their seas', () => {
    const a = synthesizeSea(grid, sea, { seed: 9, time: 0.2 });
    const b = prepareRandomSea(grid, sea, { seed: 9 }).frame(0.2);
    expect(a.height.data).toEqual(b.height.data);
    for (const p of [tankSeaPreset(), harbourSeaPreset()]) {
      const m = seaMoments(p.sea, { kMax: Math.PI / p.grid.dx });
      expect(m.peakWavenumber).toBeLessThan(Math.PI / p.grid.dx);
      expect(p.grid.width * p.grid.dx).toBeGreaterThan((2 * Math.PI) / m.peakWavenumber);
    }
  });
});
