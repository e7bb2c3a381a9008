import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { gridFromFunction, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import {
  createGaussianSurface,
  createGridSurface,
  createPlaneSurface,
  createSinusoidSurface,
  intersectSurface,
  intersectSurfaceBatch,
} from '../../src/surface/index.js';
import type { Surface, SurfaceHitOk } from '../../src/surface/index.js';

const domain = { xMin: -1, xMax: 1, yMin: -1, yMax: 1 };

function unit(v: [number, number, number]): [number, number, number] {
  const n = Math.hypot(...v);
  return [v[0] / n, v[1] / n, v[2] / n];
}

/** The clearance g(t) = z − h(x, y) along a ray (unit direction). */
function clearance(s: Surface, o: readonly number[], d: readonly number[], t: number): number {
  return o[2]! + t * d[2]! - s.height(o[0]! + t * d[0]!, o[1]! + t * d[1]!);
}

/**
 * Check the documented guarantee by dense sampling of g from the ray's entry to `tEnd`:
 * every sign change found before `tEnd` must be one of a pair (in, out) whose horizontal
 * separation is within `resolution` (a graze the intersector may pass over).
 */
function firstCrossingHolds(s: Surface, o: number[], d: number[], tEnd: number, resolution: number): boolean {
  const n = 4000;
  const horiz = Math.hypot(d[0]!, d[1]!);
  const t0 = 0;
  let prev = Math.sign(clearance(s, o, d, t0));
  const changes: number[] = [];
  for (let k = 1; k <= n; k++) {
    const t = t0 + ((tEnd - t0) * k) / n;
    if (t >= tEnd * (1 - 1e-9) - 1e-12) break;
    const sg = Math.sign(clearance(s, o, d, t));
    if (sg !== 0 && prev !== 0 && sg !== prev) changes.push(t);
    if (sg !== 0) prev = sg;
  }
  if (changes.length % 2 !== 0) return false;
  for (let k = 0; k < changes.length; k += 2) {
    const sep = (changes[k + 1]! - changes[k]!) * horiz;
    if (sep > resolution + (2 * (tEnd - t0) * horiz) / n) return false;
  }
  return true;
}

describe('intersectSurface: planes against the closed form', () => {
  it('meets a tilted plane where t = (h0 + p·ox + q·oy − oz)/(dz − p·dx − q·dy) (analytic ray–plane intersection)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: -0.2, max: 0.2, noNaN: true }),
        fc.double({ min: -0.3, max: 0.3, noNaN: true }),
        fc.double({ min: -0.3, max: 0.3, noNaN: true }),
        fc.boolean(),
        (p, q, ox, dx, dy, fromBelow) => {
          const plane = createPlaneSurface({ height: 0.01, slopeX: p, slopeY: q, domain: { xMin: -5, xMax: 5, yMin: -5, yMax: 5 } });
          const o: [number, number, number] = [ox, -ox / 2, fromBelow ? -2 : 2];
          const d = unit([dx, dy, fromBelow ? 1 : -1]);
          const tExact = (0.01 + p * o[0] + q * o[1] - o[2]) / (d[2] - p * d[0] - q * d[1]);
          const hit = intersectSurface(plane, o, d);
          if (!(tExact > 0)) return;
          expect(hit.status).toBe('ok');
          const h = hit as SurfaceHitOk;
          expect(Math.abs(h.t - tExact)).toBeLessThan(1e-8);
          expect(Math.abs(h.point[2] - plane.height(h.point[0], h.point[1]))).toBeLessThanOrEqual(1e-9);
          const k = 1 / Math.sqrt(1 + p * p + q * q);
          expect(h.normal[0]).toBeCloseTo(-p * k, 14);
          expect(h.normal[1]).toBeCloseTo(-q * k, 14);
          expect(h.normal[2]).toBeCloseTo(k, 14);
        },
      ),
      { seed: 42, numRuns: 200 },
    );
  });

  it('a bicubic grid of a plane gives the same hits (Keys 1981: the kernel reproduces linear fields)', () => {
    const g = gridFromFunction({ width: 33, height: 33, dx: 1 / 16, x0: -1, y0: -1 }, (x, y) => 0.02 + 0.1 * x - 0.05 * y);
    const s = createGridSurface(g);
    const o: [number, number, number] = [0.1, 0.2, -1];
    const d = unit([0.3, -0.1, 1]);
    const tExact = (0.02 + 0.1 * o[0] - 0.05 * o[1] - o[2]) / (d[2] - 0.1 * d[0] + 0.05 * d[1]);
    const hit = intersectSurface(s, o, d) as SurfaceHitOk;
    expect(hit.status).toBe('ok');
    expect(hit.t).toBeCloseTo(tExact, 9);
  });
});

