/**
 * Modal reconstruction: the height map as a sum of smooth modes whose coefficients are
 * fitted, in the least-squares sense, to the measured slopes through the modes' analytic
 * derivatives. Zernike polynomials (Noll's ordering and normalisation) serve circular
 * footprints; tensor products of Legendre polynomials serve rectangles.
 *
 * Axes follow the grid (`x` along columns, `y` along rows, `p = ∂h/∂x`, `q = ∂h/∂y`);
 * heights and coefficients are in metres, slopes unitless. The piston coefficient is
 * not seen by slopes: it is set so the heights have zero mean over the used samples.
 *
 * Cost: O(samples × modes × order) to build the normal equations (twice: once more for
 * one step of iterative refinement) and O(modes³) to solve them; memory O(modes²).
 *
 * @module
 */
import {
  checkFinite,
  checkGrid,
  checkInteger,
  checkMask,
  checkOptions,
  checkPositive,
  checkSameShape,
  createGrid,
  rangeError,
  typeError,
  type Grid,
  type Mask,
} from '../core/index.js';
import { solveModalLsq } from './modal-lsq.js';
import type { IntegrationResult } from './types.js';

/** Largest number of Zernike terms accepted: all modes up to radial order 20. */
export const MAX_ZERNIKE_TERMS = 231;
/** Largest total degree accepted for the Legendre fit. */
export const MAX_LEGENDRE_ORDER = 30;

/**
 * Radial order `n` and signed azimuthal frequency `m` of the Zernike polynomial with
 * Noll index `j` (1-based). `m > 0` means `cos(mθ)`, `m < 0` means `sin(|m|θ)`: in
 * Noll's convention even `j` carry the cosine and odd `j` the sine; within one radial
 * order, `|m|` grows with `j`.
 *
 * @param j - Noll index, an integer ≥ 1.
 * @returns `{ n, m }`.
 * @throws {@link core!MeniscusRangeError} when `j` is not an integer ≥ 1.
 * @see Noll, R. J. (1976), "Zernike polynomials and atmospheric turbulence", J. Opt.
 *   Soc. Am. 66(3), 207–211, Eq. (2)–(3) and Table I.
 * @example
 * ```ts
 * zernikeNoll(4);  // { n: 2, m: 0 }   (defocus)
 * zernikeNoll(7);  // { n: 3, m: -1 }  (coma, sin θ)
 * ```
 */
export function zernikeNoll(j: number): { n: number; m: number } {
  checkInteger('zernikeNoll', 'j', j, 1, 1e9);
  return nollToNm(j);
}

function nollToNm(j: number): { n: number; m: number } {
  let n = Math.ceil((-3 + Math.sqrt(1 + 8 * j)) / 2);
  // guard the square root's rounding
  while ((n * (n + 1)) / 2 >= j) n--;
  while (((n + 1) * (n + 2)) / 2 < j) n++;
  const k = j - (n * (n + 1)) / 2; // 1-based position within the radial order
  const am = n % 2 === 0 ? 2 * Math.floor(k / 2) : 2 * Math.floor((k - 1) / 2) + 1;
  const m = am === 0 ? 0 : j % 2 === 0 ? am : -am;
  return { n, m };
}

interface ZernikeTerm {
  n: number;
  am: number;
  /** 0: m = 0, 1: cos, 2: sin */
  kind: number;
  norm: number;
  /** coefficients of ρ^(n−2s), s = 0 … (n−|m|)/2 */
  c: Float64Array;
}

function factorial(k: number): number {
  let f = 1;
  for (let t = 2; t <= k; t++) f *= t;
  return f;
}

function zernikeTable(terms: number): { table: ZernikeTerm[]; nmax: number } {
  const table: ZernikeTerm[] = [];
  let nmax = 0;
  for (let j = 1; j <= terms; j++) {
    const { n, m } = nollToNm(j);
    const am = Math.abs(m);
    const len = (n - am) / 2 + 1;
    const c = new Float64Array(len);
    for (let s = 0; s < len; s++) {
      c[s] = ((s % 2 === 0 ? 1 : -1) * factorial(n - s)) / (factorial(s) * factorial((n + am) / 2 - s) * factorial((n - am) / 2 - s));
    }
    table.push({ n, am, kind: m === 0 ? 0 : m > 0 ? 1 : 2, norm: Math.sqrt(m === 0 ? n + 1 : 2 * (n + 1)), c });
    if (n > nmax) nmax = n;
  }
  return { table, nmax };
}

