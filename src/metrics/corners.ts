/**
 * Automatic detection of the inner corners of a checkerboard seen in an image (possibly
 * distorted by a water surface or a lens), with sub-pixel refinement and indexing into
 * the board's columns and rows.
 *
 * Three stages:
 * 1. Saddle points: the image is smoothed with a Gaussian of `sigma` pixels and the
 *    response `R = Ixy² − Ixx·Iyy` (minus the Hessian determinant, large and positive at
 *    the X-junction where four squares meet) is thresholded and non-maximum suppressed.
 * 2. Lattice growth: from a seed corner with four neighbours in two nearly opposite pairs,
 *    the lattice grows best-first, one slot at a time. Each empty slot next to the indexed
 *    corners is predicted from the local lattice vectors of its indexed neighbours: the
 *    parallelogram completion `P(i−1, j) + P(i, j−1) − P(i−1, j−1)` of every cell around
 *    it whose other three corners are known (exact for any locally affine map), or, where
 *    there is none, the extension `2P(i−1) − P(i−2)` of a lattice line; slots with more
 *    cell completions are filled first. No global affine map or homography is assumed,
 *    so smooth distortions are followed. The candidate nearest the prediction, within 0.7
 *    of the local side, is accepted only if it has the opposite saddle polarity to each
 *    indexed 4-neighbour (checkerboard colours alternate) and a response within a factor
 *    10 of theirs; if the segment to each of them runs along a square's side (the image
 *    differs with one sign across it all along: a diagonal or a jump into the next row
 *    crosses squares); if it folds no cell and keeps the sides along a line within a
 *    factor 3; if it looks the same after a half turn about itself (point symmetry, which
 *    rejects the L-junctions at the board's rim and the T-junctions where an occluder's
 *    edge crosses the squares); and if no second such candidate is nearly as close
 *    (ambiguous slots stay empty). A slot without an acceptable candidate is reported as
 *    missing; where a line's next slot is missing, one corner is stepped over.
 * 3. Sub-pixel refinement by the gradient-orthogonality condition: every image gradient
 *    near the corner is orthogonal to the vector from the corner to its pixel; the
 *    weighted least-squares solution is iterated with a smooth weight re-centred on each
 *    new estimate, so that the window stays symmetric about the corner.
 *
 * Accuracy on rendered anti-aliased boards at good contrast (see the tests): about
 * 0.01–0.03 px RMS undistorted; under strong local warps the curved edges add a bias of
 * up to about 0.1–0.3 px. Indexing on those boards (squares of 24 px, smooth sinusoidal
 * warps of peak displacement `a` and wavelength `λ`, peak displacement gradient
 * `g = 2πa/λ`): every corner found at its true index up to `g = 0.42` (a displacement
 * of a third of a square at `λ` = 5 squares, a quarter at 3.75 squares); beyond that,
 * and for waves shorter than about 3 squares, corners go missing, but in the tests up to
 * `g = 0.84` none was given a wrong index.
 *
 * @module
 */
import { checkImage, checkInteger, checkOptions, checkPositive, rangeError, typeError } from '../core/index.js';
import type { Image } from '../core/index.js';
import { blurClamped, gaussianKernel1d } from './filter.js';
import type { CornerLattice } from './lattice.js';

/** Options of {@link detectCheckerboardCorners}. */
export interface CheckerboardOptions {
  /**
   * Standard deviation of the smoothing before the saddle response, pixels. Larger
   * values suit blurred or noisy images; squares should be at least about `6·sigma`
   * pixels wide.
   * @defaultValue 1.5
   */
  sigma?: number;
  /**
   * Saddle candidates must have a response above this fraction of the strongest one.
   * @defaultValue 0.02
   */
  threshold?: number;
  /**
   * Fewest indexed corners for a board to count as found. Growth starts from a corner
   * whose four neighbours are all seen, so a board needs at least 3 × 3 inner corners.
   * @defaultValue 9
   */
  minCorners?: number;
  /**
   * Largest half-width of the sub-pixel refinement window, pixels. The window used at a
   * corner is `0.4 ×` the distance to its nearest indexed neighbour, clamped to
   * `[2, maxRefineRadius]`.
   * @defaultValue 8
   */
  maxRefineRadius?: number;
  /**
   * Refine the corners by the gradient-orthogonality condition. With `false` they keep
   * the coarse saddle estimate of the smoothed image (a few tenths of a pixel).
   * @defaultValue true
   */
  refine?: boolean;
}

/** The result of {@link detectCheckerboardCorners}. */
export interface CheckerboardDetection extends CornerLattice {
  /**
   * `'ok'` when a board of at least `minCorners` corners was indexed; `'notFound'`
   * otherwise (then `columns`, `rows` and `count` are 0 and the arrays empty).
   */
  readonly status: 'ok' | 'notFound';
  /** Number of indexed corners (`found` flags set). */
  readonly count: number;
  /** Saddle candidates found before the lattice growth (a diagnostic). */
  readonly candidates: number;
}

const NOT_FOUND_EMPTY = (candidates: number): CheckerboardDetection => ({
  status: 'notFound',
  columns: 0,
  rows: 0,
  points: new Float64Array(0),
  found: new Uint8Array(0),
  count: 0,
  candidates,
});

/** Most saddle candidates kept (the strongest), to bound the cost on textured images. */
const MAX_CANDIDATES = 20000;
/** Seeds whose cross of four neighbours passes the test, tried at most. */
const MAX_SEEDS = 8;
/** Search radius for a corner stepped over, as a fraction of the local step. */
const SEARCH_FRACTION = 0.45;
/**
 * Search radius for a neighbour, as a fraction of the shortest side its prediction used.
 * Wide, so that the prediction may miss by most of a side where the squares' size changes
 * fast; polarity, the edge test, the fold test and the ambiguity test keep the corners of
 * other slots out.
 */
