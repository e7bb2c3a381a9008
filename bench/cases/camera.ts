/**
 * camera.project: 1e6 camera-frame points through a Brown–Conrady pinhole model
 * (five coefficients, 1280 × 720 camera, points within the valid field), batch form.
 * error: largest angle (rad) between the ray unprojected from a projected pixel and the
 * point's own ray, over the first 1000 points (the round trip's accuracy).
 */
import type { BenchCase } from '../case.js';
import { createRng } from '../../src/core/index.js';
import { PinholeCamera } from '../../src/camera/index.js';

export const cases: BenchCase[] = [
  {
    name: 'camera.project',
    size: 1_000_000,
    quickSize: 1000,
    prepare(size: number) {
      const cam = new PinholeCamera({ model: 'pinhole', fx: 812.4, fy: 809.7, cx: 639.5, cy: 359.5, k1: -0.28, k2: 0.07, p1: 0.0012, p2: -0.0008, k3: -0.008 });
      const rng = createRng(17);
      const pts = new Float64Array(3 * size);
      for (let i = 0; i < size; i++) {
        const z = rng.uniform(0.5, 10);
        pts[3 * i] = rng.uniform(-0.75, 0.75) * z;
        pts[3 * i + 1] = rng.uniform(-0.42, 0.42) * z;
        pts[3 * i + 2] = z;
      }
      const out = new Float64Array(2 * size);
      const status = new Uint8Array(size);
      return {
        run: () => cam.projectBatch(pts, { out, status }),
        error: () => {
          const m = Math.min(size, 1000);
          const rays = cam.unprojectBatch(out.subarray(0, 2 * m));
          let worst = 0;
          for (let i = 0; i < m; i++) {
            const x = pts[3 * i]!, y = pts[3 * i + 1]!, z = pts[3 * i + 2]!;
            const n = Math.hypot(x, y, z);
            const dx = rays.directions[3 * i]!, dy = rays.directions[3 * i + 1]!, dz = rays.directions[3 * i + 2]!;
            const c = Math.hypot(y * dz - z * dy, z * dx - x * dz, x * dy - y * dx) / n;
            worst = Math.max(worst, Math.asin(Math.min(1, c)));
          }
          return worst;
        },
        notes: (medianMs: number) => `${((size / medianMs) * 1000 / 1e6).toFixed(1)} M points/s`,
      };
    },
  },
];
