/**
 * Bench cases of the surface area.
 *
 * surface.intersect: N rays (default 1e6) from points 0.5 m below the mean surface,
 * spread over the middle of the domain, with directions up to 30° from the vertical
 * (seed 21), against a 256 × 256 bicubic height field of 4 mm spacing (a 1.02 m square)
 * holding a random tank-scale sea (seed 5). error: the largest |z − h(x, y)| over the
 * hits, m. Notes: rays per second. No peer.
 */
import type { BenchCase } from '../case.js';
import { createRng } from '../../src/core/index.js';
import { createGridSurface, intersectSurfaceBatch } from '../../src/surface/index.js';
import type { SurfaceHitBatch } from '../../src/surface/index.js';
import { jonswapFromPeak, jonswapSpectrumFunction, synthesizeSea } from '../../src/waves/index.js';

export const cases: BenchCase[] = [
  {
    name: 'surface.intersect',
    size: 1_000_000,
    quickSize: 10_000,
    iterations: 3,
    prepare(n: number) {
      const p = jonswapFromPeak({ peakPeriod: 0.4, significantHeight: 0.01 });
      const frame = synthesizeSea(
        { width: 256, height: 256, dx: 0.004, x0: -0.51, y0: -0.51 },
        { frequencySpectrum: jonswapSpectrumFunction(p), meanDirection: 0.3 },
        { seed: 5 },
      );
      const surface = createGridSurface(frame.height);
      const rng = createRng(21);
      const origins = new Float64Array(3 * n);
      const dirs = new Float64Array(3 * n);
      const maxTilt = (30 * Math.PI) / 180;
      for (let k = 0; k < n; k++) {
        origins[3 * k] = rng.uniform(-0.2, 0.2);
        origins[3 * k + 1] = rng.uniform(-0.2, 0.2);
        origins[3 * k + 2] = -0.5;
        const th = Math.acos(1 - rng.random() * (1 - Math.cos(maxTilt)));
        const ph = rng.uniform(0, 2 * Math.PI);
        dirs[3 * k] = Math.sin(th) * Math.cos(ph);
        dirs[3 * k + 1] = Math.sin(th) * Math.sin(ph);
        dirs[3 * k + 2] = Math.cos(th);
      }
      const out: SurfaceHitBatch = {
        points: new Float64Array(3 * n),
        normals: new Float64Array(3 * n),
        t: new Float64Array(n),
        status: new Uint8Array(n),
      };
      return {
        run: () => intersectSurfaceBatch(surface, origins, dirs, { out }),
        error(result: unknown): number {
          const r = result as SurfaceHitBatch;
          let e = 0;
          for (let k = 0; k < n; k++) {
            if (r.status[k] !== 0) continue;
            const x = r.points[3 * k]!;
            const y = r.points[3 * k + 1]!;
            e = Math.max(e, Math.abs(r.points[3 * k + 2]! - surface.height(x, y)));
          }
          return e;
        },
        notes: (ms: number) => `${((n / ms) * 1000).toExponential(3)} rays/s`,
      };
    },
  },
];
