/**
 * Test renderer: an anti-aliased checkerboard seen under a homography, a smooth
 * sinusoidal image warp and a quadratic bend of its rows, with the exact image positions
 * of its inner corners.
 *
 * Geometry. Board coordinates `(bx, by)` are in squares; the board has
 * `(columns + 1) × (rows + 1)` squares on a light margin, and inner corner `(i, j)` sits at
 * `(i + 1, j + 1)`. A board point maps to the plane as
 * `px = ox + s·bx`, `py = oy + s·by + bend·(px − bendCentre)²`, the plane maps to the
 * image by the homography `Hm` (plane → image), and an image pixel at `u` sees the plane
 * at `Hm⁻¹(u + a·(sin(2π v/λ + φ), sin(2π u/λ + φ)))` (the warp acts on the image side).
 * True corners come from inverting that chain exactly (Newton on the warp).
 *
 * Anti-aliasing. Pixel `(u, v)` covers `[u − ½, u + ½] × [v − ½, v + ½]`. A pixel whose four
 * corners and centre fall in one region (one square, the margin, a blob) takes that
 * region's value; any other pixel is the mean of `ss` sub-samples on a Fibonacci lattice.
 */
import { createImage, createRng } from '../../src/core/index.js';
import type { Image } from '../../src/core/index.js';

export interface Blob {
  /** Centre, image pixels. */
  x: number;
  y: number;
  /** Radius, pixels. */
  radius: number;
  /** Intensity inside. */
  value: number;
}

export interface BoardSpec {
  width: number;
  height: number;
  /** Inner corners along a row. */
  columns: number;
  /** Inner corners along a column. */
  rows: number;
  /** Square side in the plane, pixels. */
  square: number;
  /** Plane position of board point (0, 0) (the outer corner of the first square), pixels. */
  origin: [number, number];
  /** Plane → image homography, row-major 3×3. @defaultValue identity */
  homography?: number[];
  /** Image-side sinusoidal warp amplitude a (pixels), wavelength λ (pixels), phase φ. */
  warp?: { amplitude: number; wavelength: number; phase?: number; kind?: 'shear' | 'stretch' | 'oblique'; angle?: number };
  /** Quadratic bend of the rows: py += bend·(px − bendCentre)². */
  bend?: { coefficient: number; centre: number };
  dark?: number;
  light?: number;
  /** Sub-samples for edge pixels: a Fibonacci number (89, 144, 233, 377, 610, 987, 1597). @defaultValue 377 */
  ss?: number;
  /** Gaussian noise standard deviation. */
  noise?: number;
  seed?: number;
  blobs?: Blob[];
  /** Channels of the output (1 or 3; 3 repeats the grey value). */
  channels?: 1 | 3;
}

export interface RenderedBoard {
  image: Image;
  /** True inner corners, image pixels, packed x y, row-major (j·columns + i). */
  corners: Float64Array;
  columns: number;
  rows: number;
}

const FIB_PREV: Record<number, number> = { 89: 55, 144: 89, 233: 144, 377: 233, 610: 377, 987: 610, 1597: 987 };

