import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mat3Det, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import type { Vec3 } from '../../src/core/index.js';
import {
  cameraDirectionToWorld,
  cameraToWorld,
  cameraToWorldBatch,
  createCameraPose,
  lookAt,
  PinholeCamera,
  reflectPoint,
  reflectPose,
  worldDirectionToCamera,
  worldToCamera,
  worldToCameraBatch,
} from '../../src/camera/index.js';

const close = (a: ArrayLike<number>, b: ArrayLike<number>, tol = 1e-12): void => {
  for (let i = 0; i < a.length; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(tol);
};

describe('camera pose', () => {
  it('lookAt: looking north from the origin, image right is east and image down is down (camera convention x right, y down, z forward)', () => {
    const pose = lookAt([0, 0, 0], [0, 10, 0]);
    close(cameraDirectionToWorld(pose, [1, 0, 0]), [1, 0, 0]);
    close(cameraDirectionToWorld(pose, [0, 1, 0]), [0, 0, -1]);
    close(cameraDirectionToWorld(pose, [0, 0, 1]), [0, 1, 0]);
    expect(mat3Det(pose.rotation)).toBeCloseTo(1, 14);
    close(worldToCamera(pose, [0, 5, 0]), [0, 0, 5]);
  });
  it('world ↔ camera round trip, single and batch (fast-check)', () => {
    const pose = lookAt([1, -2, 3], [0.5, 4, -1], [0, 0, 1]);
    fc.assert(
      fc.property(fc.tuple(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true })), (X) => {
        close(cameraToWorld(pose, worldToCamera(pose, X)), X, 1e-12);
        const b = worldToCameraBatch(pose, new Float64Array(X));
        close(b, worldToCamera(pose, X), 1e-13);
        close(cameraToWorldBatch(pose, b), X, 1e-12);
        close(worldDirectionToCamera(pose, cameraDirectionToWorld(pose, X)), X, 1e-12);
      }),
      { seed: 42, numRuns: 200 },
    );
  });
  it('bad input', () => {
    expect(() => createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, -1], [0, 0, 0])).toThrow(/determinant/);
    expect(() => createCameraPose([1, 0, 0, 0, 2, 0, 0, 0, 1], [0, 0, 0])).toThrow(MeniscusRangeError);
    expect(() => createCameraPose([1, 0, 0] as never, [0, 0, 0])).toThrow(MeniscusTypeError);
    expect(() => lookAt([0, 0, 0], [0, 0, 0])).toThrow(/target/);
    expect(() => lookAt([0, 0, 0], [0, 0, 1], [0, 0, 1])).toThrow(/up/);
    expect(() => worldToCamera({ rotation: [1, 0, 0, 0, 1, 0, 0, 0, 1], position: [0, NaN, 0] }, [0, 0, 0])).toThrow(/position/);
  });
});

describe('mirror as a virtual camera (law of reflection)', () => {
  const cam = new PinholeCamera({ model: 'pinhole', fx: 900, fy: 900, cx: 640, cy: 480, k1: -0.1 });
  const mirror = { point: [0, 0, 1] as Vec3, normal: [0.1, -0.2, 1] as Vec3 };
  const real = lookAt([0.2, 0.1, 0], [0.1, 0.3, 1], [0, 1, 0]);
  const virt = reflectPose(real, mirror);

  it('the virtual frame is mirrored (determinant −1) and reflecting twice gives the pose back', () => {
    expect(mat3Det(virt.rotation)).toBeCloseTo(-1, 14);
    const back = reflectPose(virt, mirror);
    close(back.rotation, real.rotation, 1e-14);
    close(back.position, real.position, 1e-14);
    close(reflectPoint({ point: [0, 0, 1], normal: [0, 0, 2] }, [3, 4, 0]), [3, 4, 2]);
  });

  it('a world point seen through the mirror: the virtual pixel, traced back with the real camera and reflected, passes through the point', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.3, max: 0.3, noNaN: true }), fc.double({ min: -0.3, max: 0.3, noNaN: true }), fc.double({ min: 0.2, max: 0.8, noNaN: true }), (x, y, z) => {
        // A point below the mirror (on the camera's side).
        const X: Vec3 = [x, y, z];
        const px = cam.project(worldToCamera(virt, X));
        if (px === null) return;
        const ray = cam.unproject(px)!;
        const d = cameraDirectionToWorld(real, ray.direction);
        const C = real.position;
        const n = Math.hypot(...mirror.normal);
        const nn = mirror.normal.map((v) => v / n) as unknown as Vec3;
        // Hit the mirror plane.
        const t = ((mirror.point[0] - C[0]) * nn[0] + (mirror.point[1] - C[1]) * nn[1] + (mirror.point[2] - C[2]) * nn[2]) / (d[0] * nn[0] + d[1] * nn[1] + d[2] * nn[2]);
        expect(t).toBeGreaterThan(0);
        const P = [C[0] + t * d[0], C[1] + t * d[1], C[2] + t * d[2]];
        // Reflect the direction: r = d − 2 (d·n) n (angle of incidence = angle of reflection).
        const dn = d[0] * nn[0] + d[1] * nn[1] + d[2] * nn[2];
        const r = [d[0] - 2 * dn * nn[0], d[1] - 2 * dn * nn[1], d[2] - 2 * dn * nn[2]];
        // X lies on the reflected ray: (X − P) ∥ r.
        const v = [X[0] - P[0]!, X[1] - P[1]!, X[2] - P[2]!];
        const cr = [v[1]! * r[2]! - v[2]! * r[1]!, v[2]! * r[0]! - v[0]! * r[2]!, v[0]! * r[1]! - v[1]! * r[0]!];
        expect(Math.hypot(...cr) / Math.hypot(...v)).toBeLessThan(1e-9);
        expect(v[0]! * r[0]! + v[1]! * r[1]! + v[2]! * r[2]!).toBeGreaterThan(0);
      }),
      { seed: 42, numRuns: 200 },
    );
  });
});
