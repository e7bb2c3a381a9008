/**
 * Fast transforms on typed arrays for the transform-based integrators: complex FFTs of
 * any length (the library's radix-4 kernel, `core/fft-kernel.ts`, for powers of two;
 * Bluestein's chirp-z algorithm on top of it for every other length), fast DCT-II /
 * DCT-III of any length by Makhoul's reordering, and a cache-blocked transpose. Complex
 * data is interleaved `re, im, re, im, …` in `Float64Array`s; nothing allocates per
 * element.
 *
 * These are building blocks of the integrators, not part of the public API.
 *
 * @module
 * @internal
 */
import { Pow2Fft } from '../core/fft-kernel.js';

/**
 * A plan for the complex DFT of one length. Not re-entrant: it owns scratch buffers.
 *
 * Besides the out-of-place {@link ComplexFft.forward} / {@link ComplexFft.inverse}, two
 * unscaled in-place forms let a caller fold the kernel's reordering into a copy it makes
 * anyway: {@link ComplexFft.fromOrder} takes element j at position `order[j]` and leaves
 * the spectrum in natural order; {@link ComplexFft.toOrder} takes natural order and
 * leaves `X[k]` at position `order[k]`. `order` is the bit reversal for powers of two and
 * the identity otherwise.
 */
export class ComplexFft {
  /** Transform length. */
  readonly n: number;
  /** The storage order of {@link ComplexFft.fromOrder} input / {@link ComplexFft.toOrder} output. */
  readonly order: Int32Array;
  private readonly pow2: Pow2Fft | null;
  // Bluestein state (non-power-of-two lengths)
  private readonly m: number;
  private readonly inner: Pow2Fft | null;
  private readonly chirp: Float64Array | null; // w[k] = exp(-iπk²/n)
  private readonly kernel: Float64Array | null; // FFT of conj(w) arranged circularly, times 1/m
  private readonly a: Float64Array | null;
  private readonly b: Float64Array | null;
  private readonly c: Float64Array | null;

  constructor(n: number) {
    this.n = n;
    if ((n & (n - 1)) === 0) {
      this.pow2 = new Pow2Fft(n);
      this.order = this.pow2.rev;
      this.m = n;
      this.inner = null;
      this.chirp = this.kernel = this.a = this.b = this.c = null;
      return;
    }
    this.pow2 = null;
    this.order = new Int32Array(n).map((_, k) => k);
    let m = 2;
    while (m < 2 * n - 1) m <<= 1;
    this.m = m;
    this.inner = new Pow2Fft(m);
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
    // the spectrum of the kernel in the inner kernel's bit-reversed order, with the 1/m
    // of the inner inverse folded in
    this.inner.toOrder(bk, 0, false);
    const s = 1 / m;
    for (let k = 0; k < 2 * m; k++) bk[k] = bk[k]! * s;
    this.chirp = chirp;
    this.kernel = bk;
    this.a = new Float64Array(2 * m);
    this.b = new Float64Array(2 * n);
    this.c = new Float64Array(2 * n);
  }

  /** Forward DFT `X[k] = Σ x[j] e^{-2πi jk/n}`; `out` and `input` must differ (length 2n). */
  forward(out: Float64Array, input: Float64Array): void {
    if (this.pow2) {
      this.pow2.transform(out, input, false);
      return;
    }
    this.bluestein(out, 0, input, 0, false);
  }

  /** Inverse DFT with the 1/n factor; `out` and `input` must differ (length 2n). */
  inverse(out: Float64Array, input: Float64Array): void {
    const n = this.n;
    if (this.pow2) this.pow2.transform(out, input, true);
    else this.bluestein(out, 0, input, 0, true);
    const s = 1 / n;
    for (let k = 0; k < 2 * n; k++) out[k] = out[k]! * s;
  }

