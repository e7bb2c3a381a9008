/**
 * Fast transforms on typed arrays for the transform-based integrators: complex FFTs of
 * any length (fft.js for powers of two, Bluestein's chirp-z algorithm on top of it for
 * every other length), fast DCT-II / DCT-III of any length by Makhoul's reordering, and
 * a cache-blocked transpose. Complex data is interleaved `re, im, re, im, …` in
 * `Float64Array`s; nothing allocates per element.
 *
 * These are building blocks of the integrators, not part of the public API.
 *
 * @module
 * @internal
 */
import FFT from 'fft.js';

/** A plan for the complex DFT of one length. Not re-entrant: it owns scratch buffers. */
export class ComplexFft {
  /** Transform length. */
  readonly n: number;
  private readonly pow2: FFT | null;
  // Bluestein state (non-power-of-two lengths)
  private readonly m: number;
  private readonly inner: FFT | null;
  private readonly chirp: Float64Array | null; // w[k] = exp(-iπk²/n)
  private readonly kernel: Float64Array | null; // FFT of conj(w) arranged circularly
  private readonly a: Float64Array | null;
  private readonly b: Float64Array | null;
  private readonly conjBuf: Float64Array | null;

  constructor(n: number) {
    this.n = n;
    if (n >= 2 && (n & (n - 1)) === 0) {
      this.pow2 = new FFT(n);
      this.m = n;
      this.inner = null;
      this.chirp = this.kernel = this.a = this.b = this.conjBuf = null;
      return;
    }
    this.pow2 = null;
    if (n === 1) {
      this.m = 1;
      this.inner = null;
      this.chirp = this.kernel = this.a = this.b = this.conjBuf = null;
      return;
    }
    let m = 2;
    while (m < 2 * n - 1) m <<= 1;
    this.m = m;
    this.inner = new FFT(m);
    const chirp = new Float64Array(2 * n);
    const twoN = 2 * n;
    for (let k = 0; k < n; k++) {
      // k² mod 2n keeps the angle small; k² < 2^53 so the product is exact
      const k2 = (k * k) % twoN;
      const ang = (Math.PI * k2) / n;
      chirp[2 * k] = Math.cos(ang);
      chirp[2 * k + 1] = -Math.sin(ang);
    }
    const bk = new Float64Array(2 * m);
    bk[0] = chirp[0]!;
    bk[1] = -chirp[1]!;
    for (let k = 1; k < n; k++) {
      const re = chirp[2 * k]!;
      const im = -chirp[2 * k + 1]!;
      bk[2 * k] = re;
      bk[2 * k + 1] = im;
      bk[2 * (m - k)] = re;
      bk[2 * (m - k) + 1] = im;
    }
    const kernel = new Float64Array(2 * m);
    this.inner.transform(kernel, bk);
    this.chirp = chirp;
    this.kernel = kernel;
    this.a = new Float64Array(2 * m);
    this.b = new Float64Array(2 * m);
    this.conjBuf = new Float64Array(2 * n);
  }

  /** Forward DFT `X[k] = Σ x[j] e^{-2πi jk/n}`; `out` and `input` must differ (length 2n). */
  forward(out: Float64Array, input: Float64Array): void {
    if (this.pow2) {
      this.pow2.transform(out, input);
      return;
    }
    if (this.n === 1) {
      out[0] = input[0]!;
      out[1] = input[1]!;
      return;
    }
    this.bluestein(out, input);
  }

  /** Inverse DFT with the 1/n factor; `out` and `input` must differ (length 2n). */
  inverse(out: Float64Array, input: Float64Array): void {
    if (this.pow2) {
      this.pow2.inverseTransform(out, input);
      return;
    }
    const n = this.n;
    if (n === 1) {
      out[0] = input[0]!;
      out[1] = input[1]!;
      return;
    }
    // x = conj(DFT(conj(X))) / n
    const c = this.conjBuf!;
    for (let k = 0; k < 2 * n; k += 2) {
      c[k] = input[k]!;
      c[k + 1] = -input[k + 1]!;
    }
    this.bluestein(out, c);
    const s = 1 / n;
    for (let k = 0; k < 2 * n; k += 2) {
      out[k] = out[k]! * s;
      out[k + 1] = -out[k + 1]! * s;
    }
  }

