import { describe, expect, it } from 'vitest';
import { Status, rotationAboutAxis } from '../../src/core/index.js';
import { createPlaneSurface, createSinusoidSurface } from '../../src/surface/index.js';
import { createCollimatedLight, createPointLight } from '../../src/sun/index.js';
import { createApertureArray, createSensorGeometry, referenceSpots, traceSpots, worldToSensor, planeToWorld } from '../../src/sensor/index.js';

const domain = { xMin: -2, xMax: 2, yMin: -2, yMax: 2 };

/**
 * Closed-form refraction of a plane (Snell's law: the tangential part of n·direction is
 * continuous across the interface; Born & Wolf, Principles of Optics, §1.5), written out
 * independently of the library's vector form.
 */
function snellPlane(d: readonly number[], n: readonly number[], n1: number, n2: number): number[] {
  const dn = d[0]! * n[0]! + d[1]! * n[1]! + d[2]! * n[2]!;
  const tan = [d[0]! - dn * n[0]!, d[1]! - dn * n[1]!, d[2]! - dn * n[2]!].map((c) => (n1 / n2) * c);
  const t2 = tan[0]! ** 2 + tan[1]! ** 2 + tan[2]! ** 2;
  const along = -Math.sqrt(1 - t2); // continues into the water, against the upward normal
  return [tan[0]! + along * n[0]!, tan[1]! + along * n[1]!, tan[2]! + along * n[2]!];
}

