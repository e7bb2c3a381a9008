/**
 * Diagnostics of gradient fields and reconstructions: the curl (integrability) map and
 * the per-sample residual of a height map's gradient against the slopes.
 *
 * @module
 */
import { checkGrid, checkOptions, checkSameShape, createGrid, rangeError } from '../core/index.js';
import type { Grid, Mask } from '../core/index.js';
import { checkSlopes, pairRms } from './common.js';

/** Options of {@link integrabilityMap} and {@link slopeResidual}. */
export interface DiagnosticOptions {
  /** Valid samples (1) and holes (0). @defaultValue all valid */
  mask?: Mask;
}

/** The curl of a slope field on the cells between samples. */
export interface IntegrabilityMap {
  /**
   * `∂p/∂y − ∂q/∂x` (1/m) on the `(width − 1) × (height − 1)` cells; cell `(i, j)` has
   * the samples `(i, j)`, `(i+1, j)`, `(i, j+1)`, `(i+1, j+1)` at its corners and sits at
   * `x0 + (i + ½)dx`, `y0 + (j + ½)dy`. 0 where `mask` is 0.
   */
  readonly curl: Grid;
  /** 1 for cells whose four corners are valid. */
  readonly mask: Mask;
  /** RMS of the curl over valid cells, 1/m (0 when there is none). */
  readonly rms: number;
  /** Largest |curl| over valid cells, 1/m. */
  readonly maxAbs: number;
}

/** The misfit of a height map's gradient against slopes, per sample. */
export interface SlopeResidual {
  /** Fitted minus given slope along x at each sample (unitless); 0 where undefined. */
  readonly p: Grid;
  /** Fitted minus given slope along y at each sample; 0 where undefined. */
  readonly q: Grid;
  /** 1 where both components are defined (a valid sample with a valid neighbour along x and along y). */
  readonly mask: Mask;
  /** RMS over the defined components of `p` and `q` pooled. */
  readonly rms: number;
  /**
   * RMS misfit of the forward-difference pairs, `(h_b − h_a)/d − (s_a + s_b)/2`, the
   * quantity the least-squares and DCT integrators minimise.
   */
  readonly pairRms: number;
}

/**
 * The discrete curl of a slope field, a map of where it is not the gradient of any
 * surface (noise, outliers, a bad aperture match, a wrong sign convention). A true
 * gradient has zero curl. Each cell's value is the circulation of the trapezoid pair
 * slopes around it divided by its area, which is exactly the inconsistency that the
 * forward-difference least-squares model cannot fit:
 * `((p[i,j+1] + p[i+1,j+1]) − (p[i,j] + p[i+1,j])) / (2dy) − ((q[i+1,j] + q[i+1,j+1]) − (q[i,j] + q[i,j+1])) / (2dx)`.
 * Cost O(N).
 *
 * @param p - Slopes ∂h/∂x (unitless), at least 2 × 2 samples.
 * @param q - Slopes ∂h/∂y, same size and geometry.
 * @param options - See {@link DiagnosticOptions}.
 * @returns The curl map and its RMS and maximum.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for malformed input or a grid under 2 × 2.
 * @see Frankot, R. T. & Chellappa, R. (1988), "A method for enforcing integrability in
 *   shape from shading algorithms", IEEE TPAMI 10(4), 439–451 (the integrability
 *   condition ∂p/∂y = ∂q/∂x).
 * @example
 * ```ts
 * const { rms, curl } = integrabilityMap(p, q, { mask });
 * ```
 */
export function integrabilityMap(p: Grid, q: Grid, options?: DiagnosticOptions): IntegrabilityMap {
  const fn = 'integrabilityMap';
  const o = checkOptions(fn, options);
  const s = checkSlopes(fn, p, q, o.mask);
  const { width: w, height: h, dx, dy } = s.p;
  if (w < 2 || h < 2) rangeError(fn, 'p', `${w}×${h}`, 'a grid of at least 2 × 2 samples');
  const cw = w - 1;
  const ch = h - 1;
  const curl = new Float64Array(cw * ch);
  const cm = new Uint8Array(cw * ch);
  const pd = s.p.data;
  const qd = s.q.data;
  const m = s.mask;
  let sum = 0;
  let count = 0;
  let maxAbs = 0;
  for (let j = 0; j < ch; j++) {
    for (let i = 0; i < cw; i++) {
      const k = j * w + i;
      if (m && (m[k] === 0 || m[k + 1] === 0 || m[k + w] === 0 || m[k + w + 1] === 0)) continue;
      const c =
        (pd[k + w]! + pd[k + w + 1]! - pd[k]! - pd[k + 1]!) / (2 * dy) -
        (qd[k + 1]! + qd[k + w + 1]! - qd[k]! - qd[k + w]!) / (2 * dx);
      curl[j * cw + i] = c;
      cm[j * cw + i] = 1;
      sum += c * c;
      count++;
      maxAbs = Math.max(maxAbs, Math.abs(c));
    }
  }
  return {
    curl: createGrid({ width: cw, height: ch, dx, dy, x0: s.p.x0 + dx / 2, y0: s.p.y0 + dy / 2 }, curl),
    mask: cm,
    rms: count > 0 ? Math.sqrt(sum / count) : 0,
    maxAbs,
  };
}