/** Evaluator for all terms of a table at one point in unit-disc coordinates. */
function zernikeEvaluator(terms: number): (xn: number, yn: number, v: Float64Array | null, gx: Float64Array | null, gy: Float64Array | null) => void {
  const { table, nmax } = zernikeTable(terms);
  const pw = new Float64Array(nmax + 1);
  const cm = new Float64Array(nmax + 1);
  const sm = new Float64Array(nmax + 1);
  return (xn, yn, v, gx, gy) => {
    const rho = Math.hypot(xn, yn);
    const ct = rho > 0 ? xn / rho : 1;
    const st = rho > 0 ? yn / rho : 0;
    pw[0] = 1;
    for (let t = 1; t <= nmax; t++) pw[t] = pw[t - 1]! * rho;
    cm[0] = 1;
    sm[0] = 0;
    for (let t = 1; t <= nmax; t++) {
      cm[t] = cm[t - 1]! * ct - sm[t - 1]! * st;
      sm[t] = sm[t - 1]! * ct + cm[t - 1]! * st;
    }
    for (let t = 0; t < table.length; t++) {
      const z = table[t]!;
      const { n, am, c, norm, kind } = z;
      let R = 0;
      let dR = 0;
      let Rr = 0;
      for (let s = 0; s < c.length; s++) {
        const e = n - 2 * s;
        const cs = c[s]!;
        R += cs * pw[e]!;
        if (e > 0) {
          dR += cs * e * pw[e - 1]!;
          Rr += cs * pw[e - 1]!;
        }
      }
      if (kind === 0) {
        if (v) v[t] = norm * R;
        if (gx) gx[t] = norm * dR * ct;
        if (gy) gy[t] = norm * dR * st;
      } else if (kind === 1) {
        const C = cm[am]!;
        const S = sm[am]!;
        if (v) v[t] = norm * R * C;
        if (gx) gx[t] = norm * (dR * ct * C + am * Rr * st * S);
        if (gy) gy[t] = norm * (dR * st * C - am * Rr * ct * S);
      } else {
        const C = cm[am]!;
        const S = sm[am]!;
        if (v) v[t] = norm * R * S;
        if (gx) gx[t] = norm * (dR * ct * S - am * Rr * st * C);
        if (gy) gy[t] = norm * (dR * st * S + am * Rr * ct * C);
      }
    }
  };
}

/**
 * The Zernike polynomial of Noll index `j` at a point of the unit disc, with its
 * gradient: `Z_j = √(n+1) R_n^0(ρ)` for `m = 0`, `√(2(n+1)) R_n^|m|(ρ) cos(mθ)` (even j)
 * or `… sin(|m|θ)` (odd j), `R_n^m(ρ) = Σ_s (−1)^s (n−s)! / (s! ((n+m)/2−s)! ((n−m)/2−s)!)
 * ρ^(n−2s)`. Orthonormal under `(1/π)∫∫_disc`. Points with `ρ > 1` get the polynomial's
 * continuation.
 *
 * @param j - Noll index, 1 … {@link MAX_ZERNIKE_TERMS}.
 * @param x - Unit-disc x (`ρ cos θ`).
 * @param y - Unit-disc y (`ρ sin θ`).
 * @returns `{ value, dx, dy }`, the derivatives with respect to the unit-disc `x`, `y`.
 * @throws {@link core!MeniscusRangeError} for a bad index or non-finite coordinates.
 * @see Noll, R. J. (1976), "Zernike polynomials and atmospheric turbulence", J. Opt.
 *   Soc. Am. 66(3), 207–211, Eq. (1)–(4).
 * @example
 * ```ts
 * zernikeMode(4, 0.5, 0).value;  // √3 (2·0.25 − 1) = −0.866…
 * ```
 */
export function zernikeMode(j: number, x: number, y: number): { value: number; dx: number; dy: number } {
  const fn = 'zernikeMode';
  checkInteger(fn, 'j', j, 1, MAX_ZERNIKE_TERMS);
  checkFinite(fn, 'x', x);
  checkFinite(fn, 'y', y);
  const ev = zernikeEvaluator(j);
  const v = new Float64Array(j);
  const gx = new Float64Array(j);
  const gy = new Float64Array(j);
  ev(x, y, v, gx, gy);
  return { value: v[j - 1]!, dx: gx[j - 1]!, dy: gy[j - 1]! };
}

