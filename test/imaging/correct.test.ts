import { describe, it, expect } from 'vitest';
import { createImage, MeniscusTypeError } from '../../src/core/index.js';
import type { Image } from '../../src/core/index.js';
import { PinholeCamera, createCameraPose } from '../../src/camera/index.js';
import { createGaussianSurface, createPlaneSurface, createSinusoidSurface } from '../../src/surface/index.js';
import { correctImage, prepareCorrection, renderThroughSurface } from '../../src/imaging/index.js';
import type { CorrectionResult } from '../../src/imaging/index.js';
import { detectCheckerboardCorners, lineStraightness, squareSizeSpread } from '../../src/metrics/index.js';
import { checkerboardTexture, simulateScenario, tankScenario } from '../../src/pipeline/index.js';

const N = 192;
const f = N / 2 / Math.tan((25 * Math.PI) / 180);
const camera = new PinholeCamera({ model: 'pinhole', fx: f, fy: f, cx: (N - 1) / 2, cy: (N - 1) / 2, width: N, height: N });
const pose = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, -0.4]);
const domain = { xMin: -1, xMax: 1, yMin: -1, yMax: 1 };
const flat = createPlaneSurface({ domain });
// An analytic sea: two crossing sinusoidal wave trains (amplitudes 3 and 1.5 mm).
const sea = createSinusoidSurface({
  components: [
    { amplitude: 0.003, kx: (2 * Math.PI) / 0.25, ky: (2 * Math.PI) / 0.6, phase: 0.4 },
    { amplitude: 0.0015, kx: (-2 * Math.PI) / 0.35, ky: (2 * Math.PI) / 0.2, phase: 1.3 },
  ],
  domain,
});
const Z = 1.2;

/** A two-channel texture holding its own coordinates, in texture pixels. */
function coordinateTexture(T: number): Image {
  const tex = createImage(T, T, 2);
  for (let v = 0; v < T; v++) for (let u = 0; u < T; u++) {
    tex.data[2 * (v * T + u)] = u;
    tex.data[2 * (v * T + u) + 1] = v;
  }
  return tex;
}

/**
 * RMS geometric error, in image pixels, between a corrected coordinate image and the
 * flat-water truth: the scene-coordinate difference divided by the truth's local scale
 * (scene texture pixels per image pixel, from central differences).
 */
function geometricError(c: CorrectionResult, truth: Image, truthMask: Uint8Array, skipFolds = true): { rms: number; count: number } {
  let se = 0, n = 0;
  for (let v = 1; v < N - 1; v++) for (let u = 1; u < N - 1; u++) {
    const p = v * N + u;
    if (c.mask[p] !== 1 || (skipFolds && c.folds.mask[p] === 1)) continue;
    if (!(truthMask[p] && truthMask[p - 1] && truthMask[p + 1] && truthMask[p - N] && truthMask[p + N])) continue;
    const g = (q: number, ch: number): number => truth.data[2 * q + ch]!;
    const jx = Math.hypot(g(p + 1, 0) - g(p - 1, 0), g(p + 1, 1) - g(p - 1, 1)) / 2;
    const jy = Math.hypot(g(p + N, 0) - g(p - N, 0), g(p + N, 1) - g(p - N, 1)) / 2;
    const scale = 0.5 * (jx + jy);
    const d = Math.hypot(c.image.data[2 * p]! - g(p, 0), c.image.data[2 * p + 1]! - g(p, 1)) / scale;
    se += d * d;
    n++;
  }
  return { rms: Math.sqrt(se / n), count: n };
}

