import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { createImage, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import type { Image } from '../../src/core/index.js';
import { createGridSurface } from '../../src/surface/index.js';
import type { Surface } from '../../src/surface/index.js';
import { detectCheckerboardCorners, lineStraightness, psnr, squareSizeSpread, ssim } from '../../src/metrics/index.js';
import { harbourScenario, preparePipeline, processFrame, simulateScenario, tankScenario, validateScenario } from '../../src/pipeline/index.js';
import type { PipelineResult, Scenario } from '../../src/pipeline/index.js';

const json = (name: string): unknown => JSON.parse(readFileSync(new URL(`../../examples/scenarios/${name}.json`, import.meta.url), 'utf8'));

describe('shipped scenarios', () => {
  it('the JSON files equal the exported defaults', () => {
    expect(json('harbour')).toEqual(harbourScenario());
    expect(json('tank')).toEqual(tankScenario());
  });

  it('validate and keep their values', () => {
    for (const s of [harbourScenario(), tankScenario()]) {
      const v = validateScenario(s);
      expect(v.sea).toEqual(s.sea);
      expect(v.sensor.pitch).toBe(s.sensor.pitch);
    }
  });
});

describe('validateScenario', () => {
  const bad = (edit: (s: Record<string, any>) => void): (() => void) => () => {
    const s = JSON.parse(JSON.stringify(tankScenario())) as Record<string, any>;
    edit(s);
    validateScenario(s);
  };
  it('names the field of every problem', () => {
    expect(bad((s) => { s.sea.gridSpacing = -1; })).toThrow(/scenario\.sea\.gridSpacing/);
    expect(bad((s) => { s.sea.gridSize = 300; })).toThrow(/scenario\.sea\.gridSize.*power of two/);
    expect(bad((s) => { s.sensor.frame.width = 'big'; })).toThrow(/scenario\.sensor\.frame\.width/);
    expect(bad((s) => { s.light.type = 'torch'; })).toThrow(/scenario\.light\.type/);
    expect(bad((s) => { s.light.position = [0, 0, -1]; })).toThrow(/scenario\.light\.position\[2\]/);
    expect(bad((s) => { s.camera.z = 0; })).toThrow(/scenario\.camera\.z/);
    expect(bad((s) => { s.target.z = -0.5; })).toThrow(/scenario\.target\.z/);
    expect(bad((s) => { s.sensor.apertureDiameter = 0.02; })).toThrow(/scenario\.sensor\.apertureDiameter/);
    expect(bad((s) => { s.sea.wavelenght = 3; })).toThrow(/scenario\.sea\.wavelenght.*no such field/);
    expect(bad((s) => { delete s.sensor; })).toThrow(MeniscusTypeError);
    expect(bad((s) => { s.light = { type: 'sun' }; })).toThrow(/scenario\.site/);
    expect(bad((s) => { s.light = { type: 'sun' }; s.site = { latitudeDeg: 10, longitudeDeg: 0 }; s.time = 'noon'; })).toThrow(/scenario\.time/);
  });

  it('refuses a sun below the horizon and a sea grid too small for the sensor', () => {
    const night = harbourScenario();
    night.time = '2025-06-21T01:00:00Z';
    expect(() => simulateScenario(night)).toThrow(/scenario\.time.*above the horizon/);
    const small: Scenario = tankScenario();
    small.sea.gridSpacing = 0.001;
    expect(() => simulateScenario(small)).toThrow(MeniscusRangeError);
    expect(() => simulateScenario(small)).toThrow(/scenario\.sea\.gridSpacing/);
  });
});

describe('processFrame on the simulated tank', () => {
  const sim = simulateScenario(tankScenario());
  const r = processFrame(sim.sensorFrame, sim.sceneImage, sim.setup, sim.options);

  it('measures the surface and reports every stage', () => {
    const d = r.diagnostics;
    expect(d.spotsFound).toBeGreaterThan(900);
    expect(d.spotsMatched).toBeGreaterThan(900);
    expect(Number.isFinite(d.rmsResidual)).toBe(true);
    expect(d.iterations).toBeGreaterThanOrEqual(1);
    for (const k of ['detect', 'match', 'reconstruct', 'surface', 'correctTrace', 'correctRaster', 'correctSample', 'total'] as const) {
      expect(d.timings[k]).toBeGreaterThanOrEqual(0);
    }
    expect(r.height).not.toBeNull();
    expect(r.correction).not.toBeNull();
  });

  // Issue check: corrected-vs-truth SSIM and PSNR improve over uncorrected-vs-truth on the
  // demo sea (scores: PSNR as common practice; SSIM of Wang et al. 2004, metrics area).
  it('improves PSNR and SSIM against the flat-water truth', () => {
    const c = r.correction!;
    const mask = new Uint8Array(c.mask.length);
    for (let p = 0; p < mask.length; p++) mask[p] = c.mask[p]! & sim.truthMask[p]!;
    const before = { psnr: psnr(sim.sceneImage, sim.truthImage, { mask }), ssim: ssim(sim.sceneImage, sim.truthImage, { mask }).ssim };
    const after = { psnr: psnr(c.image, sim.truthImage, { mask }), ssim: ssim(c.image, sim.truthImage, { mask }).ssim };
    expect(after.psnr).toBeGreaterThan(before.psnr + 3);
    expect(after.ssim).toBeGreaterThan(before.ssim + 0.05);
  });

  // Why the pipeline integrates the slopes onto a finer grid before correcting: the
  // sensor's one-pitch height grid, interpolated bicubically, has slopes far from the
  // slopes the sensor measured at its own sample points (the correction refracts by the
  // slopes). Truth: the simulated sea's analytic-interpolant slopes.
  it('the surface it corrects through keeps the measured slopes (the sensor grid alone does not)', () => {
    const s = r.measurement.reconstruction!.samples;
    const g = new Float64Array(2), t = new Float64Array(2);
    const rms = (surf: Surface | null): { surface: number; samples: number; truth: number } => {
      let es = 0, ed = 0, tt = 0, n = 0;
      for (let k = 0; k < s.count; k++) {
        if (s.status[k] !== Status.ok) continue;
        sim.trueSurface.heightGradient(s.x[k]!, s.y[k]!, t);
        ed += (s.p[k]! - t[0]!) ** 2 + (s.q[k]! - t[1]!) ** 2;
        tt += t[0]! ** 2 + t[1]! ** 2;
        if (surf) {
          surf.heightGradient(s.x[k]!, s.y[k]!, g);
          es += (g[0]! - t[0]!) ** 2 + (g[1]! - t[1]!) ** 2;
        }
        n++;
      }
      return { surface: Math.sqrt(es / n), samples: Math.sqrt(ed / n), truth: Math.sqrt(tt / n) };
    };
    const sensorGrid = rms(createGridSurface(r.height!));
    const used = rms(r.surface);
    expect(sensorGrid.samples).toBeLessThan(0.1 * sensorGrid.truth); // the sensor measures slopes well
    // On the shipped tank (ripples 4 cm and longer, 1 cm pitch): the one-pitch
    // interpolant's slope error is 3.2× the measurement's own; the finer grid halves it.
    expect(sensorGrid.surface).toBeGreaterThan(3 * sensorGrid.samples); // the one-pitch interpolant loses them
    expect(used.surface).toBeLessThan(0.6 * sensorGrid.surface);
    expect(r.surfaceHeight!.dx).toBeCloseTo(r.height!.dx / 2, 12);
  });

  // Issue check: against the uncorrected image, the image corrected through the MEASURED
  // surface cuts the checkerboard square-size spread and the line curvature each by
  // ≥ 80 % on the demo's tank sea. Scores from the metrics area (corner detection,
  // square-size spread, line straightness); the board and sea are the shipped scenario.
  it('corrected through the measured surface, cuts the checkerboard spread and curvature by ≥ 80 %', () => {
    const score = (im: Image): { spread: number; curvature: number; count: number } => {
      const det = detectCheckerboardCorners(im);
      expect(det.status).toBe('ok');
      return { spread: squareSizeSpread(det).all.relativeStd, curvature: lineStraightness(det).meanAbsCurvature, count: det.count };
    };
    const before = score(sim.sceneImage);
    const after = score(r.correction!.image);
    expect(after.count).toBe(225); // all 15 × 15 inner corners
    expect(after.spread).toBeLessThan(0.2 * before.spread);
    expect(after.curvature).toBeLessThan(0.2 * before.curvature);
  });

  it('reuses a previous result\'s correction buffers and gives the same frame', () => {
    const pipe = preparePipeline(sim.setup, sim.options);
    const first = pipe.process(sim.sensorFrame, sim.sceneImage);
    const fresh = pipe.process(sim.sensorFrame, sim.sceneImage);
    const kept = { image: first.correction!.image.data, map: first.correction!.map, mask: first.correction!.mask };
    const again = pipe.process(sim.sensorFrame, sim.sceneImage, { reuse: first });
    const c = again.correction!;
    expect(c.image.data).toBe(kept.image); // the same buffers …
    expect(c.map).toBe(kept.map);
    expect(c.mask).toBe(kept.mask);
    expect(Array.from(c.image.data)).toEqual(Array.from(fresh.correction!.image.data)); // … holding this frame
    expect(Array.from(c.mask)).toEqual(Array.from(fresh.correction!.mask));
    expect(c.valid).toBe(fresh.correction!.valid);
    expect(() => pipe.process(sim.sensorFrame, sim.sceneImage, { reuse: {} as PipelineResult })).toThrow(/options\.reuse/);
    // a result without a correction reuses nothing
    const empty = pipe.process(createImage(sim.sensorFrame.width, sim.sensorFrame.height), sim.sceneImage);
    expect(pipe.process(sim.sensorFrame, sim.sceneImage, { reuse: empty }).correction!.valid).toBe(fresh.correction!.valid);
  });

  it('refuses a scene image of the wrong size, and survives an empty sensor frame', () => {
    const pipe = preparePipeline(sim.setup, sim.options);
    expect(() => pipe.process(sim.sensorFrame, createImage(10, 10))).toThrow(/sceneImage.*calibrated size/);
    expect(() => preparePipeline(sim.setup, { surface: { subdivision: 9 } })).toThrow(/options\.surface\.subdivision/);
    const empty = createImage(sim.sensorFrame.width, sim.sensorFrame.height);
    const e = pipe.process(empty, sim.sceneImage);
    expect(e.surface).toBeNull();
    expect(e.correction).toBeNull();
    expect(e.diagnostics.warnings.length).toBeGreaterThan(0);
  });
});