const NEIGHBOUR_SEARCH = 0.7;
/** Smallest cosine of the angle between one of the seed's neighbours and the reverse of the opposite one (40°). */
const SEED_OPPOSITE = 0.766;
/** Accepted response ratio between neighbours (either way). */
const RESPONSE_RATIO = 0.1;
/** Radius of the point-symmetry test, as a fraction of the local step. */
const SYMMETRY_RADIUS = 0.25;
/** Largest asymmetry (see `isSymmetric`) of an accepted corner. */
const MAX_ASYMMETRY = 0.3;
/** Offset of the edge test's samples from the segment, as a fraction of its length. */
const EDGE_OFFSET = 0.2;
/** Smallest intensity step across a side in the edge test, as a fraction of the samples' spread. */
const EDGE_CONTRAST = 0.4;
/** Largest ratio between a new side and the next side along the same lattice line. */
const MAX_SIDE_RATIO = 3;
/** Smallest `sin` of the angle between two sides at a new corner (about 10°). */
const MIN_TURN = 0.17;
/** A search is ambiguous when a second fitting candidate is less than `1 / AMBIGUITY` times farther than the nearest. */
const AMBIGUITY = 0.6;

/**
 * Detect and index the inner corners of a checkerboard.
 *
 * The lattice's column axis is the one closer to the image's x axis, with columns
 * numbered left to right and rows top to bottom; index `(0, 0)` is the first column and
 * row in which any corner was found. A board is symmetric, so which physical corner is
 * `(0, 0)` cannot be told from the image alone; where corners are missing on the whole
 * first row or column, the indices start at the first one found.
 *
 * Multi-channel images are reduced to their ITU-R BT.709 luminance (3 or 4 channels) or
 * their first channel (2 channels).
 *
 * @param image - The image (linear intensity; any scale).
 * @param options - Smoothing, thresholds, refinement.
 * @returns The indexed corners, or `status: 'notFound'` when no board is seen (not an error).
 * @throws {@link core!MeniscusTypeError} for a malformed image or options.
 * @throws {@link core!MeniscusRangeError} for non-finite pixels or options out of range.
 * @see Förstner & Gülch (1987), "A fast operator for detection and precise location of
 *   distinct points, corners and centres of circular features", ISPRS Intercommission
 *   Conference on Fast Processing of Photogrammetric Data, Interlaken, 281–305
 *   (gradient-orthogonality refinement).
 * @see Lucchese & Mitra (2002), "Using saddle points for subpixel feature detection in
 *   camera calibration targets", Asia-Pacific Conference on Circuits and Systems, vol. 2,
 *   191–195 (checkerboard corners as saddle points of the smoothed image; the coarse
 *   estimate here is the stationary point of the local quadratic).
 * @see Beaudet (1978), "Rotationally invariant image operators", 4th International Joint
 *   Conference on Pattern Recognition, Kyoto, 579–583 (the Hessian-determinant operator).
 * @example
 * ```ts
 * const det = detectCheckerboardCorners(frame);
 * if (det.status === 'ok') console.log(det.columns, det.rows, det.count);
 * ```
 */
