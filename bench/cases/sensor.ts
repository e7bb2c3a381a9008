/**
 * Sensor benchmarks. `spots.centroid` follows the peers script (same image recipe,
 * threshold and estimator: label the pixels 100 counts above the known background of 20,
 * intensity-weighted centre of each component); `sensor.frame` runs one frame from pixels
 * to a height map with one refinement pass; `sensor.frame.windowed` the same with the
 * detector searching only windows around a previous frame's spots (no peer).
 */
import type { BenchCase } from '../case.js';
import { createImage, createRng } from '../../src/core/index.js';
import { createRoundTripScene, interiorHeightError } from '../../test/sensor/round-trip-scene.js';
import {
  detectSpots,
  measureFrame,
  renderSpotFrame,
  traceSpots,
} from '../../src/sensor/index.js';
import type { FrameMeasurement, SpotList } from '../../src/sensor/index.js';

function centroidCase(): BenchCase {
  return {
    name: 'spots.centroid',
    size: 2048,
    quickSize: 1024,
    prepare(n: number) {
      // N × N image, 64 × 64 Gaussian spots (σ 2 px, peak 1000) at jittered positions on
      // a background of 20, Gaussian noise σ 2 — the peers recipe (its generator differs).
      const g = 64;
      const pitch = n / g;
      const rng = createRng(11);
      const cx = new Float64Array(g * g), cy = new Float64Array(g * g);
      for (let j = 0; j < g; j++) {
        for (let i = 0; i < g; i++) {
          cx[j * g + i] = (i + 0.5) * pitch + rng.uniform(-0.2, 0.2) * pitch;
          cy[j * g + i] = (j + 0.5) * pitch + rng.uniform(-0.2, 0.2) * pitch;
        }
      }
      const img = createImage(n, n);
      img.data.fill(20);
      const r = 8;
      for (let k = 0; k < g * g; k++) {
        const x0 = cx[k]!, y0 = cy[k]!;
        const ix = Math.round(x0), iy = Math.round(y0);
        for (let v = Math.max(0, iy - r); v <= Math.min(n - 1, iy + r); v++) {
          for (let u = Math.max(0, ix - r); u <= Math.min(n - 1, ix + r); u++) {
            img.data[v * n + u]! += 1000 * Math.exp(-((u - x0) ** 2 + (v - y0) ** 2) / 8);
          }
        }
      }
      for (let k = 0; k < img.data.length; k++) img.data[k]! += rng.normal(0, 2);
      return {
        run: () => detectSpots(img, { background: 20, threshold: 100, method: 'thresholded' }),
        error(result: unknown) {
          // RMS distance from each true spot to its nearest detection, pixels (as the peer).
          const s = result as SpotList;
          const cell = new Int32Array(g * g).fill(-1);
          for (let k = 0; k < s.count; k++) {
            const i = Math.min(g - 1, Math.max(0, Math.floor(s.x[k]! / pitch)));
            const j = Math.min(g - 1, Math.max(0, Math.floor(s.y[k]! / pitch)));
            cell[j * g + i] = k;
          }
          let se = 0;
          for (let t = 0; t < g * g; t++) {
            let best = Infinity;
            const ti = t % g, tj = Math.floor(t / g);
            for (let dj = -1; dj <= 1; dj++) {
              for (let di = -1; di <= 1; di++) {
                const i = ti + di, j = tj + dj;
                if (i < 0 || j < 0 || i >= g || j >= g) continue;
                const k = cell[j * g + i]!;
                if (k >= 0) best = Math.min(best, (s.x[k]! - cx[t]!) ** 2 + (s.y[k]! - cy[t]!) ** 2);
              }
            }
            se += best;
          }
          return Math.sqrt(se / (g * g));
        },
        notes: (ms: number) => `${((g * g) / ms / 1000).toFixed(2)} M spots/s`,
      };
    },
  };
}


function frameCase(windowed = false): BenchCase {
  return {
    name: windowed ? 'sensor.frame.windowed' : 'sensor.frame',
    size: 1024,
    quickSize: 256,
    iterations: 5,
    prepare(n: number) {
      // One n × n frame of a 32 × 32 hexagonal sensor under a sun-like light 40° from the
      // zenith, over two crossing wave trains; pixels → height map with one refinement pass.
      const { sea, light, geometry, reference, view } = createRoundTripScene(n);
      const frame = renderSpotFrame(traceSpots(geometry, sea, light), light, view, { photonsPerSpot: 30000, seed: 4 });
      // The windowed variant searches ±10 px around the spots of a previous frame (here the
      // same frame's spots shifted by 2 px, found once outside the timing), as a stream of
      // frames would after its first.
      const prior = windowed ? detectSpots(frame.image) : null;
      const detect = prior ? { windows: { x: prior.x.map((v) => v + 2), y: prior.y.map((v) => v - 2), halfWidth: 10 } } : {};
      return {
        run: () => measureFrame(frame.image, { geometry, light, view, reference }, { detect, reconstruct: { maxIterations: 1 } }),
        error(result: unknown) {
          // RMS height error over the interior nodes (two-node border dropped), metres.
          return interiorHeightError((result as FrameMeasurement).reconstruction!.height, sea).rms;
        },
        notes: (ms: number) => `${(1000 / ms).toFixed(2)} frames/s (1 refinement pass${windowed ? ', windowed search' : ''})`,
      };
    },
  };
}

export const cases: BenchCase[] = [centroidCase(), frameCase(), frameCase(true)];
