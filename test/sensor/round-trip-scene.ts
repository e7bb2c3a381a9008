/**
 * The round-trip scene shared by the sensor tests and the `sensor.frame` benchmark: a
 * 32 × 32 hexagonal pinhole sensor (1 cm pitch, 30 cm deep, 5 cm to the plane) under a
 * sun-like collimated light 40° from the zenith, over two crossing wave trains (4 mm and
 * 2 mm amplitude, 15–50 cm wavelengths). Oblique light makes the mean-level assumption
 * matter, which is what refinement corrects.
 */
import { createMask, gridFromFunction } from '../../src/core/index.js';
import type { Grid } from '../../src/core/index.js';
import { heightError } from '../../src/metrics/index.js';
import { createPlaneView, createApertureArray, createSensorGeometry, referenceSpots } from '../../src/sensor/index.js';
import { createSinusoidSurface } from '../../src/surface/index.js';
import type { Surface } from '../../src/surface/index.js';
import { createCollimatedLight } from '../../src/sun/index.js';

/** Build the scene; the plane is imaged on `frameSize²` pixels covering 0.369 m. */
export function createRoundTripScene(frameSize = 1024) {
  const sea = createSinusoidSurface({
    components: [
      { amplitude: 0.004, kx: (2 * Math.PI) / 0.2, ky: (2 * Math.PI) / 0.5, phase: 0.3 },
      { amplitude: 0.002, kx: (-2 * Math.PI) / 0.4, ky: (2 * Math.PI) / 0.15, phase: 1.1 },
    ],
    domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 },
  });
  const th = (40 * Math.PI) / 180;
  const light = createCollimatedLight([Math.sin(th), 0, Math.cos(th)], 0.00465);
  const apertures = createApertureArray({ lattice: 'hexagonal', pitch: 0.01, columns: 32, rows: 32, apertureDiameter: 0.001 });
  const geometry = createSensorGeometry({ apertures, maskDepth: 0.3, planeDistance: 0.05 });
  const reference = referenceSpots(geometry, light);
  let cx = 0;
  let cy = 0;
  for (let k = 0; k < apertures.count; k++) {
    cx += reference.x[k]! / apertures.count;
    cy += reference.y[k]! / apertures.count;
  }
  const view = createPlaneView({ width: frameSize, height: frameSize, pixelSize: (0.36e-3 * 1024) / frameSize, centre: [cx, cy] });
  return { sea, light, apertures, geometry, reference, view };
}

/**
 * RMS height error of a reconstruction against the true surface over its interior nodes
 * (a two-node border dropped), piston removed (the metrics area's `heightError`), and the
 * RMS of the truth itself over the same nodes.
 */
export function interiorHeightError(h: Grid, truth: Surface): { rms: number; rmsHeight: number } {
  const t = gridFromFunction(h, (x, y) => truth.height(x, y));
  const mask = createMask(h.width, h.height, 0);
  for (let j = 2; j < h.height - 2; j++) for (let i = 2; i < h.width - 2; i++) mask[j * h.width + i] = 1;
  const zero = gridFromFunction(h, () => 0);
  return { rms: heightError(h, t, { mask }).rms, rmsHeight: heightError(t, zero, { mask }).rms };
}
