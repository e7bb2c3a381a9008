import { describe, expect, it } from 'vitest';
import { createRng } from '../../src/core/index.js';
import { bilinear1, putTriangle, rasterTriangleSnapped, rasterTrianglesSnapped, rasterUnitCellsSnapped, TRI_STRIDE } from '../../src/imaging/raster.js';
import type { RasterTarget } from '../../src/imaging/raster.js';

// The exact mode's cell rasteriser takes a row of one-pixel cells at once, with a
// branch-free test for cells whose box holds at most 4 × 4 pixel centres. It must cover
// exactly what the one-triangle rasteriser covers with the same triangles in the same
// order (same owners, same folds), and interpolate the same source positions (an
// internal consistency check; the one-triangle rasteriser is checked for watertightness
// and against closed-form maps in correct.test.ts).
describe('rasterUnitCellsSnapped', () => {
  const W = 48, H = 40;
  const target = (): RasterTarget => ({ width: W, height: H, map: new Float32Array(2 * W * H), owner: new Uint8Array(W * H), fold: new Uint8Array(W * H), sample: null });

  // jitter amplitude (px), lattice spacing along x and y (px), corners rounded to pixel
  // centres (ties everywhere)
  const cases: [number, number, number, boolean][] = [
    [0.2, 1, 1, false], [0.7, 1, 1, false], [1.5, 1, 1, false], [4, 1, 1, false],
    [0, 1, 1, true], [0.6, 1.7, 1.7, false], [1.2, 2.3, 2.3, true], [0.3, 4.3, 2.2, false],
  ];
  for (const [amp, sx, sy, round] of cases) {
    it(`equals triangle-by-triangle rasterisation on a lattice of ${sx} × ${sy} px jittered by ±${amp / 2} px${round ? ', corners on pixel centres' : ''} (folds included)`, () => {
      const rng = createRng(7 + amp * 10 + sx * 100);
      // a mesh a little larger than the image, so that cells straddle its borders
      const mc = Math.ceil(W / sx) + 6, mr = Math.ceil(H / sy) + 6;
      const snapped = new Int32Array(2 * mc * mr);
      for (let j = 0; j < mr; j++) {
        for (let i = 0; i < mc; i++) {
          let x = (i - 3) * sx + amp * (rng.uniform() - 0.5) + 0.25 * Math.sin(j / 3);
          let y = (j - 3) * sy + amp * (rng.uniform() - 0.5);
          if (round) {
            x = Math.round(x);
            y = Math.round(y);
          }
          snapped[2 * (j * mc + i)] = Math.floor(x * 256 + 0.5);
          snapped[2 * (j * mc + i) + 1] = Math.floor(y * 256 + 0.5);
        }
      }
      // which boxes of pixel centres the cells have (the fast paths go by 1 × 1, 2 × 2 and
      // up to 4 × 4 boxes)
      const boxes = new Set<string>();
      for (let j = 0; j + 1 < mr; j++) {
        for (let i = 0; i + 1 < mc; i++) {
          const k = j * mc + i, c = [k, k + 1, k + mc, k + mc + 1];
          const xs = c.map((q) => snapped[2 * q]!), ys = c.map((q) => snapped[2 * q + 1]!);
          const nx = (Math.max(...xs) >> 8) - ((Math.min(...xs) + 255) >> 8) + 1;
          const ny = (Math.max(...ys) >> 8) - ((Math.min(...ys) + 255) >> 8) + 1;
          boxes.add(`${Math.max(nx, 0)}x${Math.max(ny, 0)}`);
        }
      }
      if (sx === 1.7) expect(boxes.has('3x2') && boxes.has('1x1') && boxes.has('2x2')).toBe(true);
      if (sx === 2.3) expect(boxes.has('3x3') && boxes.has('4x4') && boxes.has('3x4')).toBe(true);
      if (sx === 4.3) expect(boxes.has('5x3') && boxes.has('4x2')).toBe(true); // 5 wide: the general loop
      const a = target(), b = target();
      let flippedA = 0, flippedB = 0;
      for (let v0 = 0; v0 + 1 < mr; v0++) {
        flippedA += rasterUnitCellsSnapped(a, snapped, mc, v0, 0, mc - 1);
        for (let i = 0; i + 1 < mc; i++) {
          const ka = 2 * (v0 * mc + i), kc = ka + 2 * mc;
          const s = 1 / 256;
          const xa = snapped[ka]! * s, ya = snapped[ka + 1]! * s, xb = snapped[ka + 2]! * s, yb = snapped[ka + 3]! * s;
          const xc = snapped[kc]! * s, yc = snapped[kc + 1]! * s, xd = snapped[kc + 2]! * s, yd = snapped[kc + 3]! * s;
          const ar1 = (xb - xa) * (yd - ya) - (yb - ya) * (xd - xa);
          const ar2 = (xd - xa) * (yc - ya) - (yd - ya) * (xc - xa);
          flippedB += (ar1 < 0 ? 1 : 0) + (ar2 < 0 ? 1 : 0);
          if (ar1 !== 0) rasterTriangleSnapped(b, ar1 > 0 ? 2 : 1, xa, ya, xb, yb, xd, yd, i, v0, i + 1, v0, i + 1, v0 + 1, null);
          if (ar2 !== 0) rasterTriangleSnapped(b, ar2 > 0 ? 2 : 1, xa, ya, xd, yd, xc, yc, i, v0, i + 1, v0 + 1, i, v0 + 1, null);
        }
      }
      expect(flippedA).toBe(flippedB);
      expect(a.owner).toEqual(b.owner);
      expect(a.fold).toEqual(b.fold);
      let worst = 0, covered = 0;
      for (let p = 0; p < W * H; p++) {
        if (a.owner[p] === 0) continue;
        covered++;
        worst = Math.max(worst, Math.abs(a.map[2 * p]! - b.map[2 * p]!), Math.abs(a.map[2 * p + 1]! - b.map[2 * p + 1]!));
      }
      // the same barycentric interpolation, written two ways: rounding only
      expect(worst).toBeLessThan(1e-4);
      // an unfolded lattice covers every pixel once; the check saw real coverage
      if (amp < 1 && !round) expect(covered).toBe(W * H);
      else if (amp >= 1 && sx === 1) expect(a.fold.some((f) => f === 1)).toBe(true);
      else expect(covered).toBeGreaterThan(0.9 * W * H);
    });
  }
});

