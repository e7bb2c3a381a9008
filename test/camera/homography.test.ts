import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRng, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import type { Mat3 } from '../../src/core/index.js';
import { applyHomography, applyHomographyBatch, fitHomography, invertHomography } from '../../src/camera/index.js';
import { loadCv, take } from './opencv.js';
import type { Cv } from './opencv.js';

let cv: Cv;
beforeAll(async () => {
  cv = (await loadCv()).cv;
});

// A plane (metres) seen by a camera in perspective (pixels).
const TRUE_H: Mat3 = [412.3, -35.1, 640.2, 21.7, 398.8, 360.4, 0.061, -0.043, 1];

function correspondences(n: number, seed: number, noise = 0, outliers = 0): { src: Float64Array; dst: Float64Array; bad: Set<number> } {
  const rng = createRng(seed);
  const src = new Float64Array(2 * n), dst = new Float64Array(2 * n);
  const bad = new Set<number>();
  for (let i = 0; i < n; i++) {
    const x = rng.uniform(-0.8, 0.8), y = rng.uniform(-0.6, 0.6);
    src[2 * i] = x;
    src[2 * i + 1] = y;
    const p = applyHomography(TRUE_H, [x, y])!;
    dst[2 * i] = p[0] + noise * rng.normal();
    dst[2 * i + 1] = p[1] + noise * rng.normal();
    if (i < outliers) {
      dst[2 * i]! += rng.uniform(40, 200) * (rng.random() < 0.5 ? -1 : 1);
      dst[2 * i + 1]! += rng.uniform(40, 200) * (rng.random() < 0.5 ? -1 : 1);
      bad.add(i);
    }
  }
  return { src, dst, bad };
}

function cvHomography(src: Float64Array, dst: Float64Array, ransac = false): { h: number[]; mask: number[] } {
  const n = src.length / 2;
  const s = cv.matFromArray(n, 1, cv.CV_64FC2, Array.from(src));
  const d = cv.matFromArray(n, 1, cv.CV_64FC2, Array.from(dst));
  const mask = new cv.Mat();
  const H = ransac ? cv.findHomography(s, d, cv.RANSAC, 3, mask, 2000, 0.995) : cv.findHomography(s, d, 0, 3, mask);
  s.delete();
  d.delete();
  const m = Array.from(mask.data as Uint8Array);
  mask.delete();
  return { h: take(H), mask: m };
}

/** Largest element difference after scaling both to unit Frobenius norm with a common sign. */
function normalisedDifference(a: ArrayLike<number>, b: ArrayLike<number>): number {
  const na = Math.hypot(...Array.from(a)), nb = Math.hypot(...Array.from(b));
  const sign = Math.sign(a[8]!) * Math.sign(b[8]!) || 1;
  let worst = 0;
  for (let k = 0; k < 9; k++) worst = Math.max(worst, Math.abs(a[k]! / na - (sign * b[k]!) / nb));
  return worst;
}

describe('fitHomography against OpenCV findHomography (opencv-bindings 4.5.5)', () => {
  it('exact correspondences: both recover the homography; agreement within 1e-6 after normalisation', () => {
    const { src, dst } = correspondences(20, 1);
    const fit = fitHomography(src, dst);
    const ref = cvHomography(src, dst);
    expect(normalisedDifference(fit.matrix, ref.h)).toBeLessThan(1e-6);
    expect(normalisedDifference(fit.matrix, TRUE_H)).toBeLessThan(1e-9);
    expect(fit.matrix[8]).toBe(1);
    expect(fit.rmsError).toBeLessThan(1e-8);
  });

  it('noisy correspondences (0.5 px): the refined fit agrees with the reference least-squares fit within 1e-6', () => {
    const { src, dst } = correspondences(60, 2, 0.5);
    const fit = fitHomography(src, dst);
    const ref = cvHomography(src, dst);
    expect(normalisedDifference(fit.matrix, ref.h)).toBeLessThan(1e-6);
    // The transfer-error RMS is about the noise level (two components of 0.5 px, 8 parameters fitted).
    expect(fit.rmsError).toBeGreaterThan(0.4);
    expect(fit.rmsError).toBeLessThan(0.9);
    // The refinement lowers the transfer error of the plain DLT.
    const dlt = fitHomography(src, dst, { refine: false });
    expect(fit.rmsError).toBeLessThanOrEqual(dlt.rmsError);
  });

  it('RANSAC with 30 % gross outliers: the same inliers and the same homography within 1e-6', () => {
    const { src, dst, bad } = correspondences(80, 3, 0.3, 24);
    const fit = fitHomography(src, dst, { ransac: { threshold: 3, seed: 5 } });
    const ref = cvHomography(src, dst, true);
    for (let i = 0; i < 80; i++) expect(fit.inliers[i]).toBe(bad.has(i) ? 0 : 1);
    expect(Array.from(fit.inliers)).toEqual(ref.mask.map((m) => (m ? 1 : 0)));
    expect(normalisedDifference(fit.matrix, ref.h)).toBeLessThan(1e-6);
    expect(fit.inlierCount).toBe(56);
    expect(fit.ransacIterations).toBeGreaterThan(0);
    // Seeded: the same seed gives the same result.
    const again = fitHomography(src, dst, { ransac: { threshold: 3, seed: 5 } });
    expect(again.matrix).toEqual(fit.matrix);
  });
});

