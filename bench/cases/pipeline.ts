/**
 * Benchmarks of the pipeline area (no numpy peer).
 *
 * pipeline.frame: one frame through `processFrame` (prepared once): a size × size sensor
 *   frame with 32 × 32 spots (the invented tank scenario: square pinhole array, point
 *   lamp, three refinement passes) plus a size × size scene image (the tank's camera and
 *   checkerboard at that size), corrected in the fast mode (8 px mesh) — the video setting:
 *   each frame reuses the previous result's correction buffers (`options.reuse`). Fifteen
 *   timed frames after five untimed ones (the compiler's warm-up, which a video pays once).
 *   error: RMS height error of the measured surface over the nodes data reach, metres
 *   (piston removed). The notes give frames per second and the time of each stage.
 */
import { preparePipeline, simulateScenario, tankScenario } from '../../src/pipeline/index.js';
import type { PipelineResult, PipelineTimings } from '../../src/pipeline/index.js';
import type { BenchCase } from '../case.js';

const frame: BenchCase = {
  name: 'pipeline.frame',
  size: 1024,
  quickSize: 256,
  iterations: 15,
  warmup: 5,
  prepare(n: number) {
    const sc = tankScenario();
    sc.sensor.frame = { width: n, height: n, pixelSize: (0.00034 * 1024) / n };
    sc.camera.width = n;
    sc.camera.height = n;
    sc.camera.supersample = 1;
    sc.correction = { mode: 'fast', meshStep: 8, reference: 'flat' };
    const sim = simulateScenario(sc);
    const pipe = preparePipeline(sim.setup, sim.options);
    let last: PipelineResult | null = null;
    return {
      // each frame reuses the previous result's correction buffers, as a video caller does
      run: () => (last = pipe.process(sim.sensorFrame, sim.sceneImage, last === null ? undefined : { reuse: last })),
      error(result: unknown) {
        const r = result as PipelineResult;
        if (r.height === null) return NaN;
        const h = r.height, m = r.heightMask!;
        let n0 = 0, mh = 0, mt = 0;
        const t = new Float64Array(h.data.length);
        for (let j = 0; j < h.height; j++) for (let i = 0; i < h.width; i++) {
          const k = j * h.width + i;
          t[k] = sim.trueSurface.height(h.x0 + i * h.dx, h.y0 + j * h.dy);
          if (m[k]) { mh += h.data[k]!; mt += t[k]!; n0++; }
        }
        mh /= n0;
        mt /= n0;
        let se = 0;
        for (let k = 0; k < t.length; k++) if (m[k]) se += (h.data[k]! - mh - t[k]! + mt) ** 2;
        return Math.sqrt(se / n0);
      },
      notes(ms: number) {
        if (last === null) return undefined;
        const t: PipelineTimings = last.diagnostics.timings;
        const parts = (['detect', 'match', 'reconstruct', 'surface', 'correctTrace', 'correctRaster', 'correctSample'] as const).map((k) => `${k} ${t[k].toFixed(1)}`);
        return `${(1000 / ms).toFixed(2)} frames/s; last frame ms: ${parts.join(', ')}`;
      },
    };
  },
};

export const cases: BenchCase[] = [frame];
