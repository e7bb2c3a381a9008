/**
 * Spot detection in a frame: background estimation, an automatic threshold, connected
 * components in one pass over the rows (runs joined by union–find), and sub-pixel centres
 * by four estimators. Pixel coordinates follow the library's image convention: pixel
 * centres at integers, origin at the centre of the top-left pixel, `x` to the right and
 * `y` down.
 *
 * @module
 */
import { checkFloat64Array, checkImage, checkInteger, checkNonNegative, checkOneOf, checkOptions, checkPositive, rangeError, Status, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';

/** The centroid estimators. */
export type CentroidMethod = 'thresholded' | 'windowed' | 'iterative' | 'gaussian';

/** Options of {@link detectSpots}. */
export interface DetectSpotsOptions {
  /**
   * Background level, counts per pixel, or `'auto'` for a sigma-clipped median of a
   * sparse sample of the frame. @defaultValue `'auto'`
   */
  background?: number | 'auto';
  /** Standard deviation of the background, counts; estimated with the background when absent. */
  noise?: number;
  /**
   * Detection level above the background, counts. When absent it is `thresholdSigma ×
   * noise`, or 5 % of the frame's peak above background for a noise-free frame.
   */
  threshold?: number;
  /** Multiple of the noise for the automatic threshold. @defaultValue 5 */
  thresholdSigma?: number;
  /** Smallest component kept, pixels. @defaultValue 3 */
  minPixels?: number;
  /** Largest component kept, pixels (larger ones are glints or merged spots). @defaultValue 100000 */
  maxPixels?: number;
  /** Pixel connectivity of a component. @defaultValue 8 */
  connectivity?: 4 | 8;
  /**
   * Centroid estimator: `'thresholded'` (centre of gravity of the component's pixels,
   * weights = value − background), `'windowed'` (centre of gravity over a square window
   * around the component), `'iterative'` (iteratively weighted centre of gravity with a
   * Gaussian weight), `'gaussian'` (weighted least-squares fit of a pixel-integrated
   * circular 2-D Gaussian with background). @defaultValue `'iterative'`
   */
  method?: CentroidMethod;
  /** Half-width of the square window of the windowed estimators, pixels; by default `ceil(3 × size)` of each spot, at least 2. */
  window?: number;
  /** Width of the Gaussian weight of `'iterative'`, pixels; by default each spot's size. */
  weightSigma?: number;
  /** Value at or above which a pixel is saturated, counts. @defaultValue Infinity */
  saturation?: number;
  /** Photo-electrons per count, for the noise model of the uncertainties and the SNR. @defaultValue 1 */
  gain?: number;
  /** Channel to read from a multi-channel image. @defaultValue 0 */
  channel?: number;
  /** Largest number of spots reported. @defaultValue 1000000 */
  maxSpots?: number;
  /**
   * Look only inside these square windows: pixel centre `(x[k], y[k])` ± `halfWidth`
   * pixels each (for example around the spots of the previous frame), instead of the
   * whole frame. Pixels outside every window are not read (nor checked for finiteness).
   * A component that reaches a window's edge inside the frame is refused (counted in
   * `rejected`), since part of it may lie outside; make the windows wider than the spots
   * plus their expected motion. @defaultValue the whole frame
   */
  windows?: SpotWindows;
}

/** Square search windows for {@link DetectSpotsOptions.windows}. */
export interface SpotWindows {
  /** Window centres x, pixels. */
  readonly x: Float64Array;
  /** Window centres y, pixels (same length as `x`). */
  readonly y: Float64Array;
  /** Half-width of every window, pixels (> 0). */
  readonly halfWidth: number;
}

/** The pixel spans to scan, per row: `[lo[t], hi[t])` for `t` in `rowStart[v] … rowStart[v + 1]`, sorted, disjoint. */
interface Spans {
  rowStart: Int32Array;
  lo: Int32Array;
  hi: Int32Array;
}

function spansOf(w: SpotWindows, width: number, height: number): Spans {
  const m = w.x.length;
  const hw = w.halfWidth;
  const rowStart = new Int32Array(height + 1);
  const box = new Int32Array(4 * m);
  let nb = 0;
  for (let k = 0; k < m; k++) {
    const x = w.x[k]!, y = w.y[k]!;
    const x0 = Math.max(0, Math.ceil(x - hw)), x1 = Math.min(width - 1, Math.floor(x + hw));
    const y0 = Math.max(0, Math.ceil(y - hw)), y1 = Math.min(height - 1, Math.floor(y + hw));
    if (!(x0 <= x1 && y0 <= y1)) continue;
    box[4 * nb] = x0;
    box[4 * nb + 1] = x1 + 1;
    box[4 * nb + 2] = y0;
    box[4 * nb + 3] = y1 + 1;
    nb++;
    for (let v = y0; v <= y1; v++) rowStart[v + 1]!++;
  }
  for (let v = 0; v < height; v++) rowStart[v + 1]! += rowStart[v]!;
  const total = rowStart[height]!;
  const lo = new Int32Array(total), hi = new Int32Array(total);
  const fill = rowStart.slice(0, height);
  for (let b = 0; b < nb; b++) {
    for (let v = box[4 * b + 2]!; v < box[4 * b + 3]!; v++) {
      const t = fill[v]!++;
      lo[t] = box[4 * b]!;
      hi[t] = box[4 * b + 1]!;
    }
  }
  // Sort each row's spans by start (insertion sort: a few a row) and merge overlaps in place.
  const outStart = new Int32Array(height + 1);
  let o = 0;
  for (let v = 0; v < height; v++) {
    const a = rowStart[v]!, e = rowStart[v + 1]!;
    for (let t = a + 1; t < e; t++) {
      const l = lo[t]!, h = hi[t]!;
      let q = t - 1;
      while (q >= a && lo[q]! > l) {
        lo[q + 1] = lo[q]!;
        hi[q + 1] = hi[q]!;
        q--;
      }
      lo[q + 1] = l;
      hi[q + 1] = h;
    }
    outStart[v] = o;
    for (let t = a; t < e; t++) {
      if (o > outStart[v]! && lo[t]! <= hi[o - 1]!) hi[o - 1] = Math.max(hi[o - 1]!, hi[t]!);
      else {
        lo[o] = lo[t]!;
        hi[o] = hi[t]!;
        o++;
      }
    }
  }
  outStart[height] = o;
  return { rowStart: outStart, lo, hi };
}

/** Whether row `v`'s spans hold `[s, e)` entirely (rows outside the frame count as held). */
function spanned(sp: Spans, height: number, v: number, s: number, e: number): boolean {
  if (v < 0 || v >= height) return true;
  for (let t = sp.rowStart[v]!, end = sp.rowStart[v + 1]!; t < end; t++) {
    if (sp.lo[t]! <= s) {
      if (sp.hi[t]! >= e) return true;
    } else return false;
  }
  return false;
}

/** Spots found in a frame, one entry per spot in each array. */
export interface SpotList {
  /** Number of spots. */
  readonly count: number;
  /** Centre x, pixels. */
  readonly x: Float64Array;
  /** Centre y, pixels. */
  readonly y: Float64Array;
  /** 1-σ uncertainty of `x` from the noise model, pixels. */
  readonly sigmaX: Float64Array;
  /** 1-σ uncertainty of `y` from the noise model, pixels. */
  readonly sigmaY: Float64Array;
  /** Integrated signal above the background over the component, counts. */
  readonly flux: Float64Array;
  /** Highest pixel value above the background, counts. */
  readonly peak: Float64Array;
  /** Gaussian-equivalent width σ, pixels (second moments; the fitted σ for `'gaussian'`). */
  readonly size: Float64Array;
  /** Signal-to-noise ratio of the flux. */
  readonly snr: Float64Array;
  /** Pixels in the component. */
  readonly pixels: Int32Array;
  /** 1 where the spot holds a saturated pixel. */
  readonly saturated: Uint8Array;
  /**
   * Per-spot status: `Status.ok`, `Status.saturated`, `Status.outside` (touches the frame
   * border, centre biased) or `Status.notConverged` (an iterative estimator stopped at
   * its cap; the thresholded centre is kept).
   */
  readonly status: Uint8Array;
  /** Background level used, counts. */
  readonly background: number;
  /** Background noise used, counts. */
  readonly noise: number;
  /** Detection level above the background used, counts. */
  readonly threshold: number;
  /** Components refused: too small, too large, or beyond `maxSpots`. */
  readonly rejected: number;
  /** Plain-language notes about the frame (empty, saturated, no spots). */
  readonly warnings: readonly string[];
}

/** Background level and noise of a frame. */
export interface BackgroundEstimate {
  /** Background level, counts. */
  readonly level: number;
  /** Standard deviation of the background, counts (from the median absolute deviation). */
  readonly noise: number;
}

/**
 * Estimate a frame's background level and noise: median and scaled median absolute
 * deviation of a sparse sample (about 16 000 pixels), sigma-clipped at 3σ above up to five times, so
 * that spots covering part of the frame do not lift it.
 *
 * @param frame - The frame.
 * @param channel - Channel to read. @defaultValue 0
 * @returns Level and noise, counts.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a malformed image.
 * @see Hampel, F. R. (1974), "The influence curve and its role in robust estimation",
 *   JASA 69, 383 (the MAD scaled by 1.4826 for a normal distribution).
 * @example
 * ```ts
 * const { level, noise } = estimateBackground(frame);
 * ```
 */
export function estimateBackground(frame: Image, channel = 0): BackgroundEstimate {
  const fn = 'estimateBackground';
  checkImage(fn, 'frame', frame, true);
  checkInteger(fn, 'channel', channel, 0, frame.channels - 1);
  return backgroundOf(frame, channel);
}

function backgroundOf(frame: Image, channel: number): BackgroundEstimate {
  const { width, height, channels, data } = frame;
  const n = width * height;
  const step = Math.max(1, Math.floor(Math.sqrt(n / 16384)));
  const sx = Math.ceil(width / step), sy = Math.ceil(height / step);
  const s = new Float32Array(sx * sy);
  let m = 0;
  for (let v = Math.floor(step / 2) % height; v < height; v += step) {
    const row = v * width;
    for (let u = Math.floor(step / 2) % width; u < width; u += step) {
      const val = data[(row + u) * channels + channel]!;
      if (Number.isFinite(val)) s[m++] = val;
    }
  }
  if (m === 0) return { level: 0, noise: 0 };
  let sample = sortFinite(s.subarray(0, m));
  let level = 0, noise = 0;
  for (let pass = 0; pass < 6; pass++) {
    level = median(sample);
    noise = 1.4826 * medianAbsDeviation(sample, level);
    if (pass === 5) break;
    const cut = level + 3 * noise;
    let hi = sample.length;
    while (hi > 1 && sample[hi - 1]! > cut) hi--;
    if (hi === sample.length) break;
    sample = sample.subarray(0, hi);
  }
  return { level, noise };
}

/**
 * Sort finite single-precision values ascending in place (the order of
 * `Float32Array.prototype.sort`, −0 before +0): least-significant-digit radix sort of the
 * bit patterns mapped to unsigned keys that order as the values do, three passes of 11,
 * 11 and 10 bits. O(n), several times faster than the comparison sort on large samples.
 *
 * @see Knuth, D. E. (1998), The Art of Computer Programming, vol. 3, §5.2.5 (radix sorting).
 */
function sortFinite(a: Float32Array): Float32Array {
  const n = a.length;
  if (n < 256) return a.sort();
  const bits = new Uint32Array(a.buffer, a.byteOffset, n);
  let src = new Uint32Array(n), dst = new Uint32Array(n);
  for (let k = 0; k < n; k++) {
    const u = bits[k]!;
    src[k] = u & 0x80000000 ? ~u >>> 0 : (u | 0x80000000) >>> 0;
  }
  const count = new Int32Array(2048);
  for (let shift = 0; shift < 32; shift += 11) {
    count.fill(0);
    for (let k = 0; k < n; k++) count[(src[k]! >>> shift) & 2047]!++;
    let sum = 0;
    for (let d = 0; d < 2048; d++) {
      const c = count[d]!;
      count[d] = sum;
      sum += c;
    }
    for (let k = 0; k < n; k++) {
      const key = src[k]!;
      dst[count[(key >>> shift) & 2047]!++] = key;
    }
    const t = src;
    src = dst;
    dst = t;
  }
  for (let k = 0; k < n; k++) {
    const key = src[k]!;
    bits[k] = key & 0x80000000 ? (key & 0x7fffffff) >>> 0 : ~key >>> 0;
  }
  return a;
}

/**
 * Median of `|x − level|` over a sorted sample, as a sort of the deviations (rounded to
 * single precision like the sample) would give it, in one merge of the two sorted runs on
 * either side of `level`: O(n) instead of a second sort.
 */
function medianAbsDeviation(sorted: Float32Array, level: number): number {
  const n = sorted.length;
  let right = 0;
  while (right < n && sorted[right]! < level) right++;
  let left = right - 1;
  const hi = n >> 1; // the median needs ranks hi − 1 (even n) and hi
  let prev = 0, cur = 0;
  for (let rank = 0; rank <= hi; rank++) {
    const dl = left >= 0 ? Math.fround(level - sorted[left]!) : Infinity;
    const dr = right < n ? Math.fround(sorted[right]! - level) : Infinity;
    prev = cur;
    if (dl <= dr) {
      cur = dl;
      left--;
    } else {
      cur = dr;
      right++;
    }
  }
  return n % 2 ? cur : 0.5 * (prev + cur);
}

function median(sorted: Float32Array): number {
  const n = sorted.length;
  return n % 2 ? sorted[(n - 1) >> 1]! : 0.5 * (sorted[n / 2 - 1]! + sorted[n / 2]!);
}

// Normal CDF via erf (Abramowitz & Stegun 7.1.26 is too coarse for fitting; use a
// rational Chebyshev form accurate to ~1.2e-7: Numerical Recipes erfc).
function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}
function phi(x: number): number {
  return 0.5 * erfc(-x / Math.SQRT2);
}

