/**
 * The library's own power-of-two FFT kernel, shared by the transform-based integrators
 * and the sea synthesis: an iterative radix-4 Cooley–Tukey transform
 * (one radix-2 stage when log₂ n is odd) on interleaved complex `Float64Array`s
 * (`re, im, re, im, …`), in place, with per-size cached tables (bit-reversal permutation
 * and one contiguous twiddle table per stage).
 *
 * Two in-place forms let callers fold the reordering into a copy they make anyway:
 * decimation in time ({@link Pow2Fft.fromOrder}: input in bit-reversed order, output in
 * natural order) and decimation in frequency ({@link Pow2Fft.toOrder}: natural order in,
 * bit-reversed order out). The strip forms ({@link Pow2Fft.stripFromOrder},
 * {@link Pow2Fft.stripToOrder}) transform many columns of a row-major array at once,
 * each butterfly running along a row, for 2-D transforms without a transpose. None
 * scales; the inverse differs from the forward transform only in the sign of the
 * exponent, `X[k] = Σ x[j] e^{∓2πi jk/n}`.
 *
 * @see Cooley, J. W. & Tukey, J. W. (1965), "An algorithm for the machine calculation of
 *   complex Fourier series", Mathematics of Computation 19(90), 297–301.
 * @see Gentleman, W. M. & Sande, G. (1966), "Fast Fourier transforms — for fun and
 *   profit", AFIPS Fall Joint Computer Conference 29, 563–578 (decimation in frequency).
 *
 * @module
 * @internal
 */

/** A plan for complex transforms of one power-of-two length `n ≥ 1`. @internal */
export class Pow2Fft {
  /** Transform length (a power of two). */
  readonly n: number;
  /** `rev[j]`: the bit reversal of j over log₂ n bits. */
  readonly rev: Int32Array;
  /** Whether log₂ n is odd (one radix-2 stage). */
  private readonly odd: boolean;
  /**
   * Forward twiddles of every radix-4 stage with sub-length m ≥ 2, stage after stage,
   * 6 doubles per j < m: w^j, w^{2j}, w^{3j} (re, im) with w = e^{−2πi/(4m)}.
   */
  private readonly twF: Float64Array;
  /**
   * Inverse twiddles, same layout with conjugate values and the first and third slots
   * exchanged (w̄^{3j}, w̄^{2j}, w̄^j): the inverse runs the forward butterfly with the
   * second and fourth quarters exchanged.
   */
  private readonly twI: Float64Array;
  /** Offset of each stage's table, stage s having sub-length `ms[s]`. */
  private readonly twOff: Int32Array;
  /** Sub-lengths m of the radix-4 stages with twiddles (m ≥ 2), ascending. */
  private readonly ms: Int32Array;

  constructor(n: number) {
    if (!(n >= 1) || (n & (n - 1)) !== 0) throw new Error(`Pow2Fft: ${n} is not a power of two`);
    this.n = n;
    let bits = 0;
    while (1 << bits < n) bits++;
    this.odd = (bits & 1) === 1;
    const rev = new Int32Array(n);
    for (let j = 1; j < n; j++) rev[j] = (rev[j >> 1]! >> 1) | ((j & 1) << (bits - 1));
    this.rev = rev;
    const ms: number[] = [];
    for (let m = this.odd ? 2 : 4; 4 * m <= n; m *= 4) ms.push(m);
    this.ms = Int32Array.from(ms);
    this.twOff = new Int32Array(ms.length);
    let size = 0;
    for (let s = 0; s < ms.length; s++) {
      this.twOff[s] = size;
      size += 6 * ms[s]!;
    }
    const twF = new Float64Array(size);
    const twI = new Float64Array(size);
    for (let s = 0; s < ms.length; s++) {
      const m = ms[s]!;
      const o = this.twOff[s]!;
      const l = 4 * m;
      for (let j = 0; j < m; j++) {
        for (let t = 1; t <= 3; t++) {
          // t·j < l: the integer numerator keeps the angle exact up to one rounding
          const a = (2 * Math.PI * (t * j)) / l;
          const c = Math.cos(a);
          const sn = Math.sin(a);
          twF[o + 6 * j + 2 * (t - 1)] = c;
          twF[o + 6 * j + 2 * (t - 1) + 1] = -sn;
          twI[o + 6 * j + 2 * (3 - t)] = c;
          twI[o + 6 * j + 2 * (3 - t) + 1] = sn;
        }
      }
    }
    this.twF = twF;
    this.twI = twI;
  }

