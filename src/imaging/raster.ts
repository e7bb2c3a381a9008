/**
 * Triangle rasterisation with interpolated source coordinates: the inverse of a smooth
 * map known at mesh vertices. Internal.
 *
 * @module
 */

/**
 * @internal One-channel bilinear sample of a W × H image (W, H ≥ 2) at (u, v), the
 * position clamped to the image: the correction's one-channel kernels share it.
 */
export function bilinear1(src: Float32Array, W: number, H: number, u: number, v: number): number {
  const Wm = W - 1, Hm = H - 1;
  const uu = u > 0 ? (u < Wm ? u : Wm) : 0;
  const vv = v > 0 ? (v < Hm ? v : Hm) : 0;
  let i = uu | 0, j = vv | 0;
  if (i > W - 2) i = W - 2;
  if (j > H - 2) j = H - 2;
  const fu = uu - i, fv = vv - j;
  const k = j * W + i;
  const a0 = src[k]!, a1 = src[k + 1]!, b0 = src[k + W]!, b1 = src[k + W + 1]!;
  const s0 = a0 + (a1 - a0) * fu;
  return s0 + (b0 + (b1 - b0) * fu - s0) * fv;
}

/** @internal Buffers a rasterisation pass writes. */
export interface RasterTarget {
  readonly width: number;
  readonly height: number;
  /** Source position `u v` of each output pixel, interleaved. */
  readonly map: Float32Array;
  /** 0 unwritten, 1 written by a flipped triangle, 2 by a triangle of the map's own orientation. */
  readonly owner: Uint8Array;
  /** 1 where more than one triangle covered the pixel. */
  readonly fold: Uint8Array;
  /**
   * One-channel source image to sample bilinearly as each pixel is written (its source
   * position clamped to the image), with `out` receiving the sample. The width and
   * height are the target's.
   */
  readonly sample?: { readonly source: Float32Array; readonly out: Float32Array } | null;
}

// Edge function of the directed edge a → b at p, computed in a canonical endpoint order
// so that the two triangles sharing an edge get exactly opposite values.
function edge(ax: number, ay: number, bx: number, by: number, px: number, py: number): number {
  if (ax < bx || (ax === bx && ay < by)) return (bx - ax) * (py - ay) - (by - ay) * (px - ax);
  return -((ax - bx) * (py - by) - (ay - by) * (px - bx));
}

/**
 * The owner rule for one output pixel: a second cover marks it as a fold, and the pixel
 * is taken (returns true, owner set) when `prio` beats its owner so far (0 none, 1 a
 * flipped triangle, 2 one of the map's own orientation); among equals the first keeps it.
 */
function claim(owner: Uint8Array, fold: Uint8Array, p: number, prio: number): boolean {
  const ow = owner[p]!;
  if (ow !== 0) fold[p] = 1;
  if (prio > ow) {
    owner[p] = prio;
    return true;
  }
  return false;
}

// Tie rule for a pixel exactly on an edge: antisymmetric in the edge's direction, so a
// pixel on a shared edge belongs to exactly one of the two triangles.
function owns(ax: number, ay: number, bx: number, by: number): boolean {
  const dy = by - ay;
  return dy > 0 || (dy === 0 && bx > ax);
}

function inside(x0: number, y0: number, x1: number, y1: number, x2: number, y2: number, px: number, py: number): boolean {
  const w0 = edge(x1, y1, x2, y2, px, py);
  if (w0 < 0 || (w0 === 0 && !owns(x1, y1, x2, y2))) return false;
  const w1 = edge(x2, y2, x0, y0, px, py);
  if (w1 < 0 || (w1 === 0 && !owns(x2, y2, x0, y0))) return false;
  const w2 = edge(x0, y0, x1, y1, px, py);
  return !(w2 < 0 || (w2 === 0 && !owns(x0, y0, x1, y1)));
}

/**
 * @internal Rasterise one triangle (output vertices x, y; source coordinates su, sv) at
 * priority `prio` into `t`, with floating-point edge functions in a canonical vertex
 * order: the fallback of {@link rasterTrianglesSnapped} for vertices beyond its range.
 * Pixel centres (integers) inside the triangle are covered; pixels on an edge follow the
 * tie rule. Returns the pixels covered.
 *
 * `curv`, when given, holds the forward map's second differences along the triangle's
 * three source edges, `D = aᵀ·D²F·a` for the source edge vectors `a` of the vertex pairs
 * (0, 1), (1, 2), (0, 2), as output-pixel vectors (`x y` each, six numbers). The source
 * position then gets the quadratic term of the inverse map: for an inverse `G` that is
 * quadratic over the triangle, `G = Σ wᵢ Gᵢ − ½ Σ_{i<j} wᵢ wⱼ eᵢⱼᵀ·D²G·eᵢⱼ` (barycentric
 * `w`, output edges `e`), and differentiating `G(F(s)) = s` twice gives
 * `D²G[DF a, DF a] = −DG·D²F[a, a]`, so the term is `+½ Σ wᵢ wⱼ · DG·Dᵢⱼ` with `DG` the
 * triangle's linear inverse. It lowers the interpolation error from second to third
 * order in the mesh size.
 */
