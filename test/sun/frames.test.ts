import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mat3Det, mat3Mul, mat3MulVec, mat3Transpose, MeniscusRangeError, MeniscusTypeError, rotationAboutAxis } from '../../src/core/index.js';
import type { Mat3, Vec3 } from '../../src/core/index.js';
import {
  attitudeToMatrix,
  attitudeToQuaternion,
  cameraPoseOnPlatform,
  cameraToEnu,
  enuToCamera,
  enuToPlatform,
  matrixToAttitude,
  matrixToQuaternion,
  MOUNT_LOOKING_DOWN,
  MOUNT_LOOKING_UP,
  platformToEnu,
  quaternionMultiply,
  quaternionToAttitude,
  quaternionToMatrix,
  underwaterLightDirection,
} from '../../src/sun/index.js';
import { worldToCamera } from '../../src/camera/index.js';

const DEG = Math.PI / 180;
const close = (a: ArrayLike<number>, b: ArrayLike<number>, tol = 1e-12): void => {
  expect(a.length).toBe(b.length);
  for (let i = 0; i < a.length; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(tol);
};

describe('attitude convention (forward-starboard-down body frame, Z-Y′-X″ from NED; common practice in marine and aerospace navigation)', () => {
  it('level, heading 0: bow north, starboard east, keel down', () => {
    const a = { heading: 0, pitch: 0, roll: 0 };
    close(platformToEnu(a, [1, 0, 0]), [0, 1, 0]);
    close(platformToEnu(a, [0, 1, 0]), [1, 0, 0]);
    close(platformToEnu(a, [0, 0, 1]), [0, 0, -1]);
  });
  it('heading is clockwise from north: 90° puts the bow east, 180° south, 270° west', () => {
    close(platformToEnu({ heading: 90 * DEG, pitch: 0, roll: 0 }, [1, 0, 0]), [1, 0, 0]);
    close(platformToEnu({ heading: 90 * DEG, pitch: 0, roll: 0 }, [0, 1, 0]), [0, -1, 0]); // starboard south
    close(platformToEnu({ heading: 180 * DEG, pitch: 0, roll: 0 }, [1, 0, 0]), [0, -1, 0]);
    close(platformToEnu({ heading: 270 * DEG, pitch: 0, roll: 0 }, [1, 0, 0]), [-1, 0, 0]);
  });
  it('positive pitch raises the bow; positive roll lowers starboard', () => {
    close(platformToEnu({ heading: 0, pitch: 30 * DEG, roll: 0 }, [1, 0, 0]), [0, Math.cos(30 * DEG), Math.sin(30 * DEG)]);
    close(platformToEnu({ heading: 0, pitch: 0, roll: 30 * DEG }, [0, 1, 0]), [Math.cos(30 * DEG), 0, -Math.sin(30 * DEG)]);
  });
  it('the order is heading, then pitch about the new starboard axis, then roll about the new bow axis', () => {
    // Heading 90° then pitch 30°: the bow points east and up.
    close(platformToEnu({ heading: 90 * DEG, pitch: 30 * DEG, roll: 0 }, [1, 0, 0]), [Math.cos(30 * DEG), 0, Math.sin(30 * DEG)]);
    // Built from elementary rotations (Rodrigues) in ENU: about up by −ψ (clockwise from
    // above), then right-handed about the rotated starboard axis, then about the rotated bow axis.
    const h = 0.7, p = -0.3, r = 0.4;
    const M = attitudeToMatrix({ heading: h, pitch: p, roll: r });
    const base: Mat3 = [0, 1, 0, 1, 0, 0, 0, 0, -1]; // level, heading 0
    const Rh = rotationAboutAxis([0, 0, 1], -h);
    const B1 = mat3Mul(Rh, base);
    const starboard = mat3MulVec(B1, [0, 1, 0]);
    const B2 = mat3Mul(rotationAboutAxis(starboard, p), B1); // right-handed about starboard raises the bow
    const bow = mat3MulVec(B2, [1, 0, 0]);
    const B3 = mat3Mul(rotationAboutAxis(bow, r), B2);
    close(M, B3, 1e-12);
  });
  it('quaternion of the level, north-facing platform is the 180° turn about (1, 1, 0)/√2', () => {
    close(attitudeToQuaternion({ heading: 0, pitch: 0, roll: 0 }), [0, Math.SQRT1_2, Math.SQRT1_2, 0], 1e-15);
  });
});

describe('round trips (fast-check)', () => {
  const angle = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true });
  const att = fc.record({ heading: angle(0, 2 * Math.PI - 1e-9), pitch: angle(-Math.PI / 2 + 1e-6, Math.PI / 2 - 1e-6), roll: angle(-Math.PI + 1e-9, Math.PI) });

  it('angles → matrix → angles', () => {
    fc.assert(
      fc.property(att, (a) => {
        const b = matrixToAttitude(attitudeToMatrix(a));
        // Compare as matrices (angles are unique away from gimbal lock, but compare robustly).
        close(attitudeToMatrix(b), attitudeToMatrix(a), 1e-9);
        if (Math.abs(a.pitch) < Math.PI / 2 - 1e-3) {
          expect(Math.abs(b.heading - a.heading)).toBeLessThan(1e-9);
          expect(Math.abs(b.pitch - a.pitch)).toBeLessThan(1e-9);
          expect(Math.abs(b.roll - a.roll)).toBeLessThan(1e-9);
        }
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('angles → quaternion → matrix equals angles → matrix; quaternion → angles → quaternion', () => {
    fc.assert(
      fc.property(att, (a) => {
        const q = attitudeToQuaternion(a);
        expect(Math.hypot(...q)).toBeCloseTo(1, 14);
        close(quaternionToMatrix(q), attitudeToMatrix(a), 1e-12);
        const q2 = attitudeToQuaternion(quaternionToAttitude(q));
        const sameSign = q2[0] * q[0] + q2[1] * q[1] + q2[2] * q[2] + q2[3] * q[3] > 0 ? 1 : -1;
        close(q2.map((x) => x * sameSign), q, 1e-8);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('matrix → quaternion → matrix, and the matrices are proper rotations', () => {
    fc.assert(
      fc.property(att, (a) => {
        const M = attitudeToMatrix(a);
        expect(mat3Det(M)).toBeCloseTo(1, 12);
        close(mat3Mul(M, mat3Transpose(M)), [1, 0, 0, 0, 1, 0, 0, 0, 1], 1e-12);
        const q = matrixToQuaternion(M);
        expect(q[0]).toBeGreaterThanOrEqual(0);
        close(quaternionToMatrix(q), M, 1e-12);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('quaternion product composes rotations like the matrix product', () => {
    fc.assert(
      fc.property(att, att, (a, b) => {
        const qa = attitudeToQuaternion(a), qb = attitudeToQuaternion(b);
        close(quaternionToMatrix(quaternionMultiply(qa, qb)), mat3Mul(attitudeToMatrix(a), attitudeToMatrix(b)), 1e-12);
      }),
      { seed: 42, numRuns: 100 },
    );
  });

  it('gimbal lock: pitch ±90° gives roll 0 and the same rotation', () => {
    const a = { heading: 1, pitch: Math.PI / 2, roll: 0.5 };
    const b = matrixToAttitude(attitudeToMatrix(a));
    expect(b.roll).toBe(0);
    expect(b.pitch).toBeCloseTo(Math.PI / 2, 7);
    close(attitudeToMatrix(b), attitudeToMatrix(a), 1e-7);
  });
});

describe('ENU ↔ platform ↔ camera', () => {
  it('enuToPlatform inverts platformToEnu and accepts a quaternion', () => {
    const a = { heading: 2, pitch: 0.1, roll: -0.2 };
    const v: Vec3 = [0.3, -0.4, 0.5];
    close(enuToPlatform(a, platformToEnu(a, v)), v);
    close(platformToEnu(attitudeToQuaternion(a), v), platformToEnu(a, v));
  });
  it('mounts: looking up sees the zenith on the optical axis, looking down sees the nadir, image top towards the bow', () => {
    const level = { heading: 0, pitch: 0, roll: 0 };
    close(enuToCamera(level, MOUNT_LOOKING_UP, [0, 0, 1]), [0, 0, 1]);
    close(enuToCamera(level, MOUNT_LOOKING_DOWN, [0, 0, -1]), [0, 0, 1]);
    // The bow (north) is image-up, i.e. −y, for both mounts.
    close(enuToCamera(level, MOUNT_LOOKING_UP, [0, 1, 0]), [0, -1, 0]);
    close(enuToCamera(level, MOUNT_LOOKING_DOWN, [0, 1, 0]), [0, -1, 0]);
    // Looking down, east (starboard) is image-right; looking up, east is image-left.
    close(enuToCamera(level, MOUNT_LOOKING_DOWN, [1, 0, 0]), [1, 0, 0]);
    close(enuToCamera(level, MOUNT_LOOKING_UP, [1, 0, 0]), [-1, 0, 0]);
    expect(mat3Det(MOUNT_LOOKING_UP)).toBe(1);
    expect(mat3Det(MOUNT_LOOKING_DOWN)).toBe(1);
  });
  it('cameraToEnu inverts enuToCamera; the platform pose matches worldToCamera', () => {
    const a = { heading: 4, pitch: -0.05, roll: 0.08 };
    const v: Vec3 = [0.1, 0.7, 0.7];
    close(cameraToEnu(a, MOUNT_LOOKING_UP, enuToCamera(a, MOUNT_LOOKING_UP, v)), v);
    const pose = cameraPoseOnPlatform(a, MOUNT_LOOKING_UP, [10, 20, -1], [0.5, 0, 0.2]);
    const X: Vec3 = [12, 18, 3];
    const Xc = worldToCamera(pose, X);
    const d = enuToCamera(a, MOUNT_LOOKING_UP, [X[0] - pose.position[0], X[1] - pose.position[1], X[2] - pose.position[2]]);
    close(Xc, d);
    // The lever arm: 0.5 m forward, 0.2 m down from the reference point.
    close(pose.position, [10 + platformToEnu(a, [0.5, 0, 0.2])[0], 20 + platformToEnu(a, [0.5, 0, 0.2])[1], -1 + platformToEnu(a, [0.5, 0, 0.2])[2]]);
  });
  it('bad input: non-finite angles, zero quaternions, non-rotation mounts', () => {
    expect(() => attitudeToMatrix({ heading: NaN, pitch: 0, roll: 0 })).toThrow(/heading/);
    expect(() => quaternionToMatrix([0, 0, 0, 0])).toThrow(MeniscusRangeError);
    expect(() => quaternionToMatrix([1, 0, 0] as never)).toThrow(MeniscusTypeError);
    expect(() => enuToCamera({ heading: 0, pitch: 0, roll: 0 }, [1, 0, 0, 0, 1, 0, 0, 0, 2], [0, 0, 1])).toThrow(/mount/);
    expect(() => matrixToQuaternion([1, 0, 0, 0, 1, 0, 0, 0, -1])).toThrow(/determinant/);
  });
});

describe('underwaterLightDirection (vector Snell law; Snell window)', () => {
  it('sun at the zenith: straight down', () => {
    close(underwaterLightDirection([0, 0, 1])!, [0, 0, -1], 1e-15);
  });
  it('n_air sin θ_air = n_water sin θ_water, azimuth kept (Snell 1621)', () => {
    const e = 25 * DEG, az = 130 * DEG;
    const toSun: Vec3 = [Math.sin(az) * Math.cos(e), Math.cos(az) * Math.cos(e), Math.sin(e)];
    const d = underwaterLightDirection(toSun, { nAir: 1.000293, nWater: 1.34 })!;
    const sinAir = Math.cos(e), sinWater = Math.hypot(d[0], d[1]);
    expect(1.000293 * sinAir).toBeCloseTo(1.34 * sinWater, 14);
    expect(d[2]).toBeLessThan(0);
    expect(Math.atan2(-d[0], -d[1])).toBeCloseTo(az - 2 * Math.PI * (az > Math.PI ? 1 : 0), 12);
  });
  it('grazing light enters at the critical angle, 48.6066° for n = 1.333 (computed from the law)', () => {
    const e = 1e-9;
    const d = underwaterLightDirection([Math.cos(e), 0, Math.sin(e)], { nAir: 1, nWater: 1.333 })!;
    expect(Math.atan2(Math.hypot(d[0], d[1]), -d[2]) / DEG).toBeCloseTo(48.6066, 4);
  });
  it('below the horizon: null, not an error', () => {
    expect(underwaterLightDirection([1, 0, -0.1])).toBeNull();
    expect(() => underwaterLightDirection([0, 0, 0])).toThrow(MeniscusRangeError);
  });
});