  /**
   * Out-of-place unscaled transform: `out[k] = Σ input[j] e^{∓2πi jk/n}` (− forward,
   * + when `inverse`). `out` (length ≥ 2n) must not overlap `input`.
   */
  transform(out: Float64Array, input: Float64Array, inverse: boolean): void {
    const n = this.n;
    const rev = this.rev;
    if (n === 1) {
      out[0] = input[0]!;
      out[1] = input[1]!;
      return;
    }
    if (this.odd) {
      // radix-2 first stage fused with the permutation
      for (let i = 0; i < n; i += 2) {
        const a = 2 * rev[i]!;
        const b = 2 * rev[i + 1]!;
        const ar = input[a]!;
        const ai = input[a + 1]!;
        const br = input[b]!;
        const bi = input[b + 1]!;
        out[2 * i] = ar + br;
        out[2 * i + 1] = ai + bi;
        out[2 * i + 2] = ar - br;
        out[2 * i + 3] = ai - bi;
      }
    } else {
      // first radix-4 stage (m = 1, no twiddles) fused with the permutation
      const qc = inverse ? 3 : 2;
      const qd = inverse ? 2 : 3;
      for (let i = 0; i < n; i += 4) {
        const a = 2 * rev[i]!;
        const b = 2 * rev[i + 1]!;
        const c = 2 * rev[i + qc]!;
        const d = 2 * rev[i + qd]!;
        const ar = input[a]!;
        const ai = input[a + 1]!;
        const br = input[b]!;
        const bi = input[b + 1]!;
        const cr = input[c]!;
        const ci = input[c + 1]!;
        const dr = input[d]!;
        const di = input[d + 1]!;
        const t0r = ar + br;
        const t0i = ai + bi;
        const t1r = ar - br;
        const t1i = ai - bi;
        const t2r = cr + dr;
        const t2i = ci + di;
        // −i (c − d)
        const t3r = ci - di;
        const t3i = dr - cr;
        const o = 2 * i;
        out[o] = t0r + t2r;
        out[o + 1] = t0i + t2i;
        out[o + 2] = t1r + t3r;
        out[o + 3] = t1i + t3i;
        out[o + 4] = t0r - t2r;
        out[o + 5] = t0i - t2i;
        out[o + 6] = t1r - t3r;
        out[o + 7] = t1i - t3i;
      }
    }
    this.ditStages(out, 0, inverse);
  }

  /**
   * In-place unscaled transform by decimation in time: `x` holds element j of the
   * sequence at complex index `off/2 + rev[j]`; on return it holds `X[k]` at
   * `off/2 + k` (natural order). `off` is a double offset (even).
   */
  fromOrder(x: Float64Array, off: number, inverse: boolean): void {
    const n = this.n;
    if (n === 1) return;
    const end = off + 2 * n;
    if (this.odd) {
      for (let o = off; o < end; o += 4) {
        const ar = x[o]!;
        const ai = x[o + 1]!;
        const br = x[o + 2]!;
        const bi = x[o + 3]!;
        x[o] = ar + br;
        x[o + 1] = ai + bi;
        x[o + 2] = ar - br;
        x[o + 3] = ai - bi;
      }
    } else {
      const qc = inverse ? 6 : 4;
      const qd = inverse ? 4 : 6;
      for (let o = off; o < end; o += 8) {
        const ar = x[o]!;
        const ai = x[o + 1]!;
        const br = x[o + 2]!;
        const bi = x[o + 3]!;
        const cr = x[o + qc]!;
        const ci = x[o + qc + 1]!;
        const dr = x[o + qd]!;
        const di = x[o + qd + 1]!;
        const t0r = ar + br;
        const t0i = ai + bi;
        const t1r = ar - br;
        const t1i = ai - bi;
        const t2r = cr + dr;
        const t2i = ci + di;
        const t3r = ci - di;
        const t3i = dr - cr;
        x[o] = t0r + t2r;
        x[o + 1] = t0i + t2i;
        x[o + 2] = t1r + t3r;
        x[o + 3] = t1i + t3i;
        x[o + 4] = t0r - t2r;
        x[o + 5] = t0i - t2i;
        x[o + 6] = t1r - t3r;
        x[o + 7] = t1i - t3i;
      }
    }
    this.ditStages(x, off, inverse);
  }