class RunStore {
  row: Int32Array = new Int32Array(1024);
  start: Int32Array = new Int32Array(1024);
  end: Int32Array = new Int32Array(1024);
  parent: Int32Array = new Int32Array(1024);
  n = 0;
  push(r: number, s: number, e: number): number {
    if (this.n === this.row.length) {
      const grow = (a: Int32Array): Int32Array => {
        const b = new Int32Array(a.length * 2);
        b.set(a);
        return b;
      };
      this.row = grow(this.row);
      this.start = grow(this.start);
      this.end = grow(this.end);
      this.parent = grow(this.parent);
    }
    const k = this.n++;
    this.row[k] = r;
    this.start[k] = s;
    this.end[k] = e;
    this.parent[k] = k;
    return k;
  }
}

function findRoot(parent: Int32Array, a: number): number {
  let r = a;
  while (parent[r] !== r) r = parent[r]!;
  while (parent[a] !== r) {
    const next = parent[a]!;
    parent[a] = r;
    a = next;
  }
  return r;
}

/**
 * Find the runs of pixels above `level` row by row and join each to the overlapping runs
 * of the row above (union–find). Returns the sum of the skipped pixels, which is
 * non-finite exactly when one of them is NaN or infinite.
 */
function labelRuns(
  data: Float32Array,
  width: number,
  height: number,
  channels: number,
  channel: number,
  level: number,
  diag: number,
  runs: RunStore,
  spans: Spans | null,
  clipped: number[],
): number {
  let prevStart = 0, prevEnd = 0; // run index range of the previous row
  let finiteProbe = 0;
  for (let v = 0; v < height; v++) {
    const curStart = runs.n;
    const base = v * width;
    let p = prevStart;
    const ta = spans ? spans.rowStart[v]! : 0, tb = spans ? spans.rowStart[v + 1]! : 1;
    for (let t = ta; t < tb; t++) {
      const lo = spans ? spans.lo[t]! : 0, hi = spans ? spans.hi[t]! : width;
      let u = lo;
      while (u < hi) {
        // The skipped pixels are summed so that a non-finite one shows (NaN or ±Infinity
        // poison the sum) without a separate pass over the frame. Single-channel frames
        // skip four pixels at a time into four sums (the sums' additions do not wait on
        // each other).
        if (channels === 1) {
          let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
          while (u + 4 <= hi) {
            const a = data[base + u]!, b = data[base + u + 1]!, c = data[base + u + 2]!, d = data[base + u + 3]!;
            if (a > level || b > level || c > level || d > level) break;
            s0 += a;
            s1 += b;
            s2 += c;
            s3 += d;
            u += 4;
          }
          finiteProbe += s0 + s1 + s2 + s3;
        }
        while (u < hi) {
          const x = data[(base + u) * channels + channel]!;
          if (x > level) break;
          finiteProbe += x;
          u++;
        }
        if (u >= hi) break;
        const s = u;
        while (u < hi && data[(base + u) * channels + channel]! > level) u++;
        const k = runs.push(v, s, u);
        if (spans) {
          // A run at a window's edge inside the frame: its component may be cut.
          const a0 = Math.max(0, s - diag), a1 = Math.min(width, u + diag);
          if ((s === lo && lo > 0) || (u === hi && hi < width) || !spanned(spans, height, v - 1, a0, a1) || !spanned(spans, height, v + 1, a0, a1)) clipped.push(k);
        }
        // Join to overlapping runs of the previous row: [s - diag, u + diag).
        const par = runs.parent, rs = runs.start, re = runs.end;
        while (p < prevEnd && re[p]! + diag <= s) p++;
        let q = p;
        while (q < prevEnd && rs[q]! < u + diag) {
          const a = findRoot(par, q);
          const b = findRoot(par, k);
          if (a !== b) {
            if (a < b) par[b] = a;
            else par[a] = b;
          }
          q++;
        }
      }
    }
    prevStart = curStart;
    prevEnd = runs.n;
  }
  return finiteProbe;
}

