import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import FFT from 'fft.js';
import { Pow2Fft } from '../../src/core/fft-kernel.js';
import { ComplexFft, FastDct } from '../../src/integrate/fft.js';

// References: fft.js (a general-purpose FFT library from npm, v4) for powers of two, and
// the analytic DFT of an impulse and of a complex exponential from the definition
// X[k] = Σ x[j] e^{−2πi jk/n} (e.g. Oppenheim & Schafer, Discrete-Time Signal
// Processing): an impulse at j0 has X[k] = e^{−2πi j0 k/n}; e^{2πi f j/n} has
// X[k] = n δ[k − f].

const pow2Sizes = Array.from({ length: 15 }, (_, b) => 1 << b); // 1 … 2^14

/** Deterministic test signal (no randomness needed: any sequence will do). */
function signal(n: number): Float64Array {
  return new Float64Array(2 * n).map((_, i) => Math.sin(0.37 * i + 0.1) + 0.5 * Math.cos(1.91 * i * i) - 0.2);
}

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]!));
  return m;
}

/** max |a − b| / max |b| over the first `len` entries. */
function relDiff(a: Float64Array, b: Float64Array, len = b.length): number {
  let e = 0;
  let s = 0;
  for (let i = 0; i < len; i++) {
    e = Math.max(e, Math.abs(a[i]! - b[i]!));
    s = Math.max(s, Math.abs(b[i]!));
  }
  return s > 0 ? e / s : e;
}

/** Store x (natural order) at the kernel's bit-reversed positions. */
function toRev(x: Float64Array, rev: Int32Array): Float64Array {
  const y = new Float64Array(x.length);
  for (let j = 0; j < rev.length; j++) {
    y[2 * rev[j]!] = x[2 * j]!;
    y[2 * rev[j]! + 1] = x[2 * j + 1]!;
  }
  return y;
}

function fromRev(y: Float64Array, rev: Int32Array): Float64Array {
  const x = new Float64Array(y.length);
  for (let k = 0; k < rev.length; k++) {
    x[2 * k] = y[2 * rev[k]!]!;
    x[2 * k + 1] = y[2 * rev[k]! + 1]!;
  }
  return x;
}

describe('Pow2Fft against fft.js (general-purpose reference library)', () => {
  it.each(pow2Sizes.filter((n) => n >= 2))('forward and inverse agree with fft.js, n = %i', (n) => {
    const x = signal(n);
    const ref = new FFT(n);
    const want = new Float64Array(2 * n);
    ref.transform(want, x);
    const k = new Pow2Fft(n);
    const got = new Float64Array(2 * n);
    k.transform(got, x, false);
    expect(relDiff(got, want)).toBeLessThan(1e-12);
    // in-place forms: decimation in time from bit-reversed order, in frequency to it
    const dit = toRev(x, k.rev);
    k.fromOrder(dit, 0, false);
    expect(relDiff(dit, want)).toBeLessThan(1e-12);
    const dif = x.slice();
    k.toOrder(dif, 0, false);
    expect(relDiff(fromRev(dif, k.rev), want)).toBeLessThan(1e-12);
    // inverse: fft.js scales by 1/n, the kernel does not
    ref.inverseTransform(want, x);
    for (let i = 0; i < 2 * n; i++) want[i] = want[i]! * n;
    k.transform(got, x, true);
    expect(relDiff(got, want)).toBeLessThan(1e-12);
    const dit2 = toRev(x, k.rev);
    k.fromOrder(dit2, 0, true);
    expect(relDiff(dit2, want)).toBeLessThan(1e-12);
    const dif2 = x.slice();
    k.toOrder(dif2, 0, true);
    expect(relDiff(fromRev(dif2, k.rev), want)).toBeLessThan(1e-12);
  });

  it('works at an offset inside a larger array and leaves the rest alone', () => {
    const n = 64;
    const x = signal(n);
    const want = new Float64Array(2 * n);
    new FFT(n).transform(want, x);
    const k = new Pow2Fft(n);
    const big = new Float64Array(2 * n + 20).fill(7);
    big.set(toRev(x, k.rev), 10);
    k.fromOrder(big, 10, false);
    expect(relDiff(big.subarray(10, 10 + 2 * n), want)).toBeLessThan(1e-12);
    for (let i = 0; i < 10; i++) expect(big[i]).toBe(7);
    for (let i = 10 + 2 * n; i < big.length; i++) expect(big[i]).toBe(7);
  });

  it('refuses a length that is not a power of two', () => {
    expect(() => new Pow2Fft(12)).toThrow();
  });
});

