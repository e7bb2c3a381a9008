import { describe, expect, it } from 'vitest';
import { createGrid, gridFromFunction, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  cos2sNormalization,
  cos2sSpreading,
  cosSquaredSpreading,
  coxMunkMeanSquareSlope,
  jonswapFromPeak,
  jonswapFromWind,
  jonswapPeakEnhancement,
  jonswapSpectrum,
  jonswapSpectrumFunction,
  mitsuyasuExponent,
  piersonMoskowitzSpectrum,
  seaMoments,
  significantWaveHeight,
  slopeStatistics,
  spectralMoments,
} from '../../src/waves/index.js';

const g = 9.81;

describe('Pierson–Moskowitz (1964, JGR 69(24), 5181)', () => {
  it('Hs ≈ 0.21 U²/g with U at 19.5 m, exactly 2√(α/β) U²/g', () => {
    for (const u of [5, 10, 20]) {
      const m = spectralMoments((w) => piersonMoskowitzSpectrum(w, u, g), 0.05 * (g / u), 200 * (g / u), 20000);
      const ratio = m.significantHeight / ((u * u) / g);
      expect(ratio).toBeCloseTo(0.21, 2);
      expect(ratio / (2 * Math.sqrt(8.1e-3 / 0.74))).toBeCloseTo(1, 6);
    }
  });

  it('peaks at ω_p = 0.877 g/U (REFERENCES.md, from memory; = (4β/5)^(1/4) g/U analytically)', () => {
    const u = 12;
    let best = 0;
    let wp = 0;
    for (let w = 0.3; w < 1.2; w += 1e-5) {
      const s = piersonMoskowitzSpectrum(w, u, g);
      if (s > best) {
        best = s;
        wp = w;
      }
    }
    expect((wp * u) / g).toBeCloseTo(0.877, 3);
    expect((wp * u) / g).toBeCloseTo(Math.pow(0.8 * 0.74, 0.25), 4);
  });
});

describe('JONSWAP (Hasselmann et al. 1973, DHZ A8(12))', () => {
  it('the peak enhancement equals γ at the peak and tends to 1 away from it', () => {
    for (const gamma of [1, 2, 3.3, 7]) {
      const p = { peakOmega: 1.3, gamma, gravity: g };
      expect(jonswapPeakEnhancement(1.3, p)).toBeCloseTo(gamma, 12);
      expect(jonswapPeakEnhancement(3, p)).toBeCloseTo(1, 6);
      // The spectrum over its γ = 1 form is γ^r.
      expect(jonswapSpectrum(1.3, p) / jonswapSpectrum(1.3, { ...p, gamma: 1 })).toBeCloseTo(gamma, 12);
    }
  });

  it('γ = 1 with ω_p from U₁₉.₅ is the Pierson–Moskowitz spectrum (Hasselmann et al. 1973)', () => {
    const u = 15;
    const wp = Math.pow(0.8 * 0.74, 0.25) * (g / u);
    for (const w of [0.4, 0.6, 1, 2.5]) {
      expect(jonswapSpectrum(w, { peakOmega: wp, gamma: 1, gravity: g }) / piersonMoskowitzSpectrum(w, u, g)).toBeCloseTo(1, 12);
    }
  });

  it('default σ_a = 0.07, σ_b = 0.09 (asymmetric peak)', () => {
    const p = { peakOmega: 1, gravity: g };
    const below = jonswapPeakEnhancement(1 - 0.07, p);
    const above = jonswapPeakEnhancement(1 + 0.09, p);
    expect(below).toBeCloseTo(Math.pow(3.3, Math.exp(-0.5)), 12);
    expect(above).toBeCloseTo(Math.pow(3.3, Math.exp(-0.5)), 12);
  });

  it('fetch relations α = 0.076 x̃^−0.22, f_p = 3.5 (g/U) x̃^−0.33 (Hasselmann et al. 1973; constants from memory)', () => {
    const u = 10;
    const fetch = 50_000;
    const p = jonswapFromWind(u, fetch, { gravity: g });
    const x = (g * fetch) / (u * u);
    expect(p.alpha).toBeCloseTo(0.076 * Math.pow(x, -0.22), 14);
    expect(p.peakOmega / (2 * Math.PI)).toBeCloseTo(3.5 * (g / u) * Math.pow(x, -0.33), 14);
    // Longer fetch: lower peak, smaller α (growth towards full development).
    const q = jonswapFromWind(u, 4 * fetch, { gravity: g });
    expect(q.peakOmega).toBeLessThan(p.peakOmega);
    expect(q.alpha!).toBeLessThan(p.alpha!);
  });

  it('the peak-period form meets its significant height: 4√m0 = Hs', () => {
    const p = jonswapFromPeak({ peakPeriod: 1.2, significantHeight: 0.05, gravity: g });
    const S = jonswapSpectrumFunction(p);
    const m = spectralMoments(S, p.peakOmega / 5, p.peakOmega * 300, 20000);
    expect(m.significantHeight).toBeCloseTo(0.05, 5);
    expect(S(-1)).toBe(0);
    expect(jonswapFromPeak({ peakPeriod: 2 }).alpha).toBeUndefined();
  });

  it('refuses non-positive frequencies and bad parameters', () => {
    expect(() => jonswapSpectrum(0, { peakOmega: 1 })).toThrow(MeniscusRangeError);
    expect(() => jonswapSpectrum(1, { peakOmega: -1 })).toThrow(/peakOmega/);
    expect(() => jonswapSpectrum(1, { peakOmega: 1, gamma: 0.5 })).toThrow(/gamma/);
    expect(() => piersonMoskowitzSpectrum(-1, 10)).toThrow(MeniscusRangeError);
    expect(() => jonswapFromWind(0, 1000)).toThrow(MeniscusRangeError);
    expect(() => jonswapFromPeak({ peakPeriod: 0 })).toThrow(MeniscusRangeError);
    expect(() => spectralMoments((w) => w, 2, 1)).toThrow(MeniscusRangeError);
    expect(() => spectralMoments('S' as never, 1, 2)).toThrow(MeniscusTypeError);
  });
});