describe('intersectSurface: Gaussian bumps against the closed form', () => {
  const A = 0.05;
  const sigma = 0.1;
  const bump = createGaussianSurface({ bumps: [{ amplitude: A, x: 0, y: 0, sigmaX: sigma }], domain });

  it('a horizontal ray at height z0 meets the bump first at x = −σ√(2 ln(A/z0)) (analytic)', () => {
    for (const z0 of [0.001, 0.01, 0.03, 0.049]) {
      const hit = intersectSurface(bump, [-0.9, 0, z0], [1, 0, 0]) as SurfaceHitOk;
      expect(hit.status).toBe('ok');
      expect(hit.point[0]).toBeCloseTo(-sigma * Math.sqrt(2 * Math.log(A / z0)), 7);
      expect(Math.abs(hit.point[2] - bump.height(hit.point[0], hit.point[1]))).toBeLessThanOrEqual(1e-9);
    }
  });

  it('a horizontal ray above the crest misses; a vertical ray hits at h(x, y) from below and above', () => {
    expect(intersectSurface(bump, [-0.9, 0, 0.051], [1, 0, 0]).status).toBe('miss');
    const up = intersectSurface(bump, [0.05, 0.02, -3], [0, 0, 1]) as SurfaceHitOk;
    const down = intersectSurface(bump, [0.05, 0.02, 3], [0, 0, -2]) as SurfaceHitOk;
    expect(up.point[2]).toBeCloseTo(bump.height(0.05, 0.02), 10);
    expect(down.point[2]).toBeCloseTo(bump.height(0.05, 0.02), 10);
    expect(up.t).toBeCloseTo(3 + bump.height(0.05, 0.02), 9);
  });
});

describe('intersectSurface: first crossing on wavy surfaces (fast-check)', () => {
  const waves = createSinusoidSurface({
    components: [
      { amplitude: 0.02, kx: 12, ky: 3, phase: 0.4 },
      { amplitude: 0.01, kx: -5, ky: 20, phase: 1.1 },
      { amplitude: 0.004, kx: 31, ky: -17 },
    ],
    domain,
  });
  const g = gridFromFunction({ width: 64, height: 64, dx: 2 / 63, x0: -1, y0: -1 }, (x, y) => waves.height(x, y));
  const grid = createGridSurface(g);
  for (const [name, s] of [
    ['sinusoids', waves],
    ['bicubic grid', grid],
  ] as const) {
    it(`${name}: every hit lies on the surface within 1e-9 m and is the first crossing`, () => {
      fc.assert(
        fc.property(
          fc.double({ min: -0.8, max: 0.8, noNaN: true }),
          fc.double({ min: -0.8, max: 0.8, noNaN: true }),
          fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
          fc.double({ min: -1.5, max: 1.5, noNaN: true }),
          fc.boolean(),
          (x, y, az, el, fromBelow) => {
            const o = [x, y, fromBelow ? -0.1 : 0.1];
            const c = Math.cos(el);
            const d = [c * Math.cos(az), c * Math.sin(az), (fromBelow ? 1 : -1) * Math.abs(Math.sin(el))];
            const res = s.lengthScale / 4;
            const hit = intersectSurface(s, o as never, d as never);
            if (hit.status === 'ok') {
              expect(Math.abs(hit.point[2] - s.height(hit.point[0], hit.point[1]))).toBeLessThanOrEqual(1e-9);
              expect(firstCrossingHolds(s, o, d, hit.t, res)).toBe(true);
            } else {
              expect(hit.status).toBe('miss');
              // No crossing (beyond grazes within the resolution) before the ray leaves the domain.
              const b = s.bounds;
              let tExit = Infinity;
              for (const [oc, dc, lo, hi] of [
                [o[0]!, d[0]!, b.xMin, b.xMax],
                [o[1]!, d[1]!, b.yMin, b.yMax],
              ] as const) {
                if (dc > 0) tExit = Math.min(tExit, (hi - oc) / dc);
                if (dc < 0) tExit = Math.min(tExit, (lo - oc) / dc);
              }
              if (d[2] !== 0) tExit = Math.min(tExit, Math.max((b.zMin - o[2]!) / d[2]!, (b.zMax - o[2]!) / d[2]!));
              expect(firstCrossingHolds(s, o, d, tExit, res)).toBe(true);
            }
          },
        ),
        { seed: 42, numRuns: 200 },
      );
    });
  }

  it('finds the first of two close crossings of a grazing ray when the resolution allows (analytic)', () => {
    const a = 0.01;
    const k = 2 * Math.PI / 0.1;
    const s = createSinusoidSurface({ components: [{ amplitude: a, kx: k }], domain });
    // A horizontal ray from a trough towards the next crest, just below its top.
    for (const z0 of [0.0099, 0.009999]) {
      const expected = (2 * Math.PI - Math.acos(z0 / a)) / k;
      const hit = intersectSurface(s, [Math.PI / k, 0, z0], [1, 0, 0], { resolution: 1e-6 }) as SurfaceHitOk;
      expect(hit.status).toBe('ok');
      expect(hit.point[0]).toBeCloseTo(expected, 8);
    }
  });

  it('reports a miss for rays that leave the domain or point away', () => {
    const s = waves;
    expect(intersectSurface(s, [0, 0, -0.1], [0, 0, -1]).status).toBe('miss');
    expect(intersectSurface(s, [0, 0, 0.2], [0, 0, 1]).status).toBe('miss');
    expect(intersectSurface(s, [3, 0, -0.1], [0, 0, 1]).status).toBe('miss');
    expect(intersectSurface(s, [0, 0, 0.05], [1, 0, 0.2]).status).toBe('miss');
  });
});

