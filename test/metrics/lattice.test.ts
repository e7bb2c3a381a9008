import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import { cornerDisplacement, createCornerLattice, lineStraightness, squareSizeSpread } from '../../src/metrics/index.js';

function lattice(columns: number, rows: number, f: (i: number, j: number) => [number, number], found?: Uint8Array) {
  const p = new Float64Array(2 * columns * rows);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const [x, y] = f(i, j);
      p[2 * (j * columns + i)] = x;
      p[2 * (j * columns + i) + 1] = y;
    }
  }
  return createCornerLattice(columns, rows, p, found);
}

describe('squareSizeSpread (analytic lattices)', () => {
  it('gives mean 11 and standard deviation 1 for sides alternating 10 and 12, and 0 for equal sides', () => {
    const xs = [0, 10, 22];
    const l = lattice(3, 2, (i, j) => [xs[i]!, 11 * j]);
    const s = squareSizeSpread(l, { knownSize: 11 });
    expect(s.alongRows.count).toBe(4);
    expect(s.alongRows.mean).toBeCloseTo(11, 14);
    expect(s.alongRows.std).toBeCloseTo(1, 14);
    expect(s.alongRows.relativeStd).toBeCloseTo(1 / 11, 14);
    expect(s.alongRows.meanRelativeError).toBeCloseTo(0, 14);
    expect(s.alongRows.rmsRelativeError).toBeCloseTo(1 / 11, 14);
    expect(s.alongRows.stdRelativeToKnown).toBeCloseTo(1 / 11, 14);
    expect(s.alongColumns.count).toBe(3);
    expect(s.alongColumns.std).toBe(0);
    expect(s.alongColumns.min).toBe(11);
    expect(s.all.count).toBe(7);
  });

  it('is 0 for a rotated square lattice and skips missing corners', () => {
    const c = Math.cos(0.3);
    const sn = Math.sin(0.3);
    const found = new Uint8Array(20).fill(1);
    found[7] = 0;
    const l = lattice(5, 4, (i, j) => [100 + 25 * (c * i - sn * j), 50 + 25 * (sn * i + c * j)], found);
    const s = squareSizeSpread(l, { knownSize: 25 });
    expect(s.all.std).toBeLessThan(1e-12);
    expect(s.all.meanRelativeError!).toBeLessThan(1e-14);
    // 5×4 lattice: 16 row sides + 15 column sides, less the 4 sides touching the missing corner.
    expect(s.all.count).toBe(31 - 4);
  });
});

describe('lineStraightness (Pearson 1901 total least squares; analytic parabolas)', () => {
  it('is 0 for straight lines at any angle', () => {
    const l = lattice(6, 5, (i, j) => [10 + 20 * i + 3 * j, 7 + 2 * i + 20 * j]);
    const s = lineStraightness(l);
    expect(s.rows.length).toBe(5);
    expect(s.columns.length).toBe(6);
    expect(s.rmsDistance).toBeLessThan(1e-12);
    expect(s.maxAbsCurvature).toBeLessThan(1e-14);
    expect(s.maxSagitta).toBeLessThan(1e-10);
  });

  it('recovers the bend of rows on parabolas y = y_j + κ (x − c)²: curvature 2κ, RMS distance κ·std(t²), sagitta κ (ℓ/2)²', () => {
    const k = 0.002;
    const n = 9;
    const l = lattice(n, 4, (i, j) => [20 * i, 30 * j + k * (20 * (i - 4)) ** 2]);
    const s = lineStraightness(l);
    // Symmetric points: the best line is horizontal and the offsets are κ (t² − mean t²).
    const t2 = Array.from({ length: n }, (_, i) => (20 * (i - 4)) ** 2);
    const mean = t2.reduce((a, b) => a + b, 0) / n;
    const std = Math.sqrt(t2.reduce((a, b) => a + (b - mean) ** 2, 0) / n);
    for (const r of s.rows) {
      expect(r.curvature).toBeCloseTo(2 * k, 12);
      expect(r.rmsDistance).toBeCloseTo(k * std, 10);
      expect(r.sagitta).toBeCloseTo(k * 80 ** 2, 9);
    }
    for (const c of s.columns) {
      expect(c.rmsDistance).toBeLessThan(1e-12);
      expect(Math.abs(c.curvature)).toBeLessThan(1e-14);
    }
    // Bending down the other way flips the sign (ends towards −y for a row).
    const up = lineStraightness(lattice(n, 2, (i, j) => [20 * i, 30 * j - k * (20 * (i - 4)) ** 2]));
    expect(up.rows[0]!.curvature).toBeCloseTo(-2 * k, 12);
  });

  it('skips lines with fewer than three known corners', () => {
    const found = new Uint8Array(6).fill(1);
    found[1] = 0;
    const s = lineStraightness(lattice(3, 2, (i, j) => [10 * i, 10 * j], found));
    expect(s.rows.length).toBe(1);
    expect(s.rows[0]!.index).toBe(1);
    expect(s.columns.length).toBe(0);
  });
});

describe('cornerDisplacement', () => {
  it('gives RMS 0.5 px for a uniform shift of (0.3, 0.4), by index and by nearest match', () => {
    const truth = lattice(4, 3, (i, j) => [30 * i + 5, 30 * j + 5]);
    const shifted = lattice(4, 3, (i, j) => [30 * i + 5.3, 30 * j + 5.4]);
    const a = cornerDisplacement(shifted, truth);
    expect(a.rms).toBeCloseTo(0.5, 12);
    expect(a.max).toBeCloseTo(0.5, 12);
    expect(a.count).toBe(12);
    const b = cornerDisplacement(shifted, truth.points);
    expect(b.rms).toBeCloseTo(0.5, 12);
    expect(b.unmatched).toBe(0);
    // A pairing limit below the shift leaves every corner unmatched.
    expect(cornerDisplacement(shifted, truth.points, { maxDistance: 0.4 }).unmatched).toBe(12);
  });

  it('counts corners the truth lacks and refuses lattices of another shape', () => {
    const f = new Uint8Array(12).fill(1);
    f[0] = 0;
    const truth = lattice(4, 3, (i, j) => [30 * i, 30 * j], f);
    const det = lattice(4, 3, (i, j) => [30 * i, 30 * j]);
    const d = cornerDisplacement(det, truth);
    expect(d.count).toBe(11);
    expect(d.unmatched).toBe(1);
    expect(() => cornerDisplacement(det, lattice(3, 4, (i, j) => [i, j]))).toThrow(MeniscusTypeError);
  });
});

describe('createCornerLattice', () => {
  it('refuses bad input', () => {
    expect(() => createCornerLattice(2, 2, new Float64Array(6))).toThrow(MeniscusTypeError);
    expect(() => createCornerLattice(0, 2, new Float64Array(0))).toThrow(MeniscusRangeError);
    expect(() => createCornerLattice(1, 1, new Float64Array([NaN, 0]))).toThrow(MeniscusRangeError);
    expect(createCornerLattice(1, 1, new Float64Array([NaN, 0]), new Uint8Array(1)).found[0]).toBe(0);
    expect(() => createCornerLattice(1, 1, new Float64Array(2), new Uint8Array([2]))).toThrow(MeniscusRangeError);
    expect(() => squareSizeSpread({ columns: 2, rows: 1, points: new Float64Array(4), found: new Uint8Array(3) })).toThrow(MeniscusTypeError);
  });
});
