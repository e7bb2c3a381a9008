import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  angleBetween,
  checkDirection,
  checkGrid,
  checkImage,
  checkInRange,
  checkMask,
  checkOneOf,
  checkPositive,
  checkRangePair,
  createGrid,
  createImage,
  createMask,
  cross,
  describeValue,
  dot,
  gridFromFunction,
  IDENTITY3,
  isMeniscusError,
  LIMITS,
  mat3Det,
  mat3Mul,
  mat3MulVec,
  mat3Transpose,
  MeniscusRangeError,
  MeniscusTypeError,
  normalize,
  rotationAboutAxis,
  Status,
  statusName,
} from '../../src/core/index.js';

describe('errors', () => {
  it('name the function, the parameter, the value and the expectation', () => {
    try {
      checkPositive('someFn', 'n1', -2);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(MeniscusRangeError);
      expect(e).toBeInstanceOf(RangeError);
      expect(isMeniscusError(e)).toBe(true);
      const err = e as MeniscusRangeError;
      expect(err.parameter).toBe('n1');
      expect(err.value).toBe(-2);
      expect(err.message).toBe('someFn: n1 must be a finite number > 0; got -2');
    }
  });

  it('reject NaN in range checks and wrong types as TypeErrors', () => {
    expect(() => checkInRange('f', 'x', NaN, 0, 1)).toThrow(MeniscusRangeError);
    expect(() => checkInRange('f', 'x', '0.5', 0, 1)).toThrow(MeniscusTypeError);
    expect(() => checkOneOf('f', 'mode', 'c', ['a', 'b'] as const)).toThrow(/one of "a", "b"/);
  });

  it('describe values briefly', () => {
    expect(describeValue([1, NaN, 3])).toBe('[1, NaN, 3]');
    expect(describeValue(new Float64Array(5))).toBe('Float64Array(length 5)');
    expect(describeValue(new Date(NaN))).toBe('Invalid Date');
  });
});

describe('checkRangePair', () => {
  it('returns [min, max] and names the parameter for a malformed or empty range', () => {
    expect(checkRangePair('fn', 'options.range', [-1, 2])).toEqual([-1, 2]);
    expect(() => checkRangePair('fn', 'options.range', [1, 1])).toThrow(MeniscusRangeError);
    expect(() => checkRangePair('fn', 'options.range', [0, NaN])).toThrow(/options\.range\[1\]/);
    expect(() => checkRangePair('fn', 'options.range', [0])).toThrow(MeniscusTypeError);
    expect(() => checkRangePair('fn', 'options.range', 'wide')).toThrow(/options\.range/);
  });
  it('finds a grid sample that is not finite, by index (the checkGrid scan)', () => {
    const g = createGrid({ width: 5, height: 3 });
    g.data[11] = Infinity;
    expect(() => checkGrid('fn', 'p', g)).toThrow(/p\.data\[11\]/);
    g.data[11] = 0;
    g.data[2] = NaN;
    expect(() => checkGrid('fn', 'p', g)).toThrow(/p\.data\[2\]/);
  });
});