/**
 * The residual of a height map's gradient against the slopes at every sample: the
 * fitted slope at a sample is the mean of the forward differences to its valid
 * neighbours on either side (a central difference inside, one-sided at an edge or hole),
 * minus the given slope. Large values point at outliers or at the limits of a method's
 * boundary assumption. Cost O(N).
 *
 * @param height - Heights (metres) on the slopes' grid.
 * @param p - Slopes ∂h/∂x.
 * @param q - Slopes ∂h/∂y.
 * @param options - See {@link DiagnosticOptions}.
 * @returns Per-sample residual maps and their RMS, plus the forward-difference pair RMS.
 * @throws {@link core!MeniscusTypeError} / {@link core!MeniscusRangeError} for malformed or mismatched input.
 * @see Harker, M. & O'Leary, P. (2008), "Least squares surface reconstruction from
 *   measured gradient fields", CVPR 2008 (the gradient residual of a reconstruction).
 * @example
 * ```ts
 * const r = integrateDctPoisson(p, q);
 * const res = slopeResidual(r.height, p, q);
 * res.rms;
 * ```
 */
export function slopeResidual(height: Grid, p: Grid, q: Grid, options?: DiagnosticOptions): SlopeResidual {
  const fn = 'slopeResidual';
  const o = checkOptions(fn, options);
  const s = checkSlopes(fn, p, q, o.mask);
  const H = checkGrid(fn, 'height', height, true);
  checkSameShape(fn, 'height', H, s.p);
  const { width: w, height: hgt, dx, dy } = s.p;
  const m = s.mask;
  const hd = H.data;
  for (let k = 0; k < hd.length; k++) {
    if ((!m || m[k] === 1) && !Number.isFinite(hd[k]!)) rangeError(fn, `height.data[${k}]`, hd[k], 'a finite height inside the mask');
  }
  const pd = s.p.data;
  const qd = s.q.data;
  const rp = new Float64Array(w * hgt);
  const rq = new Float64Array(w * hgt);
  const rm = new Uint8Array(w * hgt);
  let sum = 0;
  let count = 0;
  const ok = (k: number): boolean => !m || m[k] === 1;
  for (let j = 0; j < hgt; j++) {
    for (let i = 0; i < w; i++) {
      const k = j * w + i;
      if (!ok(k)) continue;
      const l = i > 0 && ok(k - 1);
      const r = i + 1 < w && ok(k + 1);
      const u = j > 0 && ok(k - w);
      const d = j + 1 < hgt && ok(k + w);
      let defined = 0;
      if (l || r) {
        const g = l && r ? (hd[k + 1]! - hd[k - 1]!) / (2 * dx) : r ? (hd[k + 1]! - hd[k]!) / dx : (hd[k]! - hd[k - 1]!) / dx;
        const e = g - pd[k]!;
        rp[k] = e;
        sum += e * e;
        count++;
        defined++;
      }
      if (u || d) {
        const g = u && d ? (hd[k + w]! - hd[k - w]!) / (2 * dy) : d ? (hd[k + w]! - hd[k]!) / dy : (hd[k]! - hd[k - w]!) / dy;
        const e = g - qd[k]!;
        rq[k] = e;
        sum += e * e;
        count++;
        defined++;
      }
      if (defined === 2) rm[k] = 1;
    }
  }
  return {
    p: createGrid(s.p, rp),
    q: createGrid(s.p, rq),
    mask: rm,
    rms: count > 0 ? Math.sqrt(sum / count) : 0,
    pairRms: pairRms(hd, pd, qd, m, w, hgt, dx, dy),
  };
}
