import { beforeAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRng, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import type { Vec3 } from '../../src/core/index.js';
import {
  cameraFromJSON,
  cameraToJSON,
  FisheyeCamera,
  OrthographicCamera,
  PinholeCamera,
} from '../../src/camera/index.js';
import type { CameraModel } from '../../src/camera/index.js';
import { loadCv, take } from './opencv.js';
import type { Cv } from './opencv.js';

let cv: Cv;
beforeAll(async () => {
  cv = (await loadCv()).cv;
});

const WIDE = { model: 'pinhole' as const, fx: 812.4, fy: 809.7, cx: 641.3, cy: 358.9, k1: -0.28, k2: 0.07, p1: 0.0012, p2: -0.0008, k3: -0.008 };
const RATIONAL = {
  model: 'pinhole' as const,
  fx: 1020,
  fy: 1018,
  cx: 960.2,
  cy: 540.7,
  k1: 0.5,
  k2: -0.1,
  p1: 0.0007,
  p2: 0.0011,
  k3: 0.02,
  k4: 0.55,
  k5: -0.05,
  k6: 0.01,
};
const FISH = { model: 'fisheye' as const, fx: 330.5, fy: 331.2, cx: 640.4, cy: 481.1, k1: 0.05, k2: -0.01, p1: 0, k3: 0.003, k4: -0.0005 };

/** Camera-frame points with normalised radius up to rMax (z in [0.5, 5]). */
function pointsInField(n: number, rMax: number, seed: number): Float64Array {
  const rng = createRng(seed);
  const p = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const z = rng.uniform(0.5, 5);
    const r = rMax * Math.sqrt(rng.random());
    const a = rng.uniform(0, 2 * Math.PI);
    p[3 * i] = r * Math.cos(a) * z;
    p[3 * i + 1] = r * Math.sin(a) * z;
    p[3 * i + 2] = z;
  }
  return p;
}

function cvProject(points: Float64Array, K: number[], dist: number[], fisheye: boolean): number[] {
  const n = points.length / 3;
  const obj = cv.matFromArray(n, 1, cv.CV_64FC3, Array.from(points));
  const rvec = cv.matFromArray(3, 1, cv.CV_64F, [0, 0, 0]);
  const tvec = cv.matFromArray(3, 1, cv.CV_64F, [0, 0, 0]);
  const Km = cv.matFromArray(3, 3, cv.CV_64F, K);
  const D = cv.matFromArray(dist.length, 1, cv.CV_64F, dist);
  const out = new cv.Mat();
  if (fisheye) cv.fisheye_projectPoints(obj, out, rvec, tvec, Km, D);
  else cv.projectPoints(obj, rvec, tvec, Km, D, out);
  [obj, rvec, tvec, Km, D].forEach((m) => m.delete());
  return take(out);
}

describe('pinhole Brown–Conrady against OpenCV projectPoints (opencv-bindings 4.5.5)', () => {
  for (const [name, params, rMax] of [
    ['five coefficients', WIDE, 0.9],
    ['rational eight coefficients', RATIONAL, 1.2],
    ['no distortion', { model: 'pinhole' as const, fx: 500, fy: 520, cx: 300, cy: 200 }, 2],
  ] as const) {
    it(`${name}: the same pixels within 1e-6 px`, () => {
      const cam = new PinholeCamera(params);
      const pts = pointsInField(500, Math.min(rMax, 0.95 * cam.fieldRadius), 7);
      const ours = cam.projectBatch(pts);
      const p = params as unknown as Record<string, number>;
      const dist = [p.k1 ?? 0, p.k2 ?? 0, p.p1 ?? 0, p.p2 ?? 0, p.k3 ?? 0, p.k4 ?? 0, p.k5 ?? 0, p.k6 ?? 0];
      const ref = cvProject(pts, [p.fx!, 0, p.cx!, 0, p.fy!, p.cy!, 0, 0, 1], dist, false);
      expect(ours.status.every((s) => s === Status.ok)).toBe(true);
      let worst = 0;
      for (let i = 0; i < ref.length; i++) worst = Math.max(worst, Math.abs(ours.pixels[i]! - ref[i]!));
      expect(worst).toBeLessThan(1e-6);
      // Single and batch agree exactly.
      const one = cam.project([pts[0]!, pts[1]!, pts[2]!])!;
      expect(one[0]).toBe(ours.pixels[0]);
      expect(one[1]).toBe(ours.pixels[1]);
    });
  }
});