describe('rasterTrianglesSnapped with sampling', () => {
  // A triangle with a vertex beyond the snap lattice's range (|x| ≥ 32768 px) goes to the
  // floating-point rasteriser; the pixels it writes must be sampled as well, like those
  // of a snapped triangle (they had kept whatever the output held).
  it('samples every written pixel, on the snapped path and on the floating-point fallback', () => {
    const W = 32, H = 24;
    const src = new Float32Array(W * H);
    for (let p = 0; p < W * H; p++) src[p] = Math.sin(p * 0.7) + 0.01 * p;
    const out = new Float32Array(W * H).fill(-99);
    const t: RasterTarget = { width: W, height: H, map: new Float32Array(2 * W * H), owner: new Uint8Array(W * H), fold: new Uint8Array(W * H), sample: { source: src, out } };
    const tris = new Float64Array(2 * TRI_STRIDE);
    // snapped: a triangle over the left part of the image
    putTriangle(tris, 0, 2, 0, 0, 12, 0, 0, 20, 1, 1, 9, 2, 2, 15, null);
    // fallback: one vertex far to the right, source positions inside the image
    putTriangle(tris, 1, 2, 14, 2, 40000, 3, 14, 22, 10, 3, 30, 5, 11, 20, null);
    rasterTrianglesSnapped(t, tris, 2);
    let left = 0, right = 0;
    for (let p = 0; p < W * H; p++) {
      if (t.owner[p] === 0) {
        expect(out[p]).toBe(-99);
        continue;
      }
      if (p % W < 13) left++;
      else right++;
      // sampled at the written source position (float64 there, float32 in the map)
      expect(out[p]).toBeCloseTo(bilinear1(src, W, H, t.map[2 * p]!, t.map[2 * p + 1]!), 4);
    }
    expect(left).toBeGreaterThan(50);
    expect(right).toBeGreaterThan(50);
  });
});

