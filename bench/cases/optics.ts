/**
 * Optics benchmarks, with the sizes, inputs and error figures of the numpy peers
 * (`../shared/peers/peers.py`, cases `optics.refract` and `optics.normals`).
 *
 * Inputs: unit directions going down, zenith angle uniform in [0, 60°), azimuth uniform
 * in [0, 2π); unit normals tilted uniformly up to 30° from +z, azimuth uniform; air
 * (1.000293) into water (1.333). Drawn with the core seeded generator (seed 13).
 *
 * Both are per-frame kernels, timed after five untimed calls (their steady state).
 *
 * The output and status buffers are allocated once and passed as `options.out` /
 * `options.status`, as a video-rate user of the batch API does (the peer cannot avoid
 * allocating its temporaries).
 */
import type { BenchCase } from '../case.js';
import { Status, createRng } from '../../src/core/index.js';
import { normalFromRaysBatch, refractBatch } from '../../src/optics/index.js';

const N_AIR = 1.000293;
const N_WATER = 1.333;

function rays(count: number, seed: number): { d: Float64Array; nn: Float64Array } {
  const rng = createRng(seed);
  const d = new Float64Array(3 * count);
  const nn = new Float64Array(3 * count);
  const deg = Math.PI / 180;
  for (let r = 0; r < count; r++) {
    const th = rng.uniform(0, 60 * deg);
    const ph = rng.uniform(0, 2 * Math.PI);
    d[3 * r] = Math.sin(th) * Math.cos(ph);
    d[3 * r + 1] = Math.sin(th) * Math.sin(ph);
    d[3 * r + 2] = -Math.cos(th);
  }
  for (let r = 0; r < count; r++) {
    const a = rng.uniform(0, 30 * deg);
    const b = rng.uniform(0, 2 * Math.PI);
    nn[3 * r] = Math.sin(a) * Math.cos(b);
    nn[3 * r + 1] = Math.sin(a) * Math.sin(b);
    nn[3 * r + 2] = Math.cos(a);
  }
  return { d, nn };
}

function rate(count: number, ms: number): string {
  return `${((count / ms) * 1e3 / 1e6).toFixed(1)} M rays/s`;
}

export const cases: BenchCase[] = [
  {
    // error: max | |t| − 1 | over the rays that are not totally internally reflected
    name: 'optics.refract',
    size: 1_000_000,
    quickSize: 1000,
    warmup: 5,
    iterations: 15,
    prepare(size) {
      const { d, nn } = rays(size, 13);
      const out = new Float64Array(3 * size);
      const status = new Uint8Array(size);
      return {
        run: () => refractBatch(d, nn, N_AIR, N_WATER, { out, status }),
        error(result) {
          const { directions: t, status } = result as ReturnType<typeof refractBatch>;
          let worst = 0;
          for (let r = 0; r < size; r++) {
            if (status[r] !== Status.ok) continue;
            const len = Math.sqrt(t[3 * r]! ** 2 + t[3 * r + 1]! ** 2 + t[3 * r + 2]! ** 2);
            worst = Math.max(worst, Math.abs(len - 1));
          }
          return worst;
        },
        notes: (ms) => rate(size, ms),
      };
    },
  },
  {
    // error: max angle (rad) between the solved and the true normals, as arccos of the
    // clipped dot product (the peer's figure)
    name: 'optics.normals',
    size: 1_000_000,
    quickSize: 1000,
    warmup: 5,
    iterations: 15,
    prepare(size) {
      const { d, nn } = rays(size, 13);
      const { directions: t } = refractBatch(d, nn, N_AIR, N_WATER);
      const out = new Float64Array(3 * size);
      const status = new Uint8Array(size);
      return {
        run: () => normalFromRaysBatch(d, t, N_AIR, N_WATER, { out, status }),
        error(result) {
          const { normals: m, status } = result as ReturnType<typeof normalFromRaysBatch>;
          let worst = 0;
          for (let r = 0; r < size; r++) {
            if (status[r] !== Status.ok) return Infinity; // every pair here is consistent
            const c = m[3 * r]! * nn[3 * r]! + m[3 * r + 1]! * nn[3 * r + 1]! + m[3 * r + 2]! * nn[3 * r + 2]!;
            worst = Math.max(worst, Math.acos(Math.min(1, Math.max(-1, c))));
          }
          return worst;
        },
        notes: (ms) => rate(size, ms),
      };
    },
  },
];