describe('equidistant fisheye against OpenCV fisheye::projectPoints (opencv-bindings 4.5.5)', () => {
  it('the same pixels within 1e-6 px up to 80° off axis', () => {
    const cam = new FisheyeCamera(FISH);
    const pts = pointsInField(500, Math.tan(80 * (Math.PI / 180)), 11);
    const ours = cam.projectBatch(pts);
    const ref = cvProject(pts, [FISH.fx, 0, FISH.cx, 0, FISH.fy, FISH.cy, 0, 0, 1], [FISH.k1, FISH.k2, FISH.k3, FISH.k4], true);
    let worst = 0;
    for (let i = 0; i < ref.length; i++) worst = Math.max(worst, Math.abs(ours.pixels[i]! - ref[i]!));
    expect(worst).toBeLessThan(1e-6);
  });
  it('extends past 90°: θ = atan2(ρ, z) keeps growing behind the lens plane', () => {
    const cam = new FisheyeCamera({ model: 'fisheye', fx: 300, fy: 300, cx: 0, cy: 0 });
    const px = cam.project([1, 0, -1])!; // 135° off axis, undistorted equidistant: r = f θ
    expect(px[0]).toBeCloseTo(300 * (3 * Math.PI) / 4, 10);
    expect(cam.unproject(px)!.direction[2]).toBeCloseTo(-Math.SQRT1_2, 12);
  });
});

describe('valid field (analytic turning points)', () => {
  it('pinhole, k1 < 0 only: r·(1 + k1 r²) turns at r = 1/√(−3 k1)', () => {
    const cam = new PinholeCamera({ model: 'pinhole', fx: 500, fy: 500, cx: 0, cy: 0, k1: -0.3 });
    expect(cam.fieldRadius).toBeCloseTo(1 / Math.sqrt(0.9), 10);
    expect(cam.project([0.99 * cam.fieldRadius, 0, 1])).not.toBeNull();
    expect(cam.project([1.01 * cam.fieldRadius, 0, 1])).toBeNull();
    // A pixel beyond the largest distorted radius has no ray.
    const rdMax = cam.fieldRadius * (1 - 0.3 * cam.fieldRadius ** 2);
    expect(cam.unproject([500 * rdMax * 1.01, 0])).toBeNull();
    const b = cam.unprojectBatch(new Float64Array([500 * rdMax * 1.01, 0, 10, 10]));
    expect(Array.from(b.status)).toEqual([Status.outside, Status.ok]);
    expect(Number.isNaN(b.directions[0]!)).toBe(true);
  });
  it('fisheye, k1 < 0 only: θ(1 + k1 θ²) turns at θ = 1/√(−3 k1)', () => {
    const cam = new FisheyeCamera({ model: 'fisheye', fx: 300, fy: 300, cx: 0, cy: 0, k1: -0.2 });
    expect(cam.maxTheta).toBeCloseTo(1 / Math.sqrt(0.6), 10);
  });
  it('points behind a pinhole camera are outside', () => {
    const cam = new PinholeCamera(WIDE);
    expect(cam.project([0, 0, -1])).toBeNull();
    const r = cam.projectBatch(new Float64Array([0, 0, -1, 0, 0, 0, 0.1, 0.1, 1]));
    expect(Array.from(r.status)).toEqual([Status.outside, Status.outside, Status.ok]);
  });
});

