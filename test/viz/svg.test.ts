import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError, createGrid, createRng, gridFromFunction } from '../../src/core/index.js';
import { coxMunkGaussianPdf, gaussianSlopePdf, slopeFieldSvg, slopeHistogram, slopeHistogramSvg } from '../../src/viz/index.js';
import { checkWellFormedSvg } from './svg-check.js';

const spec = { width: 30, height: 20, dx: 0.005, x0: -0.07, y0: -0.05 };

function shafts(svg: string): number[][] {
  const d = /<g class="arrows"[^>]*>\n<path fill="none" d="([^"]*)"/.exec(svg)![1]!;
  return [...d.matchAll(/M([-\d.]+) ([-\d.]+)L([-\d.]+) ([-\d.]+)/g)].map((m) => m.slice(1, 5).map(Number));
}

describe('slopeFieldSvg', () => {
  it('is well-formed SVG with one arrow per subsampled valid sample, a legend and axes in metres', () => {
    const p = gridFromFunction(spec, (x) => 0.1 * Math.cos(60 * x));
    const q = gridFromFunction(spec, (_x, y) => 0.05 * Math.sin(60 * y));
    const svg = slopeFieldSvg(p, q, { step: 3, title: 'Invented tank <test> & co' });
    checkWellFormedSvg(svg);
    expect(svg).toContain('Invented tank &lt;test&gt; &amp; co');
    expect(svg).toContain('x (mm)');
    expect(svg).toContain('y (mm)');
    expect(svg).toMatch(/slope 0\.05/); // nice number near half the largest slope (≈ 0.11)
    const drawn = shafts(svg).length + (svg.match(/h1\.6/g) ?? []).length;
    expect(drawn).toBe(10 * 7);
  });
  it('arrows point along (p, q) with y up: +p to the right, +q upwards (smaller SVG y)', () => {
    const p = gridFromFunction(spec, () => 0.1);
    const zero = createGrid(spec);
    for (const s of shafts(slopeFieldSvg(p, zero, { step: 5 }))) {
      expect(s[2]!).toBeGreaterThan(s[0]!);
      expect(s[3]!).toBeCloseTo(s[1]!, 6);
    }
    for (const s of shafts(slopeFieldSvg(zero, p, { step: 5 }))) {
      expect(s[3]!).toBeLessThan(s[1]!);
      expect(s[2]!).toBeCloseTo(s[0]!, 6);
    }
  });
  it('arrow length is arrowScale · |slope| in plot metres; default fits 0.9 of the arrow spacing', () => {
    const p = gridFromFunction(spec, () => 0.2);
    const zero = createGrid(spec);
    const a = shafts(slopeFieldSvg(p, zero, { step: 5 }));
    const b = shafts(slopeFieldSvg(p, zero, { step: 5, arrowScale: 0.05 }));
    // neighbouring arrow origins are 5 samples apart
    const spacingPx = a[1]![0]! - a[0]![0]!;
    expect(a[0]![2]! - a[0]![0]!).toBeCloseTo(0.9 * spacingPx, 1);
    // 0.05 m per unit slope × 0.2 = 0.01 m = 2 samples of 0.005 m
    expect(b[0]![2]! - b[0]![0]!).toBeCloseTo((2 / 5) * spacingPx, 1);
  });
  it('masked samples get no arrow; NaN allowed there; bad input refused', () => {
    const p = gridFromFunction(spec, () => 0.1);
    const d = p.data.slice();
    d[0] = NaN;
    const mask = new Uint8Array(d.length).fill(1);
    mask[0] = 0;
    const svg = slopeFieldSvg({ ...p, data: d }, p, { step: 1, mask });
    expect(shafts(svg).length).toBe(600 - 1);
    expect(() => slopeFieldSvg({ ...p, data: d }, p)).toThrow(MeniscusRangeError);
    expect(() => slopeFieldSvg(p, createGrid({ ...spec, dx: 0.01 }))).toThrow(MeniscusRangeError);
    expect(() => slopeFieldSvg(p, createGrid({ ...spec, width: 3 }))).toThrow(MeniscusTypeError);
    expect(() => slopeFieldSvg(p, p, { step: 0 })).toThrow(MeniscusRangeError);
  });
});

describe('Gaussian slope densities (Cox & Munk 1954, JOSA 44, 838: Gaussian term)', () => {
  it('peak 1/√(2πσ²) and unit area (analytic normal density)', () => {
    expect(gaussianSlopePdf(0, 0.02)).toBeCloseTo(1 / Math.sqrt(2 * Math.PI * 0.02), 14);
    let area = 0;
    const h = 1e-4;
    for (let s = -2; s <= 2; s += h) area += gaussianSlopePdf(s, 0.02) * h;
    expect(area).toBeCloseTo(1, 6);
    expect(gaussianSlopePdf(0.1, 0.01)).toBeCloseTo(Math.exp(-0.5) / Math.sqrt(2 * Math.PI * 0.01), 14);
  });
  it('the bivariate density is the product of its marginals and integrates to 1', () => {
    const su = 0.03;
    const sc = 0.02;
    expect(coxMunkGaussianPdf(0.1, -0.05, su, sc)).toBeCloseTo(gaussianSlopePdf(0.1, su) * gaussianSlopePdf(-0.05, sc), 12);
    let vol = 0;
    const h = 0.005;
    for (let a = -1; a <= 1; a += h) for (let b = -1; b <= 1; b += h) vol += coxMunkGaussianPdf(a, b, su, sc) * h * h;
    expect(vol).toBeCloseTo(1, 4);
    expect(() => coxMunkGaussianPdf(0, 0, 0, 1)).toThrow(MeniscusRangeError);
  });
});

