/**
 * Matching spots to apertures. Spots and reference positions are points on the
 * detection plane in plane coordinates (metres, see {@link SensorGeometry}); each spot
 * is paired with at most one aperture and each aperture with at most one spot. Missing
 * spots, extra spots (glints, bubbles) and ambiguous cases are reported as status codes
 * and never silently paired.
 *
 * @module
 */
import { checkFinite, checkFloat64Array, checkInteger, checkOneOf, checkOptions, checkPositive, rangeError, Status, typeError } from '../core/index.js';
import { apertureAt, latticeNeighbours } from './lattice.js';
import type { ApertureArray } from './lattice.js';

/** Reference (flat-water) spot positions, one per aperture, as {@link referenceSpots} returns them. */
export interface SpotReference {
  /** The aperture array the references belong to. */
  readonly apertures: ApertureArray;
  /** Reference x on the plane, metres, one per aperture. */
  readonly x: Float64Array;
  /** Reference y on the plane, metres, one per aperture. */
  readonly y: Float64Array;
  /** `Status.ok` where the reference exists (light reaches the plane through flat water). */
  readonly status: Uint8Array;
}

/** Options of {@link matchSpots}. */
export interface MatchSpotsOptions {
  /**
   * `'nearest'`: each spot goes to the nearest reference if it lies well inside that
   * aperture's cell (shifts below half a pitch). `'grow'`: lattice growing: each
   * aperture's spot is predicted from its already-matched neighbours, which follows
   * shifts of more than a pitch. @defaultValue `'grow'`
   */
  method?: 'nearest' | 'grow';
  /**
   * `'grow'`: radius around the predicted position within which exactly one spot must
   * lie, as a fraction of the pitch on the plane. @defaultValue 0.25
   */
  acceptRadius?: number;
  /**
   * `'nearest'`: a spot closer than this to a cell boundary (fraction of the pitch) is
   * ambiguous. @defaultValue 0.05
   */
  boundaryMargin?: number;
  /**
   * The mean spot shift expected before looking (plane metres), used by `'grow'` to
   * choose between lattice offsets that the array's edges cannot decide, and as the
   * `'nearest'` shift applied to the references. @defaultValue [0, 0]
   */
  expectedShift?: readonly [number, number];
  /**
   * `'grow'`: margin (fraction of the pitch) by which the chosen lattice offset's mean
   * shift must be closer to `expectedShift` than the next offset's, when the edges do
   * not decide. @defaultValue 0.2
   */
  offsetMargin?: number;
  /** `'grow'`: smallest region of connected matches that is kept. @defaultValue 4 */
  minRegion?: number;
}

/** The result of {@link matchSpots}. */
export interface SpotMatch {
  /** For each aperture, the index of its spot, or −1. */
  readonly spotOfAperture: Int32Array;
  /**
   * For each aperture: `Status.ok` (matched), `Status.unmatched` (no spot found),
   * `Status.ambiguous` (more than one spot fits), `Status.masked` (no reference).
   */
  readonly apertureStatus: Uint8Array;
  /** For each spot, the index of its aperture, or −1. */
  readonly apertureOfSpot: Int32Array;
  /** For each spot: `Status.ok`, `Status.unmatched` (extra spot) or `Status.ambiguous`. */
  readonly spotStatus: Uint8Array;
  /** Number of matched pairs. */
  readonly matched: number;
  /** Apertures with a reference but without a spot. */
  readonly missing: number;
  /** Spots paired with no aperture. */
  readonly extra: number;
  /** Apertures flagged ambiguous. */
  readonly ambiguous: number;
  /** Connected regions grown (`'grow'`), 1 for `'nearest'`. */
  readonly regions: number;
}

interface Affine {
  ox: number;
  oy: number;
  b1x: number;
  b1y: number;
  b2x: number;
  b2y: number;
  inv: [number, number, number, number];
  pitch: number;
}