describe('directional spreading', () => {
  const integrate = (f: (t: number) => number): number => {
    const n = 20000;
    let s = 0;
    for (let i = 0; i < n; i++) s += f(-Math.PI + ((i + 0.5) * 2 * Math.PI) / n);
    return (s * 2 * Math.PI) / n;
  };
  it('cos-2s integrates to 1 and G(1) = 1/π (Longuet-Higgins, Cartwright & Smith 1963)', () => {
    expect(cos2sNormalization(1)).toBeCloseTo(1 / Math.PI, 14);
    for (const s of [0, 0.5, 1, 4, 20, 75]) expect(integrate((t) => cos2sSpreading(t, s))).toBeCloseTo(1, 8);
    expect(cos2sSpreading(Math.PI, 3)).toBeCloseTo(0, 14);
    expect(cos2sSpreading(0.3 + 2 * Math.PI, 3)).toBeCloseTo(cos2sSpreading(0.3, 3), 12);
  });
  it('half-plane cos² integrates to 1 and is zero behind (common practice)', () => {
    expect(integrate(cosSquaredSpreading)).toBeCloseTo(1, 8);
    expect(cosSquaredSpreading(2)).toBe(0);
  });
  it('Mitsuyasu et al. (1975): s at the peak = 11.5 (ω_p U₁₀/g)^−2.5, smaller away from it', () => {
    const wp = 1.2;
    const sp = mitsuyasuExponent(wp, wp, 10, g);
    expect(sp).toBeCloseTo(11.5 * Math.pow((wp * 10) / g, -2.5), 12);
    expect(mitsuyasuExponent(0.8 * wp, wp, 10, g)).toBeCloseTo(sp * Math.pow(0.8, 5), 12);
    expect(mitsuyasuExponent(2 * wp, wp, 10, g)).toBeCloseTo(sp * Math.pow(2, -2.5), 12);
  });
});