  /** The radix-4 stages with twiddles (m ≥ 2) of the decimation-in-time transform. */
  private ditStages(x: Float64Array, off: number, inverse: boolean): void {
    const n2 = 2 * this.n;
    const end = off + n2;
    const tw = inverse ? this.twI : this.twF;
    const ms = this.ms;
    for (let s = 0; s < ms.length; s++) {
      const m = ms[s]!;
      const m2 = 2 * m;
      const blk = 4 * m2;
      // quarter 1 holds the residue-2 sub-transform (w^{2j}), quarter 2 residue 1 (w^j),
      // quarter 3 residue 3 (w^{3j}); the inverse reads quarters 2 and 3 exchanged
      const oc = inverse ? 3 * m2 : 2 * m2;
      const od = inverse ? 2 * m2 : 3 * m2;
      for (let j = 0, t = this.twOff[s]!; j < m; j++, t += 6) {
        const w1r = tw[t]!;
        const w1i = tw[t + 1]!;
        const w2r = tw[t + 2]!;
        const w2i = tw[t + 3]!;
        const w3r = tw[t + 4]!;
        const w3i = tw[t + 5]!;
        for (let i0 = off + 2 * j; i0 < end; i0 += blk) {
          const i1 = i0 + m2;
          const ic = i0 + oc;
          const id = i0 + od;
          const ar = x[i0]!;
          const ai = x[i0 + 1]!;
          const xbr = x[i1]!;
          const xbi = x[i1 + 1]!;
          const br = xbr * w2r - xbi * w2i;
          const bi = xbr * w2i + xbi * w2r;
          const xcr = x[ic]!;
          const xci = x[ic + 1]!;
          const cr = xcr * w1r - xci * w1i;
          const ci = xcr * w1i + xci * w1r;
          const xdr = x[id]!;
          const xdi = x[id + 1]!;
          const dr = xdr * w3r - xdi * w3i;
          const di = xdr * w3i + xdi * w3r;
          const t0r = ar + br;
          const t0i = ai + bi;
          const t1r = ar - br;
          const t1i = ai - bi;
          const t2r = cr + dr;
          const t2i = ci + di;
          const t3r = ci - di;
          const t3i = dr - cr;
          const i2 = i1 + m2;
          const i3 = i2 + m2;
          x[i0] = t0r + t2r;
          x[i0 + 1] = t0i + t2i;
          x[i1] = t1r + t3r;
          x[i1 + 1] = t1i + t3i;
          x[i2] = t0r - t2r;
          x[i2 + 1] = t0i - t2i;
          x[i3] = t1r - t3r;
          x[i3 + 1] = t1i - t3i;
        }
      }
    }
  }

