import { describe, expect, it } from 'vitest';
import { createRng, gridFromFunction, Status } from '../../src/core/index.js';
import { createCameraPose } from '../../src/camera/index.js';
import { createGridSurface, createSinusoidSurface } from '../../src/surface/index.js';
import type { Surface } from '../../src/surface/index.js';
import { createRowTracer, traceBatch, traceBatchScratch, traceContext, traceRay } from '../../src/imaging/trace.js';
import type { ResolvedScene } from '../../src/imaging/scene.js';

// The batch kernel of the exact correction must give what the one-ray kernel gives with
// the same starting distance, bit for bit: same Newton steps, same arithmetic (an
// internal consistency check; the physics of traceRay is checked against closed-form
// refraction in correct.test.ts and render.test.ts).
describe('traceBatch', () => {
  const domain = { xMin: -0.4, xMax: 0.4, yMin: -0.4, yMax: 0.4 };
  const f = (x: number, y: number): number => 0.01 * Math.sin(9 * x + 2 * y) + 0.006 * Math.cos(7 * y - 3 * x);
  const surfaces: [string, Surface][] = [
    ['grid (bspline, has heightGradientMany)', createGridSurface(gridFromFunction({ width: 41, height: 41, dx: 0.02, x0: -0.4, y0: -0.4 }, f), { interpolation: 'bspline' })],
    ['sinusoid (no heightGradientMany: point by point)', createSinusoidSurface({ components: [{ amplitude: 0.01, kx: 9, ky: 2 }], domain })],
  ];
  const pose = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, -0.5]);
  const scene = { kind: 1, z: 9.5 } as ResolvedScene;

  it('no surface (null): the rays go straight to the scene, whatever the buffers held before', () => {
    const ctx = traceContext('test', null, pose, scene, { nWater: 1.333, nAir: 1 });
    const n = 5;
    const ro = new Float64Array(3 * n), rd = new Float64Array(3 * n), rs = new Uint8Array(n).fill(Status.ok);
    for (let k = 0; k < n; k++) rd.set([0.1 * k, 0, Math.sqrt(1 - 0.01 * k * k)], 3 * k);
    rs[2] = Status.outside;
    // stale contents from an earlier call must not leak into this one
    const stat = new Uint8Array(n).fill(Status.ok), pts = new Float64Array(3 * n).fill(7), tHit = new Float64Array(n).fill(3);
    traceBatch(ctx, ro, rd, rs, 0, n, new Float64Array(n).fill(1), stat, pts, tHit, traceBatchScratch(n));
    for (let k = 0; k < n; k++) {
      expect(Number.isNaN(tHit[k]!)).toBe(true);
      if (k === 2) {
        expect(stat[k]).toBe(Status.outside);
        continue;
      }
      expect(stat[k]).toBe(Status.ok);
      // straight line from the origin to the plane z = 9.5: x = z·dx/dz
      expect(pts[3 * k]).toBeCloseTo((9.5 * rd[3 * k]!) / rd[3 * k + 2]!, 12);
      expect(pts[3 * k + 2]).toBe(9.5);
    }
  });

  for (const [name, s] of surfaces) {
    it(`${name}: statuses, scene points and hit distances equal traceRay's`, () => {
      const ctx = traceContext('test', s, pose, scene, { nWater: 1.333, nAir: 1 });
      const rng = createRng(11);
      const n = 300;
      const ro = new Float64Array(3 * n), rd = new Float64Array(3 * n), rs = new Uint8Array(n);
      const guess = new Float64Array(n);
      for (let k = 0; k < n; k++) {
        ro.set([0, 0, -0.5], 3 * k);
        // directions up to 50° off the vertical, some beyond the surface's domain
        const th = 0.87 * Math.sqrt(rng.uniform()), ph = 2 * Math.PI * rng.uniform();
        rd.set([Math.sin(th) * Math.cos(ph), Math.sin(th) * Math.sin(ph), Math.cos(th)], 3 * k);
        rs[k] = k % 37 === 5 ? Status.outside : Status.ok;
        const t0 = 0.5 / Math.cos(th);
        // good guesses, poor ones, none, and one behind the camera
        guess[k] = k % 5 === 0 ? NaN : k % 7 === 0 ? t0 * 1.5 : k % 11 === 0 ? -1 : t0 * (1 + 0.01 * rng.normal());
      }
      const stat = new Uint8Array(n), pts = new Float64Array(3 * n), tHit = new Float64Array(n);
      traceBatch(ctx, ro, rd, rs, 0, n, guess, stat, pts, tHit, traceBatchScratch(n));
      const hit = new Float64Array(6), res = new Float64Array(6);
      const seen = new Set<number>();
      for (let k = 0; k < n; k++) {
        let st: number = rs[k]!;
        if (st === Status.ok) st = traceRay(ctx, ro[3 * k]!, ro[3 * k + 1]!, ro[3 * k + 2]!, rd[3 * k]!, rd[3 * k + 1]!, rd[3 * k + 2]!, hit, res, guess[k]!);
        seen.add(st);
        expect(stat[k]).toBe(st);
        if (st === Status.ok) {
          expect([pts[3 * k], pts[3 * k + 1], pts[3 * k + 2]]).toEqual([res[0], res[1], res[2]]);
          expect(tHit[k]).toBe(hit[0]);
        }
      }
      // the check covered paths that hit and paths that did not
      expect(seen.has(Status.ok)).toBe(true);
      expect(seen.has(Status.outside) || seen.has(Status.miss)).toBe(true);
    });
  }

  it('a row tracer (guesses from the rows above) lands where cold one-ray traces land, within the surface tolerance', () => {
    const s = surfaces[0]![1];
    const ctx = traceContext('test', s, pose, scene, { nWater: 1.333, nAir: 1, tolerance: 1e-10 });
    const W = 40, H = 30;
    const rows = createRowTracer(W);
    const ro = new Float64Array(3 * W), rd = new Float64Array(3 * W), rs = new Uint8Array(W).fill(Status.ok);
    const stat = new Uint8Array(W), pts = new Float64Array(3 * W);
    const hit = new Float64Array(6), res = new Float64Array(6);
    let compared = 0, worst = 0;
    for (let v = 0; v < H; v++) {
      for (let u = 0; u < W; u++) {
        const x = (u - W / 2) / 40, y = (v - H / 2) / 40, l = Math.hypot(x, y, 1);
        ro.set([0, 0, -0.5], 3 * u);
        rd.set([x / l, y / l, 1 / l], 3 * u);
      }
      const t = rows.traceRow(ctx, ro, rd, rs, 0, W, stat, pts);
      for (let u = 0; u < W; u++) {
        const st = traceRay(ctx, 0, 0, -0.5, rd[3 * u]!, rd[3 * u + 1]!, rd[3 * u + 2]!, hit, res);
        expect(stat[u]).toBe(st);
        if (st !== Status.ok) continue;
        expect(Number.isFinite(t[u]!)).toBe(true);
        compared++;
        // a hit within 1e-10 m of the surface moves the scene point 10 m away by far less than 1e-6 m
        worst = Math.max(worst, Math.abs(pts[3 * u]! - res[0]!), Math.abs(pts[3 * u + 1]! - res[1]!));
      }
    }
    expect(compared).toBe(W * H);
    expect(worst).toBeLessThan(1e-6);
  });
});