  private bluestein(out: Float64Array, input: Float64Array): void {
    const n = this.n;
    const m = this.m;
    const w = this.chirp!;
    const a = this.a!;
    const b = this.b!;
    const K = this.kernel!;
    const inner = this.inner!;
    for (let k = 0; k < n; k++) {
      const xr = input[2 * k]!;
      const xi = input[2 * k + 1]!;
      const wr = w[2 * k]!;
      const wi = w[2 * k + 1]!;
      a[2 * k] = xr * wr - xi * wi;
      a[2 * k + 1] = xr * wi + xi * wr;
    }
    a.fill(0, 2 * n);
    inner.transform(b, a);
    for (let k = 0; k < 2 * m; k += 2) {
      const br = b[k]!;
      const bi = b[k + 1]!;
      const kr = K[k]!;
      const ki = K[k + 1]!;
      b[k] = br * kr - bi * ki;
      b[k + 1] = br * ki + bi * kr;
    }
    inner.inverseTransform(a, b);
    for (let k = 0; k < n; k++) {
      const yr = a[2 * k]!;
      const yi = a[2 * k + 1]!;
      const wr = w[2 * k]!;
      const wi = w[2 * k + 1]!;
      out[2 * k] = yr * wr - yi * wi;
      out[2 * k + 1] = yr * wi + yi * wr;
    }
  }
}

/**
 * A plan for the unnormalised DCT-II `X[k] = Σₙ x[n] cos(πk(2n+1)/(2N))` and its exact
 * inverse (a scaled DCT-III), computed two real sequences at a time through one N-point
 * complex FFT after Makhoul's even/odd reordering.
 *
 * @see Makhoul, J. (1980), "A fast cosine transform in one and two dimensions", IEEE
 *   Transactions on Acoustics, Speech, and Signal Processing 28(1), 27–34.
 */
export class FastDct {
  readonly n: number;
  private readonly fft: ComplexFft;
  private readonly tw: Float64Array; // cos, sin of πk/(2N)
  private readonly z: Float64Array;
  private readonly zf: Float64Array;

  constructor(n: number) {
    this.n = n;
    this.fft = new ComplexFft(n);
    const tw = new Float64Array(2 * n);
    for (let k = 0; k < n; k++) {
      tw[2 * k] = Math.cos((Math.PI * k) / (2 * n));
      tw[2 * k + 1] = Math.sin((Math.PI * k) / (2 * n));
    }
    this.tw = tw;
    this.z = new Float64Array(2 * n);
    this.zf = new Float64Array(2 * n);
  }

  /**
   * DCT-II of two sequences in place: sequence a starts at `ra`, b at `rb`, both with
   * element stride `stride` (1 for rows, the row length for columns). Pass `rb < 0`
   * for a single sequence.
   */
  forwardPair(data: Float64Array, ra: number, rb: number, stride = 1): void {
    const n = this.n;
    if (n === 1) return;
    const z = this.z;
    const zf = this.zf;
    const two = rb >= 0;
    // Makhoul's reordering: v[j] = x[2j] (front), v[n−1−j] = x[2j+1] (back, reversed)
    const ne = (n + 1) >> 1;
    const no = n >> 1;
    const s2 = 2 * stride;
    if (two) {
      for (let j = 0, s = 0; j < ne; j++, s += s2) {
        z[2 * j] = data[ra + s]!;
        z[2 * j + 1] = data[rb + s]!;
      }
      for (let j = 0, s = stride, d = 2 * (n - 1); j < no; j++, s += s2, d -= 2) {
        z[d] = data[ra + s]!;
        z[d + 1] = data[rb + s]!;
      }
    } else {
      for (let j = 0, s = 0; j < ne; j++, s += s2) {
        z[2 * j] = data[ra + s]!;
        z[2 * j + 1] = 0;
      }
      for (let j = 0, s = stride, d = 2 * (n - 1); j < no; j++, s += s2, d -= 2) {
        z[d] = data[ra + s]!;
        z[d + 1] = 0;
      }
    }
    this.fft.forward(zf, z);
    const tw = this.tw;
    // X[k] = Re(e^{-iπk/2N} V[k]); V_a, V_b separated from Z by Hermitian symmetry
    data[ra] = zf[0]!;
    if (two) data[rb] = zf[1]!;
    // outputs k and n − k share their two loads
    for (let k = 1, ok = stride, om = (n - 1) * stride; 2 * k <= n; k++, ok += stride, om -= stride) {
      const m = n - k;
      const Ar = zf[2 * k]!;
      const Ai = zf[2 * k + 1]!;
      const Br = zf[2 * m]!;
      const Bi = zf[2 * m + 1]!;
      const sr = Ar + Br;
      const di = Ai - Bi;
      const si = Ai + Bi;
      const dr = Ar - Br;
      const ckr = tw[2 * k]!;
      const cki = tw[2 * k + 1]!;
      data[ra + ok] = 0.5 * (ckr * sr + cki * di);
      if (two) data[rb + ok] = 0.5 * (ckr * si - cki * dr);
      if (m !== k) {
        // at n − k the roles of A and B swap: sr, si same; di, dr change sign
        const cmr = tw[2 * m]!;
        const cmi = tw[2 * m + 1]!;
        data[ra + om] = 0.5 * (cmr * sr - cmi * di);
        if (two) data[rb + om] = 0.5 * (cmr * si + cmi * dr);
      }
    }
  }