export function detectCheckerboardCorners(image: Image, options?: CheckerboardOptions): CheckerboardDetection {
  const fn = 'detectCheckerboardCorners';
  const o = checkOptions(fn, options);
  checkImage(fn, 'image', image);
  const sigma = o.sigma === undefined ? 1.5 : checkPositive(fn, 'options.sigma', o.sigma);
  if (!(sigma <= 20)) rangeError(fn, 'options.sigma', sigma, 'a number in (0, 20]');
  let threshold = 0.02;
  if (o.threshold !== undefined) {
    threshold = checkPositive(fn, 'options.threshold', o.threshold);
    if (!(threshold < 1)) rangeError(fn, 'options.threshold', threshold, 'a number in (0, 1)');
  }
  const minCorners = o.minCorners === undefined ? 9 : checkInteger(fn, 'options.minCorners', o.minCorners, 4, 1e6);
  const maxRefine = o.maxRefineRadius === undefined ? 8 : checkInteger(fn, 'options.maxRefineRadius', o.maxRefineRadius, 2, 64);
  if (o.refine !== undefined && typeof o.refine !== 'boolean') typeError(fn, 'options.refine', o.refine, 'true or false');
  const refine = o.refine !== false;

  const { width: W, height: H } = image;
  const radius = Math.max(1, Math.ceil(3 * sigma));
  if (W < 2 * radius + 5 || H < 2 * radius + 5) return NOT_FOUND_EMPTY(0);

  const grey = greyPlane(image);
  const S = new Float32Array(W * H);
  const tmp = new Float32Array(W * H);
  blurClamped(grey, W, H, gaussianKernel1d(sigma, radius), tmp, S);

  const cand = saddleCandidates(S, W, H, sigma, threshold, tmp);
  const nc = cand.x.length;
  if (nc < minCorners) return NOT_FOUND_EMPTY(nc);

  const lattice = growBest(cand, S, W, H, minCorners);
  if (lattice === null) return NOT_FOUND_EMPTY(nc);

  // Index bounds and orientation.
  const { ii, jj, idx } = lattice;
  const m = idx.length;
  let ux = 0;
  let uy = 0;
  let vx = 0;
  let vy = 0;
  const key = new Map<number, number>();
  for (let t = 0; t < m; t++) key.set(packKey(ii[t]!, jj[t]!), idx[t]!);
  for (let t = 0; t < m; t++) {
    const c = idx[t]!;
    const r = key.get(packKey(ii[t]! + 1, jj[t]!));
    if (r !== undefined) {
      ux += cand.x[r]! - cand.x[c]!;
      uy += cand.y[r]! - cand.y[c]!;
    }
    const d = key.get(packKey(ii[t]!, jj[t]! + 1));
    if (d !== undefined) {
      vx += cand.x[d]! - cand.x[c]!;
      vy += cand.y[d]! - cand.y[c]!;
    }
  }
  const swap = Math.abs(ux) / Math.hypot(ux, uy) < Math.abs(vx) / Math.hypot(vx, vy);
  const ci = new Int32Array(m);
  const cj = new Int32Array(m);
  for (let t = 0; t < m; t++) {
    ci[t] = swap ? jj[t]! : ii[t]!;
    cj[t] = swap ? ii[t]! : jj[t]!;
  }
  const colX = swap ? vx : ux;
  const rowY = swap ? uy : vy;
  if (colX < 0) for (let t = 0; t < m; t++) ci[t] = -ci[t]!;
  if (rowY < 0) for (let t = 0; t < m; t++) cj[t] = -cj[t]!;
  let imin = Infinity;
  let imax = -Infinity;
  let jmin = Infinity;
  let jmax = -Infinity;
  for (let t = 0; t < m; t++) {
    imin = Math.min(imin, ci[t]!);
    imax = Math.max(imax, ci[t]!);
    jmin = Math.min(jmin, cj[t]!);
    jmax = Math.max(jmax, cj[t]!);
  }
  const columns = imax - imin + 1;
  const rows = jmax - jmin + 1;
  const slot = new Int32Array(columns * rows).fill(-1);
  for (let t = 0; t < m; t++) slot[(cj[t]! - jmin) * columns + (ci[t]! - imin)] = idx[t]!;

  const points = new Float64Array(2 * columns * rows).fill(NaN);
  const found = new Uint8Array(columns * rows);
  let count = 0;
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const k = j * columns + i;
      const c = slot[k]!;
      if (c < 0) continue;
      let x = cand.x[c]!;
      let y = cand.y[c]!;
      if (refine) {
        // Window from the nearest indexed neighbour.
        let near = Infinity;
        const nb = [i > 0 ? slot[k - 1]! : -1, i + 1 < columns ? slot[k + 1]! : -1, j > 0 ? slot[k - columns]! : -1, j + 1 < rows ? slot[k + columns]! : -1];
        for (const n of nb) if (n >= 0) near = Math.min(near, Math.hypot(cand.x[n]! - x, cand.y[n]! - y));
        const w = Math.max(2, Math.min(maxRefine, Math.floor(0.4 * near)));
        const r = refineCorner(S, W, H, x, y, w);
        if (r === null) continue;
        x = r[0];
        y = r[1];
      }
      points[2 * k] = x;
      points[2 * k + 1] = y;
      found[k] = 1;
      count++;
    }
  }
  if (count < minCorners) return NOT_FOUND_EMPTY(nc);
  return { status: 'ok', columns, rows, points, found, count, candidates: nc };
}

/** Luminance or first channel as a Float32 plane (the image's own data when it has one channel; only read). */
function greyPlane(image: Image): Float32Array {
  const { width, height, channels, data } = image;
  const n = width * height;
  if (channels === 1) return data;
  const out = new Float32Array(n);
  if (channels >= 3) {
    for (let k = 0; k < n; k++) {
      const o = k * channels;
      out[k] = 0.2126 * data[o]! + 0.7152 * data[o + 1]! + 0.0722 * data[o + 2]!;
    }
  } else {
    for (let k = 0; k < n; k++) out[k] = data[k * channels]!;
  }
  return out;
}

/** Saddle candidates of the smoothed image, with their Hessians. */
interface Candidates {
  readonly x: Float64Array;
  readonly y: Float64Array;
  readonly r: Float64Array;
  readonly hxx: Float64Array;
  readonly hxy: Float64Array;
  readonly hyy: Float64Array;
}