function inv3(m: number[]): number[] {
  const [a, b, c, d, e, f, g, h, k] = m as [number, number, number, number, number, number, number, number, number];
  const A = e * k - f * h;
  const B = -(d * k - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  return [
    A / det,
    -(b * k - c * h) / det,
    (b * f - c * e) / det,
    B / det,
    (a * k - c * g) / det,
    -(a * f - c * d) / det,
    C / det,
    -(a * h - b * g) / det,
    (a * e - b * d) / det,
  ];
}

export function renderBoard(spec: BoardSpec): RenderedBoard {
  const { width: W, height: H, columns, rows, square: s } = spec;
  const [ox, oy] = spec.origin;
  const Hm = spec.homography ?? [1, 0, 0, 0, 1, 0, 0, 0, 1];
  const Hi = inv3(Hm);
  const amp = spec.warp?.amplitude ?? 0;
  const lam = spec.warp?.wavelength ?? 1;
  const phi = spec.warp?.phase ?? 0;
  // 'shear': u + a sin(2π v/λ + φ), v + a sin(2π u/λ + φ); 'stretch': u + a sin(2π u/λ + φ), v + a sin(2π v/λ + φ);
  // 'oblique': two waves along directions θ and θ + 90° (θ = `angle`, default 0.6 rad), each displacing along
  // its own direction, (u, v) + a Σ_m e_m sin(2π e_m·(u, v)/λ + φ_m), φ_1 = φ, φ_2 = φ + 1.3; not separable in u, v.
  const stretch = spec.warp?.kind === 'stretch';
  const oblique = spec.warp?.kind === 'oblique';
  const th = spec.warp?.angle ?? 0.6;
  const e1 = [Math.cos(th), Math.sin(th)] as const;
  const e2 = [-Math.sin(th), Math.cos(th)] as const;
  /** The warp (u, v) → image-side plane point, and its Jacobian, into `o` = [wu, wv, j11, j12, j21, j22]. */
  const warpAt = (u: number, v: number, o: Float64Array): void => {
    const k = (2 * Math.PI) / lam;
    if (oblique) {
      const s1 = k * (e1[0] * u + e1[1] * v) + phi;
      const s2 = k * (e2[0] * u + e2[1] * v) + phi + 1.3;
      const a1 = amp * Math.sin(s1), a2 = amp * Math.sin(s2);
      const c1 = amp * k * Math.cos(s1), c2 = amp * k * Math.cos(s2);
      o[0] = u + a1 * e1[0] + a2 * e2[0];
      o[1] = v + a1 * e1[1] + a2 * e2[1];
      o[2] = 1 + c1 * e1[0] * e1[0] + c2 * e2[0] * e2[0];
      o[3] = c1 * e1[0] * e1[1] + c2 * e2[0] * e2[1];
      o[4] = o[3];
      o[5] = 1 + c1 * e1[1] * e1[1] + c2 * e2[1] * e2[1];
      return;
    }
    const su = stretch ? u : v;
    const sv = stretch ? v : u;
    o[0] = u + amp * Math.sin(k * su + phi);
    o[1] = v + amp * Math.sin(k * sv + phi);
    const d1 = amp * k * Math.cos(k * su + phi);
    const d2 = amp * k * Math.cos(k * sv + phi);
    o[2] = stretch ? 1 + d1 : 1;
    o[3] = stretch ? 0 : d1;
    o[4] = stretch ? 0 : d2;
    o[5] = stretch ? 1 + d2 : 1;
  };
  const wk = new Float64Array(6);
  const kb = spec.bend?.coefficient ?? 0;
  const bc = spec.bend?.centre ?? 0;
  const dark = spec.dark ?? 0.1;
  const light = spec.light ?? 0.9;
  // Sub-samples: a Fibonacci rank-1 lattice, whose x and y coordinates are each all
  // distinct, so that the coverage of an edge in any direction is resolved to ~1/N.
  const [nSub, gen] = spec.ss === undefined ? [377, 233] : [spec.ss, FIB_PREV[spec.ss] ?? 1];
  const subX = new Float64Array(nSub);
  const subY = new Float64Array(nSub);
  for (let k = 0; k < nSub; k++) {
    subX[k] = (k + 0.5) / nSub;
    subY[k] = (((k * gen) % nSub) + 0.5) / nSub;
  }
  const blobs = spec.blobs ?? [];
  const nSq = [columns + 1, rows + 1];

  // Image point → region id and value.
  const region = (u: number, v: number, out: { value: number }): number => {
    for (let b = 0; b < blobs.length; b++) {
      const bl = blobs[b]!;
      if ((u - bl.x) ** 2 + (v - bl.y) ** 2 <= bl.radius * bl.radius) {
        out.value = bl.value;
        return -2 - b;
      }
    }
    warpAt(u, v, wk);
    const wu = wk[0]!;
    const wv = wk[1]!;
    const w = Hi[6]! * wu + Hi[7]! * wv + Hi[8]!;
    const px = (Hi[0]! * wu + Hi[1]! * wv + Hi[2]!) / w;
    const py = (Hi[3]! * wu + Hi[4]! * wv + Hi[5]!) / w;
    const bx = (px - ox) / s;
    const by = (py - kb * (px - bc) ** 2 - oy) / s;
    const sx = Math.floor(bx);
    const sy = Math.floor(by);
    if (sx < 0 || sy < 0 || sx >= nSq[0]! || sy >= nSq[1]!) {
      out.value = light;
      return -1;
    }
    out.value = (sx + sy) % 2 === 0 ? dark : light;
    return sy * 100000 + sx;
  };

  const data = new Float32Array(W * H);
  // Region ids at pixel corners (W+1)×(H+1).
  const cornerId = new Float64Array((W + 1) * (H + 1));
  const tmp = { value: 0 };
  for (let v = 0; v <= H; v++) for (let u = 0; u <= W; u++) cornerId[v * (W + 1) + u] = region(u - 0.5, v - 0.5, tmp);
  for (let v = 0; v < H; v++) {
    for (let u = 0; u < W; u++) {
      const c0 = cornerId[v * (W + 1) + u]!;
      const idc = region(u, v, tmp);
      const uniform =
        c0 === idc &&
        cornerId[v * (W + 1) + u + 1] === c0 &&
        cornerId[(v + 1) * (W + 1) + u] === c0 &&
        cornerId[(v + 1) * (W + 1) + u + 1] === c0;
      if (uniform) {
        data[v * W + u] = tmp.value;
        continue;
      }
      let sum = 0;
      for (let k = 0; k < nSub; k++) {
        region(u - 0.5 + subX[k]!, v - 0.5 + subY[k]!, tmp);
        sum += tmp.value;
      }
      data[v * W + u] = sum / nSub;
    }
  }
  if (spec.noise !== undefined && spec.noise > 0) {
    const rng = createRng(spec.seed ?? 1);
    for (let k = 0; k < data.length; k++) data[k] = data[k]! + rng.normal(0, spec.noise);
  }

  // True corners.
  const corners = new Float64Array(2 * columns * rows);
  for (let j = 0; j < rows; j++) {
    for (let i = 0; i < columns; i++) {
      const px = ox + s * (i + 1);
      const py = oy + s * (j + 1) + kb * (px - bc) ** 2;
      const w = Hm[6]! * px + Hm[7]! * py + Hm[8]!;
      const tx = (Hm[0]! * px + Hm[1]! * py + Hm[2]!) / w;
      const ty = (Hm[3]! * px + Hm[4]! * py + Hm[5]!) / w;
      // Solve warp(u, v) = (tx, ty) by Newton's method.
      let u = tx;
      let v = ty;
      for (let it = 0; it < 100; it++) {
        warpAt(u, v, wk);
        const f1 = wk[0]! - tx;
        const f2 = wk[1]! - ty;
        const det = wk[2]! * wk[5]! - wk[3]! * wk[4]!;
        const du = (wk[5]! * f1 - wk[3]! * f2) / det;
        const dv = (wk[2]! * f2 - wk[4]! * f1) / det;
        u -= du;
        v -= dv;
        if (Math.abs(du) + Math.abs(dv) < 1e-13) break;
      }
      corners[2 * (j * columns + i)] = u;
      corners[2 * (j * columns + i) + 1] = v;
    }
  }
  let image: Image;
  if (spec.channels === 3) {
    const rgb = new Float32Array(3 * W * H);
    for (let k = 0; k < W * H; k++) rgb[3 * k] = rgb[3 * k + 1] = rgb[3 * k + 2] = data[k]!;
    image = createImage(W, H, 3, rgb);
  } else image = createImage(W, H, 1, data);
  return { image, corners, columns, rows };
}

/** A homography from a rotation by `angle` about `(cx, cy)` plus a small perspective term. */
export function tiltedHomography(angle: number, cx: number, cy: number, px = 0, py = 0): number[] {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  // T(c) · R · T(−c), then a perspective row [px, py, 1 − px·cx − py·cy] keeping (cx, cy) fixed.
  const r = [c, -s, cx - c * cx + s * cy, s, c, cy - s * cx - c * cy, 0, 0, 1];
  const p = [1, 0, 0, 0, 1, 0, px, py, 1 - px * cx - py * cy];
  const m = new Array<number>(9).fill(0);
  for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) for (let k = 0; k < 3; k++) m[a * 3 + b]! += p[a * 3 + k]! * r[k * 3 + b]!;
  return m;
}