describe('sea moments and slopes', () => {
  it('deep-water gravity sea: mean-square slope = m4/g² (k = ω²/g; Cox & Munk 1954, Longuet-Higgins 1957)', () => {
    const p = jonswapFromWind(8, 20_000, { gravity: g });
    const S = jonswapSpectrumFunction(p);
    const sea = { frequencySpectrum: S, dispersion: { surfaceTension: 0, gravity: g } };
    const wMax = 6 * p.peakOmega;
    const kMax = (wMax * wMax) / g;
    const m = seaMoments(sea, { kMax, intervals: 20000 });
    const f = spectralMoments(S, p.peakOmega / 7.07, wMax, 20000);
    expect(m.m0 / f.m0).toBeCloseTo(1, 5);
    expect(m.m2 / f.m2).toBeCloseTo(1, 5);
    expect(m.meanSquareSlope / (f.m4 / (g * g))).toBeCloseTo(1, 5);
    expect(m.m4 / f.m4).toBeCloseTo(1, 5);
    // Half-plane cos²: ∫cos²θ·(2/π)cos²θ dθ = 3/4 of the slope variance lies along the wind.
    expect(m.meanSquareSlopeAlong / m.meanSquareSlope).toBeCloseTo(0.75, 6);
  });

  it('a saturation-range tail makes F ∝ k⁻³, so the slope variance per e-fold of k is constant (Phillips 1958)', () => {
    const p = jonswapFromPeak({ peakPeriod: 0.35, significantHeight: 0.008 });
    const kS = 150;
    const sea = { frequencySpectrum: jonswapSpectrumFunction(p), saturationFrom: kS };
    const a = seaMoments(sea, { kMin: 300, kMax: 600 }).meanSquareSlope;
    const b = seaMoments(sea, { kMin: 600, kMax: 1200 }).meanSquareSlope;
    expect(a / b).toBeCloseTo(1, 6);
  });

  it('refuses a missing band', () => {
    expect(() => seaMoments({ frequencySpectrum: (w) => piersonMoskowitzSpectrum(w, 10) }, undefined as never)).toThrow(MeniscusRangeError);
  });
});

describe('Cox & Munk (1954, JOSA 44(11), 838) mean-square slopes', () => {
  it('clean surface: σ² = 0.003 + 5.12e-3 U, σu² = 3.16e-3 U, σc² = 0.003 + 1.92e-3 U', () => {
    for (const [u, total] of [
      [0, 0.003],
      [5, 0.0286],
      [10, 0.0542],
      [14, 0.07468],
    ] as const) {
      const c = coxMunkMeanSquareSlope(u);
      expect(c.total).toBeCloseTo(total, 12);
      expect(c.upwind).toBeCloseTo(3.16e-3 * u, 12);
      expect(c.crosswind).toBeCloseTo(0.003 + 1.92e-3 * u, 12);
    }
  });
  it('slick surface: σ² = 0.008 + 1.56e-3 U (the components from memory)', () => {
    const c = coxMunkMeanSquareSlope(10, { surface: 'slick' });
    expect(c.total).toBeCloseTo(0.0236, 12);
    expect(c.upwind).toBeCloseTo(0.0128, 12);
    expect(c.crosswind).toBeCloseTo(0.0114, 12);
    expect(() => coxMunkMeanSquareSlope(-1)).toThrow(MeniscusRangeError);
    expect(() => coxMunkMeanSquareSlope(5, { surface: 'oily' as never })).toThrow(MeniscusRangeError);
  });
});

describe('field statistics', () => {
  it('Hs of a sampled sinusoid a·cos is 4·a/√2 (analytic)', () => {
    const a = 0.02;
    const h = gridFromFunction({ width: 64, height: 8, dx: 1 / 64 }, (x) => 0.5 + a * Math.cos(2 * Math.PI * 3 * x));
    expect(significantWaveHeight(h)).toBeCloseTo((4 * a) / Math.SQRT2, 14);
  });

  it('slope variances of a plane wave split along and across its direction (analytic)', () => {
    const th = 0.6;
    const k = 2 * Math.PI * 4;
    const a = 0.01;
    const spec = { width: 64, height: 64, dx: 1 / 64 };
    const p = gridFromFunction(spec, (x, y) => -a * k * Math.cos(th) * Math.sin(k * (x * Math.cos(th) + y * Math.sin(th))));
    const q = gridFromFunction(spec, (x, y) => -a * k * Math.sin(th) * Math.sin(k * (x * Math.cos(th) + y * Math.sin(th))));
    const s = slopeStatistics(p, q, { direction: th });
    const st = slopeStatistics(p, q);
    expect(s.meanSquareSlope).toBeCloseTo(st.meanSquareSlope, 14);
    expect(s.meanSquareSlopeAcross / s.meanSquareSlope).toBeLessThan(1e-3);
    expect(s.meanSquareSlope).toBeCloseTo((a * k) ** 2 / 2, 2);
  });

});
