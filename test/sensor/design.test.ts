import { describe, expect, it } from 'vitest';
import { designSensor, formatSensorDesign } from '../../src/sensor/index.js';

const base = {
  pitch: 0.01,
  apertureDiameter: 0.001,
  planeDistance: 0.05,
  maskDepth: 0.3,
  sourceAngularRadius: 0.00465,
  pixelSize: 50e-6,
  centroidPrecision: 0.05,
};
const nRel = 1.333 / 1.000293;

/** Solve α − asin(sin α / n) = δ for the surface tilt α (bisection): the deviation of vertical light at a tilted air–water interface. */
function tiltFor(delta: number): number {
  let lo = 0, hi = Math.PI / 2 - 1e-9;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid - Math.asin(Math.sin(mid) / nRel) < delta) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

describe('designSensor', () => {
  it('largest and smallest slope match the closed-form Shack–Hartmann relations scaled by refraction at the air–water interface (Platt & Shack 2001; Snell)', () => {
    const d = designSensor(base);
    const r = d.spot.total / 2;
    // Largest: the spot moves (pitch/2 − spot radius) over the distance L.
    const aMax = tiltFor(Math.atan((base.pitch / 2 - r) / base.planeDistance));
    expect(d.maxSlopeCell).toBeCloseTo(Math.tan(aMax), 6);
    // Smallest: the spot moves by the centroid precision.
    const aMin = tiltFor(Math.atan((base.centroidPrecision * base.pixelSize) / base.planeDistance));
    expect(d.minSlope).toBeCloseTo(Math.tan(aMin), 9);
    // Small-slope forms: (pitch/2 − r)/L and σ/L divided by (1 − 1/n).
    expect(d.minSlope / ((base.centroidPrecision * base.pixelSize) / base.planeDistance / (1 - 1 / nRel))).toBeCloseTo(1, 3);
    expect(d.gain / (base.planeDistance * (1 - 1 / nRel))).toBeCloseTo(1, 3);
  });

  it('the spot budget: source disc 2 α_w L, Airy diameter 2.44 λ_w L / D, the pinhole D (Born & Wolf §8.5.2)', () => {
    const d = designSensor({ ...base, wavelengthNm: 600 });
    const alphaW = base.sourceAngularRadius / nRel;
    expect(d.spot.source).toBeCloseTo(2 * alphaW * base.planeDistance, 12);
    expect(d.spot.diffraction).toBeCloseTo((2.44 * 600e-9) / 1.333 * base.planeDistance / base.apertureDiameter, 12);
    expect(d.spot.aperture).toBe(base.apertureDiameter);
    expect(d.spot.total).toBeCloseTo(Math.hypot(d.spot.source, d.spot.diffraction, d.spot.aperture), 12);
    expect(d.shortestWave).toBe(2 * base.pitch);
  });

  it('the fraction in range follows the Rayleigh law for an isotropic Gaussian sea (Cox & Munk 1954)', () => {
    const d = designSensor({ ...base, sea: { meanSquareSlope: 0.02 } });
    expect(d.fractionInRange).toBeCloseTo(1 - Math.exp(-(d.maxSlopeCell ** 2) / 0.02), 10);
    const an = designSensor({ ...base, sea: { slopeStd: [0.1, 0.1 + 1e-9] } });
    expect(an.fractionInRange).toBeCloseTo(d.fractionInRange!, 4);
  });

  it('warns in plain words when a choice will fail', () => {
    const bad = designSensor({ ...base, pitch: 0.003, apertureDiameter: 0.003, planeDistance: 0.2, pixelSize: 1e-3, sea: { maxSlope: 0.5, shortestWavelength: 0.005, meanSquareSlope: 0.05, significantWaveHeight: 0.5 } });
    const text = bad.warnings.join('\n');
    expect(text).toMatch(/overlap/);
    expect(text).toMatch(/out of their cells/);
    expect(text).toMatch(/aliased/);
    expect(text).toMatch(/uncover/);
    const good = designSensor({ ...base, sea: { maxSlope: 0.1, shortestWavelength: 0.1, meanSquareSlope: 0.001 } });
    expect(good.warnings).toEqual([]);
    expect(formatSensorDesign(good)).toMatch(/warnings\s+none/);
  });

  it('refuses a plane behind the mask, negative distances and apertures wider than the pitch', () => {
    expect(() => designSensor({ ...base, planeDistance: -0.05 })).toThrow(/planeDistance/);
    expect(() => designSensor({ ...base, maskDepth: 0 })).toThrow(/maskDepth/);
    expect(() => designSensor({ ...base, apertureDiameter: 0.02 })).toThrow(/apertureDiameter/);
    expect(() => designSensor({ ...base, sourceZenith: 2 })).toThrow(/sourceZenith/);
  });
});