export function rasterTriangle(
  t: RasterTarget,
  prio: number,
  x0: number, y0: number, x1: number, y1: number, x2: number, y2: number,
  su0: number, sv0: number, su1: number, sv1: number, su2: number, sv2: number,
  curv: Float64Array | null = null,
): number {
  let area = (x1 - x0) * (y2 - y0) - (y1 - y0) * (x2 - x0);
  if (!(area !== 0) || !Number.isFinite(area)) return 0;
  // Second differences of the pairs (0, 1), (1, 2), (0, 2).
  let d01x = 0, d01y = 0, d12x = 0, d12y = 0, d02x = 0, d02y = 0;
  if (curv !== null) {
    d01x = curv[0]!; d01y = curv[1]!; d12x = curv[2]!; d12y = curv[3]!; d02x = curv[4]!; d02y = curv[5]!;
  }
  if (area < 0) {
    // Normalise the winding: swap vertices 1 and 2 (pairs (0, 1) and (0, 2) trade places).
    let w = x1; x1 = x2; x2 = w;
    w = y1; y1 = y2; y2 = w;
    w = su1; su1 = su2; su2 = w;
    w = sv1; sv1 = sv2; sv2 = w;
    w = d01x; d01x = d02x; d02x = w;
    w = d01y; d01y = d02y; d02y = w;
    area = -area;
  }
  const W = t.width, H = t.height;
  let minX = Math.ceil(Math.min(x0, x1, x2)), maxX = Math.floor(Math.max(x0, x1, x2));
  let minY = Math.ceil(Math.min(y0, y1, y2)), maxY = Math.floor(Math.max(y0, y1, y2));
  if (minX < 0) minX = 0;
  if (minY < 0) minY = 0;
  if (maxX > W - 1) maxX = W - 1;
  if (maxY > H - 1) maxY = H - 1;
  if (minX > maxX || minY > maxY) return 0;
  const { map, owner, fold } = t;
  // the one-channel image sampled as pixels are written (see RasterTarget.sample)
  const src = t.sample ? t.sample.source : null, od = t.sample ? t.sample.out : null;
  if (maxX - minX <= 1 && maxY - minY <= 1) {
    // A small triangle: test its few pixels directly.
    const inv = 1 / area;
    let covered = 0;
    for (let py = minY; py <= maxY; py++) {
      for (let px = minX; px <= maxX; px++) {
        if (!inside(x0, y0, x1, y1, x2, y2, px, py)) continue;
        const w0 = ((x2 - x1) * (py - y1) - (y2 - y1) * (px - x1)) * inv;
        const w1 = ((x0 - x2) * (py - y2) - (y0 - y2) * (px - x2)) * inv;
        const w2 = 1 - w0 - w1;
        const p = py * W + px;
        if (claim(owner, fold, p, prio)) {
          let u = w0 * su0 + w1 * su1 + w2 * su2, v = w0 * sv0 + w1 * sv1 + w2 * sv2;
          if (curv !== null) {
            // The quadratic term (see above) with the triangle's linear inverse.
            const e1x = x1 - x0, e1y = y1 - y0, e2x = x2 - x0, e2y = y2 - y0;
            const au = ((su1 - su0) * e2y - (su2 - su0) * e1y) * inv, bu = ((su2 - su0) * e1x - (su1 - su0) * e2x) * inv;
            const av = ((sv1 - sv0) * e2y - (sv2 - sv0) * e1y) * inv, bv = ((sv2 - sv0) * e1x - (sv1 - sv0) * e2x) * inv;
            const a = 0.5 * w0 * w1, b = 0.5 * w1 * w2, c = 0.5 * w0 * w2;
            u += a * (au * d01x + bu * d01y) + b * (au * d12x + bu * d12y) + c * (au * d02x + bu * d02y);
            v += a * (av * d01x + bv * d01y) + b * (av * d12x + bv * d12y) + c * (av * d02x + bv * d02y);
          }
          map[2 * p] = u;
          map[2 * p + 1] = v;
          if (od !== null) od[p] = bilinear1(src!, W, H, u, v);
        }
        covered++;
      }
    }
    return covered;
  }
  // Source coordinates as planes s = a·x + b·y + c over the triangle.
  const inv = 1 / area;
  const e1x = x1 - x0, e1y = y1 - y0, e2x = x2 - x0, e2y = y2 - y0;
  const du1 = su1 - su0, du2 = su2 - su0, dv1 = sv1 - sv0, dv2 = sv2 - sv0;
  const au = (du1 * e2y - du2 * e1y) * inv, bu = (du2 * e1x - du1 * e2x) * inv;
  const av = (dv1 * e2y - dv2 * e1y) * inv, bv = (dv2 * e1x - dv1 * e2x) * inv;
  const cu = su0 - au * x0 - bu * y0, cv = sv0 - av * x0 - bv * y0;
  // Quadratic term: ½·DG·D for each pair, DG = [[au, bu], [av, bv]].
  const quad = curv !== null;
  const k01u = 0.5 * (au * d01x + bu * d01y), k01v = 0.5 * (av * d01x + bv * d01y);
  const k12u = 0.5 * (au * d12x + bu * d12y), k12v = 0.5 * (av * d12x + bv * d12y);
  const k02u = 0.5 * (au * d02x + bu * d02y), k02v = 0.5 * (av * d02x + bv * d02y);
  // Barycentric weights w0 (opposite vertex 0) and w1 along a row: w(px) = w(0) + px·dw.
  const dw0 = -(y2 - y1) * inv, dw1 = -(y0 - y2) * inv;
  let covered = 0;
  for (let py = minY; py <= maxY; py++) {
    // Span of the row from the three half-planes w_e(px) = A·px + B ≥ 0.
    let lo = minX, hi = maxX;
    let empty = false;
    for (let e = 0; e < 3 && !empty; e++) {
      const ax = e === 0 ? x1 : e === 1 ? x2 : x0, ay = e === 0 ? y1 : e === 1 ? y2 : y0;
      const bx = e === 0 ? x2 : e === 1 ? x0 : x1, by = e === 0 ? y2 : e === 1 ? y0 : y1;
      // w(px) = (bx − ax)(py − ay) − (by − ay)(px − ax)
      const A = -(by - ay);
      const B = (bx - ax) * (py - ay) + (by - ay) * ax;
      if (A > 0) {
        const x = Math.ceil(-B / A);
        if (x > lo) lo = x;
      } else if (A < 0) {
        const x = Math.floor(-B / A);
        if (x < hi) hi = x;
      } else if (B < 0) empty = true;
    }
    if (empty) continue;
    // Settle the span's ends with the exact test (rounding at the ends).
    if (lo > minX && inside(x0, y0, x1, y1, x2, y2, lo - 1, py)) lo--;
    while (lo <= hi && !inside(x0, y0, x1, y1, x2, y2, lo, py)) lo++;
    if (lo > hi) continue;
    if (hi < maxX && inside(x0, y0, x1, y1, x2, y2, hi + 1, py)) hi++;
    while (hi > lo && !inside(x0, y0, x1, y1, x2, y2, hi, py)) hi--;
    const row = py * W;
    let u = au * lo + bu * py + cu;
    let v = av * lo + bv * py + cv;
    if (quad) {
      let w0 = ((x2 - x1) * (py - y1) - (y2 - y1) * (lo - x1)) * inv;
      let w1 = ((x0 - x2) * (py - y2) - (y0 - y2) * (lo - x2)) * inv;
      for (let px = lo; px <= hi; px++) {
        const p = row + px;
        if (claim(owner, fold, p, prio)) {
          const w2 = 1 - w0 - w1, a = w0 * w1, b = w1 * w2, c = w0 * w2;
          const uq = u + a * k01u + b * k12u + c * k02u, vq = v + a * k01v + b * k12v + c * k02v;
          map[2 * p] = uq;
          map[2 * p + 1] = vq;
          if (od !== null) od[p] = bilinear1(src!, W, H, uq, vq);
        }
        u += au;
        v += av;
        w0 += dw0;
        w1 += dw1;
      }
    } else {
      for (let px = lo; px <= hi; px++) {
        const p = row + px;
        if (claim(owner, fold, p, prio)) {
          map[2 * p] = u;
          map[2 * p + 1] = v;
          if (od !== null) od[p] = bilinear1(src!, W, H, u, v);
        }
        u += au;
        v += av;
      }
    }
    covered += hi - lo + 1;
  }
  return covered;
}

