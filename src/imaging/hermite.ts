/**
 * The fast correction's non-linear map: bicubic Hermite patches of the forward map
 * (distorted pixel → reference pixel) over the mesh cells, from the traced map and its
 * traced derivatives at the vertices, and the per-pixel Newton inversion that refines the
 * linear (barycentric) source positions with them. Internal.
 *
 * @module
 */

// Power-basis coefficients (1, t, t², t³) of the cubic Hermite basis, in the order
// value at 0, value at 1, derivative at 0, derivative at 1.
const HB: readonly (readonly number[])[] = [
  [1, 0, -3, 2],
  [0, 0, 3, -2],
  [0, 1, -2, 1],
  [0, 0, -1, 1],
];

/**
 * @internal Power-basis coefficients of the bicubic Hermite patch of each mesh cell, for
 * both components of the forward map: 32 numbers a cell (`x` then `y`, `C[n·4 + m]` the
 * coefficient of `aᵐ bⁿ`), in the cell's local coordinates `a = (u − u₀)/h_u`,
 * `b = (v − v₀)/h_v` ∈ [0, 1]. A cell whose four vertices lack the map or its
 * derivatives gets `ok = 0`.
 *
 * The vertex data: the map `F`, its derivatives `F_u`, `F_v` (traced) and the twist
 * `F_uv` from central differences of the traced derivatives over the neighbouring
 * vertices (one-sided at the mesh's edges).
 *
 * @see Ferguson, J. C. (1964), "Multivariable curve interpolation", Journal of the ACM
 *   11(2), 221–228 (bicubic Hermite patches from corner values, slopes and twists).
 */
export function hermitePatches(
  cols: readonly number[],
  rows: readonly number[],
  F: Float64Array,
  Fu: Float64Array,
  Fv: Float64Array,
  ok: Uint8Array,
  coef: Float64Array,
  cellOk: Uint8Array,
): void {
  const MC = cols.length, MR = rows.length;
  const twist = new Float64Array(2 * MC * MR);
  const tw = new Uint8Array(MC * MR);
  for (let j = 0; j < MR; j++) {
    for (let i = 0; i < MC; i++) {
      const k = j * MC + i;
      if (!ok[k]) continue;
      const il = i > 0 && ok[k - 1] ? i - 1 : i, ir = i + 1 < MC && ok[k + 1] ? i + 1 : i;
      const jl = j > 0 && ok[k - MC] ? j - 1 : j, jr = j + 1 < MR && ok[k + MC] ? j + 1 : j;
      let n = 0, tx = 0, ty = 0;
      if (ir > il) {
        const a = j * MC + il, b = j * MC + ir, d = cols[ir]! - cols[il]!;
        tx += (Fv[2 * b]! - Fv[2 * a]!) / d;
        ty += (Fv[2 * b + 1]! - Fv[2 * a + 1]!) / d;
        n++;
      }
      if (jr > jl) {
        const a = jl * MC + i, b = jr * MC + i, d = rows[jr]! - rows[jl]!;
        tx += (Fu[2 * b]! - Fu[2 * a]!) / d;
        ty += (Fu[2 * b + 1]! - Fu[2 * a + 1]!) / d;
        n++;
      }
      if (n > 0) {
        twist[2 * k] = tx / n;
        twist[2 * k + 1] = ty / n;
      }
      tw[k] = 1;
    }
  }
  const G = new Float64Array(16);
  for (let j = 0; j + 1 < MR; j++) {
    for (let i = 0; i + 1 < MC; i++) {
      const c = j * (MC - 1) + i;
      const k00 = j * MC + i, k10 = k00 + 1, k01 = k00 + MC, k11 = k01 + 1;
      if (!(tw[k00] && tw[k10] && tw[k01] && tw[k11])) {
        cellOk[c] = 0;
        continue;
      }
      cellOk[c] = 1;
      const hu = cols[i + 1]! - cols[i]!, hv = rows[j + 1]! - rows[j]!;
      const ks = [k00, k10, k01, k11];
      for (let comp = 0; comp < 2; comp++) {
        // G[p·4 + q]: p indexes the a-basis, q the b-basis (value 0, value 1, slope 0, slope 1).
        for (let pa = 0; pa < 2; pa++) {
          for (let qb = 0; qb < 2; qb++) {
            const k = ks[qb * 2 + pa]!;
            G[pa * 4 + qb] = F[2 * k + comp]!;
            G[(pa + 2) * 4 + qb] = hu * Fu[2 * k + comp]!;
            G[pa * 4 + qb + 2] = hv * Fv[2 * k + comp]!;
            G[(pa + 2) * 4 + qb + 2] = hu * hv * twist[2 * k + comp]!;
          }
        }
        const o = 32 * c + 16 * comp;
        for (let n = 0; n < 4; n++) {
          for (let m = 0; m < 4; m++) {
            let s = 0;
            for (let p = 0; p < 4; p++) {
              const ap = HB[p]![m]!;
              if (ap === 0) continue;
              for (let q = 0; q < 4; q++) s += ap * G[p * 4 + q]! * HB[q]![n]!;
            }
            coef[o + n * 4 + m] = s;
          }
        }
      }
    }
  }
}