/** A circular footprint in world coordinates. */
export interface ZernikeDisc {
  /** Centre `[x, y]`, metres. */
  readonly center: readonly [number, number];
  /** Radius, metres (> 0). */
  readonly radius: number;
}

/** A Zernike expansion evaluated at points. */
export interface ZernikeEvaluation {
  /** Heights, metres. */
  readonly height: Float64Array;
  /** `∂h/∂x` (unitless). */
  readonly p: Float64Array;
  /** `∂h/∂y` (unitless). */
  readonly q: Float64Array;
}

function checkDisc(fn: string, disc: unknown): ZernikeDisc {
  if (disc === null || typeof disc !== 'object') typeError(fn, 'disc', disc, 'a { center: [x, y], radius } object');
  const d = disc as ZernikeDisc;
  if (!Array.isArray(d.center) || d.center.length !== 2) typeError(fn, 'disc.center', d.center, 'an [x, y] pair');
  checkFinite(fn, 'disc.center[0]', d.center[0]);
  checkFinite(fn, 'disc.center[1]', d.center[1]);
  checkPositive(fn, 'disc.radius', d.radius);
  return d;
}

/**
 * Evaluate a Zernike expansion `h = Σ_j coefficients[j−1] · Z_j((x − cx)/r, (y − cy)/r)`
 * and its slopes at world points.
 *
 * @param coefficients - Coefficients in metres, index `j − 1` for Noll index `j`.
 * @param x - World x of the points, metres.
 * @param y - World y, same length as `x`.
 * @param disc - The footprint the coefficients refer to.
 * @returns Heights and slopes at the points.
 * @throws {@link core!MeniscusTypeError} for non-`Float64Array` inputs or different lengths.
 * @throws {@link core!MeniscusRangeError} for more than {@link MAX_ZERNIKE_TERMS} terms, an empty
 *   coefficient array, non-finite values or a bad disc.
 * @see Noll, R. J. (1976), J. Opt. Soc. Am. 66(3), 207–211.
 * @example
 * ```ts
 * const c = new Float64Array([0, 0, 0, 1e-6]); // 1 µm of defocus
 * const e = evaluateZernike(c, new Float64Array([0]), new Float64Array([0]), { center: [0, 0], radius: 0.01 });
 * e.height[0]; // −√3 µm
 * ```
 */
export function evaluateZernike(coefficients: Float64Array, x: Float64Array, y: Float64Array, disc: ZernikeDisc): ZernikeEvaluation {
  const fn = 'evaluateZernike';
  if (!(coefficients instanceof Float64Array)) typeError(fn, 'coefficients', coefficients, 'a Float64Array');
  checkInteger(fn, 'coefficients.length', coefficients.length, 1, MAX_ZERNIKE_TERMS);
  if (!(x instanceof Float64Array)) typeError(fn, 'x', x, 'a Float64Array');
  if (!(y instanceof Float64Array) || y.length !== x.length) typeError(fn, 'y', y, `a Float64Array of length ${x.length}`);
  for (let t = 0; t < coefficients.length; t++) checkFinite(fn, `coefficients[${t}]`, coefficients[t]);
  const d = checkDisc(fn, disc);
  const terms = coefficients.length;
  const ev = zernikeEvaluator(terms);
  const v = new Float64Array(terms);
  const gx = new Float64Array(terms);
  const gy = new Float64Array(terms);
  const n = x.length;
  const height = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  const [cx, cy] = d.center;
  const r = d.radius;
  for (let k = 0; k < n; k++) {
    const xk = x[k]!;
    const yk = y[k]!;
    if (!Number.isFinite(xk)) rangeError(fn, `x[${k}]`, xk, 'a finite number');
    if (!Number.isFinite(yk)) rangeError(fn, `y[${k}]`, yk, 'a finite number');
    ev((xk - cx) / r, (yk - cy) / r, v, gx, gy);
    let h = 0;
    let sx = 0;
    let sy = 0;
    for (let t = 0; t < terms; t++) {
      const c = coefficients[t]!;
      h += c * v[t]!;
      sx += c * gx[t]!;
      sy += c * gy[t]!;
    }
    height[k] = h;
    p[k] = sx / r;
    q[k] = sy / r;
  }
  return { height, p, q };
}