/** Sub-pixel resolution of the snapped rasteriser: vertices on a 1/256-pixel lattice. */
const SNAP = 256;
/** Largest vertex coordinate, pixels, for which the snapped edge functions stay exact integers (< 2⁵³). */
const SNAP_LIMIT = 32768;

/**
 * `⌈f⌉` as an int32, clamped to `[lo − 2, hi + 2]`: a span end outside the row's
 * `[lo, hi]` only has to stay outside it. Never −0, never beyond int32, so the
 * rasteriser's loops keep integer code.
 */
function ceilIn(f: number, lo: number, hi: number): number {
  return f < lo - 2 ? lo - 2 : f > hi + 2 ? hi + 2 : Math.ceil(f) | 0;
}

/** `⌊f⌋` as an int32, clamped as in {@link ceilIn}. */
function floorIn(f: number, lo: number, hi: number): number {
  return f < lo - 2 ? lo - 2 : f > hi + 2 ? hi + 2 : Math.floor(f) | 0;
}

/** A coordinate, pixels, on the snap lattice (an integer count of 1/256 pixel). */
function snap(x: number): number {
  return Math.floor(x * SNAP + 0.5) | 0; // |x| < SNAP_LIMIT at every call: an int32, never −0
}

/** @internal Doubles per triangle in the lists of {@link rasterTrianglesSnapped}. */
export const TRI_STRIDE = 20;

/**
 * @internal Write triangle `q` of a list for {@link rasterTrianglesSnapped}: priority,
 * output vertices, source vertices and the quadratic term's second differences
 * (`curv`, 6 numbers, or null for the linear map).
 */
export function putTriangle(
  tris: Float64Array, q: number,
  prio: number,
  x0: number, y0: number, x1: number, y1: number, x2: number, y2: number,
  su0: number, sv0: number, su1: number, sv1: number, su2: number, sv2: number,
  curv: Float64Array | null,
): void {
  const o = q * TRI_STRIDE;
  tris[o] = prio;
  tris[o + 1] = x0; tris[o + 2] = y0; tris[o + 3] = x1; tris[o + 4] = y1; tris[o + 5] = x2; tris[o + 6] = y2;
  tris[o + 7] = su0; tris[o + 8] = sv0; tris[o + 9] = su1; tris[o + 10] = sv1; tris[o + 11] = su2; tris[o + 12] = sv2;
  if (curv === null) {
    tris[o + 13] = 0;
    return;
  }
  tris[o + 13] = 1;
  for (let k = 0; k < 6; k++) tris[o + 14 + k] = curv[k]!;
}

/**
 * @internal The snapped rasteriser (the fast mode's triangles; the exact mode's cells
 * that are stretched or lack a corner): as {@link rasterTriangle}, with the vertices
 * snapped to a 1/256-pixel lattice so that the edge functions at pixel centres are exact
 * integers, evaluated once a row and stepped by integers along it. Coverage then follows
 * the tie rule exactly with no per-pixel tests; the snap moves a triangle's corners by at
 * most 1/512 pixel. Triangles with a vertex beyond ±32768 pixels go to
 * {@link rasterTriangle}.
 *
 * Takes a list of `n` triangles (written by {@link putTriangle}), rasterised in order,
 * so that a caller makes one call for many triangles: V8 can then recompile this
 * function after a deoptimisation like any other, where a function called once a
 * triangle could be left running from its loop entry point only (several times slower).
 * Returns the pixels covered.
 */