describe('slopeHistogram', () => {
  it('counts, outside, density normalisation, mean and variance of known data', () => {
    const v = new Float64Array([-1, -0.5, 0, 0, 0.5, 1, 3]);
    const h = slopeHistogram(v, { bins: 4, range: [-1, 1] });
    expect(Array.from(h.counts)).toEqual([1, 1, 2, 2]); // right edge 1 in the last bin
    expect(h.outside).toBe(1);
    expect(h.n).toBe(7);
    expect(h.mean).toBeCloseTo(3 / 7, 14);
    const mean = 3 / 7;
    expect(h.variance).toBeCloseTo(v.reduce((s, x) => s + (x - mean) ** 2, 0) / 7, 14);
    expect(h.density.reduce((s, d) => s + d * 0.5, 0)).toBeCloseTo(6 / 7, 14);
  });
  it('normal draws of variance 0.016 match the Gaussian density within sampling error (seeded)', () => {
    const rng = createRng(42);
    const n = 200_000;
    const v = new Float64Array(n);
    for (let k = 0; k < n; k++) v[k] = rng.normal(0, Math.sqrt(0.016));
    const h = slopeHistogram(v, { bins: 40, range: [-0.5, 0.5] });
    expect(h.variance).toBeCloseTo(0.016, 3);
    const w = 1 / 40;
    for (let b = 0; b < 40; b++) {
      const c = (h.edges[b]! + h.edges[b + 1]!) / 2;
      // expected count from the bin's probability (midpoint rule; fine at this bin width); 5σ Poisson band
      const expected = n * w * gaussianSlopePdf(c, 0.016);
      expect(Math.abs(h.counts[b]! - expected)).toBeLessThan(5 * Math.sqrt(expected) + 0.01 * expected + 2);
    }
  });
  it('masks and bad input', () => {
    const v = new Float64Array([NaN, 1, 2]);
    expect(slopeHistogram(v, { mask: new Uint8Array([0, 1, 1]) }).n).toBe(2);
    expect(() => slopeHistogram(v)).toThrow(MeniscusRangeError);
    expect(() => slopeHistogram(v, { mask: new Uint8Array([0, 0, 0]) })).toThrow(/at least one/);
    expect(() => slopeHistogram([1, 2] as never)).toThrow(MeniscusTypeError);
  });
});

describe('slopeHistogramSvg', () => {
  const rng = createRng(7);
  const big = { width: 64, height: 64, dx: 0.01 };
  const p = gridFromFunction(big, () => rng.normal(0, Math.sqrt(0.02)));
  const q = gridFromFunction(big, () => rng.normal(0, Math.sqrt(0.005)));
  function variances(svg: string): number[] {
    return [...svg.matchAll(/measured: n \d+, variance ([\d.e-]+)/g)].map((m) => Number(m[1]));
  }
  it('well-formed, two panels with bars and model curves, variances in the text', () => {
    const svg = slopeHistogramSvg(p, q, { upwindVariance: 0.02, crosswindVariance: 0.005, title: 'Invented buoy' });
    checkWellFormedSvg(svg);
    expect(svg.match(/class="bars"/g)!.length).toBe(2);
    expect(svg.match(/class="model"/g)!.length).toBe(2);
    expect(svg).toContain('Cox &amp; Munk Gaussian: variance 0.02');
    const [vu, vc] = variances(svg);
    expect(vu).toBeCloseTo(0.02, 2);
    expect(vc).toBeCloseTo(0.005, 3);
  });
  it('windDirection rotates the components: at π/2 the along-wind slope is q', () => {
    const [vu, vc] = variances(slopeHistogramSvg(p, q, { windDirection: Math.PI / 2 }));
    expect(vu).toBeCloseTo(0.005, 3);
    expect(vc).toBeCloseTo(0.02, 2);
  });
  it('meanSquareSlope splits equally; without a model the measured variance is used', () => {
    expect(slopeHistogramSvg(p, q, { meanSquareSlope: 0.03 }).match(/variance 0\.015/g)!.length).toBe(2);
    expect(slopeHistogramSvg(p, q)).toContain('Gaussian of the measured variance');
  });
  it('refuses contradictory or half-given models', () => {
    expect(() => slopeHistogramSvg(p, q, { meanSquareSlope: 0.03, upwindVariance: 0.02, crosswindVariance: 0.01 })).toThrow(MeniscusRangeError);
    expect(() => slopeHistogramSvg(p, q, { upwindVariance: 0.02 })).toThrow(/both/);
    expect(() => slopeHistogramSvg(p, q, { meanSquareSlope: -1 })).toThrow(MeniscusRangeError);
  });
});