/**
 * @internal Refine the source positions of the covered, fold-free output pixels: solve
 * `F(u, v) = (x, y)` (the pixel's own position) on the Hermite patch of the cell holding
 * the current estimate by Newton's method, from the linear estimate, at most
 * `iterations` steps, moving to the neighbouring cell's patch when a step leaves the
 * cell. A pixel keeps its linear estimate when a cell has no patch or a step fails (a
 * singular Jacobian, a step longer than `maxStep` pixels).
 */
export function refineMap(
  W: number,
  H: number,
  map: Float32Array,
  owner: Uint8Array,
  fold: Uint8Array,
  step: number,
  cols: readonly number[],
  rows: readonly number[],
  coef: Float64Array,
  cellOk: Uint8Array,
  iterations: number,
  maxStep: number,
): void {
  const MC1 = cols.length - 1, MR1 = rows.length - 1;
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const p = y * W + x;
      if (owner[p] !== 2 || fold[p] === 1) continue;
      let u = map[2 * p]!, v = map[2 * p + 1]!;
      const u0 = u, v0 = v;
      let good = true;
      for (let it = 0; it < iterations; it++) {
        let i = Math.floor(u / step), j = Math.floor(v / step);
        if (i < 0) i = 0;
        else if (i > MC1 - 1) i = MC1 - 1;
        if (j < 0) j = 0;
        else if (j > MR1 - 1) j = MR1 - 1;
        const c = j * MC1 + i;
        if (cellOk[c] !== 1) {
          good = false;
          break;
        }
        const ua = cols[i]!, va = rows[j]!;
        const hu = cols[i + 1]! - ua, hv = rows[j + 1]! - va;
        const a = (u - ua) / hu, b = (v - va) / hv;
        const a2 = a * a, a3 = a2 * a, b2 = b * b, b3 = b2 * b;
        const o = 32 * c;
        // Component x.
        let r0 = coef[o]! + coef[o + 1]! * a + coef[o + 2]! * a2 + coef[o + 3]! * a3;
        let r1 = coef[o + 4]! + coef[o + 5]! * a + coef[o + 6]! * a2 + coef[o + 7]! * a3;
        let r2 = coef[o + 8]! + coef[o + 9]! * a + coef[o + 10]! * a2 + coef[o + 11]! * a3;
        let r3 = coef[o + 12]! + coef[o + 13]! * a + coef[o + 14]! * a2 + coef[o + 15]! * a3;
        let d0 = coef[o + 1]! + 2 * coef[o + 2]! * a + 3 * coef[o + 3]! * a2;
        let d1 = coef[o + 5]! + 2 * coef[o + 6]! * a + 3 * coef[o + 7]! * a2;
        let d2 = coef[o + 9]! + 2 * coef[o + 10]! * a + 3 * coef[o + 11]! * a2;
        let d3 = coef[o + 13]! + 2 * coef[o + 14]! * a + 3 * coef[o + 15]! * a2;
        const fx = r0 + r1 * b + r2 * b2 + r3 * b3;
        const fxa = d0 + d1 * b + d2 * b2 + d3 * b3;
        const fxb = r1 + 2 * r2 * b + 3 * r3 * b2;
        // Component y.
        const q = o + 16;
        r0 = coef[q]! + coef[q + 1]! * a + coef[q + 2]! * a2 + coef[q + 3]! * a3;
        r1 = coef[q + 4]! + coef[q + 5]! * a + coef[q + 6]! * a2 + coef[q + 7]! * a3;
        r2 = coef[q + 8]! + coef[q + 9]! * a + coef[q + 10]! * a2 + coef[q + 11]! * a3;
        r3 = coef[q + 12]! + coef[q + 13]! * a + coef[q + 14]! * a2 + coef[q + 15]! * a3;
        d0 = coef[q + 1]! + 2 * coef[q + 2]! * a + 3 * coef[q + 3]! * a2;
        d1 = coef[q + 5]! + 2 * coef[q + 6]! * a + 3 * coef[q + 7]! * a2;
        d2 = coef[q + 9]! + 2 * coef[q + 10]! * a + 3 * coef[q + 11]! * a2;
        d3 = coef[q + 13]! + 2 * coef[q + 14]! * a + 3 * coef[q + 15]! * a2;
        const fy = r0 + r1 * b + r2 * b2 + r3 * b3;
        const fya = d0 + d1 * b + d2 * b2 + d3 * b3;
        const fyb = r1 + 2 * r2 * b + 3 * r3 * b2;
        // Newton step in (a, b), then in pixels.
        const ex = fx - x, ey = fy - y;
        const det = fxa * fyb - fxb * fya;
        if (!(Math.abs(det) > 1e-12)) {
          good = false;
          break;
        }
        const da = (fyb * ex - fxb * ey) / det, db = (fxa * ey - fya * ex) / det;
        const du = -da * hu, dv = -db * hv;
        u += du;
        v += dv;
        if (!(Math.abs(u - u0) <= maxStep && Math.abs(v - v0) <= maxStep)) {
          good = false;
          break;
        }
        if (Math.abs(du) + Math.abs(dv) < 1e-3) break;
      }
      if (good) {
        map[2 * p] = u;
        map[2 * p + 1] = v;
      }
    }
  }
}
