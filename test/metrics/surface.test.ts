import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createGrid, gridFromFunction, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import { fitPlane, heightError, slopeError } from '../../src/metrics/index.js';

const spec = { width: 40, height: 30, dx: 0.01, dy: 0.02, x0: -0.2, y0: 0.1 };
const truth = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y));

describe('heightError', () => {
  it('a pure piston offset scores 0 after piston removal, and |offset| without (analytic)', () => {
    const m = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y) + 0.042);
    const r = heightError(m, truth);
    // Zero up to the rounding of the mean of 1200 samples near 0.042.
    expect(r.rms).toBeLessThan(1e-13);
    expect(r.peak).toBeLessThan(1e-13);
    expect(r.piston).toBeCloseTo(0.042, 14);
    const n = heightError(m, truth, { remove: 'none' });
    expect(n.rms).toBeCloseTo(0.042, 14);
    expect(n.peak).toBeCloseTo(0.042, 14);
    expect(n.peakToValley).toBeLessThan(1e-13);
  });

  it('a pure tilt scores 0 after tilt removal; after piston only its RMS is |a|·dx·√((n² − 1)/12) (analytic)', () => {
    const a = 0.004;
    const m = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y) + 0.01 + a * x);
    const t = heightError(m, truth, { remove: 'tilt' });
    expect(t.rms).toBeLessThan(1e-13);
    expect(t.tiltX).toBeCloseTo(a, 12);
    expect(t.tiltY).toBeCloseTo(0, 12);
    const p = heightError(m, truth, { remove: 'piston' });
    // Uniform samples x_i = x0 + i·dx, i = 0 … n−1: standard deviation dx·√((n² − 1)/12).
    expect(p.rms).toBeCloseTo(a * spec.dx * Math.sqrt((40 * 40 - 1) / 12), 14);
    expect(p.peakToValley).toBeCloseTo(a * spec.dx * 39, 14);
  });

  it('the RMS of a sine over whole periods is A/√2, its peak A (analytic: Σ sin² = N/2)', () => {
    const A = 0.002;
    // 40 columns = 4 periods of 10 samples.
    const m = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y) + A * Math.sin((2 * Math.PI * (x - spec.x0)) / (10 * spec.dx)));
    const r = heightError(m, truth);
    expect(r.rms).toBeCloseTo(A / Math.SQRT2, 14);
    expect(r.piston).toBeCloseTo(0, 14);
    expect(r.peak).toBeCloseTo(A * Math.sin((2 * Math.PI * 2) / 10), 12); // samples nearest the crest: sin(2π·2/10)
  });

  it('removing the tilt is invariant to any plane added to the measurement (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), (c, a, b) => {
        const noisy = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y) + 0.001 * Math.cos(31 * x * y));
        const tilted = gridFromFunction(spec, (x, y) => noisy.data[Math.round((y - spec.y0) / spec.dy) * 40 + Math.round((x - spec.x0) / spec.dx)]! + c + a * x + b * y);
        const r0 = heightError(noisy, truth, { remove: 'tilt' }).rms;
        const r1 = heightError(tilted, truth, { remove: 'tilt' }).rms;
        return Math.abs(r0 - r1) < 1e-12;
      }),
      { seed: 42, numRuns: 100 },
    );
  });

  it('uses only the masked samples, holes may hold NaN, and writes the residual map', () => {
    const m = gridFromFunction(spec, (x, y) => 0.003 * Math.sin(7 * x) * Math.cos(5 * y));
    const mask = new Uint8Array(40 * 30).fill(1);
    for (let k = 0; k < 40 * 30; k += 7) {
      mask[k] = 0;
      m.data[k] = NaN;
    }
    m.data[1] = m.data[1]! + 0.01; // one valid outlier
    const out = new Float64Array(40 * 30);
    const r = heightError(m, truth, { mask, remove: 'none', out });
    const count = mask.reduce((s, v) => s + v, 0);
    expect(r.count).toBe(count);
    expect(r.rms).toBeCloseTo(0.01 / Math.sqrt(count), 12);
    expect(r.residual).toBe(out);
    expect(out[1]).toBeCloseTo(0.01, 12);
    expect(out[0]).toBe(0);
    expect(() => heightError(m, truth)).toThrow(MeniscusRangeError); // NaN without a mask
  });

  it('refuses bad input', () => {
    const other = createGrid({ width: 41, height: 30, dx: 0.01, dy: 0.02, x0: -0.2, y0: 0.1 });
    expect(() => heightError(other, truth)).toThrow(MeniscusTypeError);
    const shifted = createGrid({ ...spec, x0: 0 });
    expect(() => heightError(shifted, truth)).toThrow(MeniscusRangeError);
    expect(() => heightError(truth, truth, { mask: new Uint8Array(5) })).toThrow(MeniscusTypeError);
    expect(() => heightError(truth, truth, { mask: new Uint8Array(1200) })).toThrow(MeniscusRangeError);
    const row = new Uint8Array(1200);
    for (let i = 0; i < 40; i++) row[5 * 40 + i] = 1; // one row: no unique plane
    expect(() => heightError(truth, truth, { mask: row, remove: 'tilt' })).toThrow(/one line/);
    expect(heightError(truth, truth, { mask: row }).rms).toBe(0);
    expect(() => heightError(truth, truth, { remove: 'plane' as never })).toThrow(MeniscusRangeError);
    expect(() => heightError(truth, truth, { out: new Float64Array(3) })).toThrow(MeniscusTypeError);
  });
});