  /**
   * In-place unscaled transform by decimation in frequency: `x` holds element j at
   * complex index `off/2 + j` (natural order); on return it holds `X[k]` at
   * `off/2 + rev[k]`.
   */
  toOrder(x: Float64Array, off: number, inverse: boolean): void {
    const n = this.n;
    if (n === 1) return;
    const n2 = 2 * n;
    const end = off + n2;
    const tw = inverse ? this.twI : this.twF;
    const ms = this.ms;
    for (let s = ms.length - 1; s >= 0; s--) {
      const m = ms[s]!;
      const m2 = 2 * m;
      const blk = 4 * m2;
      // the transpose of the decimation-in-time butterfly; the inverse writes quarters
      // 2 and 3 exchanged (see twI)
      const oc = inverse ? 3 * m2 : 2 * m2;
      const od = inverse ? 2 * m2 : 3 * m2;
      for (let j = 0, t = this.twOff[s]!; j < m; j++, t += 6) {
        const w1r = tw[t]!;
        const w1i = tw[t + 1]!;
        const w2r = tw[t + 2]!;
        const w2i = tw[t + 3]!;
        const w3r = tw[t + 4]!;
        const w3i = tw[t + 5]!;
        for (let i0 = off + 2 * j; i0 < end; i0 += blk) {
          const i1 = i0 + m2;
          const i2 = i1 + m2;
          const i3 = i2 + m2;
          const x0r = x[i0]!;
          const x0i = x[i0 + 1]!;
          const x1r = x[i1]!;
          const x1i = x[i1 + 1]!;
          const x2r = x[i2]!;
          const x2i = x[i2 + 1]!;
          const x3r = x[i3]!;
          const x3i = x[i3 + 1]!;
          const s02r = x0r + x2r;
          const s02i = x0i + x2i;
          const d02r = x0r - x2r;
          const d02i = x0i - x2i;
          const s13r = x1r + x3r;
          const s13i = x1i + x3i;
          // −i (x1 − x3)
          const e13r = x1i - x3i;
          const e13i = x3r - x1r;
          x[i0] = s02r + s13r;
          x[i0 + 1] = s02i + s13i;
          const yr = s02r - s13r;
          const yi = s02i - s13i;
          x[i1] = yr * w2r - yi * w2i;
          x[i1 + 1] = yr * w2i + yi * w2r;
          const ur = d02r + e13r;
          const ui = d02i + e13i;
          const ic = i0 + oc;
          x[ic] = ur * w1r - ui * w1i;
          x[ic + 1] = ur * w1i + ui * w1r;
          const vr = d02r - e13r;
          const vi = d02i - e13i;
          const id = i0 + od;
          x[id] = vr * w3r - vi * w3i;
          x[id + 1] = vr * w3i + vi * w3r;
        }
      }
    }
    if (this.odd) {
      for (let o = off; o < end; o += 4) {
        const ar = x[o]!;
        const ai = x[o + 1]!;
        const br = x[o + 2]!;
        const bi = x[o + 3]!;
        x[o] = ar + br;
        x[o + 1] = ai + bi;
        x[o + 2] = ar - br;
        x[o + 3] = ai - bi;
      }
    } else {
      const qc = inverse ? 6 : 4;
      const qd = inverse ? 4 : 6;
      for (let o = off; o < end; o += 8) {
        const x0r = x[o]!;
        const x0i = x[o + 1]!;
        const x1r = x[o + 2]!;
        const x1i = x[o + 3]!;
        const x2r = x[o + 4]!;
        const x2i = x[o + 5]!;
        const x3r = x[o + 6]!;
        const x3i = x[o + 7]!;
        const s02r = x0r + x2r;
        const s02i = x0i + x2i;
        const d02r = x0r - x2r;
        const d02i = x0i - x2i;
        const s13r = x1r + x3r;
        const s13i = x1i + x3i;
        const e13r = x1i - x3i;
        const e13i = x3r - x1r;
        x[o] = s02r + s13r;
        x[o + 1] = s02i + s13i;
        x[o + 2] = s02r - s13r;
        x[o + 3] = s02i - s13i;
        x[o + qc] = d02r + e13r;
        x[o + qc + 1] = d02i + e13i;
        x[o + qd] = d02r - e13r;
        x[o + qd + 1] = d02i - e13i;
      }
    }
  }

  /**
   * Decimation in time on a strip of `nc` interleaved complex columns: row r of the
   * strip starts at double offset `off + r·rs` and holds `nc` complex values; row j of
   * each column's sequence is stored at row `rev[j]`; on return row k holds `X[k]` of
   * every column (natural order). Each butterfly runs along the row, so the twiddles are
   * loaded once per row group and the columns are never gathered.
   */
  stripFromOrder(x: Float64Array, off: number, rs: number, nc: number, inverse: boolean): void {
    const n = this.n;
    if (n === 1) return;
    const len = 2 * nc;
    if (this.odd) stripRadix2(x, off, rs, len, n);
    else stripDit4First(x, off, rs, len, n, inverse ? 3 : 2, inverse ? 2 : 3);
    const tw = inverse ? this.twI : this.twF;
    const ms = this.ms;
    for (let s = 0; s < ms.length; s++) {
      const m = ms[s]!;
      stripDitStage(x, off, rs, len, n, m, tw, this.twOff[s]!, inverse ? 3 * m : 2 * m, inverse ? 2 * m : 3 * m);
    }
  }

  /**
   * Decimation in frequency on a strip (layout as {@link Pow2Fft.stripFromOrder}): row j
   * holds element j of every column (natural order); on return row `rev[k]` holds `X[k]`.
   */
  stripToOrder(x: Float64Array, off: number, rs: number, nc: number, inverse: boolean): void {
    const n = this.n;
    if (n === 1) return;
    const len = 2 * nc;
    const tw = inverse ? this.twI : this.twF;
    const ms = this.ms;
    for (let s = ms.length - 1; s >= 0; s--) {
      const m = ms[s]!;
      stripDifStage(x, off, rs, len, n, m, tw, this.twOff[s]!, inverse ? 3 * m : 2 * m, inverse ? 2 * m : 3 * m);
    }
    if (this.odd) stripRadix2(x, off, rs, len, n);
    else stripDif4Last(x, off, rs, len, n, inverse ? 3 : 2, inverse ? 2 : 3);
  }
}