/**
 * Find the spots of a frame and measure each: centre (four estimators), its
 * uncertainty, flux, peak, size, signal-to-noise ratio and saturation.
 *
 * Components are found in one pass over the rows: each row's runs of pixels above
 * `background + threshold` are joined to the overlapping runs of the row above by
 * union–find, so memory grows with the number of runs, not the frame.
 *
 * @param frame - The frame, linear counts.
 * @param options - Background, threshold, estimator and noise model.
 * @returns The spots; an empty or saturated frame, or one without spots, gives `count`
 *   0 and a warning.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for a malformed image or
 *   options out of range.
 * @see Rosenfeld, A. & Pfaltz, J. L. (1966), "Sequential operations in digital picture
 *   processing", JACM 13(4), 471 (two-pass labelling); Tarjan, R. E. (1975), "Efficiency of
 *   a good but not linear set union algorithm", JACM 22(2), 215 (union–find);
 *   Baker, K. L. & Moallem, M. M. (2007), "Iteratively weighted centroiding for
 *   Shack–Hartmann wave-front sensors", Optics Express 15(8), 5147;
 *   Thomas, S. et al. (2006), "Comparison of centroid computation algorithms in a
 *   Shack–Hartmann sensor", MNRAS 371, 323; Mortensen, K. I. et al. (2010), "Optimized
 *   localization analysis for single-molecule tracking and super-resolution
 *   microscopy", Nature Methods 7, 377 (pixel-integrated Gaussian, weighted fit).
 * @example
 * ```ts
 * const spots = detectSpots(frame, { method: 'gaussian' });
 * spots.x[0], spots.y[0];
 * ```
 */