describe('round trips (fast-check): unproject(project(X)) is the ray of X', () => {
  const cams: [string, CameraModel, number][] = [
    ['pinhole five', new PinholeCamera(WIDE), 0.95],
    ['pinhole rational', new PinholeCamera(RATIONAL), 1.3],
    ['fisheye', new FisheyeCamera(FISH), Math.tan(1.45)],
  ];
  for (const [name, cam, rMax] of cams) {
    it(name, () => {
      const limit = cam instanceof PinholeCamera ? Math.min(rMax, 0.98 * cam.fieldRadius) : rMax;
      fc.assert(
        fc.property(
          fc.double({ min: 0, max: 1, noNaN: true }),
          fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
          fc.double({ min: 0.1, max: 100, noNaN: true }),
          (t, a, z) => {
            const r = limit * t;
            const X: Vec3 = [r * Math.cos(a) * z, r * Math.sin(a) * z, z];
            const px = cam.project(X);
            expect(px).not.toBeNull();
            const ray = cam.unproject(px!)!;
            expect(ray).not.toBeNull();
            const n = Math.hypot(...X);
            for (let k = 0; k < 3; k++) expect(Math.abs(ray.direction[k]! - X[k]! / n)).toBeLessThan(1e-9);
            expect(ray.origin).toEqual([0, 0, 0]);
          },
        ),
        { seed: 42, numRuns: 200 },
      );
    });
  }
  it('batch unprojection equals single unprojection', () => {
    const cam = new PinholeCamera(WIDE);
    const pts = pointsInField(100, 0.9, 3);
    const px = cam.projectBatch(pts).pixels;
    const rays = cam.unprojectBatch(px);
    for (let i = 0; i < 100; i++) {
      const one = cam.unproject([px[2 * i]!, px[2 * i + 1]!])!;
      expect(one.direction).toEqual(Array.from(rays.directions.subarray(3 * i, 3 * i + 3)));
    }
  });
  it('orthographic: pixels are scaled x, y; rays start on z = 0 and run along +z', () => {
    const cam = new OrthographicCamera({ model: 'orthographic', fx: 2e4, fy: 1.9e4, cx: 511.5, cy: 383.5 });
    expect(cam.project([0.001, -0.002, 0.3])).toEqual([2e4 * 0.001 + 511.5, -1.9e4 * 0.002 + 383.5]);
    const ray = cam.unproject([531.5, 345.5])!;
    expect(ray.origin[0]).toBeCloseTo(0.001, 15);
    expect(ray.origin[1]).toBeCloseTo(-0.002, 15);
    expect(ray.direction).toEqual([0, 0, 1]);
    expect(cam.central).toBe(false);
    const b = cam.unprojectBatch(new Float64Array([531.5, 345.5]));
    expect(Array.from(b.origins)).toEqual(ray.origin);
  });
});

describe('JSON parameters (common open names)', () => {
  it('round trip through JSON.stringify for every model', () => {
    for (const p of [WIDE, RATIONAL, { ...FISH, width: 1280, height: 960 }, { model: 'orthographic' as const, fx: 1, fy: 2, cx: 3, cy: 4 }]) {
      const cam = cameraFromJSON(p as never);
      const back = cameraFromJSON(JSON.parse(JSON.stringify(cam)));
      expect(cameraToJSON(back)).toEqual(cam.toJSON());
      for (const [k, v] of Object.entries(p)) if (k !== 'p1' || p.model !== 'fisheye') expect((cam.toJSON() as unknown as Record<string, unknown>)[k]).toEqual(v);
    }
    expect(new PinholeCamera(WIDE).toJSON()).not.toHaveProperty('k4');
  });
  it('bad parameters: a clear error each', () => {
    expect(() => cameraFromJSON({ model: 'weird' } as never)).toThrow(/model/);
    expect(() => cameraFromJSON(null as never)).toThrow(MeniscusTypeError);
    expect(() => new PinholeCamera({ ...WIDE, fx: 0 })).toThrow(/fx/);
    expect(() => new PinholeCamera({ ...WIDE, k1: NaN })).toThrow(MeniscusRangeError);
    expect(() => new PinholeCamera({ ...WIDE, cy: Infinity })).toThrow(/cy/);
    expect(() => new FisheyeCamera({ ...FISH, k4: '1' as never })).toThrow(MeniscusTypeError);
    expect(() => new PinholeCamera({ ...WIDE, width: 10.5 })).toThrow(/width/);
    const cam = new PinholeCamera(WIDE);
    expect(() => cam.project([0, NaN, 1])).toThrow(MeniscusRangeError);
    expect(() => cam.unproject([0] as never)).toThrow(MeniscusTypeError);
    expect(() => cam.projectBatch(new Float64Array(4))).toThrow(MeniscusTypeError);
    expect(() => cam.projectBatch(new Float64Array(3), { out: new Float64Array(3) })).toThrow(/out/);
  });
});