// The strip stages, one loop nest per function: each is called many times, so it is
// optimised with the feedback of all its code (no half-observed tail after a loop).

/** Radix-2 stage without twiddles (rows r, r + 1), the same in both directions. */
function stripRadix2(x: Float64Array, off: number, rs: number, len: number, n: number): void {
  for (let r = 0; r < n; r += 2) {
    const o0 = off + r * rs;
    const o1 = o0 + rs;
    for (let k = 0; k < len; k++) {
      const a = x[o0 + k]!;
      const b = x[o1 + k]!;
      x[o0 + k] = a + b;
      x[o1 + k] = a - b;
    }
  }
}

/** First radix-4 stage of decimation in time (m = 1, no twiddles); rows qc, qd read. */
function stripDit4First(x: Float64Array, off: number, rs: number, len: number, n: number, qc: number, qd: number): void {
  for (let r = 0; r < n; r += 4) {
    const o0 = off + r * rs;
    const o1 = o0 + rs;
    const o2 = o1 + rs;
    const o3 = o2 + rs;
    const oc = o0 + qc * rs;
    const od = o0 + qd * rs;
    for (let k = 0; k < len; k += 2) {
      const ar = x[o0 + k]!;
      const ai = x[o0 + k + 1]!;
      const br = x[o1 + k]!;
      const bi = x[o1 + k + 1]!;
      const cr = x[oc + k]!;
      const ci = x[oc + k + 1]!;
      const dr = x[od + k]!;
      const di = x[od + k + 1]!;
      const t0r = ar + br;
      const t0i = ai + bi;
      const t1r = ar - br;
      const t1i = ai - bi;
      const t2r = cr + dr;
      const t2i = ci + di;
      const t3r = ci - di;
      const t3i = dr - cr;
      x[o0 + k] = t0r + t2r;
      x[o0 + k + 1] = t0i + t2i;
      x[o1 + k] = t1r + t3r;
      x[o1 + k + 1] = t1i + t3i;
      x[o2 + k] = t0r - t2r;
      x[o2 + k + 1] = t0i - t2i;
      x[o3 + k] = t1r - t3r;
      x[o3 + k + 1] = t1i - t3i;
    }
  }
}

/** One twiddled radix-4 stage of decimation in time, sub-length m, table at t0. */
function stripDitStage(x: Float64Array, off: number, rs: number, len: number, n: number, m: number, tw: Float64Array, t0: number, qc: number, qd: number): void {
  for (let j = 0, t = t0; j < m; j++, t += 6) {
    const w1r = tw[t]!;
    const w1i = tw[t + 1]!;
    const w2r = tw[t + 2]!;
    const w2i = tw[t + 3]!;
    const w3r = tw[t + 4]!;
    const w3i = tw[t + 5]!;
    for (let r = j; r < n; r += 4 * m) {
      const o0 = off + r * rs;
      const o1 = o0 + m * rs;
      const o2 = o1 + m * rs;
      const o3 = o2 + m * rs;
      const oc = o0 + qc * rs;
      const od = o0 + qd * rs;
      for (let k = 0; k < len; k += 2) {
        const ar = x[o0 + k]!;
        const ai = x[o0 + k + 1]!;
        const xbr = x[o1 + k]!;
        const xbi = x[o1 + k + 1]!;
        const br = xbr * w2r - xbi * w2i;
        const bi = xbr * w2i + xbi * w2r;
        const xcr = x[oc + k]!;
        const xci = x[oc + k + 1]!;
        const cr = xcr * w1r - xci * w1i;
        const ci = xcr * w1i + xci * w1r;
        const xdr = x[od + k]!;
        const xdi = x[od + k + 1]!;
        const dr = xdr * w3r - xdi * w3i;
        const di = xdr * w3i + xdi * w3r;
        const t0r = ar + br;
        const t0i = ai + bi;
        const t1r = ar - br;
        const t1i = ai - bi;
        const t2r = cr + dr;
        const t2i = ci + di;
        const t3r = ci - di;
        const t3i = dr - cr;
        x[o0 + k] = t0r + t2r;
        x[o0 + k + 1] = t0i + t2i;
        x[o1 + k] = t1r + t3r;
        x[o1 + k + 1] = t1i + t3i;
        x[o2 + k] = t0r - t2r;
        x[o2 + k + 1] = t0i - t2i;
        x[o3 + k] = t1r - t3r;
        x[o3 + k + 1] = t1i - t3i;
      }
    }
  }
}