describe('correctImage', () => {
  const tex = coordinateTexture(1300);
  const scene = { type: 'plane', z: Z, image: tex, dx: 0.002 } as const;
  const truthRender = renderThroughSurface(flat, camera, pose, scene);
  const truth = truthRender.image;
  const distorted = renderThroughSurface(sea, camera, pose, scene).image;

  /** RMS of the fast mode's map against the exact one, over the pixels both cover (at least 80 %). */
  const fastMapRms = (exact: CorrectionResult, meshStep: number, meshInterpolation: 'cubic' | 'linear' | 'quadratic'): number => {
    const fast = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z }, { mode: 'fast', meshStep, meshInterpolation });
    let se = 0, n = 0;
    for (let p = 0; p < N * N; p++) {
      if (exact.mask[p] !== 1 || fast.mask[p] !== 1) continue;
      se += (exact.map[2 * p]! - fast.map[2 * p]!) ** 2 + (exact.map[2 * p + 1]! - fast.map[2 * p + 1]!) ** 2;
      n++;
    }
    expect(n).toBeGreaterThan(0.8 * N * N);
    return Math.sqrt(se / n);
  };

  // Issue check: correction with the true surface of an analytic sea reproduces the
  // flat-water image to ≤ 0.1 px RMS (exact mode). The truth is the renderer's flat-water
  // image; the analytic sea is two sinusoids (exact heights and slopes).
  it('with the true analytic surface reproduces the flat-water image to ≤ 0.1 px RMS (exact mode)', () => {
    const c = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z });
    const before = geometricError({ ...c, image: distorted, mask: new Uint8Array(N * N).fill(1) }, truth, truthRender.mask, false);
    const after = geometricError(c, truth, truthRender.mask);
    expect(after.count).toBeGreaterThan(0.75 * N * N);
    expect(after.rms).toBeLessThan(0.1);
    expect(before.rms).toBeGreaterThan(3); // the sea really does distort the view
  });

  it('through flat water is the identity map', () => {
    const c = correctImage(truth, camera, pose, flat, { type: 'plane', z: Z });
    let worst = 0;
    for (let p = 0; p < N * N; p++) {
      if (c.mask[p] !== 1) continue;
      worst = Math.max(worst, Math.abs(c.map[2 * p]! - (p % N)), Math.abs(c.map[2 * p + 1]! - Math.floor(p / N)));
    }
    expect(worst).toBeLessThan(1e-4);
    expect(c.folds.pixels).toBe(0);
  });

  it("'none' reference gives the image without water (rendered with straight rays)", () => {
    const dry = renderThroughSurface(null, camera, pose, scene);
    const c = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z }, { reference: 'none' });
    // The no-water view is narrower: compare where the correction has a source.
    const e = geometricError(c, dry.image, dry.mask);
    expect(e.count).toBeGreaterThan(1000);
    expect(e.rms).toBeLessThan(0.1);
  });

  // The fast mode's map against the exact one. Linear interpolation over the mesh errs by
  // about meshStep²/8 × the map's second derivative: on this sea (distortion up to ~10 px
  // with ~60 px wavelengths) a 4 px mesh stays within 0.05 px RMS (8 px gives ~0.075).
  it('fast mode (4 px mesh) stays within 0.05 px RMS of the exact map on the analytic sea', () => {
    const exact = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z });
    expect(fastMapRms(exact, 4, 'linear')).toBeLessThan(0.05);
  });

  // The cubic fast mode (Hermite patches from traced derivatives, Newton inversion): on a
  // smooth map its error falls as meshStep⁴, so an 8 px mesh meets the 0.05 px target by
  // a wide margin where the linear mesh does not (its error, meshStep²/8 × the map's
  // second derivative, is ~0.075 px here).
  it('cubic fast mode (8 px mesh) stays within 0.005 px RMS of the exact map on the analytic sea; linear does not reach 0.05', () => {
    const exact = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z });
    const rms = (meshInterpolation: 'cubic' | 'linear'): number => fastMapRms(exact, 8, meshInterpolation);
    expect(rms('cubic')).toBeLessThan(0.005);
    expect(rms('linear')).toBeGreaterThan(0.05);
  });

  // The quadratic fast mode: the rasterised inverse gets the second-order term of the
  // inverse map, +½ Σ wᵢwⱼ·DG·Dᵢⱼ, from the forward map's second differences along the
  // mesh (no extra rays); the linear interpolation error (meshStep²/8 × the map's second
  // derivative, the standard bound for linear interpolation) then drops by an order.
  it('quadratic fast mode (8 px mesh) is within 0.01 px RMS of the exact map, over 10× better than linear', () => {
    const exact = correctImage(distorted, camera, pose, sea, { type: 'plane', z: Z });
    const rms = (meshInterpolation: 'quadratic' | 'linear'): number => fastMapRms(exact, 8, meshInterpolation);
    const q = rms('quadratic');
    expect(q).toBeLessThan(0.01);
    expect(rms('linear')).toBeGreaterThan(10 * q);
  });

  it('fast mode through flat water is the identity map, watertight (no holes, no double cover)', () => {
    for (const meshInterpolation of ['linear', 'quadratic'] as const) {
      const c = correctImage(truth, camera, pose, flat, { type: 'plane', z: Z }, { mode: 'fast', meshStep: 8, meshInterpolation });
      let worst = 0, covered = 0;
      for (let p = 0; p < N * N; p++) {
        // Every pixel but those on the mesh's left and bottom borders (the tie rule gives
        // pixel centres on those edges to the triangle beyond them, and there is none).
        if (p % N > 0 && p < N * (N - 1)) expect(c.mask[p]).toBe(1);
        if (c.mask[p] !== 1) continue;
        covered++;
        worst = Math.max(worst, Math.abs(c.map[2 * p]! - (p % N)), Math.abs(c.map[2 * p + 1]! - Math.floor(p / N)));
      }
      // The snapped rasteriser moves a vertex by at most 1/512 px.
      expect(worst).toBeLessThan(0.005);
      expect(c.folds.pixels).toBe(0);
      expect(covered).toBe((N - 1) * (N - 1));
    }
  });

  it('reuses a previous result\'s buffers when asked, with the same output', () => {
    const prep = prepareCorrection(camera, pose, { type: 'plane', z: Z }, { mode: 'fast', meshStep: 4, meshInterpolation: 'quadratic' });
    const a = prep.correct(distorted, sea);
    const ref = { image: Float32Array.from(a.image.data), map: Float32Array.from(a.map), mask: Uint8Array.from(a.mask) };
    const other = prep.correct(truth, flat);
    const b = prep.correct(distorted, sea, { reuse: other });
    expect(b.map).toBe(other.map);
    expect(b.mask).toBe(other.mask);
    expect(b.image).toBe(other.image);
    expect(Array.from(b.image.data)).toEqual(Array.from(ref.image));
    expect(Array.from(b.mask)).toEqual(Array.from(ref.mask));
    for (let p = 0; p < N * N; p++) if (ref.mask[p]) expect(b.map[2 * p]).toBe(ref.map[2 * p]);
    expect(() => prep.correct(distorted, sea, { reuse: {} as never })).toThrow(/options\.reuse/);
    // Correcting a result's own image again, with that result to reuse, leaves its image alone.
    const again = prep.correct(b.image, sea, { reuse: b });
    expect(again.image).not.toBe(b.image);
    expect(() => prep.correct(distorted, sea, { out: distorted })).toThrow(/options\.out/);
  });

  it('one-channel bilinear fast mode (sampled as it rasterises) equals the two-pass path, on an odd-sized image', () => {
    // 61 × 47 pixels: not a multiple of four, so the word-wise masking has a tail. The
    // sampled-while-rasterising path is checked against the general one, which samples
    // afterwards from the map: same mask and map, the same values up to the map's float32
    // rounding.
    const Wo = 61, Ho = 47, fo = Wo / 2 / Math.tan((25 * Math.PI) / 180);
    const cam = new PinholeCamera({ model: 'pinhole', fx: fo, fy: fo, cx: (Wo - 1) / 2, cy: (Ho - 1) / 2, width: Wo, height: Ho });
    const grey = createImage(Wo, Ho, 1);
    const two = createImage(Wo, Ho, 2);
    for (let p = 0; p < Wo * Ho; p++) {
      grey.data[p] = Math.sin(0.37 * p) * 0.5 + 0.5;
      two.data[2 * p] = grey.data[p]!;
      two.data[2 * p + 1] = 1;
    }
    const small = createPlaneSurface({ domain: { xMin: -0.08, xMax: 0.08, yMin: -0.06, yMax: 0.06 } });
    for (const surface of [sea, small]) {
      for (const meshInterpolation of ['linear', 'quadratic'] as const) {
        const prep = prepareCorrection(cam, pose, { type: 'plane', z: Z }, { mode: 'fast', meshStep: 5, meshInterpolation });
        const a = prep.correct(grey, surface);
        const b = prep.correct(two, surface);
        let ones = 0;
        for (let p = 0; p < Wo * Ho; p++) {
          expect(a.mask[p]).toBe(b.mask[p]);
          ones += a.mask[p]!;
          if (a.mask[p] === 1) {
            expect(a.map[2 * p]).toBe(b.map[2 * p]);
            // the one-pass path samples at the double position, the other at the map's
            // float32 one: apart by half a float32 ulp (below 4e-6 px under 64 px) a
            // coordinate, and neighbouring intensities differ by at most 1
            expect(Math.abs(a.image.data[p]! - b.image.data[2 * p]!)).toBeLessThan(1e-5);
          } else {
            expect(Number.isNaN(a.map[2 * p]!) && Number.isNaN(a.map[2 * p + 1]!)).toBe(true);
            expect(a.image.data[p]).toBe(0);
          }
        }
        expect(a.valid).toBe(ones);
        expect(a.valid).toBe(b.valid);
        expect(a.folds.pixels).toBe(a.folds.mask.reduce((x, v) => x + v, 0));
        if (surface === small) expect(ones).toBeLessThan(Wo * Ho); // some pixels have no source
      }
    }
  });

  it('a colour image is corrected channel by channel as a two-channel one is (same numbers)', () => {
    // Channels (A, B, A) against (A, B): the three-channel loop is written out, the
    // others share a loop over channels; both must give the same sample, bit for bit.
    const three = createImage(N, N, 3), pair = createImage(N, N, 2);
    for (let p = 0; p < N * N; p++) {
      const a = Math.cos(0.013 * p) * 0.5 + 0.5, b = (p % 7) / 7;
      three.data[3 * p] = a;
      three.data[3 * p + 1] = b;
      three.data[3 * p + 2] = a;
      pair.data[2 * p] = a;
      pair.data[2 * p + 1] = b;
    }
    for (const mode of ['exact', 'fast'] as const) {
      const prep = prepareCorrection(camera, pose, { type: 'plane', z: Z }, { mode });
      const c3 = prep.correct(three, sea), c2 = prep.correct(pair, sea);
      expect(c3.valid).toBe(c2.valid);
      expect(c3.valid).toBeGreaterThan(0.9 * N * N);
      for (let p = 0; p < N * N; p++) {
        expect(c3.image.data[3 * p]).toBe(c2.image.data[2 * p]);
        expect(c3.image.data[3 * p + 1]).toBe(c2.image.data[2 * p + 1]);
        expect(c3.image.data[3 * p + 2]).toBe(c2.image.data[2 * p]);
      }
    }
  });

  it('resolves folds deterministically and reports them', () => {
    // A strong lens-like bump focuses the rays: the map folds.
    const bump = createGaussianSurface({ bumps: [{ amplitude: 0.02, x: 0.02, y: -0.01, sigmaX: 0.03, sigmaY: 0.03 }], domain });
    const d = renderThroughSurface(bump, camera, pose, scene).image;
    const prep = prepareCorrection(camera, pose, { type: 'plane', z: Z });
    const a = prep.correct(d, bump);
    const b = prep.correct(d, bump);
    expect(a.folds.triangles).toBeGreaterThan(0);
    expect(a.folds.pixels).toBeGreaterThan(0);
    expect(Array.from(a.map.slice(0, 4000))).toEqual(Array.from(b.map.slice(0, 4000)));
    expect(a.folds.pixels).toBe(b.folds.pixels);
    expect(a.warnings.some((w) => /folds/.test(w))).toBe(true);
  });

  it('masks what the surface does not cover and says so', () => {
    const small = createPlaneSurface({ domain: { xMin: -0.05, xMax: 0.05, yMin: -0.05, yMax: 0.05 } });
    const c = correctImage(truth, camera, pose, small, { type: 'plane', z: Z });
    expect(c.valid).toBeGreaterThan(0);
    expect(c.valid).toBeLessThan(N * N / 2);
    expect(c.invalidVertices).toBeGreaterThan(0);
    expect(c.warnings.length).toBeGreaterThan(0);
  });

  it('a camera that never sees the surface gives an empty mask and a warning', () => {
    // Looking sideways (along +x), under a surface patch that lies behind it.
    const side = createCameraPose([0, 0, 1, -1, 0, 0, 0, -1, 0], [0, 0, -0.4]);
    const behind = createPlaneSurface({ domain: { xMin: -1, xMax: -0.5, yMin: -1, yMax: 1 } });
    const c = correctImage(truth, camera, side, behind, { type: 'plane', z: Z });
    expect(c.valid).toBe(0);
    expect(c.warnings[0]).toMatch(/never sees the surface/);
  });

  it('refuses an image whose size differs from the calibration', () => {
    const wrong = createImage(N + 1, N, 2);
    expect(() => correctImage(wrong, camera, pose, sea, { type: 'plane', z: Z })).toThrow(MeniscusTypeError);
    expect(() => correctImage(wrong, camera, pose, sea, { type: 'plane', z: Z })).toThrow(/distorted/);
    const prep = prepareCorrection(camera, pose, { type: 'plane', z: Z }, { mode: 'fast' });
    expect(() => prep.correct(wrong, sea)).toThrow(/prepared size/);
    expect(() => prepareCorrection(camera, pose, { type: 'plane', z: Z }, { meshStep: 4 })).toThrow(/options\.meshStep/);
  });
});

