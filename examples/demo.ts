/**
 * `npm run demo`: the whole job end to end on two invented scenarios, from their embedded
 * defaults (no arguments, no downloads).
 *
 * 1. An invented harbour under the sun: simulate a sea, the slope sensor's frame and the
 *    scene camera's image through the waves; recover the surface; correct the image;
 *    score it against the truth (the view through flat water) and against the
 *    uncorrected image.
 * 2. An invented lab wave tank with a point lamp and a checkerboard above the water,
 *    corrected to the view without water (where the board is a perfect grid) and scored
 *    with the checkerboard metrics as well.
 *
 * Writes PNGs (sensor frame, distorted, corrected, truth, true and measured height maps,
 * height error) and `report.json` into `out/<scenario>/`, and prints a before/after table.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { createGrid, createImage } from '../src/core/index.js';
import type { Grid, Image, Mask } from '../src/core/index.js';
import { correctImage } from '../src/imaging/index.js';
import { detectCheckerboardCorners, heightError, lineStraightness, psnr, squareSizeSpread, ssim } from '../src/metrics/index.js';
import { harbourScenario, preparePipeline, simulateScenario, tankScenario } from '../src/pipeline/index.js';
import type { Scenario } from '../src/pipeline/index.js';
import { errorMapImage, heightMapImage } from '../src/viz/index.js';
import { writePng } from '../src/node/index.js';

const OUT = 'out';

function and(...masks: Mask[]): Mask {
  const m = new Uint8Array(masks[0]!.length);
  for (let p = 0; p < m.length; p++) m[p] = masks.every((x) => x[p] === 1) ? 1 : 0;
  return m;
}

function normalised(im: Image): Image {
  let hi = 0;
  for (const v of im.data) if (v > hi) hi = v;
  const out = createImage(im.width, im.height, 1);
  for (let k = 0; k < im.data.length; k++) out.data[k] = hi > 0 ? im.data[k]! / hi : 0;
  return out;
}

function boardScores(im: Image): { corners: number; spread: number; curvature: number } | null {
  const det = detectCheckerboardCorners(im);
  if (det.status !== 'ok') return null;
  return { corners: det.count, spread: squareSizeSpread(det).all.relativeStd, curvature: lineStraightness(det).meanAbsCurvature };
}

interface Row {
  label: string;
  before: string;
  after: string;
  ideal?: string;
  truth?: string;
}

function runScenario(scenario: Scenario): { rows: Row[]; report: Record<string, unknown> } {
  const dir = join(OUT, scenario.name);
  mkdirSync(dir, { recursive: true });
  const t0 = performance.now();
  const sim = simulateScenario(scenario);
  const tSim = performance.now() - t0;
  const pipe = preparePipeline(sim.setup, sim.options);
  const r = pipe.process(sim.sensorFrame, sim.sceneImage);
  const d = r.diagnostics;
  if (r.height === null || r.correction === null) throw new Error(`${scenario.name}: no surface was measured (${d.warnings.join('; ')})`);
  const c = r.correction;
  // Surface scores: the truth sampled at the measured grid's nodes.
  const h = r.height;
  const truthGrid: Grid = createGrid(h);
  for (let j = 0; j < h.height; j++) for (let i = 0; i < h.width; i++) truthGrid.data[j * h.width + i] = sim.trueSurface.height(h.x0 + i * h.dx, h.y0 + j * h.dy);
  const he = heightError(h, truthGrid, { mask: r.heightMask!, remove: 'piston' });
  let tm = 0, tn = 0;
  for (let k = 0; k < truthGrid.data.length; k++) if (r.heightMask![k]) { tm += truthGrid.data[k]!; tn++; }
  tm /= tn;
  let ts = 0;
  for (let k = 0; k < truthGrid.data.length; k++) if (r.heightMask![k]) ts += (truthGrid.data[k]! - tm) ** 2;
  const trueRms = Math.sqrt(ts / tn);
  // Image scores over the pixels every image has.
  const mask = and(c.mask, sim.truthMask, sim.sceneMask);
  const before = { psnr: psnr(sim.sceneImage, sim.truthImage, { mask }), ssim: ssim(sim.sceneImage, sim.truthImage, { mask }).ssim };
  const after = { psnr: psnr(c.image, sim.truthImage, { mask }), ssim: ssim(c.image, sim.truthImage, { mask }).ssim };
  // The same correction through the true surface: what a perfect measurement would give.
  const target = { type: 'plane', z: scenario.target.z } as const;
  const ci = correctImage(sim.sceneImage, sim.camera, sim.pose, sim.trueSurface, target, sim.options.correction);
  const maskI = and(mask, ci.mask);
  const ideal = { psnr: psnr(ci.image, sim.truthImage, { mask: maskI }), ssim: ssim(ci.image, sim.truthImage, { mask: maskI }).ssim };
  // The fast mode's map against the exact one, on the measured surface.
  const fastError: Record<string, number> = {};
  for (const [meshStep, meshInterpolation] of [[3, 'quadratic'], [4, 'quadratic'], [8, 'quadratic'], [4, 'linear'], [4, 'cubic']] as const) {
    const tf = performance.now();
    const f = correctImage(sim.sceneImage, sim.camera, sim.pose, r.surface!, target, { ...sim.options.correction, mode: 'fast', meshStep, meshInterpolation });
    const ms = performance.now() - tf;
    let se = 0, n = 0;
    for (let p = 0; p < c.mask.length; p++) {
      if (c.mask[p] !== 1 || f.mask[p] !== 1 || c.folds.mask[p] === 1 || f.folds.mask[p] === 1) continue;
      se += (c.map[2 * p]! - f.map[2 * p]!) ** 2 + (c.map[2 * p + 1]! - f.map[2 * p + 1]!) ** 2;
      n++;
    }
    const key = `mesh${meshStep}${meshInterpolation[0]!.toUpperCase()}${meshInterpolation.slice(1)}`;
    fastError[key] = Math.sqrt(se / n);
    fastError[`${key}Ms`] = ms;
  }
  // Pictures.
  writePng(join(dir, 'sensor-frame.png'), normalised(sim.sensorFrame), { transfer: 'srgb' });
  writePng(join(dir, 'distorted.png'), sim.sceneImage, { transfer: 'srgb' });
  writePng(join(dir, 'corrected.png'), c.image, { transfer: 'srgb' });
  writePng(join(dir, 'truth.png'), sim.truthImage, { transfer: 'srgb' });
  let lo = Infinity, hi = -Infinity;
  for (const g of [h, truthGrid]) for (let k = 0; k < g.data.length; k++) if (r.heightMask![k]) {
    lo = Math.min(lo, g.data[k]!);
    hi = Math.max(hi, g.data[k]!);
  }
  const range = [lo, hi] as const;
  writePng(join(dir, 'height-true.png'), heightMapImage(truthGrid, { range, mask: r.heightMask!, pixelSize: 8 }).image, { transfer: 'srgb' });
  writePng(join(dir, 'height-measured.png'), heightMapImage(h, { range, mask: r.heightMask!, pixelSize: 8 }).image, { transfer: 'srgb' });
  const err = createGrid(h);
  for (let k = 0; k < err.data.length; k++) err.data[k] = h.data[k]! - he.piston - truthGrid.data[k]!;
  writePng(join(dir, 'height-error.png'), errorMapImage(err, { mask: r.heightMask!, pixelSize: 8 }).image, { transfer: 'srgb' });

  const truthName = sim.options.correction?.reference === 'none' ? 'no-water' : 'flat-water';
  const rows: Row[] = [
    { label: `PSNR vs ${truthName} truth, dB`, before: before.psnr.toFixed(2), after: after.psnr.toFixed(2), ideal: ideal.psnr.toFixed(2) },
    { label: `SSIM vs ${truthName} truth`, before: before.ssim.toFixed(3), after: after.ssim.toFixed(3), ideal: ideal.ssim.toFixed(3) },
  ];
  const report: Record<string, unknown> = {
    scenario: sim.scenario,
    simulationMs: tSim,
    simulationStagesMs: sim.timings,
    diagnostics: { ...d, warnings: d.warnings },
    surface: { rmsErrorM: he.rms, peakErrorM: he.peak, trueRmsM: trueRms, nodes: he.count, grid: { width: h.width, height: h.height, dx: h.dx } },
    image: { validPixels: mask.reduce((a, b) => a + b, 0), before, after, withTrueSurface: ideal, foldPixels: c.folds.pixels },
    fastModeMapErrorPx: fastError,
  };
  if (scenario.target.type === 'checkerboard') {
    const b = boardScores(sim.sceneImage), a = boardScores(c.image), t = boardScores(sim.truthImage), i = boardScores(ci.image);
    const fmt = (s: typeof b, k: 'spread' | 'curvature' | 'corners'): string => (s === null ? 'not found' : k === 'corners' ? String(s[k]) : k === 'spread' ? `${(s[k] * 100).toFixed(2)} %` : s[k].toExponential(2));
    rows.push({ label: 'checkerboard corners found', before: fmt(b, 'corners'), after: fmt(a, 'corners'), ideal: fmt(i, 'corners'), truth: fmt(t, 'corners') });
    rows.push({ label: 'square-size spread (rel. std)', before: fmt(b, 'spread'), after: fmt(a, 'spread'), ideal: fmt(i, 'spread'), truth: fmt(t, 'spread') });
    rows.push({ label: 'line curvature, 1/px (mean |κ|)', before: fmt(b, 'curvature'), after: fmt(a, 'curvature'), ideal: fmt(i, 'curvature'), truth: fmt(t, 'curvature') });
    report.checkerboard = { before: b, after: a, withTrueSurface: i, truth: t };
  }
  rows.push({ label: 'surface RMS error, mm', before: `${(trueRms * 1e3).toFixed(2)} (no correction)`, after: (he.rms * 1e3).toFixed(3) });
  writeFileSync(join(dir, 'report.json'), JSON.stringify(report, null, 2) + '\n');
  console.log(`\n${scenario.name}: ${scenario.description ?? ''}`);
  console.log(
    `  spots found ${d.spotsFound}, matched ${d.spotsMatched}, rejected ${d.spotsRejected}; ${d.iterations} refinement passes; ` +
      `${c.valid} corrected pixels, ${c.folds.pixels} on folds`,
  );
  const t = d.timings;
  console.log(
    `  frame time ${t.total.toFixed(0)} ms (detect ${t.detect.toFixed(0)}, match ${t.match.toFixed(0)}, reconstruct ${t.reconstruct.toFixed(0)}, surface ${t.surface.toFixed(0)}, ` +
      `correct ${(t.correctTrace + t.correctRaster + t.correctSample).toFixed(0)}); simulation ${tSim.toFixed(0)} ms`,
  );
  const w = Math.max(...rows.map((x) => x.label.length));
  const hasTruth = rows.some((x) => x.truth !== undefined);
  console.log(`  ${'score'.padEnd(w)}  ${'uncorrected'.padStart(22)}  ${'corrected'.padStart(10)}  ${'(true surf.)'.padStart(12)}${hasTruth ? '  ' + 'truth'.padStart(10) : ''}`);
  for (const x of rows) console.log(`  ${x.label.padEnd(w)}  ${x.before.padStart(22)}  ${x.after.padStart(10)}  ${(x.ideal ?? '').padStart(12)}${x.truth !== undefined ? '  ' + x.truth.padStart(10) : ''}`);
  const fm = (k: string, label: string): string => `${label} ${fastError[k]!.toFixed(3)} px (${fastError[`${k}Ms`]!.toFixed(0)} ms)`;
  console.log(`  fast mode vs exact map (off folds): quadratic ${[3, 4, 8].map((m) => fm(`mesh${m}Quadratic`, `${m} px`)).join(', ')}; linear ${fm('mesh4Linear', '4 px')}; cubic ${fm('mesh4Cubic', '4 px')}`);
  console.log(`  pictures and report.json in ${dir}/`);
  return { rows, report };
}

const t0 = performance.now();
console.log('meniscus demo: seeing through a moving water surface (invented scenarios)');
runScenario(harbourScenario());
runScenario(tankScenario());
console.log(`\ndone in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