/** One twiddled radix-4 stage of decimation in frequency, sub-length m, table at t0. */
function stripDifStage(x: Float64Array, off: number, rs: number, len: number, n: number, m: number, tw: Float64Array, t0: number, qc: number, qd: number): void {
  for (let j = 0, t = t0; j < m; j++, t += 6) {
    const w1r = tw[t]!;
    const w1i = tw[t + 1]!;
    const w2r = tw[t + 2]!;
    const w2i = tw[t + 3]!;
    const w3r = tw[t + 4]!;
    const w3i = tw[t + 5]!;
    for (let r = j; r < n; r += 4 * m) {
      const o0 = off + r * rs;
      const o1 = o0 + m * rs;
      const o2 = o1 + m * rs;
      const o3 = o2 + m * rs;
      const oc = o0 + qc * rs;
      const od = o0 + qd * rs;
      for (let k = 0; k < len; k += 2) {
        const x0r = x[o0 + k]!;
        const x0i = x[o0 + k + 1]!;
        const x1r = x[o1 + k]!;
        const x1i = x[o1 + k + 1]!;
        const x2r = x[o2 + k]!;
        const x2i = x[o2 + k + 1]!;
        const x3r = x[o3 + k]!;
        const x3i = x[o3 + k + 1]!;
        const s02r = x0r + x2r;
        const s02i = x0i + x2i;
        const d02r = x0r - x2r;
        const d02i = x0i - x2i;
        const s13r = x1r + x3r;
        const s13i = x1i + x3i;
        const e13r = x1i - x3i;
        const e13i = x3r - x1r;
        x[o0 + k] = s02r + s13r;
        x[o0 + k + 1] = s02i + s13i;
        const yr = s02r - s13r;
        const yi = s02i - s13i;
        x[o1 + k] = yr * w2r - yi * w2i;
        x[o1 + k + 1] = yr * w2i + yi * w2r;
        const ur = d02r + e13r;
        const ui = d02i + e13i;
        x[oc + k] = ur * w1r - ui * w1i;
        x[oc + k + 1] = ur * w1i + ui * w1r;
        const vr = d02r - e13r;
        const vi = d02i - e13i;
        x[od + k] = vr * w3r - vi * w3i;
        x[od + k + 1] = vr * w3i + vi * w3r;
      }
    }
  }
}

/** Last radix-4 stage of decimation in frequency (m = 1, no twiddles); rows qc, qd written. */
function stripDif4Last(x: Float64Array, off: number, rs: number, len: number, n: number, qc: number, qd: number): void {
  for (let r = 0; r < n; r += 4) {
    const o0 = off + r * rs;
    const o1 = o0 + rs;
    const o2 = o1 + rs;
    const o3 = o2 + rs;
    const oc = o0 + qc * rs;
    const od = o0 + qd * rs;
    for (let k = 0; k < len; k += 2) {
      const x0r = x[o0 + k]!;
      const x0i = x[o0 + k + 1]!;
      const x1r = x[o1 + k]!;
      const x1i = x[o1 + k + 1]!;
      const x2r = x[o2 + k]!;
      const x2i = x[o2 + k + 1]!;
      const x3r = x[o3 + k]!;
      const x3i = x[o3 + k + 1]!;
      const s02r = x0r + x2r;
      const s02i = x0i + x2i;
      const d02r = x0r - x2r;
      const d02i = x0i - x2i;
      const s13r = x1r + x3r;
      const s13i = x1i + x3i;
      const e13r = x1i - x3i;
      const e13i = x3r - x1r;
      x[o0 + k] = s02r + s13r;
      x[o0 + k + 1] = s02i + s13i;
      x[o1 + k] = s02r - s13r;
      x[o1 + k + 1] = s02i - s13i;
      x[oc + k] = d02r + e13r;
      x[oc + k + 1] = d02i + e13i;
      x[od + k] = d02r - e13r;
      x[od + k + 1] = d02i - e13i;
    }
  }
}