export function detectSpots(frame: Image, options?: DetectSpotsOptions): SpotList {
  const fn = 'detectSpots';
  // Finiteness is checked during the labelling pass (see below), not by a separate scan.
  checkImage(fn, 'frame', frame, true);
  const o = checkOptions(fn, options);
  const channel = o.channel === undefined ? 0 : checkInteger(fn, 'options.channel', o.channel, 0, frame.channels - 1);
  const method = o.method === undefined ? 'iterative' : checkOneOf(fn, 'options.method', o.method, ['thresholded', 'windowed', 'iterative', 'gaussian'] as const);
  const connectivity = o.connectivity === undefined ? 8 : o.connectivity;
  if (connectivity !== 4 && connectivity !== 8) rangeError(fn, 'options.connectivity', connectivity, '4 or 8');
  const minPixels = o.minPixels === undefined ? 3 : checkInteger(fn, 'options.minPixels', o.minPixels, 1);
  const maxPixels = o.maxPixels === undefined ? 100000 : checkInteger(fn, 'options.maxPixels', o.maxPixels, minPixels);
  const maxSpots = o.maxSpots === undefined ? 1000000 : checkInteger(fn, 'options.maxSpots', o.maxSpots, 0);
  const saturation = o.saturation === undefined ? Infinity : o.saturation;
  if (typeof saturation !== 'number' || !(saturation > 0)) rangeError(fn, 'options.saturation', saturation, 'a number > 0');
  const gain = o.gain === undefined ? 1 : checkPositive(fn, 'options.gain', o.gain);
  const thresholdSigma = o.thresholdSigma === undefined ? 5 : checkPositive(fn, 'options.thresholdSigma', o.thresholdSigma);
  if (o.window !== undefined) checkPositive(fn, 'options.window', o.window);
  if (o.weightSigma !== undefined) checkPositive(fn, 'options.weightSigma', o.weightSigma);
  let windows: SpotWindows | null = null;
  if (o.windows !== undefined) {
    const w = o.windows;
    if (w === null || typeof w !== 'object') typeError(fn, 'options.windows', w, 'an object { x, y, halfWidth }');
    const wx = checkFloat64Array(fn, 'options.windows.x', w.x);
    checkFloat64Array(fn, 'options.windows.y', w.y, 1, wx.length);
    checkPositive(fn, 'options.windows.halfWidth', w.halfWidth);
    for (let k = 0; k < wx.length; k++) {
      if (!Number.isFinite(wx[k]!) || !Number.isFinite(w.y[k]!)) rangeError(fn, `options.windows[${k}]`, [wx[k], w.y[k]], 'a finite window centre');
    }
    windows = w;
  }

  const warnings: string[] = [];
  const { width, height, channels, data } = frame;
  let bg: number;
  let noise: number;
  if (o.background === undefined || o.background === 'auto') {
    const est = backgroundOf(frame, channel);
    bg = est.level;
    noise = o.noise === undefined ? est.noise : checkNonNegative(fn, 'options.noise', o.noise);
  } else {
    if (typeof o.background !== 'number' || !Number.isFinite(o.background)) {
      rangeError(fn, 'options.background', o.background, "a finite number of counts or 'auto'");
    }
    bg = o.background;
    noise = o.noise === undefined ? backgroundOf(frame, channel).noise : checkNonNegative(fn, 'options.noise', o.noise);
  }
  // Extremes and saturated count of the frame: only scanned when needed (noise-free
  // fallback threshold, or a frame that yields nothing and deserves an explanation).
  const npx = width * height;
  let scanned = false;
  let vmax = -Infinity, vmin = Infinity, nsat = 0;
  const scan = (): void => {
    if (scanned) return;
    scanned = true;
    for (let k = 0, idx = channel; k < npx; k++, idx += channels) {
      const v = data[idx]!;
      if (v > vmax) vmax = v;
      if (v < vmin) vmin = v;
      if (v >= saturation) nsat++;
    }
  };
  let threshold: number;
  if (o.threshold !== undefined) threshold = checkNonNegative(fn, 'options.threshold', o.threshold);
  else if (noise > 0) threshold = thresholdSigma * noise;
  else {
    scan();
    threshold = 0.05 * Math.max(0, vmax - bg);
  }
  const empty = (): SpotList => ({
    count: 0,
    x: new Float64Array(0),
    y: new Float64Array(0),
    sigmaX: new Float64Array(0),
    sigmaY: new Float64Array(0),
    flux: new Float64Array(0),
    peak: new Float64Array(0),
    size: new Float64Array(0),
    snr: new Float64Array(0),
    pixels: new Int32Array(0),
    saturated: new Uint8Array(0),
    status: new Uint8Array(0),
    background: bg,
    noise,
    threshold,
    rejected: 0,
    warnings,
  });
  const level = bg + threshold;
  const explain = (): void => {
    scan();
    if (nsat > 0.5 * npx) {
      warnings.push(`the frame is saturated: ${((100 * nsat) / npx).toFixed(1)} % of its pixels are at or above ${saturation}; shorten the exposure or lower the gain`);
    }
    if (vmax === vmin) warnings.push(`the frame is uniform (every pixel is ${vmax}): no spots`);
    else if (!(vmax > level)) {
      warnings.push(`no pixel rises above the detection level ${level.toPrecision(4)} (background ${bg.toPrecision(4)} + threshold ${threshold.toPrecision(4)}): no spots`);
    }
  };
  if (scanned && (vmax === vmin || !(vmax > level))) {
    checkImage(fn, 'frame', frame, false); // the labelling pass that checks finiteness is skipped
    explain();
    return empty();
  }

  // One pass over the rows: runs above the level, joined to the previous row's runs.
  const runs = new RunStore();
  const clipped: number[] = [];
  const spans = windows ? spansOf(windows, width, height) : null;
  const finiteProbe = labelRuns(data, width, height, channels, channel, level, connectivity === 8 ? 1 : 0, runs, spans, clipped);

  // Accumulate per component over its runs.
  let runProbe = 0;
  const nr = runs.n;
  const par = runs.parent, rrow = runs.row, rs = runs.start, re = runs.end;
  const compOf = new Int32Array(nr);
  let nc = 0;
  for (let k = 0; k < nr; k++) {
    const r = findRoot(par, k);
    if (r === k) compOf[k] = nc++;
    else compOf[k] = compOf[r]!;
  }
  const sw = new Float64Array(nc), swx = new Float64Array(nc), swy = new Float64Array(nc);
  const swxx = new Float64Array(nc), swyy = new Float64Array(nc), svar = new Float64Array(nc);
  const cpk = new Float64Array(nc), cnp = new Int32Array(nc), csat = new Uint8Array(nc), cedge = new Uint8Array(nc);
  const cclip = new Uint8Array(nc);
  for (const k of clipped) cclip[compOf[k]!] = 1;
  for (let c = 0; c < nc; c++) cpk[c] = -Infinity;
  for (let k = 0; k < nr; k++) {
    const c = compOf[k]!;
    const v = rrow[k]!;
    const s = rs[k]!, e = re[k]!;
    const base = v * width;
    let a = 0, ax = 0, axx = 0;
    for (let u = s; u < e; u++) {
      const val = data[(base + u) * channels + channel]!;
      const w = val - bg;
      a += w;
      ax += w * u;
      axx += w * u * u;
      if (w > cpk[c]!) cpk[c] = w;
      if (val >= saturation) csat[c] = 1;
    }
    runProbe += a;
    sw[c]! += a;
    swx[c]! += ax;
    swxx[c]! += axx;
    swy[c]! += a * v;
    swyy[c]! += a * v * v;
    cnp[c]! += e - s;
    if (v === 0 || v === height - 1 || s === 0 || e === width) cedge[c] = 1;
  }
  if (!Number.isFinite(finiteProbe) || !Number.isFinite(runProbe)) {
    // Find the first offending pixel for the message.
    checkImage(fn, 'frame', frame, false);
  }
  // Select components.
  const keep: number[] = [];
  let rejected = 0;
  for (let c = 0; c < nc; c++) {
    if (cnp[c]! < minPixels || cnp[c]! > maxPixels || !(sw[c]! > 0) || cclip[c] || keep.length >= maxSpots) {
      rejected++;
      continue;
    }
    keep.push(c);
  }
  const n = keep.length;
  if (n === 0) {
    if (!Number.isFinite(finiteProbe)) checkImage(fn, 'frame', frame, false);
    explain();
    if (nc > 0) warnings.push(`no component passed the size limits (${rejected} refused): no spots`);
    const e = empty();
    return { ...e, rejected };
  }
  const X = new Float64Array(n), Y = new Float64Array(n), SX = new Float64Array(n), SY = new Float64Array(n);
  const F = new Float64Array(n), PK = new Float64Array(n), SZ = new Float64Array(n), SNR = new Float64Array(n);
  const NP = new Int32Array(n), SAT = new Uint8Array(n), ST = new Uint8Array(n);
  const noise2 = noise * noise;
  const ws = new WindowScratch();
  for (let t = 0; t < n; t++) {
    const c = keep[t]!;
    const w = sw[c]!;
    const cx = swx[c]! / w, cy = swy[c]! / w;
    const mxx = Math.max(0, swxx[c]! / w - cx * cx), myy = Math.max(0, swyy[c]! / w - cy * cy);
    let size = Math.sqrt(0.5 * (mxx + myy));
    if (!(size > 0.3)) size = 0.3;
    X[t] = cx;
    Y[t] = cy;
    F[t] = w;
    PK[t] = cpk[c]!;
    NP[t] = cnp[c]!;
    SAT[t] = csat[c]!;
    SNR[t] = (w * gain) / Math.sqrt(w * gain + cnp[c]! * noise2 * gain * gain);
    SZ[t] = size;
    ST[t] = csat[c] ? Status.saturated : cedge[c] ? Status.outside : Status.ok;
    svar[c] = 0;
  }
  // Uncertainty of the thresholded centre: second pass over the runs (cheap).
  if (method === 'thresholded') {
    const slot = new Int32Array(nc).fill(-1);
    for (let t = 0; t < n; t++) slot[keep[t]!] = t;
    const vx = new Float64Array(n), vy = new Float64Array(n);
    for (let k = 0; k < nr; k++) {
      const t = slot[compOf[k]!]!;
      if (t < 0) continue;
      const v = rrow[k]!;
      const base = v * width;
      const cx = X[t]!, cy = Y[t]!;
      const dy2 = (v - cy) * (v - cy);
      for (let u = rs[k]!; u < re[k]!; u++) {
        const val = data[(base + u) * channels + channel]! - bg;
        const var_ = (val > 0 ? val / gain : 0) + noise2;
        vx[t]! += (u - cx) * (u - cx) * var_;
        vy[t]! += dy2 * var_;
      }
    }
    for (let t = 0; t < n; t++) {
      SX[t] = Math.sqrt(vx[t]!) / F[t]!;
      SY[t] = Math.sqrt(vy[t]!) / F[t]!;
    }
  } else {
    for (let t = 0; t < n; t++) {
      const half = o.window !== undefined ? Math.max(1, Math.round(o.window)) : Math.max(2, Math.ceil(3 * SZ[t]!));
      const r =
        method === 'windowed'
          ? windowedCog(frame, channel, X[t]!, Y[t]!, half, bg, noise2, gain, ws)
          : method === 'iterative'
            ? iterativeCog(frame, channel, X[t]!, Y[t]!, half, o.weightSigma ?? SZ[t]!, bg, noise2, gain, ws)
            : gaussianFit(frame, channel, X[t]!, Y[t]!, half, SZ[t]!, F[t]!, bg, noise2, gain, saturation, ws);
      if (r.ok) {
        X[t] = r.x;
        Y[t] = r.y;
        SX[t] = r.sx;
        SY[t] = r.sy;
        if (method === 'gaussian') SZ[t] = r.size;
      } else if (ST[t] === Status.ok) ST[t] = Status.notConverged;
    }
  }
  const nSatSpots = SAT.reduce((a, b) => a + b, 0);
  if (nSatSpots > 0.5 * n) explain();
  if (nSatSpots > 0) warnings.push(`${nSatSpots} spot(s) hold saturated pixels; their centres are less certain`);
  return {
    count: n,
    x: X,
    y: Y,
    sigmaX: SX,
    sigmaY: SY,
    flux: F,
    peak: PK,
    size: SZ,
    snr: SNR,
    pixels: NP,
    saturated: SAT,
    status: ST,
    background: bg,
    noise,
    threshold,
    rejected,
    warnings,
  };
}

