import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { createImage, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import { sampleImage, sampleImageBatch, srgbDecode, srgbEncode } from '../../src/imaging/index.js';

function ramp(W: number, H: number, f: (u: number, v: number) => number): ReturnType<typeof createImage> {
  const im = createImage(W, H, 1);
  for (let v = 0; v < H; v++) for (let u = 0; u < W; u++) im.data[v * W + u] = f(u, v);
  return im;
}

describe('sampleImage', () => {
  // Bilinear interpolation reproduces any bilinear function exactly (common practice).
  it('bilinear is exact on a bilinear function', () => {
    const f = (u: number, v: number): number => 0.25 + 0.01 * u - 0.02 * v + 0.001 * u * v;
    const im = ramp(16, 12, f);
    fc.assert(
      fc.property(fc.double({ min: 0, max: 15, noNaN: true }), fc.double({ min: 0, max: 11, noNaN: true }), (u, v) => {
        expect(sampleImage(im, u, v)![0]).toBeCloseTo(f(u, v), 5);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  // Keys (1981), IEEE TASSP 29(6), 1153: the a = −1/2 kernel reproduces quadratics exactly
  // (third-order accuracy), away from the edges.
  it('bicubic (Keys a = −1/2) is exact on a quadratic in the interior', () => {
    const f = (u: number, v: number): number => 0.1 + 0.002 * u * u - 0.001 * v * v + 0.003 * u * v + 0.01 * v;
    const im = ramp(20, 20, f);
    fc.assert(
      fc.property(fc.double({ min: 1, max: 17.99, noNaN: true }), fc.double({ min: 1, max: 17.99, noNaN: true }), (u, v) => {
        expect(sampleImage(im, u, v, { interpolation: 'bicubic' })![0]).toBeCloseTo(f(u, v), 5);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('masks positions outside the footprint, or clamps them', () => {
    const im = ramp(4, 4, (u) => u);
    expect(sampleImage(im, -0.6, 1)).toBeNull();
    expect(sampleImage(im, -0.4, 1)![0]).toBe(0);
    expect(sampleImage(im, 9, 1, { edge: 'clamp' })![0]).toBe(3);
    const r = sampleImageBatch(im, new Float64Array([1.5, 1, 10, 1]));
    expect(Array.from(r.status)).toEqual([Status.ok, Status.outside]);
    expect(r.values[0]).toBeCloseTo(1.5, 6);
  });

  it('batch equals single for every channel', () => {
    const im = createImage(5, 4, 3);
    for (let k = 0; k < im.data.length; k++) im.data[k] = Math.sin(k);
    const pos = new Float64Array([0.3, 0.7, 2.2, 1.9, 3.9, 2.5]);
    for (const interpolation of ['bilinear', 'bicubic', 'nearest'] as const) {
      const b = sampleImageBatch(im, pos, { interpolation });
      for (let k = 0; k < 3; k++) {
        const s = sampleImage(im, pos[2 * k]!, pos[2 * k + 1]!, { interpolation })!;
        for (let c = 0; c < 3; c++) expect(b.values[3 * k + c]).toBeCloseTo(s[c]!, 6);
      }
    }
  });

  it('rejects bad input with the library errors', () => {
    const im = ramp(4, 4, () => 0);
    expect(() => sampleImage(im, NaN, 0)).toThrow(MeniscusRangeError);
    expect(() => sampleImage({} as never, 0, 0)).toThrow(MeniscusTypeError);
    expect(() => sampleImage(im, 0, 0, { interpolation: 'cubic' as never })).toThrow(MeniscusRangeError);
    expect(() => sampleImageBatch(im, new Float64Array([0, NaN]))).toThrow(/positions\[0\.\.1\]/);
  });

  // IEC 61966-2-1 (sRGB): the re-exported transfer functions invert each other.
  it('re-exports the sRGB transfer functions', () => {
    expect(srgbDecode(srgbEncode(0.214))).toBeCloseTo(0.214, 12);
    expect(srgbEncode(1)).toBeCloseTo(1, 12);
  });
});