function fitAffine(ref: SpotReference): Affine | null {
  // Least squares of x = ox + i b1x + j b2x (and y) over the valid references.
  const a = ref.apertures;
  const M = new Float64Array(9);
  const rx = new Float64Array(3), ry = new Float64Array(3);
  let n = 0;
  for (let k = 0; k < a.count; k++) {
    if (ref.status[k] !== Status.ok) continue;
    const i = a.indices[2 * k]!, j = a.indices[2 * k + 1]!;
    const f = [1, i, j];
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) M[r * 3 + c]! += f[r]! * f[c]!;
      rx[r]! += f[r]! * ref.x[k]!;
      ry[r]! += f[r]! * ref.y[k]!;
    }
    n++;
  }
  if (n < 3) return null;
  const sol = (b: Float64Array): [number, number, number] | null => {
    const A = Array.from(M);
    const x = Array.from(b);
    for (let c = 0; c < 3; c++) {
      let p = c;
      for (let r = c + 1; r < 3; r++) if (Math.abs(A[r * 3 + c]!) > Math.abs(A[p * 3 + c]!)) p = r;
      if (!(Math.abs(A[p * 3 + c]!) > 1e-12 * (Math.abs(A[0]!) + 1))) return null;
      for (let k = 0; k < 3; k++) [A[c * 3 + k], A[p * 3 + k]] = [A[p * 3 + k]!, A[c * 3 + k]!];
      [x[c], x[p]] = [x[p]!, x[c]!];
      for (let r = c + 1; r < 3; r++) {
        const f = A[r * 3 + c]! / A[c * 3 + c]!;
        for (let k = c; k < 3; k++) A[r * 3 + k]! -= f * A[c * 3 + k]!;
        x[r]! -= f * x[c]!;
      }
    }
    for (let r = 2; r >= 0; r--) {
      let s = x[r]!;
      for (let k = r + 1; k < 3; k++) s -= A[r * 3 + k]! * x[k]!;
      x[r] = s / A[r * 3 + r]!;
    }
    return [x[0]!, x[1]!, x[2]!];
  };
  let cx: [number, number, number] | null, cy: [number, number, number] | null;
  if (a.rows === 1 || a.columns === 1) {
    // A single row or column: the other lattice vector is the first turned by the lattice angle.
    const along = a.rows === 1 ? 1 : 2;
    const M2 = [0, 0, 0, 0];
    const bx = [0, 0], by = [0, 0];
    for (let k = 0; k < a.count; k++) {
      if (ref.status[k] !== Status.ok) continue;
      const t = a.indices[2 * k + along - 1]!;
      M2[0]! += 1;
      M2[1]! += t;
      M2[3]! += t * t;
      bx[0]! += ref.x[k]!;
      bx[1]! += t * ref.x[k]!;
      by[0]! += ref.y[k]!;
      by[1]! += t * ref.y[k]!;
    }
    M2[2] = M2[1]!;
    const det = M2[0]! * M2[3]! - M2[1]! * M2[2]!;
    if (!(Math.abs(det) > 0)) return null;
    const sx = [(M2[3]! * bx[0]! - M2[1]! * bx[1]!) / det, (M2[0]! * bx[1]! - M2[2]! * bx[0]!) / det];
    const sy = [(M2[3]! * by[0]! - M2[1]! * by[1]!) / det, (M2[0]! * by[1]! - M2[2]! * by[0]!) / det];
    // Reconstruct the other vector from the nominal basis's shape.
    const [n1x, n1y, n2x, n2y] = a.basis;
    const vx = sx[1]!, vy = sy[1]!;
    const ux = along === 1 ? n1x : n2x, uy = along === 1 ? n1y : n2y;
    const wx = along === 1 ? n2x : n1x, wy = along === 1 ? n2y : n1y;
    // Similarity taking u → v applied to w.
    const den = ux * ux + uy * uy;
    const cr = (vx * ux + vy * uy) / den, sr = (vy * ux - vx * uy) / den;
    const ox2 = cr * wx - sr * wy, oy2 = sr * wx + cr * wy;
    cx = along === 1 ? [sx[0]!, vx, ox2] : [sx[0]!, ox2, vx];
    cy = along === 1 ? [sy[0]!, vy, oy2] : [sy[0]!, oy2, vy];
  } else {
    cx = sol(rx);
    cy = sol(ry);
  }
  if (!cx || !cy) return null;
  const b1x = cx[1], b2x = cx[2], b1y = cy[1], b2y = cy[2];
  const det = b1x * b2y - b2x * b1y;
  if (!(Math.abs(det) > 0)) return null;
  return {
    ox: cx[0],
    oy: cy[0],
    b1x,
    b1y,
    b2x,
    b2y,
    inv: [b2y / det, -b2x / det, -b1y / det, b1x / det],
    pitch: Math.min(Math.hypot(b1x, b1y), Math.hypot(b2x, b2y)),
  };
}