interface CentreResult {
  ok: boolean;
  x: number;
  y: number;
  sx: number;
  sy: number;
  size: number;
}

class WindowScratch {
  ex = new Float64Array(64);
  ey = new Float64Array(64);
  dex = new Float64Array(64);
  dey = new Float64Array(64);
  dsx = new Float64Array(64);
  dsy = new Float64Array(64);
  ensure(n: number): void {
    if (this.ex.length < n) {
      this.ex = new Float64Array(n);
      this.ey = new Float64Array(n);
      this.dex = new Float64Array(n);
      this.dey = new Float64Array(n);
      this.dsx = new Float64Array(n);
      this.dsy = new Float64Array(n);
    }
  }
}

function windowedCog(frame: Image, ch: number, x0: number, y0: number, half: number, bg: number, noise2: number, gain: number, _ws: WindowScratch): CentreResult {
  const { width, height, channels, data } = frame;
  const u0 = Math.max(0, Math.round(x0) - half), u1 = Math.min(width - 1, Math.round(x0) + half);
  const v0 = Math.max(0, Math.round(y0) - half), v1 = Math.min(height - 1, Math.round(y0) + half);
  let s = 0, sx = 0, sy = 0;
  for (let v = v0; v <= v1; v++) {
    for (let u = u0; u <= u1; u++) {
      const w = data[(v * width + u) * channels + ch]! - bg;
      s += w;
      sx += w * u;
      sy += w * v;
    }
  }
  if (!(s > 0)) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
  const cx = sx / s, cy = sy / s;
  let vx = 0, vy = 0;
  for (let v = v0; v <= v1; v++) {
    for (let u = u0; u <= u1; u++) {
      const w = data[(v * width + u) * channels + ch]! - bg;
      const var_ = (w > 0 ? w / gain : 0) + noise2;
      vx += (u - cx) * (u - cx) * var_;
      vy += (v - cy) * (v - cy) * var_;
    }
  }
  return { ok: true, x: cx, y: cy, sx: Math.sqrt(vx) / s, sy: Math.sqrt(vy) / s, size: 0 };
}