/** Options of {@link integrateZernike}. */
export interface ZernikeOptions {
  /** Valid samples (1) and holes (0), same size as `p`. @defaultValue all valid */
  mask?: Mask;
  /** Number of Noll terms fitted, 2 … {@link MAX_ZERNIKE_TERMS} (term 1, piston, is set by the piston convention). @defaultValue 21 (all modes up to radial order 5) */
  terms?: number;
  /** Disc centre `[x, y]`, metres. @defaultValue the centre of the grid's extent */
  center?: [number, number];
  /**
   * Disc radius, metres; valid samples farther from the centre are left out (mask 0).
   * @defaultValue the largest distance from the centre to a valid sample
   */
  radius?: number;
}

/** What {@link integrateZernike} returns. */
export interface ZernikeResult extends IntegrationResult {
  /** Fitted coefficients, metres, index `j − 1` for Noll index `j` (index 0 is the piston). */
  readonly coefficients: Float64Array;
  /** The disc the coefficients refer to. */
  readonly disc: ZernikeDisc;
}

interface ModalSamples {
  /** grid indices of the used samples */
  index: Int32Array;
  count: number;
  mask: Uint8Array;
}

function readModalGrids(fn: string, p: Grid, q: Grid, mask: Mask | undefined): Uint8Array {
  checkGrid(fn, 'p', p, true);
  checkGrid(fn, 'q', q, true);
  checkSameShape(fn, 'q', q, p);
  const n = p.width * p.height;
  const m = mask === undefined ? undefined : checkMask(fn, 'options.mask', mask, p.width, p.height);
  const valid = new Uint8Array(n);
  let count = 0;
  for (let k = 0; k < n; k++) {
    if (m && m[k] === 0) continue;
    if (!Number.isFinite(p.data[k]!)) rangeError(fn, `p.data[${k}]`, p.data[k], 'a finite slope (mark holes with options.mask)');
    if (!Number.isFinite(q.data[k]!)) rangeError(fn, `q.data[${k}]`, q.data[k], 'a finite slope (mark holes with options.mask)');
    valid[k] = 1;
    count++;
  }
  if (count === 0) rangeError(fn, 'options.mask', 'no valid sample', 'a mask with at least one valid sample');
  return valid;
}

function collect(valid: Uint8Array, inside: (k: number) => boolean): ModalSamples {
  const n = valid.length;
  const mask = new Uint8Array(n);
  let count = 0;
  for (let k = 0; k < n; k++) if (valid[k] && inside(k)) (mask[k] = 1), count++;
  const index = new Int32Array(count);
  let t = 0;
  for (let k = 0; k < n; k++) if (mask[k]) index[t++] = k;
  return { index, count, mask };
}

/**
 * Fit the modes (all but the first, the piston) to the slopes, then set the piston so the
 * heights have zero mean over the used samples, and evaluate heights and residuals.
 */
function fitModes(
  fn: string,
  p: Grid,
  q: Grid,
  s: ModalSamples,
  modes: number,
  evalAt: (k: number, v: Float64Array | null, gx: Float64Array, gy: Float64Array) => void,
): { coefficients: Float64Array; height: Grid; rms: number } {
  const cols = modes - 1;
  if (2 * s.count < cols) {
    rangeError(fn, 'options.mask', `${s.count} samples`, `at least ${Math.ceil(cols / 2)} valid samples (2 slopes each) for ${modes} modes`);
  }
  const v = new Float64Array(modes);
  const gx = new Float64Array(modes);
  const gy = new Float64Array(modes);
  let last = -1;
  const pd = p.data;
  const qd = q.data;
  const sol = solveModalLsq(2 * s.count, cols, (r, a) => {
    const t = r >> 1;
    const k = s.index[t]!;
    if (t !== last) {
      evalAt(k, null, gx, gy);
      last = t;
    }
    const g = (r & 1) === 0 ? gx : gy;
    for (let c = 0; c < cols; c++) a[c] = g[c + 1]!;
    return (r & 1) === 0 ? pd[k]! : qd[k]!;
  });
  if (sol === null) {
    rangeError(fn, 'options.mask', `${s.count} samples`, `samples that determine all ${modes} modes (more samples, a larger footprint or fewer modes)`);
  }
  const coefficients = new Float64Array(modes);
  coefficients.set(sol.x, 1);
  const n = pd.length;
  const h = new Float64Array(n);
  let mean = 0;
  let sum = 0;
  for (let t = 0; t < s.count; t++) {
    const k = s.index[t]!;
    evalAt(k, v, gx, gy);
    let hk = 0;
    let sx = 0;
    let sy = 0;
    for (let c = 1; c < modes; c++) {
      const a = coefficients[c]!;
      hk += a * v[c]!;
      sx += a * gx[c]!;
      sy += a * gy[c]!;
    }
    h[k] = hk;
    mean += hk;
    const ep = sx - pd[k]!;
    const eq = sy - qd[k]!;
    sum += ep * ep + eq * eq;
  }
  mean /= s.count;
  // mode 1 is the constant v[0] (the same at every point)
  evalAt(s.index[0]!, v, gx, gy);
  coefficients[0] = -mean / v[0]!;
  for (let t = 0; t < s.count; t++) h[s.index[t]!]! -= mean;
  return { coefficients, height: createGrid(p, h), rms: Math.sqrt(sum / (2 * s.count)) };
}