function saddleCandidates(S: Float32Array, W: number, H: number, sigma: number, threshold: number, R: Float32Array): Candidates {
  R.fill(0);
  const margin = 2;
  let maxR = 0;
  for (let j = margin; j < H - margin; j++) {
    const row = j * W;
    for (let i = margin; i < W - margin; i++) {
      const k = row + i;
      const c = S[k]!;
      const ixx = S[k + 1]! - 2 * c + S[k - 1]!;
      const iyy = S[k + W]! - 2 * c + S[k - W]!;
      const ixy = 0.25 * (S[k + W + 1]! - S[k + W - 1]! - S[k - W + 1]! + S[k - W - 1]!);
      const r = ixy * ixy - ixx * iyy;
      if (r > 0) {
        R[k] = r;
        if (r > maxR) maxR = r;
      }
    }
  }
  const empty: Candidates = {
    x: new Float64Array(0),
    y: new Float64Array(0),
    r: new Float64Array(0),
    hxx: new Float64Array(0),
    hxy: new Float64Array(0),
    hyy: new Float64Array(0),
  };
  if (!(maxR > 0)) return empty;
  const thr = threshold * maxR;
  const nr = Math.max(2, Math.round(2 * sigma));
  const ks: number[] = [];
  for (let j = margin + 1; j < H - margin - 1; j++) {
    const row = j * W;
    for (let i = margin + 1; i < W - margin - 1; i++) {
      const k = row + i;
      const r = R[k]!;
      if (!(r > thr)) continue;
      let isMax = true;
      const j0 = Math.max(0, j - nr);
      const j1 = Math.min(H - 1, j + nr);
      const i0 = Math.max(0, i - nr);
      const i1 = Math.min(W - 1, i + nr);
      for (let b = j0; b <= j1 && isMax; b++) {
        const rb = b * W;
        for (let a = i0; a <= i1; a++) {
          const q = rb + a;
          const v = R[q]!;
          // Ties go to the first pixel in scan order.
          if (v > r || (v === r && q < k)) {
            isMax = false;
            break;
          }
        }
      }
      if (isMax) ks.push(k);
    }
  }
  if (ks.length > MAX_CANDIDATES) {
    ks.sort((a, b) => R[b]! - R[a]!);
    ks.length = MAX_CANDIDATES;
  }
  const n = ks.length;
  const out: Candidates = {
    x: new Float64Array(n),
    y: new Float64Array(n),
    r: new Float64Array(n),
    hxx: new Float64Array(n),
    hxy: new Float64Array(n),
    hyy: new Float64Array(n),
  };
  for (let t = 0; t < n; t++) {
    const k = ks[t]!;
    const i = k % W;
    const j = (k - i) / W;
    const c = S[k]!;
    const ixx = S[k + 1]! - 2 * c + S[k - 1]!;
    const iyy = S[k + W]! - 2 * c + S[k - W]!;
    const ixy = 0.25 * (S[k + W + 1]! - S[k + W - 1]! - S[k - W + 1]! + S[k - W - 1]!);
    const gx = 0.5 * (S[k + 1]! - S[k - 1]!);
    const gy = 0.5 * (S[k + W]! - S[k - W]!);
    // Newton step to the stationary point of the local quadratic.
    const det = ixx * iyy - ixy * ixy;
    let dx = 0;
    let dy = 0;
    if (det !== 0) {
      dx = -(iyy * gx - ixy * gy) / det;
      dy = -(ixx * gy - ixy * gx) / det;
      if (!(Math.abs(dx) <= 1 && Math.abs(dy) <= 1)) {
        dx = 0;
        dy = 0;
      }
    }
    out.x[t] = i + dx;
    out.y[t] = j + dy;
    out.r[t] = R[k]!;
    out.hxx[t] = ixx;
    out.hxy[t] = ixy;
    out.hyy[t] = iyy;
  }
  return out;
}

/** A grown lattice: lattice indices and candidate ids of its corners. */
interface Grown {
  readonly ii: Int32Array;
  readonly jj: Int32Array;
  readonly idx: Int32Array;
}

function packKey(i: number, j: number): number {
  return (i + 32768) * 65536 + (j + 32768);
}

/** Bucket grid over the candidates for radius queries. */
class Buckets {
  readonly cell: number;
  readonly gw: number;
  readonly gh: number;
  readonly start: Int32Array;
  readonly items: Int32Array;
  constructor(x: Float64Array, y: Float64Array, W: number, H: number, cell: number) {
    this.cell = cell;
    this.gw = Math.max(1, Math.ceil(W / cell));
    this.gh = Math.max(1, Math.ceil(H / cell));
    const n = x.length;
    const cellOf = new Int32Array(n);
    const counts = new Int32Array(this.gw * this.gh + 1);
    for (let t = 0; t < n; t++) {
      const cx = Math.min(this.gw - 1, Math.max(0, Math.floor(x[t]! / cell)));
      const cy = Math.min(this.gh - 1, Math.max(0, Math.floor(y[t]! / cell)));
      const c = cy * this.gw + cx;
      cellOf[t] = c;
      counts[c + 1]!++;
    }
    for (let c = 0; c < this.gw * this.gh; c++) counts[c + 1] = counts[c + 1]! + counts[c]!;
    this.start = counts.slice();
    const fill = counts.slice();
    this.items = new Int32Array(n);
    for (let t = 0; t < n; t++) this.items[fill[cellOf[t]!]!++] = t;
  }
}

/** Try a few seeds and keep the largest lattice of at least `minCorners` corners. */
function growBest(cand: Candidates, S: Float32Array, W: number, H: number, minCorners: number): Grown | null {
  const n = cand.x.length;
  const order = Array.from({ length: n }, (_, t) => t).sort((a, b) => cand.r[b]! - cand.r[a]!);
  const buckets = new Buckets(cand.x, cand.y, W, H, 16);
  const used = new Uint8Array(n);
  let best: Grown | null = null;
  let seeds = 0;
  const maxTries = Math.min(n, 400);
  for (let t = 0; t < maxTries && seeds < MAX_SEEDS; t++) {
    const s = order[t]!;
    if (used[s] === 1) continue;
    const cross = seedCross(cand, s, buckets, S, W, H);
    if (cross === null) continue;
    const r0 = 0.25 * Math.min(...cross.map((c) => Math.hypot(cand.x[c]! - cand.x[s]!, cand.y[c]! - cand.y[s]!)));
    if (!isSymmetric(S, W, H, cand.x[s]!, cand.y[s]!, r0) || cross.some((c) => !isSymmetric(S, W, H, cand.x[c]!, cand.y[c]!, r0))) {
      continue;
    }
    seeds++;
    const g = grow(cand, s, cross, buckets, S, W, H);
    for (let k = 0; k < g.idx.length; k++) used[g.idx[k]!] = 1;
    if (g.idx.length >= minCorners && (best === null || g.idx.length > best.idx.length)) best = g;
    // A lattice holding most strong candidates is the board.
    if (best !== null && best.idx.length * 2 > n) break;
  }
  return best;
}