describe('intersectSurfaceBatch', () => {
  const s = createGaussianSurface({ bumps: [{ amplitude: 0.03, x: 0, y: 0, sigmaX: 0.2 }], domain });

  it('agrees with the single-ray form, normalises directions and marks misses', () => {
    const n = 50;
    const o = new Float64Array(3 * n);
    const d = new Float64Array(3 * n);
    for (let k = 0; k < n; k++) {
      o.set([-0.9 + (1.8 * k) / n, 0.3 * Math.sin(k), k % 5 === 0 ? 1 : -1], 3 * k);
      d.set([0.1 * Math.cos(k), 0.1 * Math.sin(k), k % 5 === 0 ? 2 : k % 7 === 0 ? -1 : 3], 3 * k);
    }
    const out = intersectSurfaceBatch(s, o, d);
    let misses = 0;
    for (let k = 0; k < n; k++) {
      const single = intersectSurface(s, [o[3 * k]!, o[3 * k + 1]!, o[3 * k + 2]!], [d[3 * k]!, d[3 * k + 1]!, d[3 * k + 2]!]);
      if (single.status === 'ok') {
        expect(out.status[k]).toBe(Status.ok);
        // Equal up to the rounding of the two normalisations of the direction.
        expect(out.t[k]).toBeCloseTo(single.t, 12);
        for (let c = 0; c < 3; c++) {
          expect(out.points[3 * k + c]).toBeCloseTo(single.point[c]!, 12);
          expect(out.normals[3 * k + c]).toBeCloseTo(single.normal[c]!, 12);
        }
      } else {
        misses++;
        expect(out.status[k]).toBe(Status.miss);
        expect(out.t[k]).toBeNaN();
      }
    }
    expect(misses).toBeGreaterThan(0);
    expect(misses).toBeLessThan(n);
  });

  it('refuses zero directions, bad shapes and bad buffers with clear errors', () => {
    const o = new Float64Array([0, 0, -1, 0, 0, -1]);
    expect(() => intersectSurfaceBatch(s, o, new Float64Array([0, 0, 1, 0, 0, 0]))).toThrow(/directions\[3\.\.5\]/);
    expect(() => intersectSurfaceBatch(s, o, new Float64Array([0, 0, 1, 0, 0, 0]))).toThrow(MeniscusRangeError);
    expect(() => intersectSurfaceBatch(s, o, new Float64Array(3))).toThrow(MeniscusTypeError);
    expect(() => intersectSurfaceBatch(s, o, new Float64Array([0, 0, 1, 0, 0, 1]), { out: { t: new Float64Array(1) } })).toThrow(MeniscusTypeError);
    expect(() => intersectSurface(s, [0, 0, -1], [0, 0, 0])).toThrow(MeniscusRangeError);
    expect(() => intersectSurface(s, [0, NaN, -1], [0, 0, 1])).toThrow(MeniscusRangeError);
    expect(() => intersectSurface({} as never, [0, 0, -1], [0, 0, 1])).toThrow(MeniscusTypeError);
    expect(() => intersectSurface(s, [0, 0, -1], [0, 0, 1], { tolerance: 0 })).toThrow(MeniscusRangeError);
  });
});
