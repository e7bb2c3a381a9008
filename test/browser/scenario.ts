/**
 * A small end-to-end frame run identically in Node and in the browser: the invented
 * wave-tank scenario shrunk to a 12 × 12-aperture sensor on a 256² frame and a 64² scene
 * camera, simulated (sea, spot frame, scene image), then measured and corrected by
 * `processFrame`. It takes the library as an argument so that both sides run the very
 * same built code.
 */
import type * as Meniscus from '../../src/index.js';

export type ScenarioModule = typeof Meniscus;
export type ScenarioResult = Record<string, number[]>;

export function runScenario(m: ScenarioModule): ScenarioResult {
  const s = JSON.parse(JSON.stringify(m.tankScenario())) as ReturnType<ScenarioModule['tankScenario']> & Record<string, any>;
  s.sea.gridSize = 64;
  s.sensor.columns = 12;
  s.sensor.rows = 12;
  s.sensor.frame = { width: 256, height: 256, pixelSize: 0.0006 };
  s.sensor.refinementPasses = 1;
  s.camera.width = 64;
  s.camera.height = 64;
  s.camera.supersample = 1;
  const sim = m.simulateScenario(s);
  const r = m.processFrame(sim.sensorFrame, sim.sceneImage, sim.setup, sim.options);
  const rng = m.createRng(2026);
  const corrected: number[] = [];
  if (!r.height || !r.correction) throw new Error('the small tank frame was not measured and corrected');
  const img = r.correction.image;
  for (let k = 0; k < img.data.length; k += 37) corrected.push(img.data[k]!);
  return {
    draws: Array.from({ length: 8 }, () => rng.normal()),
    frame: Array.from(sim.sensorFrame.data.filter((_, k) => k % 997 === 0)),
    height: Array.from(r.height.data),
    spotsMatched: [r.diagnostics.spotsMatched],
    corrected,
  };
}

export function compareResults(
  a: ScenarioResult,
  b: ScenarioResult,
): { keys: string[]; maxRelative: number; perKey: Record<string, number> } {
  const keys = Object.keys(b).sort();
  let maxRelative = 0;
  const perKey: Record<string, number> = {};
  for (const k of Object.keys(a)) {
    const before = maxRelative;
    maxRelative = 0;
    const x = a[k]!;
    const y = b[k];
    if (!y || y.length !== x.length) return { keys, maxRelative: Infinity, perKey };
    // differences relative to the output's own scale (its largest magnitude)
    let scale = 1e-300;
    for (let i = 0; i < x.length; i++) scale = Math.max(scale, Math.abs(x[i]!), Math.abs(y[i]!));
    for (let i = 0; i < x.length; i++) {
      const d = x[i] === y[i] ? 0 : Math.abs(x[i]! - y[i]!) / scale;
      if (!(d <= maxRelative)) maxRelative = Number.isNaN(d) ? Infinity : Math.max(maxRelative, d);
    }
    perKey[k] = maxRelative;
    maxRelative = Math.max(before, maxRelative);
  }
  return { keys, maxRelative, perKey };
}