describe('fitPlane (ordinary least squares, common practice)', () => {
  it('recovers an exact plane', () => {
    const g = gridFromFunction(spec, (x, y) => 1.5 - 2 * x + 0.25 * y);
    const f = fitPlane(g);
    expect(f.a).toBeCloseTo(-2, 12);
    expect(f.b).toBeCloseTo(0.25, 12);
    expect(f.c).toBeCloseTo(1.5 - 2 * f.xc + 0.25 * f.yc, 12);
    expect(f.count).toBe(1200);
  });
});

describe('slopeError', () => {
  const p = gridFromFunction(spec, (x, y) => 0.021 * Math.cos(7 * x) * Math.cos(5 * y));
  const q = gridFromFunction(spec, (x, y) => -0.015 * Math.sin(7 * x) * Math.sin(5 * y));
  it('a constant slope offset (δp, δq) has RMS √(δp² + δq²), and 0 with the mean removed (analytic)', () => {
    const mp = gridFromFunction(spec, (x, y) => 0.021 * Math.cos(7 * x) * Math.cos(5 * y) + 0.003);
    const mq = gridFromFunction(spec, (x, y) => -0.015 * Math.sin(7 * x) * Math.sin(5 * y) - 0.004);
    const r = slopeError(mp, mq, p, q);
    expect(r.rms).toBeCloseTo(0.005, 14);
    expect(r.rmsP).toBeCloseTo(0.003, 14);
    expect(r.rmsQ).toBeCloseTo(0.004, 14);
    expect(r.peak).toBeCloseTo(0.005, 14);
    expect(r.meanP).toBeCloseTo(0.003, 14);
    expect(slopeError(mp, mq, p, q, { removeMean: true }).rms).toBeLessThan(1e-13);
  });

  it('uses only the mask and refuses bad input', () => {
    const mp = gridFromFunction(spec, (x, y) => 0.021 * Math.cos(7 * x) * Math.cos(5 * y));
    mp.data[0] = 99;
    const mask = new Uint8Array(1200).fill(1);
    mask[0] = 0;
    expect(slopeError(mp, q, p, q, { mask }).rms).toBe(0);
    expect(slopeError(mp, q, p, q, { mask }).count).toBe(1199);
    expect(() => slopeError(mp, createGrid({ width: 3, height: 3 }), p, q)).toThrow(MeniscusTypeError);
    expect(() => slopeError(mp, q, p, q, { mask: new Uint8Array(1199) })).toThrow(MeniscusTypeError);
    expect(() => slopeError(mp, q, p, q, { mask: new Uint8Array(1200) })).toThrow(MeniscusRangeError);
  });
});
