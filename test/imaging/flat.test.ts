import { describe, expect, it } from 'vitest';
import { createRng, Status } from '../../src/core/index.js';
import { PinholeCamera, createCameraPose } from '../../src/camera/index.js';
import { flatContext, referencePoint, referencePoints } from '../../src/imaging/flat.js';

// The reference view through flat water: the camera-frame point whose projection is where
// a scene point appears. Its batch form (table lookup inlined) must give the single form's
// numbers bit for bit, and both must satisfy Snell's law at the plane, n1 sin θ1 = n2 sin θ2
// (Hecht, E., "Optics", ch. 4, chapter from memory), at the refraction point they imply.
describe('referencePoints', () => {
  const depth = 0.5, planeZ = 9.5, n1 = 1.333, n2 = 1.0;
  const camera = new PinholeCamera({ model: 'pinhole', fx: 800, fy: 800, cx: 511.5, cy: 511.5, width: 1024, height: 1024 });
  // tilted a little, so the rotation's terms all count
  const c = Math.cos(0.1), s = Math.sin(0.1);
  const pose = createCameraPose([1, 0, 0, 0, c, -s, 0, s, c], [0.02, -0.03, -depth]);
  const fl = flatContext('test', camera, pose, true, 0, n1, n2, 1, planeZ);
  const rng = createRng(11);
  const count = 2000;
  const pts = new Float64Array(3 * count);
  for (let e = 0; e < count; e++) {
    const r = 12 * Math.sqrt(rng.uniform()), ph = rng.uniform(0, 2 * Math.PI);
    pts[3 * e] = 0.02 + r * Math.cos(ph);
    pts[3 * e + 1] = -0.03 + r * Math.sin(ph);
    pts[3 * e + 2] = planeZ;
  }
  pts[0] = 0.02; // straight above the camera: ρ = 0
  pts[1] = -0.03;

  it('gives the single-point numbers bit for bit', () => {
    const stat = new Uint8Array(count).fill(Status.ok);
    const batch = new Float64Array(3 * count), one = new Float64Array(3 * count);
    referencePoints(fl, pts, stat, count, batch, 0);
    for (let e = 0; e < count; e++) {
      expect(referencePoint(fl, pts[3 * e]!, pts[3 * e + 1]!, pts[3 * e + 2]!, one, 3 * e)).toBe(Status.ok);
    }
    expect(stat.every((x) => x === Status.ok)).toBe(true);
    expect(Array.from(batch)).toEqual(Array.from(one));
  });

  it("satisfies Snell's law at the level and the plane of incidence (Hecht, Optics, ch. 4)", () => {
    const stat = new Uint8Array(count).fill(Status.ok);
    const out = new Float64Array(3 * count);
    referencePoints(fl, pts, stat, count, out, 0);
    const m = pose.rotation, C = pose.position;
    let worst = 0;
    for (let e = 1; e < count; e++) {
      // back to the world: the direction from the camera centre to the refraction point
      const x = out[3 * e]!, y = out[3 * e + 1]!, z = out[3 * e + 2]!;
      const wx = m[0] * x + m[1] * y + m[2] * z, wy = m[3] * x + m[4] * y + m[5] * z, wz = m[6] * x + m[7] * y + m[8] * z;
      expect(wz).toBeCloseTo(depth, 12); // the point lies on the level z = 0
      const px = C[0] + wx, py = C[1] + wy;
      const r1 = Math.hypot(px - C[0], py - C[1]);
      const r2 = Math.hypot(pts[3 * e]! - px, pts[3 * e + 1]! - py);
      const sin1 = r1 / Math.hypot(r1, depth), sin2 = r2 / Math.hypot(r2, planeZ);
      worst = Math.max(worst, Math.abs(n1 * sin1 - n2 * sin2));
      // and the three points lie in one vertical plane (the plane of incidence)
      const cross = (px - C[0]) * (pts[3 * e + 1]! - py) - (py - C[1]) * (pts[3 * e]! - px);
      expect(Math.abs(cross)).toBeLessThan(1e-12 * (1 + r1 * r2));
    }
    expect(worst).toBeLessThan(1e-12);
  });
});