/** `trace(Ha·Hb)`: negative between checkerboard neighbours (opposite saddle polarity). */
function polarity(c: Candidates, a: number, b: number): number {
  return c.hxx[a]! * c.hxx[b]! + 2 * c.hxy[a]! * c.hxy[b]! + c.hyy[a]! * c.hyy[b]!;
}

function ratioOk(c: Candidates, a: number, b: number): boolean {
  const ra = c.r[a]!;
  const rb = c.r[b]!;
  return rb >= RESPONSE_RATIO * ra && ra >= RESPONSE_RATIO * rb;
}

/** Four neighbours of a seed forming two opposite pairs: [+e1, −e1, +e2, −e2] candidate ids. */
function seedCross(cand: Candidates, s: number, buckets: Buckets, S: Float32Array, W: number, H: number): [number, number, number, number] | null {
  const sx = cand.x[s]!;
  const sy = cand.y[s]!;
  // Nearest opposite-polarity neighbours, found ring by ring in the buckets.
  const near: { id: number; d: number }[] = [];
  const maxRing = Math.ceil(Math.max(W, H) / (2 * buckets.cell));
  const cx0 = Math.floor(sx / buckets.cell);
  const cy0 = Math.floor(sy / buckets.cell);
  for (let ring = 0; ring <= maxRing; ring++) {
    for (let cy = cy0 - ring; cy <= cy0 + ring; cy++) {
      if (cy < 0 || cy >= buckets.gh) continue;
      for (let cx = cx0 - ring; cx <= cx0 + ring; cx++) {
        if (cx < 0 || cx >= buckets.gw) continue;
        if (Math.max(Math.abs(cx - cx0), Math.abs(cy - cy0)) !== ring) continue;
        const c = cy * buckets.gw + cx;
        for (let q = buckets.start[c]!; q < buckets.start[c + 1]!; q++) {
          const id = buckets.items[q]!;
          if (id === s || polarity(cand, s, id) >= 0 || !ratioOk(cand, s, id)) continue;
          near.push({ id, d: Math.hypot(cand.x[id]! - sx, cand.y[id]! - sy) });
        }
      }
    }
    // Everything within (ring · cell) is now listed; stop once 8 are that close.
    if (near.length >= 8) {
      const safe = ring * buckets.cell;
      near.sort((a, b) => a.d - b.d);
      if (near[7]!.d <= safe) break;
    }
  }
  near.sort((a, b) => a.d - b.d);
  const list = near.slice(0, 8);
  if (list.length < 4) return null;
  const vx = (id: number): number => cand.x[id]! - sx;
  const vy = (id: number): number => cand.y[id]! - sy;
  const opposite = (a: number, exclude: Set<number>): number => {
    const la = Math.hypot(vx(a), vy(a));
    let bestId = -1;
    let bestE = Infinity;
    for (const { id } of list) {
      if (exclude.has(id)) continue;
      const lb = Math.hypot(vx(id), vy(id));
      // Nearly opposite (a kinked lattice line still counts), of comparable length, along a side.
      if (-(vx(a) * vx(id) + vy(a) * vy(id)) < SEED_OPPOSITE * la * lb || la > MAX_SIDE_RATIO * lb || lb > MAX_SIDE_RATIO * la) continue;
      const e = Math.hypot(vx(a) + vx(id), vy(a) + vy(id)) / (la + lb);
      if (e < bestE && isEdge(S, W, H, sx, sy, cand.x[id]!, cand.y[id]!)) {
        bestE = e;
        bestId = id;
      }
    }
    return bestId;
  };
  for (let p = 0; p < list.length; p++) {
    const a = list[p]!.id;
    if (!isEdge(S, W, H, sx, sy, cand.x[a]!, cand.y[a]!)) continue;
    const b = opposite(a, new Set([a]));
    if (b < 0) continue;
    const la = Math.hypot(vx(a), vy(a));
    for (let q = 0; q < list.length; q++) {
      const c = list[q]!.id;
      if (c === a || c === b) continue;
      const lc = Math.hypot(vx(c), vy(c));
      if (lc > 2 * la || la > 2 * lc) continue;
      const cr = Math.abs(vx(a) * vy(c) - vy(a) * vx(c));
      if (cr < 0.5 * la * lc) continue;
      if (!isEdge(S, W, H, sx, sy, cand.x[c]!, cand.y[c]!)) continue;
      const d = opposite(c, new Set([a, b, c]));
      if (d < 0) continue;
      return [a, b, c, d];
    }
  }
  return null;
}

