import { describe, expect, it } from 'vitest';
import { Status } from '../../src/core/index.js';
import { createPlaneSurface, createSinusoidSurface } from '../../src/surface/index.js';
import { createCollimatedLight, createPointLight } from '../../src/sun/index.js';
import { createApertureArray, createSensorGeometry, slopesFromSpots, traceSpots } from '../../src/sensor/index.js';

const domain = { xMin: -2, xMax: 2, yMin: -2, yMax: 2 };
const arr = createApertureArray({ lattice: 'hexagonal', pitch: 0.02, columns: 8, rows: 8, apertureDiameter: 0.002 });
const g = createSensorGeometry({ apertures: arr, maskDepth: 0.25, planeDistance: 0.06 });

describe('slopesFromSpots', () => {
  it('a tilted plane under collimated light: the slopes come back exactly (inverse Snell law; Born & Wolf §1.5.1)', () => {
    const surf = createPlaneSurface({ height: 0.005, slopeX: 0.15, slopeY: -0.08, domain });
    const light = createCollimatedLight([0.2, 0.1, 1]);
    const tr = traceSpots(g, surf, light);
    const s = slopesFromSpots(g, light, tr);
    for (let k = 0; k < arr.count; k++) {
      expect(s.status[k]).toBe(Status.ok);
      expect(Math.abs(s.p[k]! - 0.15)).toBeLessThan(1e-9);
      expect(Math.abs(s.q[k]! + 0.08)).toBeLessThan(1e-9);
    }
  });

  it('a curved surface and a point lamp: with the true surface for the crossings, slopes and crossing points are exact', () => {
    const sea = createSinusoidSurface({ components: [{ amplitude: 0.004, kx: 20, ky: 6, phase: 0.4 }], domain });
    const lamp = createPointLight([0.3, -0.2, 2]);
    const tr = traceSpots(g, sea, lamp);
    const s = slopesFromSpots(g, lamp, tr, { surface: sea });
    const gr = [0, 0];
    for (let k = 0; k < arr.count; k++) {
      expect(s.status[k]).toBe(Status.ok);
      expect(Math.abs(s.x[k]! - tr.crossings[3 * k]!)).toBeLessThan(1e-9);
      sea.gradient(s.x[k]!, s.y[k]!, gr);
      expect(Math.abs(s.p[k]! - gr[0]!)).toBeLessThan(1e-8);
      expect(Math.abs(s.q[k]! - gr[1]!)).toBeLessThan(1e-8);
    }
  });

  it('the slope covariance follows the spot covariance: about (σ / gain)² for a small spot shift', () => {
    const light = createCollimatedLight([0, 0, 1]);
    const flat = createPlaneSurface({ domain });
    const tr = traceSpots(g, flat, light);
    const sigma = 1e-5; // 10 µm on the plane
    const cov = new Float64Array(arr.count).fill(sigma * sigma);
    const s = slopesFromSpots(g, light, { x: tr.x, y: tr.y, cxx: cov, cxy: new Float64Array(arr.count), cyy: cov });
    // Small-slope gain of a level sensor under vertical light: L (1 − n_a/n_w) per unit slope
    // (the closed-form Shack–Hartmann relation scaled by refraction at the air–water interface).
    const gain = g.planeDistance * (1 - g.nAir / g.nWater);
    for (let k = 0; k < arr.count; k++) {
      expect(Math.sqrt(s.cpp[k]!) / (sigma / gain)).toBeCloseTo(1, 3);
      expect(Math.abs(s.cpq[k]!)).toBeLessThan(1e-6 * s.cpp[k]!);
    }
  });

  it('apertures without a spot are flagged unmatched; a spot above the mask is blocked', () => {
    const x = new Float64Array(arr.count).fill(NaN), y = new Float64Array(arr.count).fill(NaN);
    const s = slopesFromSpots(g, createCollimatedLight([0, 0, 1]), { x, y });
    expect(s.status.every((v) => v === Status.unmatched)).toBe(true);
    expect(() => slopesFromSpots(g, createCollimatedLight([0, 0, 1]), { x: new Float64Array(2), y: new Float64Array(2) })).toThrow(/spots\.x/);
  });
});