describe('checkerboard through the demo tank sea (true surface)', () => {
  // Issue check: against the uncorrected image, the corrected one cuts the square-size
  // spread and the line curvature each by ≥ 80 % on the demo sea. Scores from the metrics
  // area (checkerboard corners, square-size spread, line straightness).
  it('cuts the square-size spread and the line curvature by ≥ 80 %', () => {
    const sim = simulateScenario(tankScenario());
    const board = checkerboardTexture({ squareSize: 0.025, columns: 16, rows: 16, pixelsPerSquare: 16 });
    const scene = { type: 'plane', z: 0.6, image: board.image, x0: board.x0, y0: board.y0, dx: board.dx } as const;
    const c = correctImage(sim.sceneImage, sim.camera, sim.pose, sim.trueSurface, { type: 'plane', z: 0.6 }, { nWater: 1.333, nAir: 1.000293 });
    expect(scene.image.width).toBe(board.image.width);
    const score = (im: Image): { spread: number; curvature: number; count: number } => {
      const det = detectCheckerboardCorners(im);
      expect(det.status).toBe('ok');
      return { spread: squareSizeSpread(det).all.relativeStd, curvature: lineStraightness(det).meanAbsCurvature, count: det.count };
    };
    const before = score(sim.sceneImage);
    const after = score(c.image);
    expect(after.count).toBeGreaterThan(150);
    expect(after.spread).toBeLessThan(0.2 * before.spread);
    expect(after.curvature).toBeLessThan(0.2 * before.curvature);
  });
});