export function rasterTrianglesSnapped(t: RasterTarget, tris: Float64Array, n: number): number {
  const { map, owner, fold } = t;
  const W = t.width, H = t.height;
  const smp = t.sample ?? null;
  const src = smp !== null ? smp.source : null, od = smp !== null ? smp.out : null;
  const Wm = W - 1, Hm = H - 1;
  let covered = 0;
  for (let q = 0, o = 0; q < n; q++, o += TRI_STRIDE) {
    const prio = tris[o]!;
    const x0 = tris[o + 1]!, y0 = tris[o + 2]!, x1 = tris[o + 3]!, y1 = tris[o + 4]!, x2 = tris[o + 5]!, y2 = tris[o + 6]!;
    let su0 = tris[o + 7]!, sv0 = tris[o + 8]!, su1 = tris[o + 9]!, sv1 = tris[o + 10]!, su2 = tris[o + 11]!, sv2 = tris[o + 12]!;
    const hasCurv = tris[o + 13] === 1;
    if (!(Math.abs(x0) < SNAP_LIMIT && Math.abs(y0) < SNAP_LIMIT && Math.abs(x1) < SNAP_LIMIT && Math.abs(y1) < SNAP_LIMIT && Math.abs(x2) < SNAP_LIMIT && Math.abs(y2) < SNAP_LIMIT)) {
      if (Number.isFinite(x0 + y0 + x1 + y1 + x2 + y2)) covered += rasterTriangle(t, prio, x0, y0, x1, y1, x2, y2, su0, sv0, su1, sv1, su2, sv2, hasCurv ? tris.subarray(o + 14, o + 20) : null);
      continue;
    }
    let X0 = snap(x0), Y0 = snap(y0);
    let X1 = snap(x1), Y1 = snap(y1);
    let X2 = snap(x2), Y2 = snap(y2);
    let area = (X1 - X0) * (Y2 - Y0) - (Y1 - Y0) * (X2 - X0);
    if (area === 0) continue;
    let d01x = 0, d01y = 0, d12x = 0, d12y = 0, d02x = 0, d02y = 0;
    if (hasCurv) {
      d01x = tris[o + 14]!; d01y = tris[o + 15]!; d12x = tris[o + 16]!; d12y = tris[o + 17]!; d02x = tris[o + 18]!; d02y = tris[o + 19]!;
    }
    if (area < 0) {
      let w = X1; X1 = X2; X2 = w;
      w = Y1; Y1 = Y2; Y2 = w;
      w = su1; su1 = su2; su2 = w;
      w = sv1; sv1 = sv2; sv2 = w;
      w = d01x; d01x = d02x; d02x = w;
      w = d01y; d01y = d02y; d02y = w;
      area = -area;
    }
    // `| 0`: the bounds are int32 (|X| < 2²³) and never −0 (a −0 start would make V8 drop
    // its integer code for this function)
    let minX = Math.ceil(Math.min(X0, X1, X2) / SNAP) | 0, maxX = Math.floor(Math.max(X0, X1, X2) / SNAP) | 0;
    let minY = Math.ceil(Math.min(Y0, Y1, Y2) / SNAP) | 0, maxY = Math.floor(Math.max(Y0, Y1, Y2) / SNAP) | 0;
    if (minX < 0) minX = 0;
    if (minY < 0) minY = 0;
    if (maxX > W - 1) maxX = W - 1;
    if (maxY > H - 1) maxY = H - 1;
    if (minX > maxX || minY > maxY) continue;
    // Source coordinates as planes over the snapped triangle, in pixels.
    const inv = (SNAP * SNAP) / area;
    const e1x = (X1 - X0) / SNAP, e1y = (Y1 - Y0) / SNAP, e2x = (X2 - X0) / SNAP, e2y = (Y2 - Y0) / SNAP;
    const du1 = su1 - su0, du2 = su2 - su0, dv1 = sv1 - sv0, dv2 = sv2 - sv0;
    const au = (du1 * e2y - du2 * e1y) * inv, bu = (du2 * e1x - du1 * e2x) * inv;
    const av = (dv1 * e2y - dv2 * e1y) * inv, bv = (dv2 * e1x - dv1 * e2x) * inv;
    const sx0 = X0 / SNAP, sy0 = Y0 / SNAP;
    const cu = su0 - au * sx0 - bu * sy0, cv = sv0 - av * sx0 - bv * sy0;
    const k01u = 0.5 * (au * d01x + bu * d01y), k01v = 0.5 * (av * d01x + bv * d01y);
    const k12u = 0.5 * (au * d12x + bu * d12y), k12v = 0.5 * (av * d12x + bv * d12y);
    const k02u = 0.5 * (au * d02x + bu * d02y), k02v = 0.5 * (av * d02x + bv * d02y);
    // Edge e from a to b: E(px, py) = (Xb − Xa)(S·py − Ya) − (Yb − Ya)(S·px − Xa), integer.
    // Per row E = C + A·px with A = −S·(Yb − Ya), and C grows by S·(Xb − Xa) a row. Inside:
    // E ≥ m with m = 0, or 1 where the edge does not own its ties (the rule of `owns`). The
    // span's end from an edge is ⌈(m − C)/A⌉ (A > 0) or ⌊(m − C)/A⌋ (A < 0), exact in
    // floating point: the quotient q of two integers with |m − C| < 2⁵³ is either an
    // integer (the division is then exact) or at least 1/|A| from one, farther than its
    // rounding error |q|·2⁻⁵³, so rounding cannot carry it across an integer.
    const A0 = -SNAP * (Y2 - Y1), A1 = -SNAP * (Y0 - Y2), A2 = -SNAP * (Y1 - Y0);
    const m0 = Y2 - Y1 > 0 || (Y2 === Y1 && X2 > X1) ? 0 : 1;
    const m1 = Y0 - Y2 > 0 || (Y0 === Y2 && X0 > X2) ? 0 : 1;
    const m2 = Y1 - Y0 > 0 || (Y1 === Y0 && X1 > X0) ? 0 : 1;
    const PY0 = SNAP * minY;
    let C0 = (X2 - X1) * (PY0 - Y1) + (Y2 - Y1) * X1;
    let C1 = (X0 - X2) * (PY0 - Y2) + (Y0 - Y2) * X2;
    let C2 = (X1 - X0) * (PY0 - Y0) + (Y1 - Y0) * X0;
    const dC0 = SNAP * (X2 - X1), dC1 = SNAP * (X0 - X2), dC2 = SNAP * (X1 - X0);
    const iA = 1 / area; // barycentric weights: w0 = E0/area, w1 = E1/area
    // The quadratic term Σ kᵢⱼ wᵢ wⱼ as a polynomial in X = px − minX, Y = py − minY:
    // wᵢ = αᵢ + βᵢ X + γᵢ Y, so the term is Q00 + Q10 X + Q01 Y + Q20 X² + Q11 X Y + Q02 Y²
    // (2·Q20 the second difference along a row, the same on every row).
    let qu00 = 0, qu10 = 0, qu01 = 0, qu20 = 0, qu11 = 0, qu02 = 0;
    let qv00 = 0, qv10 = 0, qv01 = 0, qv20 = 0, qv11 = 0, qv02 = 0;
    if (hasCurv) {
      const al0 = (C0 + A0 * minX) * iA, al1 = (C1 + A1 * minX) * iA, al2 = 1 - al0 - al1;
      const be0 = A0 * iA, be1 = A1 * iA, be2 = -be0 - be1;
      const ga0 = dC0 * iA, ga1 = dC1 * iA, ga2 = -ga0 - ga1;
      // products wᵢ wⱼ of the pairs (0, 1), (1, 2), (0, 2), term by term
      const p00a = al0 * al1, p00b = al1 * al2, p00c = al0 * al2;
      const p10a = al0 * be1 + al1 * be0, p10b = al1 * be2 + al2 * be1, p10c = al0 * be2 + al2 * be0;
      const p01a = al0 * ga1 + al1 * ga0, p01b = al1 * ga2 + al2 * ga1, p01c = al0 * ga2 + al2 * ga0;
      const p20a = be0 * be1, p20b = be1 * be2, p20c = be0 * be2;
      const p11a = be0 * ga1 + be1 * ga0, p11b = be1 * ga2 + be2 * ga1, p11c = be0 * ga2 + be2 * ga0;
      const p02a = ga0 * ga1, p02b = ga1 * ga2, p02c = ga0 * ga2;
      qu00 = k01u * p00a + k12u * p00b + k02u * p00c; qv00 = k01v * p00a + k12v * p00b + k02v * p00c;
      qu10 = k01u * p10a + k12u * p10b + k02u * p10c; qv10 = k01v * p10a + k12v * p10b + k02v * p10c;
      qu01 = k01u * p01a + k12u * p01b + k02u * p01c; qv01 = k01v * p01a + k12v * p01b + k02v * p01c;
      qu20 = k01u * p20a + k12u * p20b + k02u * p20c; qv20 = k01v * p20a + k12v * p20b + k02v * p20c;
      qu11 = k01u * p11a + k12u * p11b + k02u * p11c; qv11 = k01v * p11a + k12v * p11b + k02v * p11c;
      qu02 = k01u * p02a + k12u * p02b + k02u * p02c; qv02 = k01v * p02a + k12v * p02b + k02v * p02c;
    }
    // With the linear part, the source position is one quadratic in X and Y: along row Y
    // it is b(Y) + s(Y)·X + Q20·X², with b(Y) = b(0) + (bu + Q01)·Y + Q02·Y² and
    // s(Y) = au + Q10 + Q11·Y, both stepped from row to row (first differences db and
    // Q11, second difference 2·Q02 of b); its step along the row from X is
    // s + Q20·(2X + 1), and its second difference there 2·Q20
    const ddu = 2 * qu20, ddv = 2 * qv20;
    let bU = au * minX + bu * minY + cu + qu00, bV = av * minX + bv * minY + cv + qv00;
    let dbU = bu + qu01 + qu02, dbV = bv + qv01 + qv02;
    const ddbU = 2 * qu02, ddbV = 2 * qv02;
    let sU = au + qu10, sV = av + qv10;
    // Whether every covered pixel's source position lies in [0, W − 1) × [0, H − 1), so the
    // sampling needs no clamps: the linear part stays in the source triangle and the
    // quadratic term is at most ¼ Σ|kᵢⱼ| (each product of weights is at most ¼ inside).
    const qu = 0.25 * (Math.abs(k01u) + Math.abs(k12u) + Math.abs(k02u)) + 1e-6;
    const qv = 0.25 * (Math.abs(k01v) + Math.abs(k12v) + Math.abs(k02v)) + 1e-6;
    const inside =
      Math.min(su0, su1, su2) - qu > 0 && Math.max(su0, su1, su2) + qu < Wm &&
      Math.min(sv0, sv1, sv2) - qv > 0 && Math.max(sv0, sv1, sv2) + qv < Hm;
    for (
      let py = minY;
      py <= maxY;
      py++, C0 += dC0, C1 += dC1, C2 += dC2, bU += dbU, dbU += ddbU, bV += dbV, dbV += ddbV, sU += qu11, sV += qv11
    ) {
      let lo = minX, hi = maxX;
      if (A0 > 0) { const x = ceilIn((m0 - C0) / A0, minX, maxX); if (x > lo) lo = x; }
      else if (A0 < 0) { const x = floorIn((m0 - C0) / A0, minX, maxX); if (x < hi) hi = x; }
      else if (C0 < m0) continue;
      if (A1 > 0) { const x = ceilIn((m1 - C1) / A1, minX, maxX); if (x > lo) lo = x; }
      else if (A1 < 0) { const x = floorIn((m1 - C1) / A1, minX, maxX); if (x < hi) hi = x; }
      else if (C1 < m1) continue;
      if (A2 > 0) { const x = ceilIn((m2 - C2) / A2, minX, maxX); if (x > lo) lo = x; }
      else if (A2 < 0) { const x = floorIn((m2 - C2) / A2, minX, maxX); if (x < hi) hi = x; }
      else if (C2 < m2) continue;
      if (lo > hi) continue;
      const row = py * W;
      // The source position at lo and its first difference along the row.
      const X = lo - minX;
      const tu = qu20 * X, tv = qv20 * X;
      let u = bU + (sU + tu) * X, v = bV + (sV + tv) * X;
      let du = sU + tu + tu + qu20, dv = sV + tv + tv + qv20;
      if (src === null) {
        for (let p = row + lo, end = row + hi; p <= end; p++) {
          if (claim(owner, fold, p, prio)) {
            map[2 * p] = u;
            map[2 * p + 1] = v;
          }
          u += du;
          du += ddu;
          v += dv;
          dv += ddv;
        }
      } else if (inside) {
        // every source position of the triangle lies in [0, W − 1) × [0, H − 1): no clamps
        for (let p = row + lo, end = row + hi; p <= end; p++) {
          if (claim(owner, fold, p, prio)) {
            map[2 * p] = u;
            map[2 * p + 1] = v;
            const i = u | 0, j = v | 0;
            const fu = u - i, fv = v - j;
            const k = j * W + i;
            const a0 = src[k]!, a1 = src[k + 1]!, b0 = src[k + W]!, b1 = src[k + W + 1]!;
            const s0 = a0 + (a1 - a0) * fu;
            od![p] = s0 + (b0 + (b1 - b0) * fu - s0) * fv;
          }
          u += du;
          du += ddu;
          v += dv;
          dv += ddv;
        }
      } else {
        for (let p = row + lo, end = row + hi; p <= end; p++) {
          if (claim(owner, fold, p, prio)) {
            map[2 * p] = u;
            map[2 * p + 1] = v;
            od![p] = bilinear1(src, W, H, u, v);
          }
          u += du;
          du += ddu;
          v += dv;
          dv += ddv;
        }
      }
      covered += hi - lo + 1;
    }
  }
  return covered;
}

