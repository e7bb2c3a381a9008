/**
 * The two shipped scenarios (also in `examples/scenarios/` as JSON), as plain objects so
 * that browsers and the command line can use them without reading files.
 *
 * @module
 */
import type { Scenario } from './scenario.js';

/**
 * An invented harbour at sea under the sun: a camera 0.5 m under the water looks up
 * through short wind waves (peak period 1.2 s, Hs 30 mm) at a patterned panel 1.5 m above
 * the water; a 32 × 32 hexagonal pinhole sensor beside it measures the surface.
 *
 * @returns A fresh copy of the scenario (plain JSON).
 * @example
 * ```ts
 * const sim = simulateScenario(harbourScenario());
 * ```
 */
export function harbourScenario(): Scenario {
  return {
    name: 'harbour',
    description: 'An invented harbour (Kestrel Quay) on a June morning: a camera 0.5 m down looks up through wind ripples at a patterned panel on the quay wall, 1.5 m above the water, while a 32 × 32 pinhole slope sensor beside it watches the sun.',
    site: { name: 'Kestrel Quay (invented)', latitudeDeg: 46.5, longitudeDeg: -18.5, height: 0 },
    time: '2025-06-21T10:30:00Z',
    water: { nWater: 1.34, nAir: 1.000293 },
    sea: { peakPeriod: 1.2, significantHeight: 0.03, gamma: 3.3, spreadingS: 6, meanDirectionDeg: 30, gridSize: 256, gridSpacing: 0.016, seed: 11, time: 0 },
    light: { type: 'sun' },
    sensor: {
      lattice: 'hexagonal',
      pitch: 0.012,
      columns: 32,
      rows: 32,
      apertureDiameter: 0.001,
      maskDepth: 0.25,
      planeDistance: 0.04,
      frame: { width: 1024, height: 1024, pixelSize: 0.0004 },
      photonsPerSpot: 30000,
      readNoise: 3,
      seed: 7,
      refinementPasses: 3,
    },
    camera: { width: 384, height: 384, fovDeg: 40, z: -0.5, position: [0, 0], supersample: 2 },
    target: { type: 'pattern', z: 1.5, size: 2.4, pixels: 1024, seed: 3 },
    correction: { mode: 'exact', meshStep: 8, reference: 'flat' },
  };
}

/**
 * An invented lab wave tank with a point lamp: a camera 0.35 m under the water looks up
 * through fan-driven ripples (peak period 0.5 s, Hs 3 mm) at a checkerboard held 0.6 m
 * above the water; a lamp off to the side, 1 m up, is the slope sensor's guide light.
 *
 * @returns A fresh copy of the scenario (plain JSON).
 * @example
 * ```ts
 * const sim = simulateScenario(tankScenario());
 * ```
 */
export function tankScenario(): Scenario {
  return {
    name: 'tank',
    description: 'An invented 0.6 m deep wind-wave flume: a camera 0.35 m down looks up through fan-driven ripples (4 cm and longer, which the sensor\'s 1 cm pitch resolves) at a checkerboard 0.6 m above the water; a lamp 1 m up and 0.8 m to the side is the slope sensor\'s guide light. The image is corrected to the view without water, where the board is a perfect grid.',
    water: { nWater: 1.333, nAir: 1.000293 },
    sea: { peakPeriod: 0.5, significantHeight: 0.003, gamma: 3.3, spreadingS: 4, meanDirectionDeg: 0, depth: 0.6, gridSize: 256, gridSpacing: 0.02, seed: 5, time: 0 },
    light: { type: 'point', position: [0.8, 0, 1.0], radius: 0.005 },
    sensor: {
      lattice: 'square',
      pitch: 0.01,
      columns: 32,
      rows: 32,
      apertureDiameter: 0.001,
      maskDepth: 0.2,
      planeDistance: 0.03,
      frame: { width: 1024, height: 1024, pixelSize: 0.00034 },
      photonsPerSpot: 30000,
      readNoise: 3,
      seed: 9,
      refinementPasses: 3,
    },
    camera: { width: 384, height: 384, fovDeg: 36, z: -0.35, position: [0, 0], supersample: 2 },
    target: { type: 'checkerboard', z: 0.6, squareSize: 0.025, columns: 16, rows: 16, pixelsPerSquare: 16 },
    correction: { mode: 'exact', meshStep: 8, reference: 'none' },
  };
}
