/**
 * Triangle rasterisation with interpolated source coordinates: the inverse of a smooth
 * map known at mesh vertices. Internal.
 *
 * @module
 */

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
}

// Edge function of the directed edge a → b at p, computed in a canonical endpoint order
// so that the two triangles sharing an edge get exactly opposite values.
function edge(ax: number, ay: number, bx: number, by: number, px: number, py: number): number {
  if (ax < bx || (ax === bx && ay < by)) return (bx - ax) * (py - ay) - (by - ay) * (px - ax);
  return -((ax - bx) * (py - by) - (ay - by) * (px - bx));
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
 * priority `prio` into `t`. Pixel centres (integers) inside the triangle are covered;
 * pixels on an edge follow the tie rule. Returns the pixels covered.
 */
export function rasterTriangle(
  t: RasterTarget,
  prio: number,
  x0: number, y0: number, x1: number, y1: number, x2: number, y2: number,
  su0: number, sv0: number, su1: number, sv1: number, su2: number, sv2: number,
): number {
  let area = (x1 - x0) * (y2 - y0) - (y1 - y0) * (x2 - x0);
  if (!(area !== 0) || !Number.isFinite(area)) return 0;
  if (area < 0) {
    // Normalise the winding: swap vertices 1 and 2.
    let w = x1; x1 = x2; x2 = w;
    w = y1; y1 = y2; y2 = w;
    w = su1; su1 = su2; su2 = w;
    w = sv1; sv1 = sv2; sv2 = w;
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
  if (maxX - minX <= 1 && maxY - minY <= 1) {
    // A small triangle (the exact mode's one-pixel mesh): test its few pixels directly.
    let covered = 0;
    const inv = 1 / area;
    for (let py = minY; py <= maxY; py++) {
      for (let px = minX; px <= maxX; px++) {
        if (!inside(x0, y0, x1, y1, x2, y2, px, py)) continue;
        const w0 = ((x2 - x1) * (py - y1) - (y2 - y1) * (px - x1)) * inv;
        const w1 = ((x0 - x2) * (py - y2) - (y0 - y2) * (px - x2)) * inv;
        const w2 = 1 - w0 - w1;
        const p = py * W + px;
        const ow = owner[p]!;
        if (ow !== 0) fold[p] = 1;
        if (prio > ow) {
          owner[p] = prio;
          map[2 * p] = w0 * su0 + w1 * su1 + w2 * su2;
          map[2 * p + 1] = w0 * sv0 + w1 * sv1 + w2 * sv2;
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
    for (let px = lo; px <= hi; px++) {
      const p = row + px;
      const ow = owner[p]!;
      if (ow !== 0) fold[p] = 1;
      if (prio > ow) {
        owner[p] = prio;
        map[2 * p] = u;
        map[2 * p + 1] = v;
      }
      u += au;
      v += av;
    }
    covered += hi - lo + 1;
  }
  return covered;
}