/**
 * Modal reconstruction with Zernike polynomials on a circular footprint: the
 * coefficients of Noll terms 2 … `terms` are fitted in the least-squares sense to the
 * slopes through the modes' analytic gradients (`∂h/∂x = Σ a_j ∂Z_j/∂x / radius`),
 * the piston (term 1) is set so the heights have zero mean over the used samples.
 *
 * Heights come back on the slopes' grid at the used samples (valid and inside the disc;
 * elsewhere 0, mask 0). `rmsResidual` is the RMS over both slope components of the
 * fitted minus the measured slope. `iterations` is 0 (a direct solve). A surface made of
 * the fitted modes is recovered to rounding; anything else is projected onto them (the
 * fit is only as good as the modes can describe the surface).
 *
 * Cost: O(samples · terms · n_max) for the rows (two passes), O(terms³) for the solve.
 *
 * @param p - x-slopes (unitless).
 * @param q - y-slopes, same grid as `p`.
 * @param options - Mask, number of terms, disc.
 * @returns Heights, coefficients (metres) and the disc.
 * @throws {@link core!MeniscusTypeError} for grids of different sizes or wrong types.
 * @throws {@link core!MeniscusRangeError} for non-finite slopes at valid samples, a mask with no
 *   valid sample, a bad `terms`, `center` or `radius`, or too few samples (or too small a
 *   footprint) to determine all the modes.
 * @see Noll, R. J. (1976), "Zernike polynomials and atmospheric turbulence", J. Opt.
 *   Soc. Am. 66(3), 207–211 (ordering and normalisation).
 * @see Southwell, W. H. (1980), "Wave-front estimation from wave-front slope
 *   measurements", J. Opt. Soc. Am. 70(8), 998–1006, §III (modal estimation from slopes).
 * @example
 * ```ts
 * const r = integrateZernike(p, q, { terms: 15, mask: pupil });
 * r.coefficients[3]; // defocus (Noll 4), metres
 * ```
 */
export function integrateZernike(p: Grid, q: Grid, options?: ZernikeOptions): ZernikeResult {
  const fn = 'integrateZernike';
  const o = checkOptions(fn, options);
  const valid = readModalGrids(fn, p, q, o.mask);
  const terms = o.terms === undefined ? 21 : checkInteger(fn, 'options.terms', o.terms, 2, MAX_ZERNIKE_TERMS);
  const { width, height, dx, dy, x0, y0 } = p;
  let cx = x0 + ((width - 1) * dx) / 2;
  let cy = y0 + ((height - 1) * dy) / 2;
  if (o.center !== undefined) {
    if (!Array.isArray(o.center) || o.center.length !== 2) typeError(fn, 'options.center', o.center, 'an [x, y] pair');
    cx = checkFinite(fn, 'options.center[0]', o.center[0]);
    cy = checkFinite(fn, 'options.center[1]', o.center[1]);
  }
  let radius: number;
  if (o.radius !== undefined) radius = checkPositive(fn, 'options.radius', o.radius);
  else {
    radius = 0;
    for (let k = 0; k < valid.length; k++) {
      if (!valid[k]) continue;
      const i = k % width;
      const j = (k - i) / width;
      radius = Math.max(radius, Math.hypot(x0 + i * dx - cx, y0 + j * dy - cy));
    }
    if (!(radius > 0)) rangeError(fn, 'options.radius', radius, 'a footprint of non-zero size (valid samples away from the centre)');
  }
  const r2 = radius * radius * (1 + 1e-12);
  const s = collect(valid, (k) => {
    const i = k % width;
    const j = (k - i) / width;
    const ex = x0 + i * dx - cx;
    const ey = y0 + j * dy - cy;
    return ex * ex + ey * ey <= r2;
  });
  const ev = zernikeEvaluator(terms);
  const fit = fitModes(fn, p, q, s, terms, (k, v, gx, gy) => {
    const i = k % width;
    const j = (k - i) / width;
    ev((x0 + i * dx - cx) / radius, (y0 + j * dy - cy) / radius, v, gx, gy);
    for (let t = 0; t < terms; t++) {
      gx[t] = gx[t]! / radius;
      gy[t] = gy[t]! / radius;
    }
  });
  return {
    height: fit.height,
    mask: s.mask,
    rmsResidual: fit.rms,
    iterations: 0,
    converged: true,
    relativeResidual: 0,
    coefficients: fit.coefficients,
    disc: { center: [cx, cy], radius },
  };
}