/** Grow a lattice from a seed and its cross of neighbours (stage 2 of the module description). */
function grow(
  cand: Candidates,
  s: number,
  cross: [number, number, number, number],
  buckets: Buckets,
  S: Float32Array,
  W: number,
  H: number,
): Grown {
  const X = cand.x;
  const Y = cand.y;
  const at = new Map<number, number>();
  const assigned = new Int8Array(X.length);
  const ii: number[] = [];
  const jj: number[] = [];
  const idx: number[] = [];
  const get = (i: number, j: number): number => {
    const v = at.get(packKey(i, j));
    return v === undefined ? -1 : v;
  };
  const heap = new SlotHeap();
  /** Best priority at which a slot's search failed (retried only with a better prediction). */
  const failed = new Map<number, number>();
  const pred = new Float64Array(3);
  const put = (i: number, j: number, c: number): void => {
    at.set(packKey(i, j), c);
    assigned[c] = 1;
    ii.push(i);
    jj.push(j);
    idx.push(c);
    // Slots whose predictions may use the new corner: its 8 neighbours and the slots two steps along the axes.
    for (const [di, dj] of AFFECTED) {
      const a = i + di;
      const b = j + dj;
      if (get(a, b) >= 0) continue;
      const p = predict(a, b, pred);
      if (p > 0) heap.push(p, a, b);
    }
  };
  // Orientation of the seed's cell: the sign of cross(e1, e2) every accepted cell keeps (no fold).
  const e1x = X[cross[0]]! - X[s]!;
  const e1y = Y[cross[0]]! - Y[s]!;
  const e2x = X[cross[2]]! - X[s]!;
  const e2y = Y[cross[2]]! - Y[s]!;
  const orient = Math.sign(e1x * e2y - e1y * e2x);

  /**
   * Predicted position of slot (i, j) into `out` (x, y, shortest lattice side used):
   * the mean of the parallelogram completions `P(i−a, j) + P(i, j−b) − P(i−a, j−b)` of the
   * cells around it whose three other corners are known, or, where there is none, the
   * mean of the linear extrapolations `2P(i−d) − P(i−2d)` along the lattice lines.
   * Returns the priority (0 = no prediction): `2 + cells` or `1` for lines only.
   */
  function predict(i: number, j: number, out: Float64Array): number {
    let sx = 0;
    let sy = 0;
    let cnt = 0;
    let side = Infinity;
    for (const [a, b] of DIAGONALS) {
      const p = get(i - a, j);
      if (p < 0) continue;
      const q = get(i, j - b);
      if (q < 0) continue;
      const r = get(i - a, j - b);
      if (r < 0) continue;
      sx += X[p]! + X[q]! - X[r]!;
      sy += Y[p]! + Y[q]! - Y[r]!;
      cnt++;
      side = Math.min(side, Math.hypot(X[p]! - X[r]!, Y[p]! - Y[r]!), Math.hypot(X[q]! - X[r]!, Y[q]! - Y[r]!));
    }
    if (cnt > 0) {
      out[0] = sx / cnt;
      out[1] = sy / cnt;
      out[2] = side;
      return 2 + cnt;
    }
    for (const [di, dj] of AXES) {
      const p = get(i - di, j - dj);
      if (p < 0) continue;
      const q = get(i - 2 * di, j - 2 * dj);
      if (q < 0) continue;
      sx += 2 * X[p]! - X[q]!;
      sy += 2 * Y[p]! - Y[q]!;
      cnt++;
      side = Math.min(side, Math.hypot(X[p]! - X[q]!, Y[p]! - Y[q]!));
    }
    if (cnt === 0) return 0;
    out[0] = sx / cnt;
    out[1] = sy / cnt;
    out[2] = side;
    return 1;
  }

  /**
   * Whether candidate `c` fits slot (i, j) among its known neighbours: opposite saddle
   * polarity to each known 4-neighbour and a response within the ratio of it; sides
   * within a factor 3 of the neighbour's other sides along the same axis; and every cell
   * corner it forms with two known orthogonal neighbours turning the seed's way by at
   * least about 10° (no fold, no jump into the next row).
   */
  function fits(i: number, j: number, c: number): boolean {
    const cx = X[c]!;
    const cy = Y[c]!;
    const nb = [get(i + 1, j), get(i, j + 1), get(i - 1, j), get(i, j - 1)];
    for (let d = 0; d < 4; d++) {
      const n = nb[d]!;
      if (n < 0) continue;
      if (polarity(cand, n, c) >= 0 || !ratioOk(cand, n, c)) return false;
      if (!isEdge(S, W, H, X[n]!, Y[n]!, cx, cy)) return false;
      const len = Math.hypot(X[n]! - cx, Y[n]! - cy);
      // The neighbour's side beyond it along the same axis.
      const [di, dj] = AXES[d]!;
      const f = get(i + 2 * di, j + 2 * dj);
      if (f >= 0) {
        const l2 = Math.hypot(X[f]! - X[n]!, Y[f]! - Y[n]!);
        if (len > MAX_SIDE_RATIO * l2 || l2 > MAX_SIDE_RATIO * len) return false;
      }
      const m = nb[(d + 1) % 4]!;
      if (m < 0) continue;
      // nb[d] and nb[d + 1] are a quarter turn apart in index space (+i → +j → −i → −j).
      const ax = X[n]! - cx;
      const ay = Y[n]! - cy;
      const bx = X[m]! - cx;
      const by = Y[m]! - cy;
      const cr = ax * by - ay * bx;
      if (!(orient * cr > MIN_TURN * Math.hypot(ax, ay) * Math.hypot(bx, by))) return false;
    }
    return true;
  }

  /**
   * The candidate for slot (i, j) near `(px, py)` within `rad`: the nearest one that fits,
   * provided it is unambiguous (no other fitting candidate within `rad` less than
   * `AMBIGUITY` times farther). `same` ≥ 0: the slot is two steps from that corner, whose
   * polarity the candidate must share (a corner stepped over).
   */
  function search(i: number, j: number, px: number, py: number, rad: number, ring: number, same: number): number {
    const cell = buckets.cell;
    const cx0 = Math.max(0, Math.floor((px - rad) / cell));
    const cx1 = Math.min(buckets.gw - 1, Math.floor((px + rad) / cell));
    const cy0 = Math.max(0, Math.floor((py - rad) / cell));
    const cy1 = Math.min(buckets.gh - 1, Math.floor((py + rad) / cell));
    let best = -1;
    let d1 = Infinity;
    let d2 = Infinity;
    const r2 = rad * rad;
    for (let cy = cy0; cy <= cy1; cy++) {
      for (let cx = cx0; cx <= cx1; cx++) {
        const bc = cy * buckets.gw + cx;
        for (let q = buckets.start[bc]!; q < buckets.start[bc + 1]!; q++) {
          const id = buckets.items[q]!;
          if (assigned[id] === 1) continue;
          const e2 = (X[id]! - px) ** 2 + (Y[id]! - py) ** 2;
          if (!(e2 < r2)) continue;
          if (same >= 0) {
            if (polarity(cand, same, id) <= 0 || !ratioOk(cand, same, id)) continue;
          } else if (!fits(i, j, id)) continue;
          if (!isSymmetric(S, W, H, X[id]!, Y[id]!, ring)) continue;
          const e = Math.sqrt(e2);
          if (e < d1) {
            d2 = d1;
            d1 = e;
            best = id;
          } else if (e < d2) d2 = e;
        }
      }
    }
    if (best >= 0 && d2 < Infinity && d1 > AMBIGUITY * d2) return -1;
    return best;
  }

  put(0, 0, s);
  put(1, 0, cross[0]);
  put(-1, 0, cross[1]);
  put(0, 1, cross[2]);
  put(0, -1, cross[3]);
  for (let pass = 0; pass < 8; pass++) {
    // Best-first growth: the slots with the most reliable prediction first.
    for (let top = heap.pop(); top !== null; top = heap.pop()) {
      const [pr, i, j] = top;
      if (get(i, j) >= 0) continue;
      const key = packKey(i, j);
      const cur = predict(i, j, pred);
      if (cur !== pr) continue; // stale entry: a fresher one is queued
      if ((failed.get(key) ?? 0) >= cur) continue;
      const side = pred[2]!;
      if (!(side >= 4)) {
        failed.set(key, cur);
        continue;
      }
      const c = search(i, j, pred[0]!, pred[1]!, NEIGHBOUR_SEARCH * side, Math.max(2, SYMMETRY_RADIUS * side), -1);
      if (c >= 0) put(i, j, c);
      else failed.set(key, cur);
    }
    // Step over one missing corner along a lattice line, where the next slot found nothing.
    const before = idx.length;
    const m = idx.length;
    for (let t = 0; t < m; t++) {
      const i = ii[t]!;
      const j = jj[t]!;
      const n = idx[t]!;
      for (const [di, dj] of AXES) {
        const b = get(i - di, j - dj);
        if (b < 0 || get(i + di, j + dj) >= 0 || get(i + 2 * di, j + 2 * dj) >= 0) continue;
        const sx = X[n]! - X[b]!;
        const sy = Y[n]! - Y[b]!;
        const len = Math.hypot(sx, sy);
        if (!(len >= 4)) continue;
        const c = search(i + 2 * di, j + 2 * dj, X[n]! + 2 * sx, Y[n]! + 2 * sy, SEARCH_FRACTION * len, Math.max(2, SYMMETRY_RADIUS * len), n);
        if (c >= 0) put(i + 2 * di, j + 2 * dj, c);
      }
    }
    if (idx.length === before) break;
  }
  return { ii: Int32Array.from(ii), jj: Int32Array.from(jj), idx: Int32Array.from(idx) };
}