  /**
   * Unscaled DFT in place (`e^{+2πi jk/n}` when `inverse`), input element j at complex
   * position `off/2 + order[j]`, output `X[k]` at `off/2 + k`.
   */
  fromOrder(x: Float64Array, off: number, inverse: boolean): void {
    if (this.pow2) this.pow2.fromOrder(x, off, inverse);
    else this.bluesteinInPlace(x, off, inverse);
  }

  /**
   * Unscaled DFT in place (`e^{+2πi jk/n}` when `inverse`), input element j at complex
   * position `off/2 + j`, output `X[k]` at `off/2 + order[k]`.
   */
  toOrder(x: Float64Array, off: number, inverse: boolean): void {
    if (this.pow2) this.pow2.toOrder(x, off, inverse);
    else this.bluesteinInPlace(x, off, inverse);
  }

  /**
   * {@link ComplexFft.fromOrder} on a strip of `nc` complex columns of a row-major array
   * (row r at double offset `off + r·rs`, `nc` interleaved complex values per row): each
   * column's element j at row `order[j]`, its `X[k]` left at row k. Powers of two run
   * along the rows without gathering; other lengths gather one column at a time.
   */
  stripFromOrder(x: Float64Array, off: number, rs: number, nc: number, inverse: boolean): void {
    if (this.pow2) this.pow2.stripFromOrder(x, off, rs, nc, inverse);
    else this.bluesteinStrip(x, off, rs, nc, inverse);
  }

  /**
   * {@link ComplexFft.toOrder} on a strip (layout as {@link ComplexFft.stripFromOrder}):
   * element j at row j, `X[k]` left at row `order[k]`.
   */
  stripToOrder(x: Float64Array, off: number, rs: number, nc: number, inverse: boolean): void {
    if (this.pow2) this.pow2.stripToOrder(x, off, rs, nc, inverse);
    else this.bluesteinStrip(x, off, rs, nc, inverse);
  }

  private bluesteinStrip(x: Float64Array, off: number, rs: number, nc: number, inverse: boolean): void {
    const n = this.n;
    const b = this.b!;
    const c = this.c!;
    for (let col = 0; col < nc; col++) {
      const o = off + 2 * col;
      for (let r = 0, s = o; r < n; r++, s += rs) {
        b[2 * r] = x[s]!;
        b[2 * r + 1] = x[s + 1]!;
      }
      this.bluestein(c, 0, b, 0, inverse);
      for (let r = 0, s = o; r < n; r++, s += rs) {
        x[s] = c[2 * r]!;
        x[s + 1] = c[2 * r + 1]!;
      }
    }
  }

  private bluesteinInPlace(x: Float64Array, off: number, inverse: boolean): void {
    const b = this.b!;
    const n2 = 2 * this.n;
    for (let k = 0; k < n2; k++) b[k] = x[off + k]!;
    this.bluestein(x, off, b, 0, inverse);
  }

  /**
   * Unscaled DFT of length n by Bluestein's algorithm, `X[k] = w[k] Σ_j (x[j] w[j])
   * conj(w[k − j])` with `w[k] = e^{∓iπk²/n}`: one circular convolution of length m by
   * the kernel (decimation in frequency forward, pointwise product in bit-reversed
   * order, decimation in time back, so no reordering pass). The inverse uses the
   * conjugate chirp and the conjugate kernel (the kernel of the conjugate chirp is the
   * conjugate of the reversed kernel, which the symmetric kernel equals).
   */
  private bluestein(out: Float64Array, oo: number, input: Float64Array, io: number, inverse: boolean): void {
    const n = this.n;
    const m = this.m;
    const w = this.chirp!;
    const a = this.a!;
    const K = this.kernel!;
    const inner = this.inner!;
    const sg = inverse ? -1 : 1;
    for (let k = 0; k < n; k++) {
      const xr = input[io + 2 * k]!;
      const xi = input[io + 2 * k + 1]!;
      const wr = w[2 * k]!;
      const wi = sg * w[2 * k + 1]!;
      a[2 * k] = xr * wr - xi * wi;
      a[2 * k + 1] = xr * wi + xi * wr;
    }
    a.fill(0, 2 * n);
    inner.toOrder(a, 0, false);
    for (let k = 0; k < 2 * m; k += 2) {
      const br = a[k]!;
      const bi = a[k + 1]!;
      const kr = K[k]!;
      const ki = sg * K[k + 1]!;
      a[k] = br * kr - bi * ki;
      a[k + 1] = br * ki + bi * kr;
    }
    inner.fromOrder(a, 0, true);
    for (let k = 0; k < n; k++) {
      const yr = a[2 * k]!;
      const yi = a[2 * k + 1]!;
      const wr = w[2 * k]!;
      const wi = sg * w[2 * k + 1]!;
      out[oo + 2 * k] = yr * wr - yi * wi;
      out[oo + 2 * k + 1] = yr * wi + yi * wr;
    }
  }
}