/** One triangle list for {@link rasterTriangleSnapped}. */
const oneTriangle = new Float64Array(TRI_STRIDE);

/**
 * @internal {@link rasterTrianglesSnapped} for one triangle (for the few triangles of a
 * frame that take another path; many triangles should go in one list).
 */
export function rasterTriangleSnapped(
  t: RasterTarget,
  prio: number,
  x0: number, y0: number, x1: number, y1: number, x2: number, y2: number,
  su0: number, sv0: number, su1: number, sv1: number, su2: number, sv2: number,
  curv: Float64Array | null = null,
): number {
  putTriangle(oneTriangle, 0, prio, x0, y0, x1, y1, x2, y2, su0, sv0, su1, sv1, su2, sv2, curv);
  return rasterTrianglesSnapped(t, oneTriangle, 1);
}

/**
 * @internal Snap packed output positions (`x y …`, pixels) to the lattice of the snapped
 * rasterisers. A vertex whose status is not `okValue`, or with a coordinate beyond
 * ±32768 pixels, gets `snapOk[k] = 0`.
 */
export function snapVertices(xy: Float64Array, status: Uint8Array, okValue: number, snapped: Int32Array, snapOk: Uint8Array): void {
  const n = snapOk.length;
  for (let k = 0; k < n; k++) {
    const x = xy[2 * k]!, y = xy[2 * k + 1]!;
    if (status[k] !== okValue || !(Math.abs(x) < SNAP_LIMIT && Math.abs(y) < SNAP_LIMIT)) {
      snapOk[k] = 0;
      continue;
    }
    snapped[2 * k] = snap(x);
    snapped[2 * k + 1] = snap(y);
    snapOk[k] = 1;
  }
}

