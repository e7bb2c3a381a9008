/**
 * The fast correction's quadratic term: second differences of the forward map
 * (distorted pixel → reference pixel) over the mesh, for the quadratic correction of the
 * rasterised inverse (see `rasterTriangle`). Internal.
 *
 * @module
 */

/**
 * @internal Second derivatives of the map at the mesh vertices, per pixel²: `Fuu` along
 * the mesh rows, `Fvv` along the columns (`x y` interleaved), by the three-point
 * difference on the (possibly uneven) vertex spacing. A vertex without both neighbours
 * takes the value of the adjacent vertex that has one (a one-sided estimate, first order
 * at the mesh's edges and beside invalid vertices); with none, zero (the linear map).
 *
 * @see Fornberg, B. (1988), "Generation of finite difference formulas on arbitrarily
 *   spaced grids", Mathematics of Computation 51(184), 699–706 (the three-point formula).
 */
export function mapSecondDerivatives(
  cols: readonly number[],
  rows: readonly number[],
  F: Float64Array,
  ok: Uint8Array,
  Fuu: Float64Array,
  Fvv: Float64Array,
  have: Uint8Array,
): void {
  const MC = cols.length, MR = rows.length;
  // Along rows.
  have.fill(0);
  Fuu.fill(0);
  for (let j = 0; j < MR; j++) {
    for (let i = 1; i + 1 < MC; i++) {
      const k = j * MC + i;
      if (!ok[k] || !ok[k - 1] || !ok[k + 1]) continue;
      const h0 = cols[i]! - cols[i - 1]!, h1 = cols[i + 1]! - cols[i]!, s = 2 / (h0 + h1);
      Fuu[2 * k] = ((F[2 * k + 2]! - F[2 * k]!) / h1 - (F[2 * k]! - F[2 * k - 2]!) / h0) * s;
      Fuu[2 * k + 1] = ((F[2 * k + 3]! - F[2 * k + 1]!) / h1 - (F[2 * k + 1]! - F[2 * k - 1]!) / h0) * s;
      have[k] = 1;
    }
    for (let i = 0; i < MC; i++) {
      const k = j * MC + i;
      if (have[k] || !ok[k]) continue;
      const n = i + 1 < MC && have[k + 1] === 1 ? k + 1 : i > 0 && have[k - 1] === 1 ? k - 1 : -1;
      if (n < 0) continue;
      Fuu[2 * k] = Fuu[2 * n]!;
      Fuu[2 * k + 1] = Fuu[2 * n + 1]!;
    }
  }
  // Along columns.
  have.fill(0);
  Fvv.fill(0);
  for (let j = 1; j + 1 < MR; j++) {
    const h0 = rows[j]! - rows[j - 1]!, h1 = rows[j + 1]! - rows[j]!, s = 2 / (h0 + h1);
    for (let i = 0; i < MC; i++) {
      const k = j * MC + i, a = k - MC, b = k + MC;
      if (!ok[k] || !ok[a] || !ok[b]) continue;
      Fvv[2 * k] = ((F[2 * b]! - F[2 * k]!) / h1 - (F[2 * k]! - F[2 * a]!) / h0) * s;
      Fvv[2 * k + 1] = ((F[2 * b + 1]! - F[2 * k + 1]!) / h1 - (F[2 * k + 1]! - F[2 * a + 1]!) / h0) * s;
      have[k] = 1;
    }
  }
  for (let j = 0; j < MR; j++) {
    for (let i = 0; i < MC; i++) {
      const k = j * MC + i;
      if (have[k] || !ok[k]) continue;
      const n = j + 1 < MR && have[k + MC] === 1 ? k + MC : j > 0 && have[k - MC] === 1 ? k - MC : -1;
      if (n < 0) continue;
      Fvv[2 * k] = Fvv[2 * n]!;
      Fvv[2 * k + 1] = Fvv[2 * n + 1]!;
    }
  }
}

/**
 * @internal The second differences `aᵀ·D²F·a` along the source edges of the two
 * triangles of the mesh cell with corners `ka` (top left), `kb = ka + 1`, `kc = ka + MC`,
 * `kd = kc + 1`, cell size `hu × hv` pixels: triangle (a, b, d) into `t1`, (a, d, c) into
 * `t2`, pairs in the order (0, 1), (1, 2), (0, 2) as `rasterTriangle` reads them. The
 * sides take the mean of their end vertices' second derivatives (second order at the
 * side's middle); the diagonal `hu²·Fuu + 2·hu·hv·Fuv + hv²·Fvv` at the cell's centre
 * takes the twist from the cell's four corners, `hu·hv·Fuv = F_d − F_b − F_c + F_a`
 * (none when `twist` is false: a corner has no map).
 */
export function cellEdgeCurvatures(
  F: Float64Array,
  Fuu: Float64Array,
  Fvv: Float64Array,
  ka: number,
  kb: number,
  kc: number,
  kd: number,
  hu: number,
  hv: number,
  t1: Float64Array,
  t2: Float64Array,
  twist: boolean,
): void {
  const u2 = 0.5 * hu * hu, v2 = 0.5 * hv * hv;
  for (let c = 0; c < 2; c++) {
    const ab = u2 * (Fuu[2 * ka + c]! + Fuu[2 * kb + c]!);
    const cd = u2 * (Fuu[2 * kc + c]! + Fuu[2 * kd + c]!);
    const ac = v2 * (Fvv[2 * ka + c]! + Fvv[2 * kc + c]!);
    const bd = v2 * (Fvv[2 * kb + c]! + Fvv[2 * kd + c]!);
    const ad = 0.5 * (ab + cd) + 0.5 * (ac + bd) + (twist ? 2 * (F[2 * kd + c]! - F[2 * kb + c]! - F[2 * kc + c]! + F[2 * ka + c]!) : 0);
    // Triangle (a, b, d): pairs ab, bd, ad.
    t1[c] = ab;
    t1[2 + c] = bd;
    t1[4 + c] = ad;
    // Triangle (a, d, c): pairs ad, dc, ac.
    t2[c] = ad;
    t2[2 + c] = cd;
    t2[4 + c] = ac;
  }
}