/** A rectangle in world coordinates, the domain `[−1, 1]²` of the Legendre modes. */
export interface LegendreRectangle {
  /** Smallest x, metres. */
  readonly xMin: number;
  /** Largest x, metres (> xMin). */
  readonly xMax: number;
  /** Smallest y, metres. */
  readonly yMin: number;
  /** Largest y, metres (> yMin). */
  readonly yMax: number;
}

/**
 * The `(a, b)` degree pairs of the Legendre modes `L_a(ξ) L_b(η)` of total degree
 * `a + b ≤ order`, in the order their coefficients are stored: by total degree, then by
 * increasing `b` (`(0,0), (1,0), (0,1), (2,0), (1,1), (0,2), …`).
 *
 * @param order - Largest total degree, 0 … {@link MAX_LEGENDRE_ORDER}.
 * @returns Pairs `[a, b]`; `(order + 1)(order + 2)/2` of them.
 * @throws {@link core!MeniscusRangeError} for a bad order.
 * @example
 * ```ts
 * legendreModes(1); // [[0, 0], [1, 0], [0, 1]]
 * ```
 */
export function legendreModes(order: number): Array<[number, number]> {
  checkInteger('legendreModes', 'order', order, 0, MAX_LEGENDRE_ORDER);
  return modesOf(order);
}

function modesOf(order: number): Array<[number, number]> {
  const out: Array<[number, number]> = [];
  for (let d = 0; d <= order; d++) for (let b = 0; b <= d; b++) out.push([d - b, b]);
  return out;
}

/** Orthonormal Legendre values `√(2a+1) P_a(t)` and derivatives for a = 0 … order. */
function legendre1d(t: number, order: number, v: Float64Array, dv: Float64Array): void {
  // Bonnet: (a+1) P_{a+1} = (2a+1) t P_a − a P_{a−1};  P'_{a+1} = P'_{a−1} + (2a+1) P_a
  let p0 = 1;
  let p1 = t;
  let d0 = 0;
  let d1 = 1;
  v[0] = 1;
  dv[0] = 0;
  if (order >= 1) {
    v[1] = Math.sqrt(3) * t;
    dv[1] = Math.sqrt(3);
  }
  for (let a = 1; a < order; a++) {
    const p2 = ((2 * a + 1) * t * p1 - a * p0) / (a + 1);
    const d2 = d0 + (2 * a + 1) * p1;
    const s = Math.sqrt(2 * a + 3);
    v[a + 1] = s * p2;
    dv[a + 1] = s * d2;
    p0 = p1;
    p1 = p2;
    d0 = d1;
    d1 = d2;
  }
}