/** A bucket grid over the spots for radius queries. */
class SpotHash {
  readonly head: Int32Array;
  readonly next: Int32Array;
  readonly nx: number;
  readonly ny: number;
  readonly x0: number;
  readonly y0: number;
  readonly cell: number;
  constructor(
    readonly x: Float64Array,
    readonly y: Float64Array,
    cell: number,
  ) {
    let minX = Infinity, maxX = -Infinity, minY = Infinity, maxY = -Infinity;
    for (let k = 0; k < x.length; k++) {
      minX = Math.min(minX, x[k]!);
      maxX = Math.max(maxX, x[k]!);
      minY = Math.min(minY, y[k]!);
      maxY = Math.max(maxY, y[k]!);
    }
    if (x.length === 0) minX = maxX = minY = maxY = 0;
    // Cap the number of buckets for sparse or scattered inputs.
    let c = cell;
    while (((maxX - minX) / c + 1) * ((maxY - minY) / c + 1) > 4 * x.length + 1024) c *= 2;
    this.cell = c;
    this.x0 = minX;
    this.y0 = minY;
    this.nx = Math.floor((maxX - minX) / c) + 1;
    this.ny = Math.floor((maxY - minY) / c) + 1;
    this.head = new Int32Array(this.nx * this.ny).fill(-1);
    this.next = new Int32Array(x.length);
    for (let k = 0; k < x.length; k++) {
      const b = Math.floor((y[k]! - minY) / c) * this.nx + Math.floor((x[k]! - minX) / c);
      this.next[k] = this.head[b]!;
      this.head[b] = k;
    }
  }
  /** Calls `f(k, d²)` for each spot within `r` of (px, py). */
  query(px: number, py: number, r: number, f: (k: number, d2: number) => void): void {
    const c = this.cell;
    const i0 = Math.max(0, Math.floor((px - r - this.x0) / c)), i1 = Math.min(this.nx - 1, Math.floor((px + r - this.x0) / c));
    const j0 = Math.max(0, Math.floor((py - r - this.y0) / c)), j1 = Math.min(this.ny - 1, Math.floor((py + r - this.y0) / c));
    const r2 = r * r;
    for (let j = j0; j <= j1; j++) {
      for (let i = i0; i <= i1; i++) {
        for (let k = this.head[j * this.nx + i]!; k >= 0; k = this.next[k]!) {
          const dx = this.x[k]! - px, dy = this.y[k]! - py;
          const d2 = dx * dx + dy * dy;
          if (d2 <= r2) f(k, d2);
        }
      }
    }
  }
}

/**
 * Pair spots on the plane with the apertures that made them.
 *
 * `'nearest'` gives each spot to the nearest reference when it lies inside that cell by
 * at least `boundaryMargin`; two spots in one cell make the aperture ambiguous.
 *
 * `'grow'` starts from a spot whose neighbours sit where an undisturbed lattice puts
 * them, then repeatedly predicts the spot of an unmatched aperture next to matched ones
 * (the mean of its two neighbours on a line through it when both are matched, else a
 * linear extrapolation from two in a row, else the neighbour's own shift) and accepts the
 * one spot within `acceptRadius` of the prediction. Two spots there make the aperture
 * ambiguous; none leaves it for a better prediction later, or missing. A grown region is
 * fixed to the array by the lattice offset that leaves the fewest matched spots outside
 * the array (its edges), and, when the edges do not decide, by the mean shift closest to
 * `expectedShift`; a region that neither decides is flagged ambiguous. Further regions
 * are grown from the remaining spots in the same way.
 *
 * @param spots - Spot positions on the plane, metres: `{ x, y }` of equal length.
 * @param reference - The flat-water reference of the aperture array.
 * @param options - Method and tolerances.
 * @returns The pairing and its flags.
 * @throws {@link core!MeniscusTypeError} for mismatched array lengths;
 *   {@link core!MeniscusRangeError} for non-finite positions or options out of range.
 * @see Lee, J., Shack, R. V. & Descour, M. R. (2005), "Sorting method to extend the
 *   dynamic range of the Shack–Hartmann wave-front sensor", Applied Optics 44(23), 4838;
 *   Leroux, C. & Dainty, C. (2010), "Estimation of centroid positions with a matched-filter
 *   algorithm: relevance for aberrometry of the eye", Optics Express 18(2), 1197 (local
 *   spot ordering in the spirit used here).
 * @example
 * ```ts
 * const ref = referenceSpots(geometry, light);
 * const m = matchSpots({ x: planeX, y: planeY }, ref, { method: 'grow' });
 * m.matched, m.missing, m.extra;
 * ```
 */