function iterativeCog(
  frame: Image,
  ch: number,
  x0: number,
  y0: number,
  half: number,
  sigmaW: number,
  bg: number,
  noise2: number,
  gain: number,
  ws: WindowScratch,
): CentreResult {
  const { width, height, channels, data } = frame;
  let cx = x0, cy = y0;
  const inv = 1 / (2 * sigmaW * sigmaW);
  const iw = 2 * inv;
  ws.ensure(2 * half + 3);
  const gx = ws.ex, gy = ws.ey;
  let ok = false;
  let u0 = 0, v0 = 0, u1 = 0, v1 = 0;
  for (let it = 0; it < 30; it++) {
    u0 = Math.max(0, Math.round(cx) - half);
    u1 = Math.min(width - 1, Math.round(cx) + half);
    v0 = Math.max(0, Math.round(cy) - half);
    v1 = Math.min(height - 1, Math.round(cy) + half);
    for (let u = u0; u <= u1; u++) gx[u - u0] = Math.exp(-(u - cx) * (u - cx) * inv);
    for (let v = v0; v <= v1; v++) gy[v - v0] = Math.exp(-(v - cy) * (v - cy) * inv);
    // Moments about the current centre: F = (Σ w du, Σ w dv) vanishes at the fixed point.
    let s = 0, sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0;
    for (let v = v0; v <= v1; v++) {
      const wy = gy[v - v0]!;
      const row = v * width;
      const dv = v - cy;
      for (let u = u0; u <= u1; u++) {
        const w = (data[(row + u) * channels + ch]! - bg) * gx[u - u0]! * wy;
        const du = u - cx;
        const wu = w * du;
        s += w;
        sx += wu;
        sy += w * dv;
        sxx += wu * du;
        sxy += wu * dv;
        syy += w * dv * dv;
      }
    }
    if (!(s > 0)) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
    // Newton step on F (Jacobian from the Gaussian weight's derivative), which converges
    // in a few iterations where the plain re-weighting step (F / Σ w) shrinks the error
    // only by about half each time; the plain step is kept where the Jacobian is not
    // negative definite or the Newton step is far longer.
    let stepX = sx / s, stepY = sy / s;
    const j00 = sxx * iw - s, j11 = syy * iw - s, j01 = sxy * iw;
    const det = j00 * j11 - j01 * j01;
    if (j00 < 0 && det > 0) {
      const nxs = -(j11 * sx - j01 * sy) / det, nys = -(j00 * sy - j01 * sx) / det;
      if (Math.hypot(nxs, nys) <= Math.max(1, 3 * Math.hypot(stepX, stepY))) {
        stepX = nxs;
        stepY = nys;
      }
    }
    const nx = cx + stepX, ny = cy + stepY;
    if (!(Math.abs(nx - x0) <= half && Math.abs(ny - y0) <= half)) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
    const shift = Math.hypot(nx - cx, ny - cy);
    cx = nx;
    cy = ny;
    if (shift < 1e-5) {
      ok = true;
      break;
    }
  }
  if (!ok) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
  // Uncertainty at the fixed point by the delta method: the estimate solves
  // Σ g (u − x̂) I = 0 with g centred on x̂, so dx̂/dI_i = g_i (u_i − x̂) / Σ g I (1 − (u − x̂)²/σw²).
  let vx = 0, vy = 0, dx = 0, dy = 0;
  for (let u = u0; u <= u1; u++) gx[u - u0] = Math.exp(-(u - cx) * (u - cx) * inv);
  for (let v = v0; v <= v1; v++) gy[v - v0] = Math.exp(-(v - cy) * (v - cy) * inv);
  for (let v = v0; v <= v1; v++) {
    for (let u = u0; u <= u1; u++) {
      const g = gx[u - u0]! * gy[v - v0]!;
      const val = data[(v * width + u) * channels + ch]! - bg;
      const ux = u - cx, vy_ = v - cy;
      dx += g * val * (1 - ux * ux * iw);
      dy += g * val * (1 - vy_ * vy_ * iw);
      const var_ = (val > 0 ? val / gain : 0) + noise2;
      vx += g * g * ux * ux * var_;
      vy += g * g * vy_ * vy_ * var_;
    }
  }
  if (!(dx > 0) || !(dy > 0)) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
  return { ok: true, x: cx, y: cy, sx: Math.sqrt(vx) / dx, sy: Math.sqrt(vy) / dy, size: 0 };
}