function legendreEvaluator(order: number, rect: LegendreRectangle): (x: number, y: number, v: Float64Array | null, gx: Float64Array, gy: Float64Array) => void {
  const modes = modesOf(order);
  const vx = new Float64Array(order + 1);
  const dvx = new Float64Array(order + 1);
  const vy = new Float64Array(order + 1);
  const dvy = new Float64Array(order + 1);
  const hx = (rect.xMax - rect.xMin) / 2;
  const hy = (rect.yMax - rect.yMin) / 2;
  const mx = (rect.xMax + rect.xMin) / 2;
  const my = (rect.yMax + rect.yMin) / 2;
  return (x, y, v, gx, gy) => {
    legendre1d((x - mx) / hx, order, vx, dvx);
    legendre1d((y - my) / hy, order, vy, dvy);
    for (let t = 0; t < modes.length; t++) {
      const [a, b] = modes[t]!;
      if (v) v[t] = vx[a]! * vy[b]!;
      gx[t] = (dvx[a]! * vy[b]!) / hx;
      gy[t] = (vx[a]! * dvy[b]!) / hy;
    }
  };
}

function checkRect(fn: string, rect: unknown): LegendreRectangle {
  if (rect === null || typeof rect !== 'object') typeError(fn, 'rectangle', rect, 'a { xMin, xMax, yMin, yMax } object');
  const r = rect as LegendreRectangle;
  checkFinite(fn, 'rectangle.xMin', r.xMin);
  checkFinite(fn, 'rectangle.xMax', r.xMax);
  checkFinite(fn, 'rectangle.yMin', r.yMin);
  checkFinite(fn, 'rectangle.yMax', r.yMax);
  if (!(r.xMax > r.xMin)) rangeError(fn, 'rectangle.xMax', r.xMax, `a number > xMin = ${r.xMin}`);
  if (!(r.yMax > r.yMin)) rangeError(fn, 'rectangle.yMax', r.yMax, `a number > yMin = ${r.yMin}`);
  return r;
}

/**
 * Evaluate a Legendre expansion `h = Σ_t coefficients[t] · √((2a+1)(2b+1)) P_a(ξ) P_b(η)`
 * with `(a, b) = legendreModes(order)[t]`, `ξ`, `η` the point mapped from the rectangle
 * onto `[−1, 1]²`, and its slopes, at world points.
 *
 * @param coefficients - Coefficients, metres; `(order + 1)(order + 2)/2` of them.
 * @param order - Largest total degree.
 * @param x - World x of the points, metres.
 * @param y - World y, same length.
 * @param rectangle - The rectangle the coefficients refer to.
 * @returns Heights and slopes at the points.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for wrong lengths, non-finite
 *   values or a bad rectangle.
 * @see Abramowitz, M. & Stegun, I. A. (1964), Handbook of Mathematical Functions, 22.7.10
 *   (the recurrence) and 8.5.3 (the derivative recurrence).
 * @example
 * ```ts
 * const c = new Float64Array(3); c[1] = 1e-6 / Math.sqrt(3); // a tilt
 * evaluateLegendre(c, 1, new Float64Array([1]), new Float64Array([0]), { xMin: -1, xMax: 1, yMin: -1, yMax: 1 }).height[0]; // 1e-6
 * ```
 */
export function evaluateLegendre(
  coefficients: Float64Array,
  order: number,
  x: Float64Array,
  y: Float64Array,
  rectangle: LegendreRectangle,
): { height: Float64Array; p: Float64Array; q: Float64Array } {
  const fn = 'evaluateLegendre';
  checkInteger(fn, 'order', order, 0, MAX_LEGENDRE_ORDER);
  const modes = ((order + 1) * (order + 2)) / 2;
  if (!(coefficients instanceof Float64Array) || coefficients.length !== modes) {
    typeError(fn, 'coefficients', coefficients, `a Float64Array of length ${modes}`);
  }
  if (!(x instanceof Float64Array)) typeError(fn, 'x', x, 'a Float64Array');
  if (!(y instanceof Float64Array) || y.length !== x.length) typeError(fn, 'y', y, `a Float64Array of length ${x.length}`);
  for (let t = 0; t < modes; t++) checkFinite(fn, `coefficients[${t}]`, coefficients[t]);
  const rect = checkRect(fn, rectangle);
  const ev = legendreEvaluator(order, rect);
  const v = new Float64Array(modes);
  const gx = new Float64Array(modes);
  const gy = new Float64Array(modes);
  const n = x.length;
  const height = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(x[k]!)) rangeError(fn, `x[${k}]`, x[k], 'a finite number');
    if (!Number.isFinite(y[k]!)) rangeError(fn, `y[${k}]`, y[k], 'a finite number');
    ev(x[k]!, y[k]!, v, gx, gy);
    let h = 0;
    let sx = 0;
    let sy = 0;
    for (let t = 0; t < modes; t++) {
      const c = coefficients[t]!;
      h += c * v[t]!;
      sx += c * gx[t]!;
      sy += c * gy[t]!;
    }
    height[k] = h;
    p[k] = sx;
    q[k] = sy;
  }
  return { height, p, q };
}

