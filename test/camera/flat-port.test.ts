import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import type { Vec3 } from '../../src/core/index.js';
import { refract } from '../../src/optics/index.js';
import { FisheyeCamera, FlatPortHousing, OrthographicCamera, PinholeCamera } from '../../src/camera/index.js';

const cam = new PinholeCamera({ model: 'pinhole', fx: 1100, fy: 1100, cx: 640, cy: 480, k1: -0.05, k2: 0.01 });
const port = new FlatPortHousing({ camera: cam, distance: 0.025, thickness: 0.012, nGlass: 1.49, nWater: 1.334 });

/** Distance from point X to the line origin + s·direction, relative to |X − origin|. */
function offLine(X: Vec3, o: Vec3, d: Vec3): number {
  const v = [X[0] - o[0], X[1] - o[1], X[2] - o[2]];
  const c = [v[1]! * d[2] - v[2]! * d[1], v[2]! * d[0] - v[0]! * d[2], v[0]! * d[1] - v[1]! * d[0]];
  return Math.hypot(...c) / Math.hypot(v[0]!, v[1]!, v[2]!);
}

describe('flat-port housing', () => {
  it('equal indices everywhere: the housing is invisible (analytic)', () => {
    const clear = new FlatPortHousing({ camera: cam, distance: 0.02, thickness: 0.01, nGlass: 1, nWater: 1 });
    const X: Vec3 = [0.3, -0.2, 1.4];
    const a = clear.project(X)!, b = cam.project(X)!;
    expect(Math.abs(a[0] - b[0])).toBeLessThan(1e-9);
    expect(Math.abs(a[1] - b[1])).toBeLessThan(1e-9);
  });

  it('a window of zero thickness has no effect, whatever its index (analytic)', () => {
    const a = new FlatPortHousing({ camera: cam, distance: 0.02, thickness: 0, nGlass: 1.49, nWater: 1.333 });
    const b = new FlatPortHousing({ camera: cam, distance: 0.02, thickness: 0, nGlass: 1.9, nWater: 1.333 });
    const X: Vec3 = [0.4, 0.3, 1.1];
    const pa = a.project(X)!, pb = b.project(X)!;
    expect(Math.abs(pa[0] - pb[0])).toBeLessThan(1e-9);
    expect(Math.abs(pa[1] - pb[1])).toBeLessThan(1e-9);
  });

  it('in air, the window is a parallel plate: rays leave parallel, shifted by t sin θ (1 − cos θ / √(n² − sin² θ)) (Hecht, Optics, plane-parallel plate; textbook)', () => {
    const t = 0.01, n = 1.5;
    const plate = new FlatPortHousing({ camera: new PinholeCamera({ model: 'pinhole', fx: 1000, fy: 1000, cx: 0, cy: 0 }), distance: 0.02, thickness: t, nGlass: n, nWater: 1 });
    for (const u of [100, 400, 900]) {
      const r = plate.unproject([u, 0])!;
      const th = Math.atan(u / 1000);
      expect(Math.abs(r.direction[0] - Math.sin(th))).toBeLessThan(1e-14);
      // Perpendicular distance between the exit ray and the undeviated line through the centre.
      const shift = Math.abs(r.origin[0] * Math.cos(th) - r.origin[2] * Math.sin(th));
      const expected = t * Math.sin(th) * (1 - Math.cos(th) / Math.sqrt(n * n - Math.sin(th) ** 2));
      expect(Math.abs(shift - expected)).toBeLessThan(1e-14);
    }
  });

  it('round trip (fast-check): the ray in the water of the projected pixel passes through the point', () => {
    fc.assert(
      fc.property(fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: -1, max: 1, noNaN: true }), fc.double({ min: 0.05, max: 20, noNaN: true }), (a, b, z) => {
        const X: Vec3 = [0.7 * a * z, 0.5 * b * z, z];
        const px = port.project(X);
        if (px === null) return; // beyond the camera's field
        const r = port.unproject(px)!;
        expect(r).not.toBeNull();
        expect(offLine(X, r.origin, r.direction)).toBeLessThan(1e-9);
        expect(Math.abs(r.origin[2] - 0.037)).toBeLessThan(1e-12); // on the outer face
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('each face obeys the vector Snell law (optics.refract) along the solved path', () => {
    const X: Vec3 = [0.5, -0.3, 0.9];
    const d = port.housingDirection(X)!;
    const g = refract(d, [0, 0, -1], 1, 1.49)!;
    const w = refract(g, [0, 0, -1], 1.49, 1.334)!;
    const P1 = [d[0] * (0.025 / d[2]), d[1] * (0.025 / d[2]), 0.025];
    const P2: Vec3 = [P1[0]! + g[0] * (0.012 / g[2]), P1[1]! + g[1] * (0.012 / g[2]), 0.037];
    expect(offLine(X, P2, w)).toBeLessThan(1e-12);
  });

  it('an axial camera: every ray in the water meets the axis through the centre along the normal (Agrawal et al. 2012)', () => {
    const tilted = new FlatPortHousing({ camera: cam, distance: 0.03, thickness: 0.008, nGlass: 1.52, nWater: 1.34, normal: [0.1, -0.05, 1] });
    const nrm = tilted.normal;
    const pixels = new Float64Array([0, 0, 1279, 0, 640, 480, 100, 900, 1200, 700]);
    const rays = tilted.unprojectBatch(pixels);
    for (let i = 0; i < 5; i++) {
      expect(rays.status[i]).toBe(Status.ok);
      const o = rays.origins.subarray(3 * i, 3 * i + 3), d = rays.directions.subarray(3 * i, 3 * i + 3);
      // Coplanar with the axis (which passes through the origin): det[o, d, n] = 0.
      const det = o[0]! * (d[1]! * nrm[2] - d[2]! * nrm[1]) - o[1]! * (d[0]! * nrm[2] - d[2]! * nrm[0]) + o[2]! * (d[0]! * nrm[1] - d[1]! * nrm[0]);
      expect(Math.abs(det)).toBeLessThan(1e-15);
      // And the round trip holds for the tilted port as well.
      const X: Vec3 = [o[0]! + 2 * d[0]!, o[1]! + 2 * d[1]!, o[2]! + 2 * d[2]!];
      const px = tilted.project(X)!;
      expect(Math.abs(px[0] - pixels[2 * i]!)).toBeLessThan(1e-6);
      expect(Math.abs(px[1] - pixels[2 * i + 1]!)).toBeLessThan(1e-6);
    }
  });

  it('batch equals single; points not in the water are outside', () => {
    const pts = new Float64Array([0.1, 0.2, 1, 0, 0, 0.03, 0.3, -0.1, 2, 0, 0, 5]);
    const b = port.projectBatch(pts);
    expect(Array.from(b.status)).toEqual([Status.ok, Status.outside, Status.ok, Status.ok]);
    for (const i of [0, 2, 3]) {
      const one = port.project([pts[3 * i]!, pts[3 * i + 1]!, pts[3 * i + 2]!])!;
      expect(b.pixels[2 * i]).toBeCloseTo(one[0], 9);
      expect(b.pixels[2 * i + 1]).toBeCloseTo(one[1], 9);
    }
    expect(b.pixels[6]).toBeCloseTo(640, 9); // on the axis
    const px = new Float64Array([10, 20, 640, 480, 1200, 900]);
    const rays = port.unprojectBatch(px);
    for (let i = 0; i < 3; i++) {
      const one = port.unproject([px[2 * i]!, px[2 * i + 1]!])!;
      for (let k = 0; k < 3; k++) {
        expect(Math.abs(rays.origins[3 * i + k]! - one.origin[k]!)).toBeLessThan(1e-15);
        expect(Math.abs(rays.directions[3 * i + k]! - one.direction[k]!)).toBeLessThan(1e-14);
      }
    }
    expect(port.project([0, 0, 0.03])).toBeNull();
  });

  it('fisheye behind a flat port: air → glass → water never totally reflects; rays at 90° or more miss; an oil-filled housing reflects wide rays (TIR as a status)', () => {
    const fish = new FisheyeCamera({ model: 'fisheye', fx: 300, fy: 300, cx: 640, cy: 480 });
    const fp = new FlatPortHousing({ camera: fish, distance: 0.02, thickness: 0.01, nGlass: 1.5, nWater: 1.333 });
    // Air → glass → water: the Snell invariant κ = sin θ_air < 1 < 1.333, so no TIR for any ray that reaches the window.
    expect(fp.unproject([640 + 300 * 1.5, 480])).not.toBeNull();
    // A ray at or beyond 90° misses the window.
    expect(fp.unproject([640 + 300 * 1.7, 480])).toBeNull();
    const b = fp.unprojectBatch(new Float64Array([640 + 300 * 1.7, 480]));
    expect(b.status[0]).toBe(Status.miss);
    // Oil inside (n 1.5): κ = 1.5 sin θ exceeds 1.333 beyond asin(1.333/1.5) ≈ 62.7°.
    const oil = new FlatPortHousing({ camera: fish, distance: 0.02, thickness: 0.01, nGlass: 1.5, nWater: 1.333, nAir: 1.5 });
    expect(oil.unproject([640 + 300 * 1.0, 480])).not.toBeNull(); // 57.3°
    const t = oil.unprojectBatch(new Float64Array([640 + 300 * 1.2, 480])); // 68.8°
    expect(t.status[0]).toBe(Status.tir);
  });

  it('bad input', () => {
    expect(() => new FlatPortHousing({ camera: cam, distance: 0, thickness: 0.01, nGlass: 1.5, nWater: 1.33 })).toThrow(/distance/);
    expect(() => new FlatPortHousing({ camera: cam, distance: 0.01, thickness: -1, nGlass: 1.5, nWater: 1.33 })).toThrow(/thickness/);
    expect(() => new FlatPortHousing({ camera: cam, distance: 0.01, thickness: 0.01, nGlass: NaN, nWater: 1.33 })).toThrow(MeniscusRangeError);
    const ortho = new OrthographicCamera({ model: 'orthographic', fx: 1, fy: 1, cx: 0, cy: 0 });
    expect(() => new FlatPortHousing({ camera: ortho, distance: 0.01, thickness: 0.01, nGlass: 1.5, nWater: 1.33 })).toThrow(MeniscusTypeError);
    expect(() => port.project([0, 0, Infinity])).toThrow(MeniscusRangeError);
    expect(port.toJSON()).toEqual({ camera: cam.toJSON(), distance: 0.025, thickness: 0.012, nGlass: 1.49, nWater: 1.334, nAir: 1, normal: [0, 0, 1] });
  });
});