describe('traceSpots', () => {
  it('tilted flat surface: every spot where the closed-form refraction of a plane puts it (1e-9 m; Snell, Born & Wolf §1.5)', () => {
    const arr = createApertureArray({ lattice: 'hexagonal', pitch: 0.02, columns: 9, rows: 7, apertureDiameter: 0.002, rotation: 0.3 });
    const g = createSensorGeometry({ apertures: arr, maskDepth: 0.25, planeDistance: 0.08 });
    const [h0, p, q] = [0.01, 0.12, -0.07];
    const surf = createPlaneSurface({ height: h0, slopeX: p, slopeY: q, domain });
    const toLight = [0.3, -0.2, 1];
    const light = createCollimatedLight(toLight as [number, number, number]);
    const tr = traceSpots(g, surf, light);
    const len = Math.hypot(...toLight);
    const d = toLight.map((c) => -c / len);
    const nl = Math.hypot(p, q, 1);
    const t = snellPlane(d, [-p / nl, -q / nl, 1 / nl], g.nAir, g.nWater);
    let worst = 0;
    for (let k = 0; k < arr.count; k++) {
      expect(tr.status[k]).toBe(Status.ok);
      const A = [g.apertureWorld[3 * k]!, g.apertureWorld[3 * k + 1]!, g.apertureWorld[3 * k + 2]!];
      // Spot: from the aperture along t down to the plane z = −(maskDepth + planeDistance).
      const u = (-(g.maskDepth + g.planeDistance) - A[2]!) / t[2]!;
      const S = [A[0]! + u * t[0]!, A[1]! + u * t[1]!];
      const w = planeToWorld(g, tr.x[k]!, tr.y[k]!);
      worst = Math.max(worst, Math.hypot(w[0] - S[0]!, w[1] - S[1]!));
      // Crossing: back from the aperture along −t to the plane surface.
      const s = (A[2]! - h0 - p * A[0]! - q * A[1]!) / (t[2]! - p * t[0]! - q * t[1]!);
      const X = [A[0]! - s * t[0]!, A[1]! - s * t[1]!, A[2]! - s * t[2]!];
      worst = Math.max(worst, Math.hypot(tr.crossings[3 * k]! - X[0]!, tr.crossings[3 * k + 1]! - X[1]!, tr.crossings[3 * k + 2]! - X[2]!));
    }
    expect(worst).toBeLessThan(1e-9);
  });

  it('a tilted, shifted sensor under a point lamp: the traced ray passes through the aperture and obeys Snell at the crossing', () => {
    const arr = createApertureArray({ pitch: 0.03, columns: 6, rows: 5, apertureDiameter: 0.002 });
    const g = createSensorGeometry({ apertures: arr, maskDepth: 0.3, planeDistance: 0.05, position: [0.1, -0.05], rotation: rotationAboutAxis([1, 1, 0], 0.1) });
    const sea = createSinusoidSurface({ components: [{ amplitude: 0.01, kx: 14, ky: 8, phase: 0.2 }], domain });
    const lamp = createPointLight([0.5, 0.2, 3]);
    const tr = traceSpots(g, sea, lamp);
    for (let k = 0; k < arr.count; k++) {
      expect(tr.status[k]).toBe(Status.ok);
      const X = [tr.crossings[3 * k]!, tr.crossings[3 * k + 1]!, tr.crossings[3 * k + 2]!] as const;
      expect(Math.abs(X[2] - sea.height(X[0], X[1]))).toBeLessThan(1e-12);
      const A = [g.apertureWorld[3 * k]!, g.apertureWorld[3 * k + 1]!, g.apertureWorld[3 * k + 2]!];
      const t = [tr.directions[3 * k]!, tr.directions[3 * k + 1]!, tr.directions[3 * k + 2]!];
      // Collinear: the aperture lies on the ray from X along t.
      const v = [A[0]! - X[0], A[1]! - X[1], A[2]! - X[2]];
      const cr = [v[1]! * t[2]! - v[2]! * t[1]!, v[2]! * t[0]! - v[0]! * t[2]!, v[0]! * t[1]! - v[1]! * t[0]!];
      expect(Math.hypot(...cr)).toBeLessThan(1e-10);
      // Snell: n1 sin θi = n2 sin θt with the true normal.
      const gr = [0, 0];
      sea.gradient(X[0], X[1], gr);
      const nl = Math.hypot(gr[0]!, gr[1]!, 1);
      const n = [-gr[0]! / nl, -gr[1]! / nl, 1 / nl];
      const L = lamp.toLight(X as unknown as [number, number, number]);
      const ci = L[0] * n[0]! + L[1] * n[1]! + L[2] * n[2]!;
      const ct = -(t[0]! * n[0]! + t[1]! * n[1]! + t[2]! * n[2]!);
      expect(g.nAir * Math.sqrt(1 - ci * ci)).toBeCloseTo(g.nWater * Math.sqrt(1 - ct * ct), 10);
      // The spot lies on the plane.
      const s = worldToSensor(g, planeToWorld(g, tr.x[k]!, tr.y[k]!));
      expect(s[2]).toBeCloseTo(-g.planeDistance, 12);
    }
  });

  it('flat water under vertical light: references sit right below the apertures', () => {
    const arr = createApertureArray({ pitch: 0.01, columns: 4, rows: 4, apertureDiameter: 0.001 });
    const g = createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: 0.05 });
    const ref = referenceSpots(g, createCollimatedLight([0, 0, 1]));
    for (let k = 0; k < arr.count; k++) {
      expect(ref.status[k]).toBe(Status.ok);
      expect(ref.x[k]).toBeCloseTo(arr.positions[2 * k]!, 12);
      expect(ref.y[k]).toBeCloseTo(arr.positions[2 * k + 1]!, 12);
    }
  });

  it('light lost off a finite plane is flagged blocked; a surface outside its domain is a miss', () => {
    const arr = createApertureArray({ pitch: 0.01, columns: 5, rows: 1, apertureDiameter: 0.001 });
    const g = createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: 0.05, planeHalfSize: [0.015, 0.01] });
    const tr = traceSpots(g, createPlaneSurface({ domain }), createCollimatedLight([0, 0, 1]));
    expect(Array.from(tr.status)).toEqual([Status.blocked, Status.ok, Status.ok, Status.ok, Status.blocked]);
    expect(Number.isNaN(tr.x[0]!)).toBe(true);
    const small = createPlaneSurface({ domain: { xMin: 5, xMax: 6, yMin: 5, yMax: 6 } });
    const tr2 = traceSpots(g, small, createCollimatedLight([0, 0, 1]));
    expect(tr2.status.every((s) => s === Status.miss)).toBe(true);
  });

  it('bad geometry: a plane behind the mask, negative distances and depths are refused with a clear message', () => {
    const arr = createApertureArray({ pitch: 0.01, columns: 2, rows: 2, apertureDiameter: 0.001 });
    expect(() => createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: -0.05 })).toThrow(/planeDistance.*below the mask/);
    expect(() => createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: 0 })).toThrow(/planeDistance/);
    expect(() => createSensorGeometry({ apertures: arr, maskDepth: -0.1, planeDistance: 0.05 })).toThrow(/maskDepth/);
    expect(() => createSensorGeometry({ apertures: arr, maskDepth: 0.2, planeDistance: 0.05, rotation: rotationAboutAxis([1, 0, 0], 2) })).toThrow(/facing up/);
    expect(() => createApertureArray({ pitch: 0.01, columns: 2, rows: 2, apertureDiameter: 0.02 })).toThrow(/apertureDiameter/);
    expect(() => createApertureArray({ pitch: -1, columns: 2, rows: 2, apertureDiameter: 0.001 })).toThrow(/pitch/);
  });
});