describe('Pow2Fft against the analytic DFT (definition)', () => {
  it.each(pow2Sizes)('impulses and complex exponentials, forward and inverse, n = %i', (n) => {
    const k = new Pow2Fft(n);
    const out = new Float64Array(2 * n);
    const picks = [0, 1, n >> 1, n - 1, Math.floor(n / 3)].filter((v, i, a) => v < n && a.indexOf(v) === i);
    for (const j0 of picks) {
      // impulse at j0: X[k] = e^{∓2πi j0 k/n}
      const x = new Float64Array(2 * n);
      x[2 * j0] = 1;
      for (const inverse of [false, true]) {
        k.transform(out, x, inverse);
        const sg = inverse ? 1 : -1;
        let err = 0;
        for (let f = 0; f < n; f++) {
          const a = (2 * Math.PI * ((j0 * f) % n)) / n;
          err = Math.max(err, Math.abs(out[2 * f]! - Math.cos(a)), Math.abs(out[2 * f + 1]! - sg * Math.sin(a)));
        }
        expect(err).toBeLessThan(1e-12);
      }
      // e^{±2πi j0 j/n}: X[k] = n δ[k − j0] for the matching sign
      for (const inverse of [false, true]) {
        const sg = inverse ? -1 : 1;
        for (let j = 0; j < n; j++) {
          const a = (2 * Math.PI * ((j0 * j) % n)) / n;
          x[2 * j] = Math.cos(a);
          x[2 * j + 1] = sg * Math.sin(a);
        }
        k.transform(out, x, inverse);
        let err = 0;
        for (let f = 0; f < n; f++) {
          err = Math.max(err, Math.abs(out[2 * f]! - (f === j0 ? n : 0)), Math.abs(out[2 * f + 1]!));
        }
        expect(err / n).toBeLessThan(1e-12);
      }
    }
  });
});

describe('ComplexFft on the kernel, every length', () => {
  // Bluestein lengths checked against the definition summed directly
  function naiveDft(x: Float64Array, n: number, sg: number): Float64Array {
    const X = new Float64Array(2 * n);
    for (let f = 0; f < n; f++) {
      let re = 0;
      let im = 0;
      for (let j = 0; j < n; j++) {
        const a = (sg * 2 * Math.PI * ((j * f) % n)) / n;
        re += x[2 * j]! * Math.cos(a) - x[2 * j + 1]! * Math.sin(a);
        im += x[2 * j]! * Math.sin(a) + x[2 * j + 1]! * Math.cos(a);
      }
      X[2 * f] = re;
      X[2 * f + 1] = im;
    }
    return X;
  }

  it.each([3, 5, 6, 7, 12, 100, 127, 243, 1000])('in-place forms match the definition, n = %i', (n) => {
    const f = new ComplexFft(n);
    const x = signal(n);
    for (const inverse of [false, true]) {
      const want = naiveDft(x, n, inverse ? 1 : -1);
      const a = toRev(x, f.order);
      f.fromOrder(a, 0, inverse);
      expect(relDiff(a, want)).toBeLessThan(1e-12);
      const b = x.slice();
      f.toOrder(b, 0, inverse);
      expect(relDiff(fromRev(b, f.order), want)).toBeLessThan(1e-12);
    }
    const X = new Float64Array(2 * n);
    f.forward(X, x);
    expect(relDiff(X, naiveDft(x, n, -1))).toBeLessThan(1e-12);
  });

  it('round trips forward → inverse for random data and lengths 1 … 300 (fast-check, seed 42)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 300 }),
        fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 600, maxLength: 600 }),
        (n, vals) => {
          const x = Float64Array.from(vals.slice(0, 2 * n));
          const f = new ComplexFft(n);
          const X = new Float64Array(2 * n);
          const y = new Float64Array(2 * n);
          f.forward(X, x);
          f.inverse(y, X);
          const scale = Math.max(maxAbs(x), 1e-300);
          for (let i = 0; i < 2 * n; i++) if (Math.abs(y[i]! - x[i]!) > 1e-12 * scale) return false;
          return true;
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });

  it('round trips through the in-place forms, powers of two 2^0 … 2^12 (fast-check, seed 42)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 12 }), fc.integer({ min: 1, max: 1e6 }), (b, s) => {
        const n = 1 << b;
        const k = new Pow2Fft(n);
        const x = new Float64Array(2 * n).map((_, i) => Math.sin(s * 1e-3 * (i + 1)) * (1 + (i % 5)));
        // DIF forward leaves bit-reversed order, which DIT inverse takes: no reordering
        const y = x.slice();
        k.toOrder(y, 0, false);
        k.fromOrder(y, 0, true);
        const scale = maxAbs(x);
        for (let i = 0; i < 2 * n; i++) if (Math.abs(y[i]! / n - x[i]!) > 1e-12 * scale) return false;
        return true;
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});

