import { describe, expect, it } from 'vitest';
import { createImage } from '../../src/core/index.js';
import { measureFrame, renderSpotFrame, traceSpots } from '../../src/sensor/index.js';
import { createRoundTripScene, interiorHeightError } from './round-trip-scene.js';

const { sea, light, apertures: arr, geometry, reference, view } = createRoundTripScene();
const heightError = interiorHeightError;

describe('measureFrame round trip (analytic sea → rendered frame → spots → matching → slopes → integration)', () => {
  it('recovers the surface, and refinement lowers the height error against the single pass', () => {
    const trace = traceSpots(geometry, sea, light);
    const frame = renderSpotFrame(trace, light, view, { photonsPerSpot: 30000, seed: 4 });
    const m = measureFrame(frame.image, { geometry, light, view, reference }, { reconstruct: { maxIterations: 5 } });
    expect(m.diagnostics.spotsMatched).toBe(1024);
    // Every pairing is right: the matched spot is the one rendered for that aperture.
    for (let a = 0; a < arr.count; a++) {
      const s = m.match.spotOfAperture[a]!;
      expect(Math.hypot(m.spots.x[s]! - frame.centres[2 * a]!, m.spots.y[s]! - frame.centres[2 * a + 1]!)).toBeLessThan(0.5);
    }
    const r = m.reconstruction!;
    const single = heightError(r.firstPass, sea);
    const refined = heightError(r.height, sea);
    // Reported numbers (seed 4): single pass ≈ 0.45 mm, refined ≈ 0.1 mm of 3.1 mm RMS height.
    console.log(`round trip: single-pass RMS height error ${(single.rms * 1e3).toFixed(3)} mm, refined ${(refined.rms * 1e3).toFixed(3)} mm, RMS height ${(refined.rmsHeight * 1e3).toFixed(3)} mm, ${r.iterations} passes, last change ${r.changes.at(-1)!.toExponential(2)} m`);
    expect(refined.rms).toBeLessThan(single.rms);
    expect(refined.rms).toBeLessThan(0.1 * refined.rmsHeight);
    expect(r.converged).toBe(true);
  });

  it('refinement meets its tolerance on a noisy frame (read noise 3, seed 7), where the bilinear slope model alternates between two states', () => {
    // Cause of the alternation: with the bilinear model the slope of a sample is the
    // gradient of its cell's bilinear interpolant, constant across the cell and jumping at
    // its edges, so a crossing point that moves by ~50 µm over an edge changes the fit by
    // ~0.4 mm; the smooth model's equations change continuously with the crossing points.
    const trace = traceSpots(geometry, sea, light);
    const frame = renderSpotFrame(trace, light, view, { photonsPerSpot: 30000, readNoise: 3, seed: 7 });
    const setup = { geometry, light, view, reference };
    const smooth = measureFrame(frame.image, setup, { reconstruct: { maxIterations: 5 } }).reconstruction!;
    expect(smooth.converged).toBe(true);
    expect(smooth.changes.at(-1)!).toBeLessThan(1e-7);
    // Each pass shrinks the change (a contraction), by at least 5× after the first.
    for (let k = 1; k < smooth.changes.length; k++) expect(smooth.changes[k]!).toBeLessThan(0.2 * smooth.changes[k - 1]!);
    const noisy = heightError(smooth.height, sea);
    expect(noisy.rms).toBeLessThan(heightError(smooth.firstPass, sea).rms);
    expect(noisy.rms).toBeLessThan(0.05 * noisy.rmsHeight);
    const cell = measureFrame(frame.image, setup, { reconstruct: { maxIterations: 6, slopeModel: 'bilinear' } }).reconstruction!;
    expect(cell.converged).toBe(false);
    const c = cell.changes;
    // Period two: the last changes repeat every other pass and do not shrink.
    expect(Math.abs(c[5]! - c[3]!)).toBeLessThan(0.05 * c[3]!);
    expect(c[5]!).toBeGreaterThan(1e-5);
    console.log(`noisy frame: smooth model changes ${smooth.changes.map((v) => v.toExponential(1)).join(', ')} m, error ${(noisy.rms * 1e3).toFixed(3)} mm; bilinear model changes ${c.map((v) => v.toExponential(1)).join(', ')} m`);
  });

  it('an empty frame and a saturated frame give a flagged result, not a crash', () => {
    const empty = createImage(256, 256);
    const a = measureFrame(empty, { geometry, light, view, reference });
    expect(a.reconstruction).toBeNull();
    expect(a.diagnostics.warnings.join(' ')).toMatch(/uniform|too few/);
    const sat = createImage(256, 256, 1, new Float32Array(256 * 256).fill(65535));
    const b = measureFrame(sat, { geometry, light, view, reference }, { detect: { saturation: 65535 } });
    expect(b.reconstruction).toBeNull();
    expect(b.diagnostics.warnings.join(' ')).toMatch(/saturated/);
  });
});