describe('round trips (fast-check)', () => {
  it('a homography fitted to exact correspondences reproduces them', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -0.3, max: 0.3, noNaN: true }), { minLength: 8, maxLength: 8 }), fc.integer({ min: 4, max: 30 }), fc.integer({ min: 0, max: 1000 }), (pert, n, seed) => {
        const H = [1 + pert[0]!, pert[1]!, 5 * pert[2]!, pert[3]!, 1 + pert[4]!, 5 * pert[5]!, 0.2 * pert[6]!, 0.2 * pert[7]!, 1] as unknown as Mat3;
        const rng = createRng(seed);
        const src = new Float64Array(2 * n);
        for (let k = 0; k < 2 * n; k++) src[k] = rng.uniform(-1, 1);
        const dst = applyHomographyBatch(H, src).points;
        let fit;
        try {
          fit = fitHomography(src, dst);
        } catch (e) {
          // Random points may happen to be degenerate (three of four collinear): that is refused, not guessed.
          expect(e).toBeInstanceOf(MeniscusRangeError);
          return;
        }
        expect(fit.maxError).toBeLessThan(1e-8);
        expect(normalisedDifference(fit.matrix, H)).toBeLessThan(1e-7);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('apply then invert gives the points back', () => {
    const inv = invertHomography(TRUE_H);
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), (x, y) => {
        const p = applyHomography(inv, applyHomography(TRUE_H, [x, y])!)!;
        expect(Math.abs(p[0] - x)).toBeLessThan(1e-10);
        expect(Math.abs(p[1] - y)).toBeLessThan(1e-10);
      }),
      { seed: 42, numRuns: 200 },
    );
    expect(invertHomography([2, 0, 1, 0, 2, 1, 0, 0, 1])).toEqual([0.5, 0, -0.5, 0, 0.5, -0.5, 0, 0, 1]);
  });
});

describe('degenerate and bad input: a clear error each', () => {
  it('collinear points', () => {
    const src = new Float64Array([0, 0, 1, 1, 2, 2, 3, 3, 4, 4]);
    const dst = new Float64Array([0, 0, 1, 2, 2, 1, 3, 0, 5, 5]);
    expect(() => fitHomography(src, dst)).toThrow(/collinear/);
    expect(() => fitHomography(dst, src)).toThrow(/collinear/);
  });
  it('four points of which three are collinear', () => {
    const src = new Float64Array([0, 0, 1, 0, 2, 0, 0, 1]);
    const dst = new Float64Array([0, 0, 1, 0, 2.5, 0.1, 0, 1]);
    expect(() => fitHomography(src, dst)).toThrow(/collinear/);
  });
  it('all but one point on a line (rank-deficient system)', () => {
    const src = new Float64Array([0, 0, 1, 0, 2, 0, 3, 0, 4, 0, 0, 1]);
    const dst = new Float64Array([0, 0, 1, 0, 2, 0, 3, 0, 4, 0, 0, 1]);
    expect(() => fitHomography(src, dst)).toThrow(MeniscusRangeError);
  });
  it('too few points, wrong lengths, non-finite values, bad options', () => {
    expect(() => fitHomography(new Float64Array(6), new Float64Array(6))).toThrow(/at least 4/);
    expect(() => fitHomography(new Float64Array(8), new Float64Array(10))).toThrow(MeniscusTypeError);
    expect(() => fitHomography(new Float64Array([0, 0, 1, 0, 1, 1, NaN, 1]), new Float64Array(8))).toThrow(/src\[6\]/);
    expect(() => fitHomography(new Float64Array(8), new Float64Array(8), { ransac: { threshold: -1 } })).toThrow(/threshold/);
    expect(() => fitHomography([0, 0] as never, new Float64Array(8))).toThrow(MeniscusTypeError);
  });
  it('singular homographies and points at infinity', () => {
    expect(() => invertHomography([1, 2, 3, 2, 4, 6, 0, 0, 1])).toThrow(/non-singular/);
    expect(() => applyHomography([1, 0, 0, 0, 1, 0, 1, 0, 0], [0, 5])).not.toThrow();
    expect(applyHomography([1, 0, 0, 0, 1, 0, 1, 0, 0], [0, 5])).toBeNull();
    const b = applyHomographyBatch([1, 0, 0, 0, 1, 0, 1, 0, 0], new Float64Array([0, 5, 1, 1]));
    expect(Array.from(b.status)).toEqual([Status.outside, Status.ok]);
    expect(() => applyHomography([1, 0, 0, 0, NaN, 0, 0, 0, 1], [0, 0])).toThrow(MeniscusRangeError);
  });
});