// Steps of the cell rasteriser's coverage value for the edge P → Q of a triangle of
// orientation sg (t = 2·sg) from one pixel centre to the next: along x it adds
// −t·256·(Qy − Py), along y t·256·(Qx − Px) (int32 for corners within a few pixels).
function stepX(t: number, py: number, qy: number): number {
  return Math.imul(t, py - qy) << 8;
}

function stepY(t: number, px: number, qx: number): number {
  return Math.imul(t, qx - px) << 8;
}

// Coverage by an exact (integer) edge value `e` of a → b for a triangle of orientation
// `sg`, with the tie rule of `owns` on the normalised winding.
function coversSnapped(e: number, sg: number, ax: number, ay: number, bx: number, by: number): boolean {
  const v = sg * e;
  if (v !== 0) return v > 0;
  return sg > 0 ? owns(ax, ay, bx, by) : owns(bx, by, ax, ay);
}

/**
 * @internal The exact mode's inverse on the mesh cells `i0 … iEnd−1` of mesh row `v0` (cells of
 * one-pixel size, cell i spanning source u = i … i + 1) whose four corners all have the
 * map, on snapped corners (integers from {@link snapVertices}): the
 * cell's triangles (a, b, d) and (a, d, c) (a top left, b top right, c bottom left, d
 * bottom right; source u₀ … u₀ + 1, v₀ … v₀ + 1) rasterised together over their common
 * bounding box, with the coverage, tie rule, priorities and interpolation that
 * {@link rasterTrianglesSnapped} gives them one at a time. The edge functions are exact,
 * so a cell's triangles and its neighbours agree on every shared edge with no ordering
 * rule, and ties follow the rule exactly. The corners are read from `snapped` (as
 * {@link snapVertices} wrote them, `mc` vertices a mesh row); one call takes a run of
 * cells so that V8 compiles the loop once (see {@link rasterTrianglesSnapped}). Returns
 * the flipped triangles.
 */