const AXES: readonly (readonly [number, number])[] = [
  [1, 0],
  [0, 1],
  [-1, 0],
  [0, -1],
];
const DIAGONALS: readonly (readonly [number, number])[] = [
  [1, 1],
  [-1, 1],
  [-1, -1],
  [1, -1],
];
const AFFECTED: readonly (readonly [number, number])[] = [...AXES, ...DIAGONALS, [2, 0], [0, 2], [-2, 0], [0, -2]];

/** A max-heap of lattice slots by priority, first in first out among equal priorities. */
class SlotHeap {
  private readonly pr: number[] = [];
  private readonly seq: number[] = [];
  private readonly si: number[] = [];
  private readonly sj: number[] = [];
  private counter = 0;
  private before(a: number, b: number): boolean {
    return this.pr[a]! > this.pr[b]! || (this.pr[a] === this.pr[b] && this.seq[a]! < this.seq[b]!);
  }
  private swap(a: number, b: number): void {
    for (const arr of [this.pr, this.seq, this.si, this.sj]) {
      const t = arr[a]!;
      arr[a] = arr[b]!;
      arr[b] = t;
    }
  }
  push(priority: number, i: number, j: number): void {
    let k = this.pr.length;
    this.pr.push(priority);
    this.seq.push(this.counter++);
    this.si.push(i);
    this.sj.push(j);
    while (k > 0) {
      const p = (k - 1) >> 1;
      if (!this.before(k, p)) break;
      this.swap(k, p);
      k = p;
    }
  }
  pop(): [number, number, number] | null {
    const n = this.pr.length;
    if (n === 0) return null;
    const out: [number, number, number] = [this.pr[0]!, this.si[0]!, this.sj[0]!];
    this.swap(0, n - 1);
    this.pr.pop();
    this.seq.pop();
    this.si.pop();
    this.sj.pop();
    let k = 0;
    const m = n - 1;
    for (;;) {
      const l = 2 * k + 1;
      const r = l + 1;
      let b = k;
      if (l < m && this.before(l, b)) b = l;
      if (r < m && this.before(r, b)) b = r;
      if (b === k) break;
      this.swap(k, b);
      k = b;
    }
    return out;
  }
}

/**
 * Whether the segment from `(ax, ay)` to `(bx, by)` runs along a side of a square: at a
 * quarter, half and three quarters of the way, the image a fifth of the segment's length
 * to either side differs with the same sign each time, by at least `EDGE_CONTRAST` of the
 * spread of the six samples. A segment between corners that are not neighbours (a
 * diagonal, a knight's move into the next row) crosses squares and fails.
 */
