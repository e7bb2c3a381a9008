// Test fixtures for the command line: a small version of the shipped wave-tank scenario
// (small frames, a coarse sea) so that a short sequence simulates in about a second.
import type { Scenario } from '../../src/pipeline/index.js';
import { tankScenario } from '../../src/pipeline/index.js';

export function smallTankScenario(): Scenario {
  const s = tankScenario();
  s.name = 'small-tank';
  s.sea.gridSize = 64;
  s.sea.gridSpacing = 0.004;
  s.sensor.columns = 12;
  s.sensor.rows = 12;
  s.sensor.frame = { width: 160, height: 160, pixelSize: 0.0008 };
  s.camera = { ...s.camera, width: 64, height: 64, fovDeg: 24, supersample: 1 };
  s.target = { type: 'checkerboard', z: 0.6, squareSize: 0.025, columns: 8, rows: 8, pixelsPerSquare: 8 };
  return s;
}
