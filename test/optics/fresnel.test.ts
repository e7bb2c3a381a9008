import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MeniscusRangeError } from '../../src/core/index.js';
import {
  brewsterAngle,
  criticalAngle,
  fresnelAmplitudes,
  fresnelAmplitudesFromCosines,
  fresnelReflectance,
  fresnelReflectanceFromCosine,
  fresnelTransmittance,
  fresnelTransmittanceFromCosine,
  snellWindowHalfAngle,
} from '../../src/optics/index.js';
import { FC, expectError, index } from './helpers.js';

const DEG = Math.PI / 180;

describe('Fresnel and special angles: published values', () => {
  // Air–water with n = 1.333: values computed from the Fresnel and Snell formulas
  // (Born & Wolf, Principles of Optics, §1.5), as listed in the project references.
  it('normal-incidence reflectance of air–water is ((n−1)/(n+1))² = 0.020373 (Born & Wolf §1.5.3)', () => {
    const r = fresnelReflectance(0, 1, 1.333);
    expect(r.unpolarized).toBeCloseTo(0.020373, 6);
    expect(r.s).toBeCloseTo(((1.333 - 1) / (1.333 + 1)) ** 2, 15);
    expect(r.p).toBeCloseTo(r.s, 15);
  });

  it('Brewster angle of air–water is 53.1232° (Brewster 1815; Born & Wolf §1.5.3)', () => {
    expect(brewsterAngle(1, 1.333) / DEG).toBeCloseTo(53.1232, 4);
    // and p-polarised reflection vanishes there
    expect(fresnelAmplitudes(brewsterAngle(1, 1.333), 1, 1.333)!.rp).toBeCloseTo(0, 15);
  });

  it('critical angle of water–air is 48.6066° (Born & Wolf §1.5.4) and equals the half-angle of Snell’s window', () => {
    expect(criticalAngle(1.333, 1)! / DEG).toBeCloseTo(48.6066, 4);
    expect(snellWindowHalfAngle(1.333, 1)).toBe(criticalAngle(1.333, 1));
    expect(criticalAngle(1, 1.333)).toBeNull();
    // common practice: Snell's window is a cone of about 97° for water
    expect((2 * snellWindowHalfAngle(1.333)) / DEG).toBeCloseTo(97, 0);
  });

  it('calm-sea reflectance table (Jerlov, Marine Optics, 1976 — attribution inferred) within ±0.25 points', () => {
    // Printed to 0.1 %. The table is not an exact rounding of the Fresnel formula at any
    // single index (no n in 1.330–1.341 reproduces every entry to ±0.05 points); with
    // n = 1.333 the largest difference is 0.11 points (at 80°). The project's references
    // quote the table's agreement with n = 1.333 as ±0.25 points.
    const table = [2.0, 2.0, 2.0, 2.0, 2.1, 2.1, 2.1, 2.3, 2.4, 2.8, 3.4, 4.4, 5.9, 8.7, 13.3, 21.2, 34.9, 58.3, 100];
    table.forEach((pct, k) => {
      const r = 100 * fresnelReflectance(Math.min(5 * k * DEG, Math.PI / 2), 1, 1.333).unpolarized;
      expect(Math.abs(r - pct)).toBeLessThanOrEqual(0.25);
    });
    // and the rounding-level agreement holds on average
    const rms = Math.sqrt(
      table.reduce((s, pct, k) => s + (100 * fresnelReflectance(Math.min(5 * k * DEG, Math.PI / 2), 1, 1.333).unpolarized - pct) ** 2, 0) /
        table.length,
    );
    expect(rms).toBeLessThan(0.06);
  });

  it('glass at normal incidence reflects 4 % (common practice, n = 1.5)', () => {
    expect(fresnelReflectanceFromCosine(1, 1, 1.5).unpolarized).toBeCloseTo(0.04, 15);
    expect(fresnelTransmittanceFromCosine(1, 1, 1.5).unpolarized).toBeCloseTo(0.96, 15);
  });
});