function isEdge(S: Float32Array, W: number, H: number, ax: number, ay: number, bx: number, by: number): boolean {
  const tx = bx - ax;
  const ty = by - ay;
  // Normal of length EDGE_OFFSET · |b − a|.
  const nx = -EDGE_OFFSET * ty;
  const ny = EDGE_OFFSET * tx;
  let lo = Infinity;
  let hi = -Infinity;
  let dmin = Infinity;
  let pos = 0;
  let neg = 0;
  for (const f of [0.25, 0.5, 0.75]) {
    const px = ax + f * tx;
    const py = ay + f * ty;
    const u = bilinear(S, W, H, px + nx, py + ny);
    const v = bilinear(S, W, H, px - nx, py - ny);
    lo = Math.min(lo, u, v);
    hi = Math.max(hi, u, v);
    const d = u - v;
    if (d > 0) pos++;
    else if (d < 0) neg++;
    dmin = Math.min(dmin, Math.abs(d));
  }
  return (pos === 3 || neg === 3) && dmin >= EDGE_CONTRAST * (hi - lo);
}

/**
 * Point-symmetry test of a candidate: an X-junction of four squares looks the same
 * after a half turn about its centre, an L- or T-junction (the board's rim, an occluder's
 * edge) does not. Sixteen samples on a circle of radius `r`; the asymmetry is
 * `Σ|v(θ) − v(θ + π)| / Σ|v(θ) − mean|`.
 */
function isSymmetric(S: Float32Array, W: number, H: number, x: number, y: number, r: number): boolean {
  const v = new Float64Array(16);
  let m = 0;
  for (let k = 0; k < 16; k++) {
    const a = (k * Math.PI) / 8;
    v[k] = bilinear(S, W, H, x + r * Math.cos(a), y + r * Math.sin(a));
    m += v[k]!;
  }
  m /= 16;
  let asym = 0;
  let contrast = 0;
  for (let k = 0; k < 16; k++) {
    contrast += Math.abs(v[k]! - m);
    if (k < 8) asym += 2 * Math.abs(v[k]! - v[k + 8]!);
  }
  return contrast > 0 && asym <= MAX_ASYMMETRY * contrast;
}

/** Bilinear sample of a plane, coordinates clamped to the image. */
function bilinear(S: Float32Array, W: number, H: number, x: number, y: number): number {
  if (x < 0) x = 0;
  else if (x > W - 1) x = W - 1;
  if (y < 0) y = 0;
  else if (y > H - 1) y = H - 1;
  let i = Math.floor(x);
  let j = Math.floor(y);
  if (i > W - 2) i = W - 2;
  if (j > H - 2) j = H - 2;
  const fx = x - i;
  const fy = y - j;
  const k = j * W + i;
  const a = S[k]!;
  const b = S[k + 1]!;
  const c = S[k + W]!;
  const d = S[k + W + 1]!;
  return a + fx * (b - a) + fy * (c - a) + fx * fy * (a - b - c + d);
}

/**
 * Gradient-orthogonality refinement: minimise `Σ w(p − q) (g(p)ᵀ(p − q))²` over the
 * corner `q`, where `g` is the central-difference gradient of the smoothed image at the
 * pixels `p` and `w` a smooth compact weight centred on `q` (the biweight
 * `(1 − |p − q|²/R²)²`, `R = w + 1`). The weight is re-centred on every new estimate, so
 * the window stays symmetric about the corner without resampling the image; for a
 * point-symmetric junction the fixed point is its centre.
 *
 * @returns The refined corner, or `null` when the system is singular or the corner runs away.
 */
function refineCorner(S: Float32Array, W: number, H: number, x0: number, y0: number, w: number): [number, number] | null {
  const R = w + 1;
  const R2 = R * R;
  let qx = x0;
  let qy = y0;
  for (let it = 0; it < 30; it++) {
    const i0 = Math.max(1, Math.ceil(qx - R));
    const i1 = Math.min(W - 2, Math.floor(qx + R));
    const j0 = Math.max(1, Math.ceil(qy - R));
    const j1 = Math.min(H - 2, Math.floor(qy + R));
    let a11 = 0;
    let a12 = 0;
    let a22 = 0;
    let b1 = 0;
    let b2 = 0;
    for (let j = j0; j <= j1; j++) {
      const dy = j - qy;
      const row = j * W;
      for (let i = i0; i <= i1; i++) {
        const dx = i - qx;
        const r2 = dx * dx + dy * dy;
        if (r2 >= R2) continue;
        const t = 1 - r2 / R2;
        const wt = t * t;
        const k = row + i;
        const gx = 0.5 * (S[k + 1]! - S[k - 1]!);
        const gy = 0.5 * (S[k + W]! - S[k - W]!);
        const gxx = wt * gx * gx;
        const gxy = wt * gx * gy;
        const gyy = wt * gy * gy;
        a11 += gxx;
        a12 += gxy;
        a22 += gyy;
        b1 += gxx * dx + gxy * dy;
        b2 += gxy * dx + gyy * dy;
      }
    }
    const det = a11 * a22 - a12 * a12;
    if (!(det > 1e-12 * (a11 + a22) * (a11 + a22))) return null;
    const dx = (a22 * b1 - a12 * b2) / det;
    const dy = (a11 * b2 - a12 * b1) / det;
    qx += dx;
    qy += dy;
    if (Math.hypot(qx - x0, qy - y0) > Math.max(2, 0.5 * w)) return null;
    if (dx * dx + dy * dy < 1e-7) break;
  }
  return [qx, qy];
}
