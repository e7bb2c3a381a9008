import { describe, expect, it } from 'vitest';
import { ComplexFft, FastDct } from '../../src/integrate/fft.js';

// Reference: the definitions of the DFT, X[k] = Σ x[j] e^{−2πi jk/n}, and of the
// DCT-II, X[k] = Σ x[j] cos(πk(2j+1)/(2n)) (e.g. Oppenheim & Schafer, Discrete-Time
// Signal Processing; Makhoul 1980), summed directly.
function naiveDft(x: Float64Array, n: number): Float64Array {
  const X = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let j = 0; j < n; j++) {
      const a = (-2 * Math.PI * ((j * k) % n)) / n;
      re += x[2 * j]! * Math.cos(a) - x[2 * j + 1]! * Math.sin(a);
      im += x[2 * j]! * Math.sin(a) + x[2 * j + 1]! * Math.cos(a);
    }
    X[2 * k] = re;
    X[2 * k + 1] = im;
  }
  return X;
}

function naiveDct(x: Float64Array, n: number): Float64Array {
  const X = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += x[j]! * Math.cos((Math.PI * ((k * (2 * j + 1)) % (4 * n))) / (2 * n));
    X[k] = s;
  }
  return X;
}

const sizes = [1, 2, 3, 4, 5, 7, 8, 12, 16, 31, 33, 64, 100];

describe('ComplexFft (powers of two by the radix-4 kernel, other lengths by Bluestein)', () => {
  it.each(sizes)('matches the DFT definition and inverts, n = %i', (n) => {
    const x = new Float64Array(2 * n).map((_, i) => Math.sin(1.3 * i + 0.2) + (i % 3) - 1);
    const f = new ComplexFft(n);
    const X = new Float64Array(2 * n);
    f.forward(X, x);
    const ref = naiveDft(x, n);
    for (let k = 0; k < 2 * n; k++) expect(X[k]).toBeCloseTo(ref[k]!, 10);
    const y = new Float64Array(2 * n);
    f.inverse(y, X);
    for (let k = 0; k < 2 * n; k++) expect(y[k]).toBeCloseTo(x[k]!, 12);
  });
});

describe('FastDct (Makhoul reordering, two sequences per FFT)', () => {
  it.each(sizes)('matches the DCT-II definition for a pair and a single row, n = %i', (n) => {
    const data = new Float64Array(2 * n).map((_, i) => Math.cos(0.7 * i) + (i % 4));
    const orig = data.slice();
    const d = new FastDct(n);
    d.forwardPair(data, 0, n, 1);
    const ra = naiveDct(orig.subarray(0, n), n);
    const rb = naiveDct(orig.subarray(n), n);
    for (let k = 0; k < n; k++) {
      expect(data[k]).toBeCloseTo(ra[k]!, 10);
      expect(data[n + k]).toBeCloseTo(rb[k]!, 10);
    }
    d.inversePair(data, 0, n, 1);
    for (let k = 0; k < 2 * n; k++) expect(data[k]).toBeCloseTo(orig[k]!, 12);
    const one = orig.slice(0, n);
    d.forwardPair(one, 0, -1, 1);
    for (let k = 0; k < n; k++) expect(one[k]).toBeCloseTo(ra[k]!, 10);
  });

  it('handles strided (column) sequences', () => {
    const n = 6;
    const w = 5;
    const data = new Float64Array(n * w).map((_, i) => Math.sin(i));
    const col = (c: number, src: Float64Array) => Float64Array.from({ length: n }, (_, j) => src[j * w + c]!);
    const ref1 = naiveDct(col(1, data), n);
    const ref2 = naiveDct(col(2, data), n);
    const d = new FastDct(n);
    const work = data.slice();
    d.forwardPair(work, 1, 2, w);
    for (let k = 0; k < n; k++) {
      expect(work[k * w + 1]).toBeCloseTo(ref1[k]!, 12);
      expect(work[k * w + 2]).toBeCloseTo(ref2[k]!, 12);
      expect(work[k * w]).toBe(data[k * w]); // untouched column
    }
  });
});