/**
 * A plan for the unnormalised DCT-II `X[k] = Σₙ x[n] cos(πk(2n+1)/(2N))` and its exact
 * inverse (a scaled DCT-III), computed two real sequences at a time through one N-point
 * complex FFT after Makhoul's even/odd reordering. The reordering copy writes straight
 * into the FFT kernel's storage order, so no separate permutation pass is made.
 *
 * @see Makhoul, J. (1980), "A fast cosine transform in one and two dimensions", IEEE
 *   Transactions on Acoustics, Speech, and Signal Processing 28(1), 27–34.
 */
export class FastDct {
  readonly n: number;
  private readonly fft: ComplexFft;
  private readonly tw: Float64Array; // cos, sin of πk/(2N)
  private readonly twInv: Float64Array; // the same divided by N (the inverse FFT's 1/N)
  /** Position (in doubles) in `z` of reordered element j: 2·order[j]. */
  private readonly pos: Int32Array;
  /** Sample index whose value goes to complex position i of `z` (reordering and storage order composed). */
  private readonly src: Int32Array;
  private readonly z: Float64Array;

  constructor(n: number) {
    this.n = n;
    this.fft = new ComplexFft(n);
    const tw = new Float64Array(2 * n);
    const twInv = new Float64Array(2 * n);
    for (let k = 0; k < n; k++) {
      tw[2 * k] = Math.cos((Math.PI * k) / (2 * n));
      tw[2 * k + 1] = Math.sin((Math.PI * k) / (2 * n));
      twInv[2 * k] = tw[2 * k]! / n;
      twInv[2 * k + 1] = tw[2 * k + 1]! / n;
    }
    this.tw = tw;
    this.twInv = twInv;
    const order = this.fft.order;
    this.pos = new Int32Array(n);
    for (let j = 0; j < n; j++) this.pos[j] = 2 * order[j]!;
    // position i holds reordered element e = order[i] (the order is an involution), which
    // is sample 2e for e < ⌈n/2⌉ and sample 2(n − 1 − e) + 1 otherwise
    this.src = new Int32Array(n);
    const ne = (n + 1) >> 1;
    for (let i = 0; i < n; i++) {
      const e = order[i]!;
      this.src[i] = e < ne ? 2 * e : 2 * (n - 1 - e) + 1;
    }
    this.z = new Float64Array(2 * n);
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
    const two = rb >= 0;
    // Makhoul's reordering: v[j] = x[2j] (front), v[n−1−j] = x[2j+1] (back, reversed),
    // gathered straight into the transform's storage order
    const src = this.src;
    if (two) {
      for (let i = 0, d = 0; i < n; i++, d += 2) {
        const s = src[i]! * stride;
        z[d] = data[ra + s]!;
        z[d + 1] = data[rb + s]!;
      }
    } else {
      for (let i = 0, d = 0; i < n; i++, d += 2) {
        z[d] = data[ra + src[i]! * stride]!;
        z[d + 1] = 0;
      }
    }
    this.fft.fromOrder(z, 0, false);
    const zf = z;
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

  /**
   * A diagonal solve in the DCT-II basis along the columns of a row-major real array
   * (transform, divide, transform back, the coefficients never stored), for `nb`
   * adjacent columns at once: columns `i0 … i0+nb−1` of `data`
   * (row r at `r·w`); coefficient k of column `i0 + c` is divided by `lx[i0 + c] + lam[k]`
   * (zero divisor → zero coefficient). The columns are packed two to a complex value in
   * `tile` (at least `n · 2⌈nb/2⌉` doubles), each row copied whole into the row that the
   * even/odd reordering and the transform's storage order give it, and transformed along
   * the tile's rows (the FFT kernel's strip form), so nothing is transposed.
   */
  solveStrip(data: Float64Array, w: number, i0: number, nb: number, lx: Float64Array, lam: Float64Array, tile: Float64Array): void {
    const n = this.n;
    const nc = (nb + 1) >> 1;
    const ts = 2 * nc;
    const pos = this.pos;
    // sample y goes to reordered element e: 2e = y (even y), 2(n − 1 − e) + 1 = y (odd y)
    for (let y = 0; y < n; y++) {
      const e = (y & 1) === 0 ? y >> 1 : n - 1 - (y >> 1);
      const d = (pos[e]! >> 1) * ts;
      const s = y * w + i0;
      for (let c = 0; c < nb; c++) tile[d + c] = data[s + c]!;
      if (nb & 1) tile[d + nb] = 0;
    }
    this.fft.stripFromOrder(tile, 0, ts, nc, false);
    const tw = this.tw;
    const ti = this.twInv;
    // k = 0: X = Re Z / Im Z, V = X / n
    for (let c = 0; c < nc; c++) {
      const da = lx[i0 + 2 * c]! + lam[0]!;
      // a missing partner column (odd nb) is zero and borrows its neighbour's divisors
      const db = (2 * c + 1 < nb ? lx[i0 + 2 * c + 1]! : lx[i0 + 2 * c]!) + lam[0]!;
      tile[2 * c] = da !== 0 ? tile[2 * c]! / (da * n) : 0;
      tile[2 * c + 1] = db !== 0 ? tile[2 * c + 1]! / (db * n) : 0;
    }
    // rows k and n − k: coefficients from Z[k], Z[n − k], divided, and V[k], V[n − k] of
    // the inverse written over them (both read before either is written), one complex
    // column at a time
    for (let k = 1; 2 * k <= n; k++) {
      const m = n - k;
      const ok = k * ts;
      const om = m * ts;
      const ckr = tw[2 * k]!;
      const cki = tw[2 * k + 1]!;
      const cmr = tw[2 * m]!;
      const cmi = tw[2 * m + 1]!;
      const er = ti[2 * k]!;
      const ei = ti[2 * k + 1]!;
      const fr = ti[2 * m]!;
      const fi = ti[2 * m + 1]!;
      const lk = lam[k]!;
      const lm = lam[m]!;
      for (let c = 0; c < nc; c++) {
        const la = lx[i0 + 2 * c]!;
        const lb = 2 * c + 1 < nb ? lx[i0 + 2 * c + 1]! : la;
        const Ar = tile[ok + 2 * c]!;
        const Ai = tile[ok + 2 * c + 1]!;
        const Br = tile[om + 2 * c]!;
        const Bi = tile[om + 2 * c + 1]!;
        const sr = Ar + Br;
        const di = Ai - Bi;
        const si = Ai + Bi;
        const dr = Ar - Br;
        const dak = la + lk;
        const dbk = lb + lk;
        const xak = dak !== 0 ? (0.5 * (ckr * sr + cki * di)) / dak : 0;
        const xbk = dbk !== 0 ? (0.5 * (ckr * si - cki * dr)) / dbk : 0;
        if (m === k) {
          tile[ok + 2 * c] = er * xak + ei * xak - (ei * xbk - er * xbk);
          tile[ok + 2 * c + 1] = ei * xak - er * xak + (er * xbk + ei * xbk);
          continue;
        }
        const dam = la + lm;
        const dbm = lb + lm;
        const xam = dam !== 0 ? (0.5 * (cmr * sr - cmi * di)) / dam : 0;
        const xbm = dbm !== 0 ? (0.5 * (cmr * si + cmi * dr)) / dbm : 0;
        tile[ok + 2 * c] = er * xak + ei * xam - (ei * xbk - er * xbm);
        tile[ok + 2 * c + 1] = ei * xak - er * xam + (er * xbk + ei * xbm);
        tile[om + 2 * c] = fr * xam + fi * xak - (fi * xbm - fr * xbk);
        tile[om + 2 * c + 1] = fi * xam - fr * xak + (fr * xbm + fi * xbk);
      }
    }
    this.fft.stripToOrder(tile, 0, ts, nc, true);
    for (let y = 0; y < n; y++) {
      const e = (y & 1) === 0 ? y >> 1 : n - 1 - (y >> 1);
      const d = (pos[e]! >> 1) * ts;
      const s = y * w + i0;
      for (let c = 0; c < nb; c++) data[s + c] = tile[d + c]!;
    }
  }

  /** Exact inverse of {@link FastDct.forwardPair}, in place, same layout arguments. */
  inversePair(data: Float64Array, ra: number, rb: number, stride = 1): void {
    const n = this.n;
    if (n === 1) return;
    const z = this.z;
    const tw = this.twInv;
    const two = rb >= 0;
    // V[k] = e^{iπk/2N} (X[k] − i X[N−k]) / N, X[N] = 0; Z = V_a + i V_b (the 1/N of
    // the inverse transform is folded into the twiddles)
    const s0 = 1 / n;
    z[0] = data[ra]! * s0;
    z[1] = two ? data[rb]! * s0 : 0;
    if (two) {
      for (let k = 1, ok = stride, om = (n - 1) * stride; k < n; k++, ok += stride, om -= stride) {
        const er = tw[2 * k]!;
        const ei = tw[2 * k + 1]!;
        const ak = data[ra + ok]!;
        const am = data[ra + om]!;
        const bk = data[rb + ok]!;
        const bm = data[rb + om]!;
        z[2 * k] = er * ak + ei * am - (ei * bk - er * bm);
        z[2 * k + 1] = ei * ak - er * am + (er * bk + ei * bm);
      }
    } else {
      for (let k = 1, ok = stride, om = (n - 1) * stride; k < n; k++, ok += stride, om -= stride) {
        const er = tw[2 * k]!;
        const ei = tw[2 * k + 1]!;
        const ak = data[ra + ok]!;
        const am = data[ra + om]!;
        z[2 * k] = er * ak + ei * am;
        z[2 * k + 1] = ei * ak - er * am;
      }
    }
    this.fft.toOrder(z, 0, true);
    const pos = this.pos;
    const ne = (n + 1) >> 1;
    const no = n >> 1;
    const s2 = 2 * stride;
    if (two) {
      for (let j = 0, s = 0; j < ne; j++, s += s2) {
        const d = pos[j]!;
        data[ra + s] = z[d]!;
        data[rb + s] = z[d + 1]!;
      }
      for (let j = 0, s = stride; j < no; j++, s += s2) {
        const d = pos[n - 1 - j]!;
        data[ra + s] = z[d]!;
        data[rb + s] = z[d + 1]!;
      }
    } else {
      for (let j = 0, s = 0; j < ne; j++, s += s2) data[ra + s] = z[pos[j]!]!;
      for (let j = 0, s = stride; j < no; j++, s += s2) data[ra + s] = z[pos[n - 1 - j]!]!;
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
