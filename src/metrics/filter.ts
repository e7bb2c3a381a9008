/**
 * Internal separable Gaussian filtering used by the image scores and the corner
 * detector. Not part of the public surface of the area.
 *
 * @module
 * @internal
 */

/**
 * A normalised 1-D Gaussian kernel of `2·radius + 1` taps (sum 1). The outer product of
 * two such kernels is the normalised 2-D Gaussian window, so filtering rows then columns
 * equals the 2-D filter exactly.
 *
 * @param sigma - Standard deviation in samples (> 0).
 * @param radius - Half-width in samples (≥ 0).
 * @returns The kernel, centre at index `radius`.
 * @internal
 */
export function gaussianKernel1d(sigma: number, radius: number): Float64Array {
  const g = new Float64Array(2 * radius + 1);
  let s = 0;
  for (let k = -radius; k <= radius; k++) {
    const v = Math.exp(-(k * k) / (2 * sigma * sigma));
    g[k + radius] = v;
    s += v;
  }
  for (let k = 0; k < g.length; k++) g[k] = g[k]! / s;
  return g;
}

/**
 * Horizontal pass of a symmetric kernel over the 'valid' part of each row: output row
 * `j` column `i` is `Σ_k g[k] · src[j·W + i + k]`, for `i` in `[0, W − 2r)`.
 *
 * @internal
 */
export function filterRowsValid(
  src: Float64Array,
  width: number,
  height: number,
  g: Float64Array,
  dst: Float64Array,
): void {
  const r = (g.length - 1) >> 1;
  const wv = width - 2 * r;
  const g0 = g[r]!;
  for (let j = 0; j < height; j++) {
    const row = j * width;
    const orow = j * wv;
    for (let i = 0; i < wv; i++) {
      const c = row + i + r;
      let s = g0 * src[c]!;
      for (let k = 1; k <= r; k++) s += g[r + k]! * (src[c - k]! + src[c + k]!);
      dst[orow + i] = s;
    }
  }
}

/**
 * Same-size separable Gaussian blur of a single-channel Float32 plane, with the edge
 * sample repeated beyond the border (clamp).
 *
 * @param src - Input plane, `width × height`.
 * @param g - Kernel from {@link gaussianKernel1d}.
 * @param tmp - Scratch of `width × height`.
 * @param out - Output plane of `width × height` (may not alias `src`).
 * @internal
 */
export function blurClamped(
  src: Float32Array,
  width: number,
  height: number,
  g: Float64Array,
  tmp: Float32Array,
  out: Float32Array,
): void {
  const r = (g.length - 1) >> 1;
  const g0 = g[r]!;
  // Rows: the interior without index clamping, then the border columns with it.
  const lo = Math.min(r, width);
  const hi = Math.max(lo, width - r);
  if (r === 5) rowsInterior5(src, width, height, g, tmp);
  for (let j = 0; j < height; j++) {
    const row = j * width;
    if (r !== 5) {
      for (let i = lo; i < hi; i++) {
        let s = g0 * src[row + i]!;
        for (let k = 1; k <= r; k++) s += g[r + k]! * (src[row + i - k]! + src[row + i + k]!);
        tmp[row + i] = s;
      }
    }
    for (let i = 0; i < width; i++) {
      if (i === lo && hi > lo) i = hi;
      if (i >= width) break;
      let s = g0 * src[row + i]!;
      for (let k = 1; k <= r; k++) {
        const a = i - k < 0 ? 0 : i - k;
        const b = i + k > width - 1 ? width - 1 : i + k;
        s += g[r + k]! * (src[row + a]! + src[row + b]!);
      }
      tmp[row + i] = s;
    }
  }
  // Columns, row by row so that memory is read in order.
  for (let j = 0; j < height; j++) {
    const orow = j * width;
    for (let i = 0; i < width; i++) out[orow + i] = g0 * tmp[orow + i]!;
    for (let k = 1; k <= r; k++) {
      const ja = j - k < 0 ? 0 : j - k;
      const jb = j + k > height - 1 ? height - 1 : j + k;
      const ra = ja * width;
      const rb = jb * width;
      const gk = g[r + k]!;
      for (let i = 0; i < width; i++) out[orow + i] = out[orow + i]! + gk * (tmp[ra + i]! + tmp[rb + i]!);
    }
  }
}

/** Interior of the row pass for the 11-tap kernel, unrolled. */
function rowsInterior5(src: Float32Array, width: number, height: number, g: Float64Array, out: Float32Array): void {
  const g0 = g[5]!;
  const g1 = g[6]!;
  const g2 = g[7]!;
  const g3 = g[8]!;
  const g4 = g[9]!;
  const g5 = g[10]!;
  for (let j = 0; j < height; j++) {
    const row = j * width;
    for (let c = row + 5; c < row + width - 5; c++) {
      // (no iterations when width ≤ 10: the border loop then covers every column)
      out[c] =
        g0 * src[c]! +
        g1 * (src[c - 1]! + src[c + 1]!) +
        g2 * (src[c - 2]! + src[c + 2]!) +
        g3 * (src[c - 3]! + src[c + 3]!) +
        g4 * (src[c - 4]! + src[c + 4]!) +
        g5 * (src[c - 5]! + src[c + 5]!);
    }
  }
}