export function matchSpots(spots: { readonly x: Float64Array; readonly y: Float64Array }, reference: SpotReference, options?: MatchSpotsOptions): SpotMatch {
  const fn = 'matchSpots';
  if (spots === null || typeof spots !== 'object') typeError(fn, 'spots', spots, 'an object { x, y } of Float64Arrays');
  const sx = checkFloat64Array(fn, 'spots.x', spots.x);
  const sy = checkFloat64Array(fn, 'spots.y', spots.y, 1, sx.length);
  for (let k = 0; k < sx.length; k++) {
    if (!Number.isFinite(sx[k]!) || !Number.isFinite(sy[k]!)) rangeError(fn, `spots[${k}]`, [sx[k], sy[k]], 'a finite position');
  }
  if (reference === null || typeof reference !== 'object' || reference.apertures === undefined) {
    typeError(fn, 'reference', reference, 'a SpotReference { apertures, x, y, status }');
  }
  const na = reference.apertures.count;
  checkFloat64Array(fn, 'reference.x', reference.x, 1, na);
  checkFloat64Array(fn, 'reference.y', reference.y, 1, na);
  if (!(reference.status instanceof Uint8Array) || reference.status.length !== na) {
    typeError(fn, 'reference.status', reference.status, `a Uint8Array of length ${na}`);
  }
  const o = checkOptions(fn, options);
  const method = o.method === undefined ? 'grow' : checkOneOf(fn, 'options.method', o.method, ['nearest', 'grow'] as const);
  const acceptRadius = o.acceptRadius === undefined ? 0.25 : checkPositive(fn, 'options.acceptRadius', o.acceptRadius);
  if (!(acceptRadius < 0.5)) rangeError(fn, 'options.acceptRadius', acceptRadius, 'a fraction of the pitch below 0.5');
  const margin = o.boundaryMargin === undefined ? 0.05 : checkFinite(fn, 'options.boundaryMargin', o.boundaryMargin);
  if (!(margin >= 0 && margin < 0.5)) rangeError(fn, 'options.boundaryMargin', margin, 'a fraction of the pitch in [0, 0.5)');
  const offsetMargin = o.offsetMargin === undefined ? 0.2 : checkFinite(fn, 'options.offsetMargin', o.offsetMargin);
  if (!(offsetMargin >= 0 && offsetMargin < 0.5)) rangeError(fn, 'options.offsetMargin', offsetMargin, 'a fraction of the pitch in [0, 0.5)');
  const minRegion = o.minRegion === undefined ? 4 : checkInteger(fn, 'options.minRegion', o.minRegion, 1);
  let ex = 0, ey = 0;
  if (o.expectedShift !== undefined) {
    if (!Array.isArray(o.expectedShift) || o.expectedShift.length !== 2) typeError(fn, 'options.expectedShift', o.expectedShift, 'a pair [dx, dy] in metres');
    ex = checkFinite(fn, 'options.expectedShift[0]', o.expectedShift[0]);
    ey = checkFinite(fn, 'options.expectedShift[1]', o.expectedShift[1]);
  }
  const aff = fitAffine(reference);
  const ns = sx.length;
  const spotOfAperture = new Int32Array(na).fill(-1);
  const apertureStatus = new Uint8Array(na).fill(Status.unmatched);
  const apertureOfSpot = new Int32Array(ns).fill(-1);
  const spotStatus = new Uint8Array(ns).fill(Status.unmatched);
  for (let k = 0; k < na; k++) if (reference.status[k] !== Status.ok) apertureStatus[k] = Status.masked;
  const finish = (regions: number): SpotMatch => {
    let matched = 0, missing = 0, ambiguous = 0, extra = 0;
    for (let k = 0; k < na; k++) {
      const s = apertureStatus[k]!;
      if (s === Status.ok) matched++;
      else if (s === Status.unmatched) missing++;
      else if (s === Status.ambiguous) ambiguous++;
    }
    for (let k = 0; k < ns; k++) if (spotStatus[k] === Status.unmatched) extra++;
    return { spotOfAperture, apertureStatus, apertureOfSpot, spotStatus, matched, missing, extra, ambiguous, regions };
  };
  if (aff === null || ns === 0) return finish(0);
  const hash = new SpotHash(sx, sy, aff.pitch);
  if (method === 'nearest') {
    matchNearest(reference, aff, hash, margin, ex, ey, spotOfAperture, apertureStatus, apertureOfSpot, spotStatus);
    return finish(1);
  }
  const regions = matchGrow(reference, aff, hash, acceptRadius, offsetMargin, minRegion, ex, ey, spotOfAperture, apertureStatus, apertureOfSpot, spotStatus);
  return finish(regions);
}