  /** Exact inverse of {@link FastDct.forwardPair}, in place, same layout arguments. */
  inversePair(data: Float64Array, ra: number, rb: number, stride = 1): void {
    const n = this.n;
    if (n === 1) return;
    const z = this.z;
    const zf = this.zf;
    const tw = this.tw;
    const two = rb >= 0;
    // V[k] = e^{iπk/2N} (X[k] − i X[N−k]), X[N] = 0; Z = V_a + i V_b
    zf[0] = data[ra]!;
    zf[1] = two ? data[rb]! : 0;
    for (let k = 1; k < n; k++) {
      const er = tw[2 * k]!;
      const ei = tw[2 * k + 1]!;
      const ok = k * stride;
      const om = (n - k) * stride;
      const ak = data[ra + ok]!;
      const am = data[ra + om]!;
      const var_ = er * ak + ei * am;
      const vai = ei * ak - er * am;
      let vbr = 0;
      let vbi = 0;
      if (two) {
        const bk = data[rb + ok]!;
        const bm = data[rb + om]!;
        vbr = er * bk + ei * bm;
        vbi = ei * bk - er * bm;
      }
      zf[2 * k] = var_ - vbi;
      zf[2 * k + 1] = vai + vbr;
    }
    this.fft.inverse(z, zf);
    const ne = (n + 1) >> 1;
    const no = n >> 1;
    const s2 = 2 * stride;
    if (two) {
      for (let j = 0, s = 0; j < ne; j++, s += s2) {
        data[ra + s] = z[2 * j]!;
        data[rb + s] = z[2 * j + 1]!;
      }
      for (let j = 0, s = stride, d = 2 * (n - 1); j < no; j++, s += s2, d -= 2) {
        data[ra + s] = z[d]!;
        data[rb + s] = z[d + 1]!;
      }
    } else {
      for (let j = 0, s = 0; j < ne; j++, s += s2) data[ra + s] = z[2 * j]!;
      for (let j = 0, s = stride, d = 2 * (n - 1); j < no; j++, s += s2, d -= 2) data[ra + s] = z[d]!;
    }
  }
}

const BLOCK = 32;

/** Transpose a real `rows × cols` row-major array into `out` (`cols × rows`). */
export function transposeReal(src: Float64Array, rows: number, cols: number, out: Float64Array): void {
  for (let r0 = 0; r0 < rows; r0 += BLOCK) {
    const r1 = Math.min(rows, r0 + BLOCK);
    for (let c0 = 0; c0 < cols; c0 += BLOCK) {
      const c1 = Math.min(cols, c0 + BLOCK);
      for (let r = r0; r < r1; r++) {
        const base = r * cols;
        for (let c = c0; c < c1; c++) out[c * rows + r] = src[base + c]!;
      }
    }
  }
}

/** Transpose an interleaved complex `rows × cols` array into `out` (`cols × rows`). */
export function transposeComplex(src: Float64Array, rows: number, cols: number, out: Float64Array): void {
  for (let r0 = 0; r0 < rows; r0 += BLOCK) {
    const r1 = Math.min(rows, r0 + BLOCK);
    for (let c0 = 0; c0 < cols; c0 += BLOCK) {
      const c1 = Math.min(cols, c0 + BLOCK);
      for (let r = r0; r < r1; r++) {
        const base = 2 * r * cols;
        for (let c = c0; c < c1; c++) {
          const d = 2 * (c * rows + r);
          const s = base + 2 * c;
          out[d] = src[s]!;
          out[d + 1] = src[s + 1]!;
        }
      }
    }
  }
}