export function rasterUnitCellsSnapped(t: RasterTarget, snapped: Int32Array, mc: number, v0: number, i0: number, iEnd: number): number {
  const W = t.width, H = t.height;
  const { map, owner, fold } = t;
  let flipped = 0;
  // the cell's right corners (b, d) are the next cell's left ones (a, c)
  const k0 = 2 * (v0 * mc + i0);
  let Xb = snapped[k0]!, Yb = snapped[k0 + 1]!, Xd = snapped[k0 + 2 * mc]!, Yd = snapped[k0 + 2 * mc + 1]!;
  for (let i = i0; i < iEnd; i++) {
    const u0 = i;
    const kb = 2 * (v0 * mc + i) + 2, kd = kb + 2 * mc;
    const Xa = Xb, Ya = Yb, Xc = Xd, Yc = Yd;
    Xb = snapped[kb]!;
    Yb = snapped[kb + 1]!;
    Xd = snapped[kd]!;
    Yd = snapped[kd + 1]!;
    const area1 = (Xb - Xa) * (Yd - Ya) - (Yb - Ya) * (Xd - Xa);
    const area2 = (Xd - Xa) * (Yc - Ya) - (Yd - Ya) * (Xc - Xa);
    flipped += (area1 < 0 ? 1 : 0) + (area2 < 0 ? 1 : 0);
    if (area1 === 0 && area2 === 0) continue;
    let lo = Xa < Xb ? Xa : Xb, hi = Xa < Xb ? Xb : Xa;
    if (Xc < lo) lo = Xc; else if (Xc > hi) hi = Xc;
    if (Xd < lo) lo = Xd; else if (Xd > hi) hi = Xd;
    let minX = (lo + SNAP - 1) >> 8, maxX = hi >> 8;
    lo = Ya < Yb ? Ya : Yb;
    hi = Ya < Yb ? Yb : Ya;
    if (Yc < lo) lo = Yc; else if (Yc > hi) hi = Yc;
    if (Yd < lo) lo = Yd; else if (Yd > hi) hi = Yd;
    let minY = (lo + SNAP - 1) >> 8, maxY = hi >> 8;
    if (minX > maxX || minY > maxY) continue; // no pixel centre in the box (a fifth of the cells)
    const nx = maxX - minX, ny = maxY - minY;
    if (nx <= 3 && ny <= 3 && minX >= 0 && minY >= 0 && maxX < W && maxY < H) {
      // The common cell: at most 4 × 4 pixel centres in its box (almost always 2 × 2 or
      // fewer), all in the image. The (centre, triangle) coverage tests are made without a
      // branch on int32 values into a bit mask, then only the covered pairs visited, in
      // the order of the general loop below (rows, then columns, triangle 1 before 2 at a
      // centre).
      //
      // Corners relative to the box's first centre (X0, Y0), within 5 px of it, so all
      // below is exact int32. The edge P → Q has e(x, y) = P×Q + (Qx − Px)·y − (Qy − Py)·x
      // there (cross product P×Q = Px·Qy − Py·Qx), and the coverage value
      // E = 2·sg·e + (owned ? 1 : −1) for a triangle of orientation sg = ±1: odd, never 0,
      // and positive exactly where the exact rule covers (e > 0, or e = 0 on an edge the
      // tie rule of `owns` gives its pixels: sg·(256·ey + ex) > 0). A centre is in the
      // triangle when its three values are positive: the sign bit of their OR is clear.
      const X0 = minX << 8, Y0 = minY << 8;
      const ax = Xa - X0, ay = Ya - Y0, bx = Xb - X0, by = Yb - Y0;
      const cx = Xc - X0, cy = Yc - Y0, dx = Xd - X0, dy = Yd - Y0;
      const g1 = (area1 >> 31) | 1, g2 = (area2 >> 31) | 1; // orientation signs
      const t1 = g1 << 1, t2 = g2 << 1;
      // triangle 1: a → b, b → d, d → a; triangle 2: a → d, d → c, c → a
      const ad = (Math.imul(ax, dy) - Math.imul(ay, dx)) | 0;
      const A1 = (Math.imul(t1, (Math.imul(ax, by) - Math.imul(ay, bx)) | 0) + ((Math.imul(g1, ((by - ay) << 12) + bx - ax) >> 31) | 1)) | 0;
      const B1 = (Math.imul(t1, (Math.imul(bx, dy) - Math.imul(by, dx)) | 0) + ((Math.imul(g1, ((dy - by) << 12) + dx - bx) >> 31) | 1)) | 0;
      const C1 = (Math.imul(-t1, ad) + ((Math.imul(g1, ((ay - dy) << 12) + ax - dx) >> 31) | 1)) | 0;
      const A2 = (Math.imul(t2, ad) + ((Math.imul(g2, ((dy - ay) << 12) + dx - ax) >> 31) | 1)) | 0;
      const B2 = (Math.imul(t2, (Math.imul(dx, cy) - Math.imul(dy, cx)) | 0) + ((Math.imul(g2, ((cy - dy) << 12) + cx - dx) >> 31) | 1)) | 0;
      const C2 = (Math.imul(t2, (Math.imul(cx, ay) - Math.imul(cy, ax)) | 0) + ((Math.imul(g2, ((ay - cy) << 12) + ax - cx) >> 31) | 1)) | 0;
      // a degenerate triangle covers nothing
      const k1 = (area1 | -area1) >> 31, k2 = (area2 | -area2) >> 31;
      // Bit 2·(4·row + column) + (triangle − 1); a step to the next centre (`stepX`,
      // `stepY`) is taken only where the box has that column or row (a third of the cells
      // have a single centre).
      let bits = ((~(A1 | B1 | C1) >>> 31) & k1) | (((~(A2 | B2 | C2) >>> 31) << 1) & k2);
      if (nx <= 1 && ny <= 1) {
        // the values at the next column, where the box has one
        let A1x = 0, B1x = 0, C1x = 0, A2x = 0, B2x = 0, C2x = 0;
        if (nx === 1) {
          A1x = (A1 + stepX(t1, ay, by)) | 0; B1x = (B1 + stepX(t1, by, dy)) | 0; C1x = (C1 + stepX(t1, dy, ay)) | 0;
          A2x = (A2 + stepX(t2, ay, dy)) | 0; B2x = (B2 + stepX(t2, dy, cy)) | 0; C2x = (C2 + stepX(t2, cy, ay)) | 0;
          bits |= (((~(A1x | B1x | C1x) >>> 31) << 2) & k1) | (((~(A2x | B2x | C2x) >>> 31) << 3) & k2);
        }
        if (ny === 1) {
          const ya1 = stepY(t1, ax, bx), yb1 = stepY(t1, bx, dx), yc1 = stepY(t1, dx, ax);
          const ya2 = stepY(t2, ax, dx), yb2 = stepY(t2, dx, cx), yc2 = stepY(t2, cx, ax);
          bits |= (((~((A1 + ya1) | (B1 + yb1) | (C1 + yc1)) >>> 31) << 8) & k1) | (((~((A2 + ya2) | (B2 + yb2) | (C2 + yc2)) >>> 31) << 9) & k2);
          if (nx === 1) {
            bits |= (((~((A1x + ya1) | (B1x + yb1) | (C1x + yc1)) >>> 31) << 10) & k1) | (((~((A2x + ya2) | (B2x + yb2) | (C2x + yc2)) >>> 31) << 11) & k2);
          }
        }
      } else {
        // a wider box (one cell in twenty): the same tests, row by row
        const xa1 = stepX(t1, ay, by), xb1 = stepX(t1, by, dy), xc1 = stepX(t1, dy, ay);
        const xa2 = stepX(t2, ay, dy), xb2 = stepX(t2, dy, cy), xc2 = stepX(t2, cy, ay);
        const ya1 = stepY(t1, ax, bx), yb1 = stepY(t1, bx, dx), yc1 = stepY(t1, dx, ax);
        const ya2 = stepY(t2, ax, dx), yb2 = stepY(t2, dx, cx), yc2 = stepY(t2, cx, ax);
        bits = 0;
        for (let r = 0, ra1 = A1, rb1 = B1, rc1 = C1, ra2 = A2, rb2 = B2, rc2 = C2; r <= ny; r++) {
          for (let q = 0, e1 = ra1, f1 = rb1, h1 = rc1, e2 = ra2, f2 = rb2, h2 = rc2; q <= nx; q++) {
            const sh = (r << 3) | (q << 1);
            bits |= (((~(e1 | f1 | h1) >>> 31) & k1) | (((~(e2 | f2 | h2) >>> 31) << 1) & k2)) << sh;
            e1 = (e1 + xa1) | 0; f1 = (f1 + xb1) | 0; h1 = (h1 + xc1) | 0;
            e2 = (e2 + xa2) | 0; f2 = (f2 + xb2) | 0; h2 = (h2 + xc2) | 0;
          }
          ra1 = (ra1 + ya1) | 0; rb1 = (rb1 + yb1) | 0; rc1 = (rc1 + yc1) | 0;
          ra2 = (ra2 + ya2) | 0; rb2 = (rb2 + yb2) | 0; rc2 = (rc2 + yc2) | 0;
        }
      }
      while (bits !== 0) {
        const b = 31 - Math.clz32(bits & -bits);
        bits &= bits - 1;
        const px = minX + ((b >> 1) & 3), py = minY + (b >> 3);
        const p = py * W + px;
        const PX = px * SNAP, PY = py * SNAP;
        if ((b & 1) === 0) {
          if (claim(owner, fold, p, area1 > 0 ? 2 : 1)) {
            // Weights: b ← eda, d ← eab; source a (u0, v0), b (u0+1, v0), d (u0+1, v0+1).
            const i1 = 1 / area1;
            const eab = (Xb - Xa) * (PY - Ya) - (Yb - Ya) * (PX - Xa);
            const ead = (Xd - Xa) * (PY - Ya) - (Yd - Ya) * (PX - Xa);
            const wb = -ead * i1, wd = eab * i1;
            map[2 * p] = u0 + wb + wd;
            map[2 * p + 1] = v0 + wd;
          }
        } else if (claim(owner, fold, p, area2 > 0 ? 2 : 1)) {
          // Weights: d ← eca, c ← ead; source a (u0, v0), d (u0+1, v0+1), c (u0, v0+1).
          const i2 = 1 / area2;
          const ead = (Xd - Xa) * (PY - Ya) - (Yd - Ya) * (PX - Xa);
          const eca = (Xa - Xc) * (PY - Yc) - (Ya - Yc) * (PX - Xc);
          const wd = eca * i2, wc = ead * i2;
          map[2 * p] = u0 + wd;
          map[2 * p + 1] = v0 + wd + wc;
        }
      }
      continue;
    }
    if (minX < 0) minX = 0;
    if (minY < 0) minY = 0;
    if (maxX > W - 1) maxX = W - 1;
    if (maxY > H - 1) maxY = H - 1;
    if (minX > maxX || minY > maxY) continue;
    if ((maxX - minX + 1) * (maxY - minY + 1) > 16) {
      // A stretched cell: the per-triangle scan is cheaper than testing its whole box.
      const s = 1 / SNAP;
      if (area1 !== 0) rasterTriangleSnapped(t, area1 > 0 ? 2 : 1, Xa * s, Ya * s, Xb * s, Yb * s, Xd * s, Yd * s, u0, v0, u0 + 1, v0, u0 + 1, v0 + 1, null);
      if (area2 !== 0) rasterTriangleSnapped(t, area2 > 0 ? 2 : 1, Xa * s, Ya * s, Xd * s, Yd * s, Xc * s, Yc * s, u0, v0, u0 + 1, v0 + 1, u0, v0 + 1, null);
      continue;
    }
    const s1 = area1 > 0 ? 1 : -1, s2 = area2 > 0 ? 1 : -1;
    const p1 = area1 > 0 ? 2 : 1, p2 = area2 > 0 ? 2 : 1;
    const i1 = 1 / area1, i2 = 1 / area2;
    for (let py = minY; py <= maxY; py++) {
      const PY = py * SNAP;
      for (let px = minX; px <= maxX; px++) {
        const PX = px * SNAP;
        const ead = (Xd - Xa) * (PY - Ya) - (Yd - Ya) * (PX - Xa);
        // Triangle (a, b, d): edges a → b, b → d, d → a (= −ead).
        if (area1 !== 0) {
          const eab = (Xb - Xa) * (PY - Ya) - (Yb - Ya) * (PX - Xa);
          if (coversSnapped(eab, s1, Xa, Ya, Xb, Yb)) {
            const ebd = (Xd - Xb) * (PY - Yb) - (Yd - Yb) * (PX - Xb);
            if (coversSnapped(ebd, s1, Xb, Yb, Xd, Yd) && coversSnapped(-ead, s1, Xd, Yd, Xa, Ya)) {
              const p = py * W + px;
              if (claim(owner, fold, p, p1)) {
                // Weights: b ← eda, d ← eab; source a (u0, v0), b (u0+1, v0), d (u0+1, v0+1).
                const wb = -ead * i1, wd = eab * i1;
                map[2 * p] = u0 + wb + wd;
                map[2 * p + 1] = v0 + wd;
              }
            }
          }
        }
        // Triangle (a, d, c): edges a → d, d → c, c → a.
        if (area2 !== 0 && coversSnapped(ead, s2, Xa, Ya, Xd, Yd)) {
          const edc = (Xc - Xd) * (PY - Yd) - (Yc - Yd) * (PX - Xd);
          if (coversSnapped(edc, s2, Xd, Yd, Xc, Yc)) {
            const eca = (Xa - Xc) * (PY - Yc) - (Ya - Yc) * (PX - Xc);
            if (coversSnapped(eca, s2, Xc, Yc, Xa, Ya)) {
              const p = py * W + px;
              if (claim(owner, fold, p, p2)) {
                // Weights: d ← eca, c ← ead; source a (u0, v0), d (u0+1, v0+1), c (u0, v0+1).
                const wd = eca * i2, wc = ead * i2;
                map[2 * p] = u0 + wd;
                map[2 * p + 1] = v0 + wd + wc;
              }
            }
          }
        }
      }
    }
  }
  return flipped;
}