describe('Fresnel: laws for all inputs (fast-check)', () => {
  it('R + T = 1 for s, p and unpolarised light, T from the transmission amplitudes', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: Math.PI / 2, noNaN: true }), index, index, (a, n1, n2) => {
        const r = fresnelReflectance(a, n1, n2);
        const t = fresnelTransmittance(a, n1, n2);
        expect(Math.abs(r.s + t.s - 1)).toBeLessThan(1e-13);
        expect(Math.abs(r.p + t.p - 1)).toBeLessThan(1e-13);
        expect(Math.abs(r.unpolarized + t.unpolarized - 1)).toBeLessThan(1e-13);
        for (const v of [r.s, r.p, t.s, t.p]) {
          expect(v).toBeGreaterThanOrEqual(0);
          expect(v).toBeLessThanOrEqual(1 + 1e-15);
        }
      }),
      FC,
    );
  });

  it('reflectance is 1 exactly beyond the critical angle and amplitudes are then null', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.01, max: 2.5, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (n1, u) => {
        const tc = criticalAngle(n1, 1)!;
        const a = u * (Math.PI / 2);
        if (Math.abs(a - tc) < 1e-9) return;
        if (a > tc) {
          expect(fresnelReflectance(a, n1, 1).unpolarized).toBe(1);
          expect(fresnelTransmittance(a, n1, 1).unpolarized).toBe(0);
          expect(fresnelAmplitudes(a, n1, 1)).toBeNull();
        } else {
          expect(fresnelAmplitudes(a, n1, 1)).not.toBeNull();
        }
      }),
      FC,
    );
  });

  it("Stokes relations t·t' = 1 − r² and r' = −r (Stokes 1849; Born & Wolf §1.5.2)", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1.5, noNaN: true }), index, index, (a, n1, n2) => {
        const f = fresnelAmplitudes(a, n1, n2);
        if (f === null) return;
        const ci = Math.cos(a);
        const ct = Math.sqrt(1 - ((n1 / n2) * Math.sin(a)) ** 2);
        const b = fresnelAmplitudesFromCosines(ct, ci, n2, n1); // the reverse path
        expect(Math.abs(b.rs + f.rs)).toBeLessThan(1e-13);
        expect(Math.abs(b.rp + f.rp)).toBeLessThan(1e-13);
        expect(Math.abs(f.ts * b.ts - (1 - f.rs * f.rs))).toBeLessThan(1e-13);
        expect(Math.abs(f.tp * b.tp - (1 - f.rp * f.rp))).toBeLessThan(1e-13);
      }),
      FC,
    );
  });

  it('angle and cosine forms agree; equal media neither reflect nor bend', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: Math.PI / 2, noNaN: true }), index, index, (a, n1, n2) => {
        const c = Math.cos(a);
        expect(fresnelReflectanceFromCosine(Math.max(0, c), n1, n2).s).toBeCloseTo(fresnelReflectance(a, n1, n2).s, 14);
        expect(fresnelTransmittanceFromCosine(Math.max(0, c), n1, n2).p).toBeCloseTo(fresnelTransmittance(a, n1, n2).p, 14);
        expect(fresnelReflectance(a, n1, n1).unpolarized).toBe(0);
      }),
      FC,
    );
  });
});

describe('Fresnel: bad input', () => {
  it('angles, cosines and indices out of range name the parameter', () => {
    expectError(() => fresnelReflectance(-0.1, 1, 1.33), MeniscusRangeError, 'angle');
    expectError(() => fresnelReflectance(2, 1, 1.33), MeniscusRangeError, 'angle');
    expectError(() => fresnelTransmittance(NaN, 1, 1.33), MeniscusRangeError, 'angle');
    expectError(() => fresnelAmplitudes(0, 0, 1.33), MeniscusRangeError, 'n1');
    expectError(() => fresnelReflectanceFromCosine(1.1, 1, 1.33), MeniscusRangeError, 'cosIncident');
    expectError(() => fresnelAmplitudesFromCosines(1, -0.1, 1, 1.33), MeniscusRangeError, 'cosTransmitted');
    expectError(() => fresnelAmplitudesFromCosines(0, 0, 1, 1.33), MeniscusRangeError, 'cosTransmitted');
    expectError(() => criticalAngle(1.33, -1), MeniscusRangeError, 'n2');
    expectError(() => brewsterAngle(Infinity, 1), MeniscusRangeError, 'n1');
    expectError(() => snellWindowHalfAngle(1, 1.33), MeniscusRangeError, 'nBelow');
  });
});
