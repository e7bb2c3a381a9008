/**
 * The measured slope samples packed for the scattered integrator. Internal to the
 * library (shared by the sensor's reconstruction and the pipeline), not re-exported.
 *
 * @module
 */
import { Status } from '../core/index.js';
import type { SlopeSamples } from './slopes.js';

/**
 * The samples with status ok, packed (positions, slopes) with their weights: the inverse
 * of each slope variance relative to the mean variance, capped at 100, when `weighted`
 * and the samples carry variances; 1 otherwise. `used` is their number.
 */
export function samplesFor(s: SlopeSamples, weighted: boolean): { x: Float64Array; y: Float64Array; p: Float64Array; q: Float64Array; weights: Float64Array; used: number } {
  let m = 0;
  for (let k = 0; k < s.count; k++) if (s.status[k] === Status.ok) m++;
  const x = new Float64Array(m), y = new Float64Array(m), p = new Float64Array(m), q = new Float64Array(m), w = new Float64Array(m);
  let mean = 0, nv = 0;
  if (weighted) {
    for (let k = 0; k < s.count; k++) {
      const v = 0.5 * (s.cpp[k]! + s.cqq[k]!);
      if (s.status[k] === Status.ok && v > 0 && Number.isFinite(v)) {
        mean += v;
        nv++;
      }
    }
    mean = nv > 0 ? mean / nv : 0;
  }
  let i = 0;
  for (let k = 0; k < s.count; k++) {
    if (s.status[k] !== Status.ok) continue;
    x[i] = s.x[k]!;
    y[i] = s.y[k]!;
    p[i] = s.p[k]!;
    q[i] = s.q[k]!;
    const v = 0.5 * (s.cpp[k]! + s.cqq[k]!);
    w[i] = weighted && mean > 0 && v > 0 && Number.isFinite(v) ? Math.min(100, mean / v) : 1;
    i++;
  }
  return { x, y, p, q, weights: w, used: m };
}