// Strip forms and the column solve: references are the DFT X[k] = Σ x[j] e^{∓2πi jk/n}
// and the unnormalised DCT-II X[k] = Σ x[j] cos(πk(2j+1)/(2n)) with its inverse
// x[j] = (X[0] + 2 Σ_{k≥1} X[k] cos(πk(2j+1)/(2n)))/n, summed directly from the
// definitions (Makhoul 1980, IEEE Trans. ASSP 28(1), 27–34, eqs. 1–2; any DSP text).

/** Direct DFT of column c of a strip (row r at off + r·rs), angle reduced mod n. */
function naiveColumnDft(x: Float64Array, off: number, rs: number, c: number, n: number, inverse: boolean): Float64Array {
  const y = new Float64Array(2 * n);
  const sg = inverse ? 1 : -1;
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let j = 0; j < n; j++) {
      const a = (sg * 2 * Math.PI * ((j * k) % n)) / n;
      const xr = x[off + j * rs + 2 * c]!;
      const xi = x[off + j * rs + 2 * c + 1]!;
      re += xr * Math.cos(a) - xi * Math.sin(a);
      im += xr * Math.sin(a) + xi * Math.cos(a);
    }
    y[2 * k] = re;
    y[2 * k + 1] = im;
  }
  return y;
}