function matchNearest(
  ref: SpotReference,
  aff: Affine,
  hash: SpotHash,
  margin: number,
  ex: number,
  ey: number,
  spotOfAperture: Int32Array,
  apertureStatus: Uint8Array,
  apertureOfSpot: Int32Array,
  spotStatus: Uint8Array,
): void {
  const a = ref.apertures;
  const ns = hash.x.length;
  const count = new Int32Array(a.count);
  const choice = new Int32Array(ns).fill(-1);
  for (let s = 0; s < ns; s++) {
    const px = hash.x[s]! - ex - aff.ox, py = hash.y[s]! - ey - aff.oy;
    const fi = aff.inv[0] * px + aff.inv[1] * py, fj = aff.inv[2] * px + aff.inv[3] * py;
    const ci = Math.round(fi), cj = Math.round(fj);
    let best = -1, d1 = Infinity, d2 = Infinity;
    for (let dj = -2; dj <= 2; dj++) {
      for (let di = -2; di <= 2; di++) {
        const k = apertureAt(a, ci + di, cj + dj);
        // Virtual neighbours outside the array still bound the cell.
        let rx: number, ry: number;
        if (k >= 0 && ref.status[k] === Status.ok) {
          rx = ref.x[k]!;
          ry = ref.y[k]!;
        } else {
          rx = aff.ox + (ci + di) * aff.b1x + (cj + dj) * aff.b2x;
          ry = aff.oy + (ci + di) * aff.b1y + (cj + dj) * aff.b2y;
        }
        const d = Math.hypot(hash.x[s]! - ex - rx, hash.y[s]! - ey - ry);
        if (d < d1) {
          d2 = d1;
          d1 = d;
          best = k >= 0 && ref.status[k] === Status.ok ? k : -2;
        } else if (d < d2) d2 = d;
      }
    }
    // Perpendicular distance to the bisector of the two nearest references ≈ (d2² − d1²)/(2·pitch).
    const toBoundary = (d2 * d2 - d1 * d1) / (2 * aff.pitch);
    if (best === -2) continue; // nearest to no aperture: an extra spot
    if (!(toBoundary > margin * aff.pitch)) {
      spotStatus[s] = Status.ambiguous;
      continue;
    }
    choice[s] = best;
    count[best]!++;
  }
  for (let s = 0; s < ns; s++) {
    const k = choice[s]!;
    if (k < 0) continue;
    if (count[k] === 1) {
      spotOfAperture[k] = s;
      apertureOfSpot[s] = k;
      apertureStatus[k] = Status.ok;
      spotStatus[s] = Status.ok;
    } else {
      apertureStatus[k] = Status.ambiguous;
      spotStatus[s] = Status.ambiguous;
    }
  }
}