// Solve the 5 × 5 system A x = b in place (Gaussian elimination with partial pivoting).
function solve5(A: Float64Array, b: Float64Array, n: number): boolean {
  for (let c = 0; c < n; c++) {
    let piv = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(A[r * n + c]!) > Math.abs(A[piv * n + c]!)) piv = r;
    if (!(Math.abs(A[piv * n + c]!) > 1e-300)) return false;
    if (piv !== c) {
      for (let k = 0; k < n; k++) {
        const t = A[c * n + k]!;
        A[c * n + k] = A[piv * n + k]!;
        A[piv * n + k] = t;
      }
      const t = b[c]!;
      b[c] = b[piv]!;
      b[piv] = t;
    }
    for (let r = c + 1; r < n; r++) {
      const f = A[r * n + c]! / A[c * n + c]!;
      for (let k = c; k < n; k++) A[r * n + k]! -= f * A[c * n + k]!;
      b[r]! -= f * b[c]!;
    }
  }
  for (let r = n - 1; r >= 0; r--) {
    let s = b[r]!;
    for (let k = r + 1; k < n; k++) s -= A[r * n + k]! * b[k]!;
    b[r] = s / A[r * n + r]!;
  }
  return true;
}

function gaussianFit(
  frame: Image,
  ch: number,
  x0: number,
  y0: number,
  half: number,
  size0: number,
  flux0: number,
  bg0: number,
  noise2: number,
  gain: number,
  saturation: number,
  ws: WindowScratch,
): CentreResult {
  const { width, height, channels, data } = frame;
  const u0 = Math.max(0, Math.round(x0) - half), u1 = Math.min(width - 1, Math.round(x0) + half);
  const v0 = Math.max(0, Math.round(y0) - half), v1 = Math.min(height - 1, Math.round(y0) + half);
  const nu = u1 - u0 + 1, nv = v1 - v0 + 1;
  ws.ensure(Math.max(nu, nv) + 1);
  const ex = ws.ex, ey = ws.ey, dex = ws.dex, dey = ws.dey, dsx = ws.dsx, dsy = ws.dsy;
  // Parameters: amplitude (total flux), x, y, sigma, background.
  let P = [flux0, x0, y0, Math.max(0.5, size0 * 1.1), bg0];
  const varFloor = Math.max(noise2, 1 / gain);
  const JTJ = new Float64Array(25), JTr = new Float64Array(5), A = new Float64Array(25), b = new Float64Array(5);
  const evalFactors = (p: number[]): void => {
    const sx = p[1]!, sy = p[2]!, s = p[3]!;
    const is = 1 / s;
    const c = 1 / (Math.sqrt(2 * Math.PI) * s);
    for (let k = 0; k <= nu; k++) {
      const u = u0 + k;
      const a = (u - 0.5 - sx) * is, bb = (u + 0.5 - sx) * is;
      if (k < nu) {
        ex[k] = phi(bb) - phi(a);
        const ga = c * Math.exp(-0.5 * a * a), gb = c * Math.exp(-0.5 * bb * bb);
        dex[k] = -(gb - ga); // d/dx0
        dsx[k] = -(gb * bb - ga * a); // d/dsigma
      }
    }
    for (let k = 0; k < nv; k++) {
      const v = v0 + k;
      const a = (v - 0.5 - sy) * is, bb = (v + 0.5 - sy) * is;
      ey[k] = phi(bb) - phi(a);
      const ga = c * Math.exp(-0.5 * a * a), gb = c * Math.exp(-0.5 * bb * bb);
      dey[k] = -(gb - ga);
      dsy[k] = -(gb * bb - ga * a);
    }
  };
  const cost = (p: number[], build: boolean): number => {
    evalFactors(p);
    const amp = p[0]!, B = p[4]!;
    let chi = 0;
    if (build) {
      JTJ.fill(0);
      JTr.fill(0);
    }
    const j = [0, 0, 0, 0, 0];
    for (let kv = 0; kv < nv; kv++) {
      const v = v0 + kv;
      for (let ku = 0; ku < nu; ku++) {
        const u = u0 + ku;
        const d = data[(v * width + u) * channels + ch]!;
        if (d >= saturation) continue;
        const g = ex[ku]! * ey[kv]!;
        const m = B + amp * g;
        const var_ = Math.max((m - bg0) / gain, 0) + varFloor;
        const w = 1 / var_;
        const r = d - m;
        chi += r * r * w;
        if (build) {
          j[0] = g;
          j[1] = amp * dex[ku]! * ey[kv]!;
          j[2] = amp * ex[ku]! * dey[kv]!;
          j[3] = amp * (dsx[ku]! * ey[kv]! + ex[ku]! * dsy[kv]!);
          j[4] = 1;
          for (let a = 0; a < 5; a++) {
            const ja = j[a]! * w;
            JTr[a]! += ja * r;
            for (let c = a; c < 5; c++) JTJ[a * 5 + c]! += ja * j[c]!;
          }
        }
      }
    }
    if (build) for (let a = 0; a < 5; a++) for (let c = 0; c < a; c++) JTJ[a * 5 + c] = JTJ[c * 5 + a]!;
    return chi;
  };
  let lambda = 1e-3;
  let chi = cost(P, true);
  let converged = false;
  for (let it = 0; it < 50; it++) {
    A.set(JTJ);
    for (let a = 0; a < 5; a++) A[a * 6]! *= 1 + lambda;
    b.set(JTr);
    if (!solve5(A, b, 5)) break;
    const Q = P.map((v, k) => v + b[k]!);
    if (!(Q[3]! > 0.2) || !(Q[0]! > 0) || !(Math.abs(Q[1]! - x0) <= half) || !(Math.abs(Q[2]! - y0) <= half)) {
      lambda *= 10;
      if (lambda > 1e10) break;
      continue;
    }
    const chiQ = cost(Q, false);
    if (chiQ <= chi) {
      const step = Math.hypot(b[1]!, b[2]!);
      P = Q;
      chi = cost(P, true);
      lambda = Math.max(lambda / 10, 1e-9);
      if (step < 1e-6) {
        converged = true;
        break;
      }
    } else {
      lambda *= 10;
      if (lambda > 1e10) {
        converged = true; // no downhill step left: at the minimum to precision
        break;
      }
    }
  }
  if (!converged) return { ok: false, x: x0, y: y0, sx: 0, sy: 0, size: 0 };
  // Covariance ≈ (JᵀWJ)⁻¹: solve for the x and y columns.
  const cov = (k: number): number => {
    A.set(JTJ);
    b.fill(0);
    b[k] = 1;
    return solve5(A, b, 5) ? b[k]! : NaN;
  };
  return { ok: true, x: P[1]!, y: P[2]!, sx: Math.sqrt(Math.max(0, cov(1))), sy: Math.sqrt(Math.max(0, cov(2))), size: P[3]! };
}