describe('strip transforms (many columns of a row-major array) against the DFT definition', () => {
  const cases: [number, number][] = [];
  for (const n of [1, 2, 4, 8, 16, 32, 64, 128]) for (const nc of [1, 3, 16]) cases.push([n, nc]);
  it.each(cases)('Pow2Fft.stripFromOrder / stripToOrder, n = %i, %i columns, padded rows at an offset', (n, nc) => {
    const k = new Pow2Fft(n);
    const rs = 2 * nc + 6; // padding between rows must be left alone
    const off = 4;
    const base = new Float64Array(off + n * rs + 3).map((_, i) => Math.sin(0.71 * i + 0.3) - 0.4 * Math.cos(2.3 * i * i));
    for (const inverse of [false, true]) {
      // natural in, bit-reversed out
      const a = base.slice();
      k.stripToOrder(a, off, rs, nc, inverse);
      // bit-reversed in, natural out: feed the same sequences permuted
      const b = base.slice();
      for (let j = 0; j < n; j++) {
        for (let t = 0; t < 2 * nc; t++) b[off + k.rev[j]! * rs + t] = base[off + j * rs + t]!;
      }
      k.stripFromOrder(b, off, rs, nc, inverse);
      for (let c = 0; c < nc; c++) {
        const ref = naiveColumnDft(base, off, rs, c, n, inverse);
        const gotA = new Float64Array(2 * n);
        const gotB = new Float64Array(2 * n);
        for (let f = 0; f < n; f++) {
          gotA[2 * f] = a[off + k.rev[f]! * rs + 2 * c]!;
          gotA[2 * f + 1] = a[off + k.rev[f]! * rs + 2 * c + 1]!;
          gotB[2 * f] = b[off + f * rs + 2 * c]!;
          gotB[2 * f + 1] = b[off + f * rs + 2 * c + 1]!;
        }
        expect(relDiff(gotA, ref)).toBeLessThan(1e-13);
        expect(relDiff(gotB, ref)).toBeLessThan(1e-13);
      }
      // outside the strip: the offset, the row padding and the tail are untouched
      for (let i = 0; i < base.length; i++) {
        const inStrip = i >= off && i < off + n * rs && (i - off) % rs < 2 * nc;
        if (!inStrip) {
          expect(a[i]).toBe(base[i]);
          expect(b[i]).toBe(base[i]);
        }
      }
    }
  });

  it.each([3, 5, 6, 12, 17])('ComplexFft strip forms on a Bluestein length n = %i (identity order)', (n) => {
    const f = new ComplexFft(n);
    const nc = 3;
    const rs = 2 * nc + 2;
    const base = new Float64Array(n * rs).map((_, i) => Math.cos(0.53 * i) + 0.2 * Math.sin(1.7 * i));
    for (const inverse of [false, true]) {
      const a = base.slice();
      f.stripToOrder(a, 0, rs, nc, inverse);
      const b = base.slice();
      f.stripFromOrder(b, 0, rs, nc, inverse);
      for (let c = 0; c < nc; c++) {
        const ref = naiveColumnDft(base, 0, rs, c, n, inverse);
        const got = new Float64Array(2 * n);
        for (let r = 0; r < n; r++) {
          got[2 * r] = a[r * rs + 2 * c]!;
          got[2 * r + 1] = a[r * rs + 2 * c + 1]!;
          expect(b[r * rs + 2 * c]).toBe(a[r * rs + 2 * c]);
        }
        expect(relDiff(got, ref)).toBeLessThan(1e-12);
      }
    }
  });
});

describe('FastDct.solveStrip (column solve in the DCT-II basis) against the definitions', () => {
  it.each([
    [1, 3],
    [2, 2],
    [7, 5],
    [8, 4],
    [12, 7],
    [16, 1],
    [64, 6],
  ])('n = %i rows, %i columns (odd counts use a zero partner column)', (n, nb) => {
    const w = nb + 3; // the strip sits inside wider rows; the other columns stay
    const i0 = 2;
    const data = new Float64Array(n * w).map((_, i) => Math.sin(0.9 * i + 0.2) + 0.3 * Math.cos(0.11 * i * i));
    const before = data.slice();
    const lx = new Float64Array(w).map((_, i) => (i === i0 ? 0 : 0.5 + 0.25 * i)); // a zero: the piston column
    const lam = new Float64Array(n).map((_, k) => 2 - 2 * Math.cos((Math.PI * k) / n));
    const d = new FastDct(n);
    d.solveStrip(data, w, i0, nb, lx, lam, new Float64Array(n * 2 * ((nb + 1) >> 1)));
    for (let c = 0; c < w; c++) {
      if (c < i0 || c >= i0 + nb) {
        for (let y = 0; y < n; y++) expect(data[y * w + c]).toBe(before[y * w + c]);
        continue;
      }
      // DCT-II by definition, divide, inverse by definition
      const X = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        let s = 0;
        for (let y = 0; y < n; y++) s += before[y * w + c]! * Math.cos((Math.PI * k * (2 * y + 1)) / (2 * n));
        const den = lx[c]! + lam[k]!;
        X[k] = den !== 0 ? s / den : 0;
      }
      const ref = new Float64Array(n);
      for (let y = 0; y < n; y++) {
        let s = X[0]!;
        for (let k = 1; k < n; k++) s += 2 * X[k]! * Math.cos((Math.PI * k * (2 * y + 1)) / (2 * n));
        ref[y] = s / n;
      }
      const got = new Float64Array(n);
      for (let y = 0; y < n; y++) got[y] = data[y * w + c]!;
      expect(relDiff(got, ref)).toBeLessThan(1e-12);
    }
  });
});