/** Options of {@link integrateLegendre}. */
export interface LegendreOptions {
  /** Valid samples (1) and holes (0), same size as `p`. @defaultValue all valid */
  mask?: Mask;
  /** Largest total degree `a + b` of the modes, 1 … {@link MAX_LEGENDRE_ORDER}. @defaultValue 6 */
  order?: number;
}

/** What {@link integrateLegendre} returns. */
export interface LegendreResult extends IntegrationResult {
  /** Coefficients, metres, in the order of {@link legendreModes}(order); index 0 is the piston. */
  readonly coefficients: Float64Array;
  /** The order fitted. */
  readonly order: number;
  /** The rectangle mapped onto `[−1, 1]²`: the grid's extent, sample centre to sample centre. */
  readonly rectangle: LegendreRectangle;
}

/**
 * Modal reconstruction with tensor products of Legendre polynomials on the grid's
 * rectangle: `h = Σ c_t √((2a+1)(2b+1)) P_a(ξ) P_b(η)`, `a + b ≤ order`, with
 * `ξ ∈ [−1, 1]` across the grid's columns (first to last sample centre) and `η` across its
 * rows. The modes are orthonormal over the rectangle (mean square 1). Coefficients of
 * all modes but the constant are fitted in the least-squares sense to the slopes
 * through the modes' analytic gradients; the constant is set so the heights have zero
 * mean over the valid samples.
 *
 * Heights come back on the slopes' grid at the valid samples. `rmsResidual` as in
 * {@link integrateZernike}. `iterations` is 0 (direct solve).
 *
 * Cost: O(samples · modes) for the rows (two passes), O(modes³) for the solve.
 *
 * @param p - x-slopes (unitless).
 * @param q - y-slopes, same grid as `p` (at least 2 × 2 samples).
 * @param options - Mask and order.
 * @returns Heights, coefficients (metres), order and rectangle.
 * @throws {@link core!MeniscusTypeError} for grids of different sizes or wrong types.
 * @throws {@link core!MeniscusRangeError} for non-finite slopes at valid samples, a mask with no
 *   valid sample, a grid narrower than 2 samples, a bad order, or samples that do not
 *   determine every mode.
 * @see Abramowitz, M. & Stegun, I. A. (1964), Handbook of Mathematical Functions, §22
 *   (Legendre polynomials, 22.2.10 orthogonality).
 * @see Southwell, W. H. (1980), J. Opt. Soc. Am. 70(8), 998–1006, §III (modal estimation
 *   from slopes).
 * @example
 * ```ts
 * const r = integrateLegendre(p, q, { order: 8 });
 * r.coefficients.length; // 45
 * ```
 */
export function integrateLegendre(p: Grid, q: Grid, options?: LegendreOptions): LegendreResult {
  const fn = 'integrateLegendre';
  const o = checkOptions(fn, options);
  const valid = readModalGrids(fn, p, q, o.mask);
  const order = o.order === undefined ? 6 : checkInteger(fn, 'options.order', o.order, 1, MAX_LEGENDRE_ORDER);
  const { width, height, dx, dy, x0, y0 } = p;
  if (width < 2) rangeError(fn, 'p.width', width, 'at least 2 samples');
  if (height < 2) rangeError(fn, 'p.height', height, 'at least 2 samples');
  const rectangle: LegendreRectangle = { xMin: x0, xMax: x0 + (width - 1) * dx, yMin: y0, yMax: y0 + (height - 1) * dy };
  const s = collect(valid, () => true);
  const modes = ((order + 1) * (order + 2)) / 2;
  const ev = legendreEvaluator(order, rectangle);
  const fit = fitModes(fn, p, q, s, modes, (k, v, gx, gy) => {
    const i = k % width;
    const j = (k - i) / width;
    ev(x0 + i * dx, y0 + j * dy, v, gx, gy);
  });
  return {
    height: fit.height,
    mask: s.mask,
    rmsResidual: fit.rms,
    iterations: 0,
    converged: true,
    relativeResidual: 0,
    coefficients: fit.coefficients,
    order,
    rectangle,
  };
}
