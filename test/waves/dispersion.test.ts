import { describe, expect, it } from 'vitest';
import { MeniscusRangeError } from '../../src/core/index.js';
import {
  angularFrequency,
  groupSpeed,
  minimumPhaseSpeed,
  phaseSpeed,
  surfaceTensionWater,
  wavenumber,
  STANDARD_GRAVITY,
} from '../../src/waves/index.js';

const gravityOnly = { surfaceTension: 0, gravity: 9.81 };

describe('dispersion relation ω² = (g k + σ k³/ρ) tanh(k h) (Lamb 1932, Hydrodynamics, §267)', () => {
  it('deep water gravity waves: ω = √(g k), c = √(g/k), c_g = c/2 (analytic)', () => {
    for (const k of [0.01, 0.5, 1, 7.3, 40]) {
      expect(angularFrequency(k, gravityOnly)).toBeCloseTo(Math.sqrt(9.81 * k), 12);
      expect(phaseSpeed(k, gravityOnly)).toBeCloseTo(Math.sqrt(9.81 / k), 12);
      expect(groupSpeed(k, gravityOnly) / phaseSpeed(k, gravityOnly)).toBeCloseTo(0.5, 12);
    }
    expect(angularFrequency(1, gravityOnly)).toBeCloseTo(3.132091952673165, 13);
  });

  it('finite depth: values computed from the formula at several (k, h)', () => {
    for (const [k, h] of [
      [0.5, 2],
      [0.05, 10],
      [2, 0.3],
      [0.2, 50],
    ] as const) {
      const w = Math.sqrt(9.81 * k * Math.tanh(k * h));
      expect(angularFrequency(k, { ...gravityOnly, depth: h })).toBeCloseTo(w, 12);
    }
    expect(angularFrequency(0.5, { ...gravityOnly, depth: 2 })).toBeCloseTo(1.932775, 6);
  });

  it('shallow-water limit c → √(g h) and c_g → c (analytic)', () => {
    for (const h of [0.1, 4, 30]) {
      const k = 1e-5 / h;
      expect(phaseSpeed(k, { ...gravityOnly, depth: h }) / Math.sqrt(9.81 * h)).toBeCloseTo(1, 9);
      expect(groupSpeed(k, { ...gravityOnly, depth: h }) / Math.sqrt(9.81 * h)).toBeCloseTo(1, 9);
    }
  });

  it('pure capillary waves: c_g = 3c/2 (Lighthill 1978, Waves in Fluids, §3.6)', () => {
    const k = 1e6;
    expect(groupSpeed(k) / phaseSpeed(k)).toBeCloseTo(1.5, 4);
  });

  it('group speed is the derivative dω/dk (central difference)', () => {
    for (const [k, h] of [
      [3, 0.4],
      [400, Infinity],
      [0.01, 20],
    ] as const) {
      const e = k * 1e-6;
      const fd = (angularFrequency(k + e, { depth: h }) - angularFrequency(k - e, { depth: h })) / (2 * e);
      expect(groupSpeed(k, { depth: h }) / fd).toBeCloseTo(1, 7);
    }
  });

  it('k from ω inverts ω from k to full precision, in every regime', () => {
    for (const k of [1e-4, 0.03, 1, 37, 370, 5e3, 1e5]) {
      for (const depth of [Infinity, 0.05, 3, 4000]) {
        for (const surfaceTension of [0, 0.0728]) {
          const w = angularFrequency(k, { depth, surfaceTension });
          expect(wavenumber(w, { depth, surfaceTension }) / k).toBeCloseTo(1, 12);
        }
      }
    }
  });

  it('minimum phase speed about 0.23 m/s at about 1.7 cm wavelength (Lamb, Hydrodynamics §267; Lighthill, Waves in Fluids §3.6)', () => {
    const m = minimumPhaseSpeed();
    expect(m.speed).toBeGreaterThan(0.225);
    expect(m.speed).toBeLessThan(0.235);
    expect(m.wavelength).toBeGreaterThan(0.0165);
    expect(m.wavelength).toBeLessThan(0.0175);
    // And it is the minimum of the phase speed of the full relation (deep water).
    let best = Infinity;
    let bestK = 0;
    for (let k = 100; k < 1000; k += 0.05) {
      const c = phaseSpeed(k);
      if (c < best) {
        best = c;
        bestK = k;
      }
    }
    expect(best).toBeCloseTo(m.speed, 8);
    expect(bestK / m.wavenumber).toBeCloseTo(1, 3);
    // At the minimum, phase and group speeds are equal.
    expect(groupSpeed(m.wavenumber) / phaseSpeed(m.wavenumber)).toBeCloseTo(1, 12);
  });

  it('refuses negative depths, non-positive frequencies and wavenumbers', () => {
    expect(() => angularFrequency(1, { depth: -1 })).toThrow(MeniscusRangeError);
    expect(() => angularFrequency(1, { depth: 0 })).toThrow(/depth/);
    expect(() => wavenumber(0)).toThrow(/omega/);
    expect(() => wavenumber(-2)).toThrow(MeniscusRangeError);
    expect(() => wavenumber(NaN)).toThrow(MeniscusRangeError);
    expect(() => phaseSpeed(0)).toThrow(MeniscusRangeError);
    expect(() => groupSpeed(1, { surfaceTension: -0.1 })).toThrow(MeniscusRangeError);
    expect(() => minimumPhaseSpeed({ surfaceTension: 0 })).toThrow(MeniscusRangeError);
    expect(STANDARD_GRAVITY).toBe(9.80665);
  });
});

describe('surface tension of water, IAPWS R1-76(2014)', () => {
  it('matches the release table: 75.65 (0.01 °C), 72.74 (20 °C), 71.97 (25 °C), 58.91 (100 °C) mN/m', () => {
    // 20 °C from the release table as quoted in the project's references; the 0.01, 25
    // and 100 °C values are from memory of the same table, and agree with the formula.
    expect(surfaceTensionWater(0.01) * 1000).toBeCloseTo(75.65, 2);
    expect(surfaceTensionWater(0) * 1000).toBeCloseTo(75.65, 2);
    expect(surfaceTensionWater(20) * 1000).toBeCloseTo(72.74, 2);
    expect(surfaceTensionWater(25) * 1000).toBeCloseTo(71.97, 2);
    expect(surfaceTensionWater(100) * 1000).toBeCloseTo(58.91, 2);
  });

  it('is zero at the critical point and refuses temperatures outside the range', () => {
    expect(surfaceTensionWater(373.946)).toBeCloseTo(0, 12);
    expect(() => surfaceTensionWater(400)).toThrow(MeniscusRangeError);
    expect(() => surfaceTensionWater(-30)).toThrow(MeniscusRangeError);
    expect(() => surfaceTensionWater(NaN)).toThrow(MeniscusRangeError);
  });
});

describe('dispersion bounds', () => {
  it('refuses wavenumbers and frequencies beyond MAX_WAVENUMBER instead of returning ∞ or NaN', async () => {
    const w = await import('../../src/waves/index.js');
    for (const f of [w.angularFrequency, w.phaseSpeed, w.groupSpeed]) {
      expect(() => f(1e308)).toThrow(/MAX_WAVENUMBER/);
      expect(Number.isFinite(f(w.MAX_WAVENUMBER))).toBe(true);
    }
    expect(() => w.wavenumber(1e308)).toThrow(/MAX_WAVENUMBER/);
    // the round trip holds at the bound (the relation is monotonic)
    const om = w.angularFrequency(w.MAX_WAVENUMBER);
    expect(w.wavenumber(om) / w.MAX_WAVENUMBER).toBeCloseTo(1, 10);
  });
});
