import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MeniscusTypeError } from '../../src/core/index.js';
import { SRGB_ENCODED_THRESHOLD, SRGB_LINEAR_THRESHOLD, srgbByteToLinear, srgbDecode, srgbDecodeArray, srgbEncode, srgbEncodeArray } from '../../src/viz/index.js';

describe('sRGB transfer function (IEC 61966-2-1:1999, section 5.2)', () => {
  it('0.5 linear → 0.7354 encoded (1.055 · 0.5^(1/2.4) − 0.055)', () => {
    expect(srgbEncode(0.5)).toBeCloseTo(0.735357, 6);
    expect(srgbEncode(0.5)).toBe(1.055 * Math.pow(0.5, 1 / 2.4) - 0.055);
  });
  it('0.5 encoded → 0.2140 linear (((0.5 + 0.055)/1.055)^2.4)', () => {
    expect(srgbDecode(0.5)).toBeCloseTo(0.214041, 6);
  });
  it('linear segment 12.92·L below 0.0031308, and V/12.92 below 0.04045', () => {
    expect(srgbEncode(0.001)).toBeCloseTo(0.01292, 12);
    expect(srgbEncode(SRGB_LINEAR_THRESHOLD)).toBeCloseTo(12.92 * 0.0031308, 12);
    expect(srgbDecode(0.02)).toBeCloseTo(0.02 / 12.92, 12);
    expect(srgbDecode(SRGB_ENCODED_THRESHOLD)).toBeCloseTo(0.04045 / 12.92, 12);
  });
  it('the two segments meet at the thresholds (continuity to 1e-7, as the standard rounds its constants)', () => {
    const t = SRGB_LINEAR_THRESHOLD;
    expect(Math.abs(12.92 * t - (1.055 * Math.pow(t, 1 / 2.4) - 0.055))).toBeLessThan(1e-7);
    const v = SRGB_ENCODED_THRESHOLD;
    expect(Math.abs(v / 12.92 - Math.pow((v + 0.055) / 1.055, 2.4))).toBeLessThan(1e-7);
  });
  it('ends: 0 → 0, 1 → 1; 18 % grey encodes to about 0.4614 (from the formula)', () => {
    expect(srgbEncode(0)).toBe(0);
    expect(srgbEncode(1)).toBeCloseTo(1, 15);
    expect(srgbDecode(1)).toBeCloseTo(1, 15);
    expect(srgbEncode(0.18)).toBeCloseTo(0.461356, 5);
  });
  it('decode inverts encode on [0, 1] (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (x) => {
        expect(srgbDecode(srgbEncode(x))).toBeCloseTo(x, 12);
        expect(srgbEncode(srgbDecode(x))).toBeCloseTo(x, 12);
      }),
      { seed: 42, numRuns: 200 },
    );
  });
  it('array forms, in place allowed, type-checked', () => {
    const a = new Float32Array([0, 0.5, 1]);
    const e = srgbEncodeArray(a);
    expect(e[1]).toBeCloseTo(0.735357, 6);
    expect(a[1]).toBe(0.5);
    srgbDecodeArray(e, e);
    expect(e[1]).toBeCloseTo(0.5, 6);
    expect(() => srgbEncodeArray([0.5] as never)).toThrow(MeniscusTypeError);
    expect(() => srgbEncodeArray(new Float64Array(2), new Float64Array(3))).toThrow(MeniscusTypeError);
    expect(srgbByteToLinear(255)).toBeCloseTo(1, 15);
  });
});