function matchGrow(
  ref: SpotReference,
  aff: Affine,
  hash: SpotHash,
  acceptRadius: number,
  offsetMargin: number,
  minRegion: number,
  ex: number,
  ey: number,
  spotOfAperture: Int32Array,
  apertureStatus: Uint8Array,
  apertureOfSpot: Int32Array,
  spotStatus: Uint8Array,
): number {
  const a = ref.apertures;
  const ns = hash.x.length;
  const nb = latticeNeighbours(a);
  const nd = nb.length;
  const pitch = aff.pitch;
  const r = acceptRadius * pitch;
  // Extended node rectangle in axial indices: the array plus a margin.
  const M = 4;
  let imin = Infinity, imax = -Infinity, jmin = Infinity, jmax = -Infinity;
  for (let k = 0; k < a.count; k++) {
    imin = Math.min(imin, a.indices[2 * k]!);
    imax = Math.max(imax, a.indices[2 * k]!);
    jmin = Math.min(jmin, a.indices[2 * k + 1]!);
    jmax = Math.max(jmax, a.indices[2 * k + 1]!);
  }
  imin -= M;
  imax += M;
  jmin -= M;
  jmax += M;
  const W = imax - imin + 1, H = jmax - jmin + 1;
  const nodeOf = (i: number, j: number): number => (i < imin || i > imax || j < jmin || j > jmax ? -1 : (j - jmin) * W + (i - imin));
  const refX = new Float64Array(W * H), refY = new Float64Array(W * H);
  for (let j = jmin; j <= jmax; j++) {
    for (let i = imin; i <= imax; i++) {
      const n = nodeOf(i, j);
      const k = apertureAt(a, i, j);
      if (k >= 0 && ref.status[k] === Status.ok) {
        refX[n] = ref.x[k]!;
        refY[n] = ref.y[k]!;
      } else {
        refX[n] = aff.ox + i * aff.b1x + j * aff.b2x;
        refY[n] = aff.oy + i * aff.b1y + j * aff.b2y;
      }
    }
  }
  const used = new Uint8Array(ns); // spot consumed by some region (matched, extra or ambiguous)
  const nodeSpot = new Int32Array(W * H);
  const nodeTried = new Uint8Array(W * H); // highest tier attempted
  const nodeAmb = new Uint8Array(W * H);
  const spotNode = new Int32Array(ns);
  const apAmb = new Uint8Array(a.count);
  let regions = 0;
  const order = Array.from({ length: ns }, (_, k) => k);
  // Seeds are tried from the array's centre outwards.
  let cxr = 0, cyr = 0, nr = 0;
  for (let k = 0; k < a.count; k++) if (ref.status[k] === Status.ok) { cxr += ref.x[k]!; cyr += ref.y[k]!; nr++; }
  cxr /= Math.max(1, nr);
  cyr /= Math.max(1, nr);
  const dist = new Float64Array(ns);
  for (let k = 0; k < ns; k++) dist[k] = Math.hypot(hash.x[k]! - cxr, hash.y[k]! - cyr);
  order.sort((p, q) => dist[p]! - dist[q]!);
  let seedCursor = 0;
  const queues: number[][] = [[], [], [], []];
  const qhead = [0, 0, 0, 0];
  const pred = [0, 0, 0, 0]; // tier, px, py (displacement), count

  const predict = (n: number, i: number, j: number): void => {
    // Best tier of prediction available at node n from its labelled neighbours.
    let t3x = 0, t3y = 0, t3 = 0, t2x = 0, t2y = 0, t2 = 0, t1x = 0, t1y = 0, t1 = 0;
    for (let e = 0; e < nd; e++) {
      const di = nb[e]![0], dj = nb[e]![1];
      const n1 = nodeOf(i + di, j + dj);
      if (n1 < 0 || nodeSpot[n1]! < 0) continue;
      const s1 = nodeSpot[n1]!;
      const d1x = hash.x[s1]! - refX[n1]!, d1y = hash.y[s1]! - refY[n1]!;
      t1x += d1x;
      t1y += d1y;
      t1++;
      if (e % 2 === 0) {
        const nm = nodeOf(i - di, j - dj);
        if (nm >= 0 && nodeSpot[nm]! >= 0) {
          const sm = nodeSpot[nm]!;
          t3x += 0.5 * (d1x + hash.x[sm]! - refX[nm]!);
          t3y += 0.5 * (d1y + hash.y[sm]! - refY[nm]!);
          t3++;
        }
      }
      const n2 = nodeOf(i + 2 * di, j + 2 * dj);
      if (n2 >= 0 && nodeSpot[n2]! >= 0) {
        const s2 = nodeSpot[n2]!;
        t2x += 2 * d1x - (hash.x[s2]! - refX[n2]!);
        t2y += 2 * d1y - (hash.y[s2]! - refY[n2]!);
        t2++;
      }
    }
    if (t3 > 0) {
      pred[0] = 3;
      pred[1] = t3x / t3;
      pred[2] = t3y / t3;
      pred[3] = t3;
    } else if (t2 > 0) {
      pred[0] = 2;
      pred[1] = t2x / t2;
      pred[2] = t2y / t2;
      pred[3] = t2;
    } else if (t1 > 0) {
      pred[0] = 1;
      pred[1] = t1x / t1;
      pred[2] = t1y / t1;
      pred[3] = t1;
    } else pred[0] = 0;
  };
  const pushNeighbours = (i: number, j: number): void => {
    for (let e = 0; e < nd; e++) {
      const i2 = i + nb[e]![0], j2 = j + nb[e]![1];
      const n2 = nodeOf(i2, j2);
      if (n2 < 0 || nodeSpot[n2]! >= 0) continue;
      predict(n2, i2, j2);
      if (pred[0]! > nodeTried[n2]!) queues[pred[0]!]!.push(n2);
    }
  };

  const candidates: number[] = [];
  for (;;) {
    // ---- pick a seed among the unused spots
    let seed = -1, seedI = 0, seedJ = 0;
    while (seedCursor < ns) {
      const s = order[seedCursor++]!;
      if (used[s]) continue;
      const px = hash.x[s]! - ex - aff.ox, py = hash.y[s]! - ey - aff.oy;
      const fi = aff.inv[0] * px + aff.inv[1] * py, fj = aff.inv[2] * px + aff.inv[3] * py;
      // Nearest lattice node (check the four surrounding ones).
      let bi = 0, bj = 0, bd = Infinity;
      for (const ci of [Math.floor(fi), Math.floor(fi) + 1]) {
        for (const cj of [Math.floor(fj), Math.floor(fj) + 1]) {
          const dx = px - ci * aff.b1x - cj * aff.b2x, dy = py - ci * aff.b1y - cj * aff.b2y;
          const d = dx * dx + dy * dy;
          if (d < bd) {
            bd = d;
            bi = ci;
            bj = cj;
          }
        }
      }
      if (nodeOf(bi, bj) < 0) continue;
      // Alone within half a pitch, with a regular neighbourhood.
      let close = 0;
      hash.query(hash.x[s]!, hash.y[s]!, 0.5 * pitch, (k) => {
        if (k !== s && !used[k]) close++;
      });
      if (close > 0) continue;
      let good = 0;
      for (let e = 0; e < nd; e++) {
        const di = nb[e]![0], dj = nb[e]![1];
        const qx = hash.x[s]! + di * aff.b1x + dj * aff.b2x, qy = hash.y[s]! + di * aff.b1y + dj * aff.b2y;
        let within = 0, near = 0;
        hash.query(qx, qy, 0.5 * pitch, (k, d2) => {
          if (used[k]) return;
          near++;
          if (d2 <= 0.15 * 0.15 * pitch * pitch) within++;
        });
        if (within === 1 && near === 1) good++;
      }
      if (good >= nd - 1) {
        seed = s;
        seedI = bi;
        seedJ = bj;
        break;
      }
    }
    if (seed < 0) break;
    // ---- grow a region from the seed
    nodeSpot.fill(-1);
    nodeTried.fill(0);
    nodeAmb.fill(0);
    const region: number[] = [];
    const seedNode = nodeOf(seedI, seedJ);
    nodeSpot[seedNode] = seed;
    spotNode[seed] = seedNode;
    used[seed] = 1;
    region.push(seedNode);
    const regionAmbSpots: number[] = [];
    for (let t = 0; t < 4; t++) {
      queues[t]!.length = 0;
      qhead[t] = 0;
    }
    pushNeighbours(seedI, seedJ);
    for (;;) {
      let tier = 3;
      while (tier > 0 && qhead[tier]! >= queues[tier]!.length) tier--;
      if (tier === 0) break;
      const n = queues[tier]![qhead[tier]!++]!;
      if (nodeSpot[n]! >= 0) continue;
      const i = (n % W) + imin, j = Math.floor(n / W) + jmin;
      predict(n, i, j);
      const t = pred[0]!;
      if (t <= nodeTried[n]!) continue;
      if (t > tier) {
        queues[t]!.push(n);
        continue;
      }
      nodeTried[n] = t;
      const qx = refX[n]! + pred[1]!, qy = refY[n]! + pred[2]!;
      candidates.length = 0;
      hash.query(qx, qy, r, (k) => {
        if (!used[k]) candidates.push(k);
      });
      if (candidates.length === 1) {
        const s = candidates[0]!;
        nodeSpot[n] = s;
        spotNode[s] = n;
        used[s] = 1;
        nodeAmb[n] = 0;
        region.push(n);
        pushNeighbours(i, j);
      } else if (candidates.length > 1) {
        nodeAmb[n] = 1;
        for (const k of candidates) regionAmbSpots.push(k);
      }
    }
    regions++;
    // ---- fix the region to the array: the lattice offset leaving the fewest spots outside
    let best: { di: number; dj: number; out: number; shift: number }[] = [];
    let mx = 0, my = 0;
    for (const n of region) {
      const s = nodeSpot[n]!;
      mx += hash.x[s]! - refX[n]!;
      my += hash.y[s]! - refY[n]!;
    }
    mx /= region.length;
    my /= region.length;
    // Which nodes of the rectangle widened by M can still take a spot: an aperture with a
    // reference, not yet matched.
    const FW = W + 2 * M, FH = H + 2 * M;
    const free = new Uint8Array(FW * FH);
    for (let fj = 0; fj < FH; fj++) {
      for (let fi = 0; fi < FW; fi++) {
        const k = apertureAt(a, fi - M + imin, fj - M + jmin);
        free[fj * FW + fi] = k >= 0 && ref.status[k] === Status.ok && apertureStatus[k] !== Status.ok ? 1 : 0;
      }
    }
    const regionCell = new Int32Array(region.length);
    for (let t = 0; t < region.length; t++) {
      const n = region[t]!;
      regionCell[t] = (Math.floor(n / W) + M) * FW + (n % W) + M;
    }
    for (let dj = -M; dj <= M; dj++) {
      for (let di = -M; di <= M; di++) {
        let out = 0;
        const shift = dj * FW + di;
        for (let t = 0; t < regionCell.length; t++) if (!free[regionCell[t]! + shift]) out++;
        // Mean shift under this offset: the labels' shift minus the lattice step.
        const sxm = mx - di * aff.b1x - dj * aff.b2x - ex, sym = my - di * aff.b1y - dj * aff.b2y - ey;
        best.push({ di, dj, out, shift: Math.hypot(sxm, sym) });
      }
    }
    best.sort((p, q) => p.out - q.out || p.shift - q.shift);
    const b0 = best[0]!;
    // Offsets whose outside count is close to the best one cannot be told apart by the edges.
    const tol = Math.max(2, Math.ceil(0.02 * region.length));
    const rivals = best.filter((c) => c !== b0 && c.out <= b0.out + tol);
    let decided = true;
    let chosen = b0;
    if (rivals.length > 0) {
      const pool = [b0, ...rivals].sort((p, q) => p.shift - q.shift);
      chosen = pool[0]!;
      if (!(pool[1]!.shift - chosen.shift > offsetMargin * pitch)) decided = false;
      if (chosen.out > b0.out + tol) decided = false;
    }
    if (region.length < minRegion) decided = false;
    if (!decided) {
      // The region cannot be tied to the array: its spots are flagged, not paired.
      for (const n of region) spotStatus[nodeSpot[n]!] = Status.ambiguous;
      continue;
    }
    for (const n of region) {
      const s = nodeSpot[n]!;
      const i = (n % W) + imin + chosen.di, j = Math.floor(n / W) + jmin + chosen.dj;
      const k = apertureAt(a, i, j);
      if (k < 0 || ref.status[k] !== Status.ok || apertureStatus[k] === Status.ok) {
        spotStatus[s] = Status.unmatched; // a spot beyond the array: an extra
        continue;
      }
      spotOfAperture[k] = s;
      apertureOfSpot[s] = k;
      apertureStatus[k] = Status.ok;
      spotStatus[s] = Status.ok;
    }
    for (let n = 0; n < W * H; n++) {
      if (!nodeAmb[n] || nodeSpot[n]! >= 0) continue;
      const i = (n % W) + imin + chosen.di, j = Math.floor(n / W) + jmin + chosen.dj;
      const k = apertureAt(a, i, j);
      if (k >= 0 && apertureStatus[k] === Status.unmatched) apAmb[k] = 1;
    }
    for (const k of regionAmbSpots) if (spotStatus[k] !== Status.ok && !used[k]) spotStatus[k] = Status.ambiguous;
  }
  for (let k = 0; k < a.count; k++) if (apAmb[k] && apertureStatus[k] === Status.unmatched) apertureStatus[k] = Status.ambiguous;
  return regions;
}