describe('vec3 and mat3', () => {
  it('cross product is right-handed and orthogonal to both factors (analytic)', () => {
    expect(cross([1, 0, 0], [0, 1, 0])).toEqual([0, 0, 1]);
    fc.assert(
      fc.property(
        fc.tuple(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true })),
        fc.tuple(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: -10, max: 10, noNaN: true })),
        (a, b) => {
          const c = cross(a, b);
          const scaleAB = (Math.hypot(...a) * Math.hypot(...b)) ** 2 + 1e-300;
          return Math.abs(dot(c, a)) * Math.hypot(...b) <= 1e-9 * scaleAB + 1e-12 && Math.abs(dot(c, b)) * Math.hypot(...a) <= 1e-9 * scaleAB + 1e-12;
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });

  it('normalize refuses a zero vector', () => {
    expect(() => normalize([0, 0, 0])).toThrow(MeniscusRangeError);
    expect(() => checkDirection('f', 'd', [0, 0, 0])).toThrow(/non-zero length/);
    expect(normalize([0, 3, 4])).toEqual([0, 0.6, 0.8]);
  });

  it('Rodrigues rotation: a quarter turn about z maps x to y; matrices are orthonormal with det 1', () => {
    const r = rotationAboutAxis([0, 0, 1], Math.PI / 2);
    const v = mat3MulVec(r, [1, 0, 0]);
    expect(v[0]).toBeCloseTo(0, 15);
    expect(v[1]).toBeCloseTo(1, 15);
    fc.assert(
      fc.property(
        fc.tuple(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0.1, max: 1, noNaN: true })),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        (axis, angle) => {
          const m = rotationAboutAxis(axis, angle);
          const mtm = mat3Mul(mat3Transpose(m), m);
          const okOrtho = mtm.every((x, k) => Math.abs(x - IDENTITY3[k]!) < 1e-12);
          // the rotation angle between a vector perpendicular to the axis and its image is |angle|
          const a = normalize(axis);
          const perp = normalize(cross(a, Math.abs(a[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0]));
          const ang = angleBetween(perp, mat3MulVec(m, perp));
          return okOrtho && Math.abs(mat3Det(m) - 1) < 1e-12 && Math.abs(ang - Math.abs(angle)) < 1e-9;
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });
});

describe('Grid, Mask, Image', () => {
  it('place sample (i, j) at x0 + i dx, y0 + j dy, row-major', () => {
    const g = gridFromFunction({ width: 4, height: 3, dx: 0.5, dy: 0.25, x0: 1, y0: -1 }, (x, y) => 10 * x + y);
    // sample (i = 3, j = 2) at x = 2.5, y = -0.5, index 2 * 4 + 3
    expect(g.data[11]).toBeCloseTo(24.5, 12);
    expect(checkGrid('t', 'g', g)).toBe(g);
  });

  it('refuse bad sizes, spacing, data lengths and absurd allocations', () => {
    expect(() => createGrid({ width: 0, height: 3 })).toThrow(/spec.width/);
    expect(() => createGrid({ width: 2.5, height: 3 })).toThrow(MeniscusRangeError);
    expect(() => createGrid({ width: 3, height: 3, dx: -1 })).toThrow(/spec.dx/);
    expect(() => createGrid({ width: 3, height: 3 }, new Float64Array(8))).toThrow(MeniscusTypeError);
    expect(() => createGrid({ width: 65536, height: 65536 })).toThrow(/LIMITS/);
    expect(() => createImage(65536, 65536)).toThrow(/LIMITS/);
    expect(LIMITS.maxSamples).toBe(2 ** 26);
  });

  it('checkGrid reports the first non-finite sample by index', () => {
    const g = createGrid({ width: 3, height: 2 });
    g.data[4] = NaN;
    expect(() => checkGrid('integrate', 'p', g)).toThrow('integrate: p.data[4] must be a finite number (pass a mask to mark holes); got NaN');
    expect(checkGrid('integrate', 'p', g, true)).toBe(g);
  });

  it('masks hold only 0 and 1', () => {
    const m = createMask(2, 2);
    expect(Array.from(m)).toEqual([1, 1, 1, 1]);
    m[1] = 2;
    expect(() => checkMask('f', 'mask', m, 2, 2)).toThrow(/mask\[1\]/);
    expect(() => checkMask('f', 'mask', new Uint8Array(3), 2, 2)).toThrow(MeniscusTypeError);
  });

  it('images check their data length and finiteness', () => {
    const im = createImage(2, 2, 3);
    expect(im.data.length).toBe(12);
    expect(() => createImage(2, 2, 5)).toThrow(/channels/);
    const bad = { width: 2, height: 2, channels: 1, data: new Float32Array([0, 1, Infinity, 0]) };
    expect(() => checkImage('f', 'frame', bad)).toThrow(/frame.data\[2\]/);
  });
});

describe('status codes', () => {
  it('are stable and named', () => {
    expect(Status.ok).toBe(0);
    expect(Status.tir).toBe(1);
    expect(statusName(Status.miss)).toBe('miss');
    expect(statusName(250)).toBeUndefined();
  });
});
