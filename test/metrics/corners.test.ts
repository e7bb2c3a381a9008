/**
 * Corner detection against boards rendered with known corners (test/metrics/render-board.ts:
 * anti-aliased by coverage sampling, exact corner positions from the rendering geometry).
 */
import { describe, expect, it } from 'vitest';
import { createImage, createRng, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  cornerDisplacement,
  createCornerLattice,
  detectCheckerboardCorners,
  lineStraightness,
  squareSizeSpread,
} from '../../src/metrics/index.js';
import type { CheckerboardDetection } from '../../src/metrics/index.js';
import { renderBoard, tiltedHomography } from './render-board.js';
import type { BoardSpec, RenderedBoard } from './render-board.js';

const base: BoardSpec = { width: 320, height: 240, columns: 9, rows: 6, square: 24, origin: [40.3, 30.7] };

function truthLattice(r: RenderedBoard) {
  return createCornerLattice(r.columns, r.rows, r.corners);
}

/** For each found corner, (true index − detected index) of its nearest true corner: one value means consistent indexing. */
function indexOffsets(d: CheckerboardDetection, r: RenderedBoard): Set<string> {
  const out = new Set<string>();
  for (let j = 0; j < d.rows; j++) {
    for (let i = 0; i < d.columns; i++) {
      const k = j * d.columns + i;
      if (!d.found[k]) continue;
      let best = Infinity;
      let bi = -1;
      for (let t = 0; t < r.columns * r.rows; t++) {
        const e = (r.corners[2 * t]! - d.points[2 * k]!) ** 2 + (r.corners[2 * t + 1]! - d.points[2 * k + 1]!) ** 2;
        if (e < best) {
          best = e;
          bi = t;
        }
      }
      out.add(`${(bi % r.columns) - i},${Math.floor(bi / r.columns) - j}`);
    }
  }
  return out;
}

describe('detectCheckerboardCorners on undistorted boards at good contrast', () => {
  const boards: [string, BoardSpec][] = [
    ['fronto-parallel', base],
    ['fronto-parallel, other sub-pixel phase', { ...base, origin: [41.82, 29.45] }],
    ['rotated 7°', { ...base, homography: tiltedHomography(0.12, 160, 120) }],
    ['rotated −11° with perspective', { ...base, homography: tiltedHomography(-0.2, 160, 120, 0.0008, -0.0005) }],
    ['rotated 30°, small squares', { ...base, columns: 7, rows: 5, square: 16, origin: [90.5, 70.2], homography: tiltedHomography(0.52, 160, 120) }],
  ];
  for (const [name, spec] of boards) {
    it(`${name}: every corner indexed, ≤ 0.05 px RMS against the rendered truth`, () => {
      const r = renderBoard(spec);
      const d = detectCheckerboardCorners(r.image);
      expect(d.status).toBe('ok');
      expect([d.columns, d.rows, d.count]).toEqual([r.columns, r.rows, r.columns * r.rows]);
      const e = cornerDisplacement(d, truthLattice(r)); // paired by index: checks the indexing too
      expect(e.count).toBe(r.columns * r.rows);
      expect(e.rms).toBeLessThanOrEqual(0.05);
      expect(e.max).toBeLessThan(0.1);
    });
  }

  it('an RGB image gives the grey result (BT.709 luminance of equal channels)', () => {
    const g = renderBoard({ ...base, homography: tiltedHomography(0.12, 160, 120) });
    const c = renderBoard({ ...base, homography: tiltedHomography(0.12, 160, 120), channels: 3 });
    const dg = detectCheckerboardCorners(g.image);
    const dc = detectCheckerboardCorners(c.image);
    expect(dc.count).toBe(dg.count);
    for (let k = 0; k < dg.points.length; k++) expect(dc.points[k]).toBeCloseTo(dg.points[k]!, 4);
  });

  it('stays sub-pixel with noise (σ = 0.02 on a 0.8 contrast)', () => {
    const r = renderBoard({ ...base, homography: tiltedHomography(0.12, 160, 120), noise: 0.02, seed: 3 });
    const d = detectCheckerboardCorners(r.image);
    expect(d.count).toBe(54);
    expect(cornerDisplacement(d, truthLattice(r)).rms).toBeLessThan(0.08);
  });
});

describe('detectCheckerboardCorners with missing corners and distortion', () => {
  it('a blob hiding a few corners: the rest keep their indices', () => {
    const blob = { x: 150, y: 100, radius: 28, value: 0.5 };
    const r = renderBoard({ ...base, blobs: [blob] });
    const d = detectCheckerboardCorners(r.image);
    expect(d.status).toBe('ok');
    expect([d.columns, d.rows]).toEqual([9, 6]);
    const truth = truthLattice(r);
    let hidden = 0;
    for (let k = 0; k < 54; k++) {
      const dist = Math.hypot(r.corners[2 * k]! - blob.x, r.corners[2 * k + 1]! - blob.y);
      if (dist < blob.radius) {
        hidden++;
        expect(d.found[k]).toBe(0);
      } else if (dist > blob.radius + 12) expect(d.found[k]).toBe(1);
    }
    expect(hidden).toBeGreaterThanOrEqual(3);
    const e = cornerDisplacement(d, truth);
    expect(e.unmatched).toBe(0);
    expect(e.max).toBeLessThan(0.3); // paired by index: no corner carries a wrong index
  });

  it('blobs hiding the first corner and a run along the last row', () => {
    const r = renderBoard({
      ...base,
      blobs: [
        { x: 64.3, y: 54.7, radius: 9, value: 0.5 },
        { x: 184.3, y: 174.7, radius: 30, value: 0.2 },
      ],
    });
    const d = detectCheckerboardCorners(r.image);
    expect([d.columns, d.rows]).toEqual([9, 6]);
    expect(d.found[0]).toBe(0);
    expect(d.count).toBeLessThan(52);
    const e = cornerDisplacement(d, truthLattice(r));
    expect(e.unmatched).toBe(0);
    expect(e.max).toBeLessThan(0.3);
  });

  it('a board running off the image indexes its visible part consistently', () => {
    const r = renderBoard({ ...base, columns: 15, rows: 11, origin: [-50.6, -40.2], homography: tiltedHomography(0.1, 160, 120) });
    const d = detectCheckerboardCorners(r.image);
    expect(d.status).toBe('ok');
    expect(indexOffsets(d, r).size).toBe(1);
    expect(cornerDisplacement(d, r.corners).rms).toBeLessThan(0.05);
  });

  for (const [amp, lam] of [
    [2, 120],
    [3, 90],
  ] as const) {
    it(`a smooth sinusoidal warp of ${amp} px (wavelength ${lam} px) still indexes every corner`, () => {
      const r = renderBoard({ ...base, warp: { amplitude: amp, wavelength: lam, phase: 0.4 } });
      const d = detectCheckerboardCorners(r.image);
      expect([d.columns, d.rows, d.count]).toEqual([9, 6, 54]);
      const e = cornerDisplacement(d, truthLattice(r));
      expect(e.count).toBe(54);
      expect(e.rms).toBeLessThan(amp <= 2 ? 0.06 : 0.15);
    });
  }
});

/**
 * Index check against the rendered truth, allowing for the detection's origin (its (0, 0)
 * is the first column and row in which a corner was found): every found corner must sit
 * within `tol` px of the true corner at its index plus one common offset.
 */
function checkIndexing(d: CheckerboardDetection, r: RenderedBoard, tol: number): { offset: [number, number]; maxError: number } {
  const offs = indexOffsets(d, r);
  expect(offs.size).toBe(1);
  const [oi, oj] = [...offs][0]!.split(',').map(Number) as [number, number];
  let maxError = 0;
  for (let j = 0; j < d.rows; j++) {
    for (let i = 0; i < d.columns; i++) {
      const k = j * d.columns + i;
      if (!d.found[k]) continue;
      const t = (j + oj) * r.columns + (i + oi);
      maxError = Math.max(maxError, Math.hypot(d.points[2 * k]! - r.corners[2 * t]!, d.points[2 * k + 1]! - r.corners[2 * t + 1]!));
    }
  }
  expect(maxError).toBeLessThan(tol);
  return { offset: [oi, oj], maxError };
}

describe('detectCheckerboardCorners under strong smooth warps (rendered with known true corners)', () => {
  // The image-side warp displaces by a·sin(2π(·)/λ + φ): peak displacement a, peak displacement
  // gradient g = 2πa/λ (a square of side s is stretched or sheared to between (1 − g)s and
  // (1 + g)s). Squares are 24 px; λ = 120 px is 5 squares, λ = 90 px 3.75 squares.
  // 'oblique' crosses two such waves at 34° and 124° to the x axis (not separable in x and y).
  // Edge pixels use 144 sub-samples: indexing is the point here, not the last hundredth of a pixel.
  const sweep: [string, 'shear' | 'stretch' | 'oblique', number, number][] = [];
  for (const kind of ['shear', 'stretch', 'oblique'] as const) {
    for (const amp of [2, 4, 6, 8]) sweep.push([`${kind}, a = ${amp} px, λ = 120 px`, kind, amp, 120]);
    sweep.push([`${kind}, a = 6 px, λ = 90 px`, kind, 6, 90]);
  }
  for (const [name, kind, amp, lam] of sweep) {
    const g = (2 * Math.PI * amp) / lam;
    it(`${name} (g = ${g.toFixed(2)}, displacement up to ${(amp / 24).toFixed(2)} square): every corner found at its true index`, () => {
      const r = renderBoard({ ...base, ss: 144, warp: { amplitude: amp, wavelength: lam, phase: 0.4, kind } });
      const d = detectCheckerboardCorners(r.image);
      expect([d.status, d.columns, d.rows, d.count]).toEqual(['ok', 9, 6, 54]);
      // Paired by index: a corner given a neighbour's index would be ≥ 12 px off.
      const e = cornerDisplacement(d, truthLattice(r));
      expect(e.count).toBe(54);
      expect(e.max).toBeLessThan(0.6);
    });
  }

  // Beyond g ≈ 0.5 (and for waves under 3 squares long) corners go missing, but those found keep their true indices.
  const beyond: [string, 'shear' | 'stretch' | 'oblique', number, number][] = [
    ['shear, a = 8 px, λ = 90 px', 'shear', 8, 90],
    ['stretch, a = 8 px, λ = 90 px', 'stretch', 8, 90],
    ['stretch, a = 10 px, λ = 120 px', 'stretch', 10, 120],
    ['oblique, a = 10 px, λ = 90 px', 'oblique', 10, 90],
    ['shear, a = 4 px, λ = 60 px', 'shear', 4, 60],
    ['oblique, a = 6 px, λ = 60 px', 'oblique', 6, 60],
    ['stretch, a = 8 px, λ = 60 px', 'stretch', 8, 60],
  ];
  for (const [name, kind, amp, lam] of beyond) {
    const g = (2 * Math.PI * amp) / lam;
    it(`${name} (g = ${g.toFixed(2)}): corners may be missing, none carries a wrong index`, () => {
      const r = renderBoard({ ...base, ss: 144, warp: { amplitude: amp, wavelength: lam, phase: 0.4, kind } });
      const d = detectCheckerboardCorners(r.image);
      expect(d.status).toBe('ok');
      expect(d.count).toBeGreaterThanOrEqual(9);
      expect(d.columns).toBeLessThanOrEqual(9);
      expect(d.rows).toBeLessThanOrEqual(6);
      checkIndexing(d, r, 1);
      let nan = 0;
      for (let k = 0; k < d.found.length; k++) if (!d.found[k] && Number.isNaN(d.points[2 * k]!)) nan++;
      expect(nan).toBe(d.columns * d.rows - d.count); // missing corners are reported as missing
    });
  }

  it('a larger board (23 × 16 corners) under crossed waves with noise: every corner at its true index', () => {
    const r = renderBoard({
      width: 640,
      height: 480,
      columns: 23,
      rows: 16,
      square: 24,
      origin: [28.3, 30.7],
      ss: 89,
      warp: { amplitude: 10, wavelength: 150, phase: 0.4, kind: 'oblique' },
      noise: 0.03,
      seed: 5,
    });
    const d = detectCheckerboardCorners(r.image);
    expect([d.columns, d.rows, d.count]).toEqual([23, 16, 368]);
    expect(cornerDisplacement(d, truthLattice(r)).max).toBeLessThan(0.6);
  });

  it('at g = 0.42 the square-size spread and line straightness of the detected corners match those of the true corners', () => {
    for (const kind of ['stretch', 'oblique'] as const) {
      const r = renderBoard({ ...base, ss: 144, warp: { amplitude: 8, wavelength: 120, phase: 0.4, kind } });
      const d = detectCheckerboardCorners(r.image);
      expect(d.count).toBe(54);
      const t = truthLattice(r);
      const sd = squareSizeSpread(d);
      const st = squareSizeSpread(t);
      expect(st.all.std).toBeGreaterThan(3); // a strongly distorted board: squares of 24 ± several px
      // With every index right, the scores differ only through the sub-pixel error ε of the corners
      // (RMS e.rms): a side changes by at most the error of its two ends, and |std(a) − std(b)| ≤ rms(a − b),
      // so the spreads differ by at most about 2ε; a line fit's RMS distance likewise moves by at most about ε.
      // (One corner with a neighbour's index would move a side by a whole square, ≥ 12 px.)
      const e = cornerDisplacement(d, t);
      expect(e.rms).toBeLessThan(0.15);
      expect(Math.abs(sd.all.std - st.all.std)).toBeLessThanOrEqual(2 * e.rms);
      expect(Math.abs(sd.alongRows.mean - st.alongRows.mean)).toBeLessThanOrEqual(2 * e.rms);
      const ld = lineStraightness(d);
      const lt = lineStraightness(t);
      expect([ld.rows.length, ld.columns.length]).toEqual([6, 9]);
      expect(Math.abs(ld.rmsDistance - lt.rmsDistance)).toBeLessThanOrEqual(2 * e.rms);
      // 'stretch' moves corners only along the rows and columns (lines stay straight); 'oblique' bends them far above that error.
      if (kind === 'oblique') expect(lt.rmsDistance).toBeGreaterThan(10 * e.rms);
      else expect(lt.rmsDistance).toBeLessThan(1e-9);
    }
  });
});

describe('checkerboard scores on detected corners', () => {
  it('square-size spread is ~0 for a fronto-parallel board and grows with the distortion, as on the true corners', () => {
    const std: number[] = [];
    for (const amp of [0, 1, 2, 3]) {
      // A magnifying warp (squares stretched and shrunk along their own axes, as waves do).
      const r = renderBoard({ ...base, warp: { amplitude: amp, wavelength: 110, kind: 'stretch' } });
      const d = detectCheckerboardCorners(r.image);
      expect(d.count).toBe(54);
      const s = squareSizeSpread(d, { knownSize: 24 });
      std.push(s.all.std);
      expect(Math.abs(s.all.std - squareSizeSpread(truthLattice(r)).all.std)).toBeLessThan(0.02);
      if (amp === 0) {
        expect(s.all.std).toBeLessThan(0.02);
        expect(Math.abs(s.all.meanRelativeError!)).toBeLessThan(1e-3);
        // The truth itself: exactly zero spread.
        expect(squareSizeSpread(truthLattice(r)).all.std).toBeLessThan(1e-12);
      }
    }
    for (let k = 1; k < std.length; k++) expect(std[k]).toBeGreaterThan(std[k - 1]! + 0.5);
  });

  it('line straightness is ~0 for straight lines and matches a quadratic bend of known amplitude (analytic)', () => {
    const straight = detectCheckerboardCorners(renderBoard(base).image);
    const s0 = lineStraightness(straight);
    expect(s0.rmsDistance).toBeLessThan(0.03);
    expect(s0.maxAbsCurvature).toBeLessThan(2e-5);
    // Rows bent onto y = y_j + κ (x − c)², c the middle column: curvature 2κ, sagitta κ (ℓ/2)².
    const kappa = 0.0004;
    const c = 40.3 + 24 * 5;
    const r = renderBoard({ ...base, bend: { coefficient: kappa, centre: c } });
    const d = detectCheckerboardCorners(r.image);
    expect(d.count).toBe(54);
    const s = lineStraightness(d);
    expect(s.rows.length).toBe(6);
    for (const row of s.rows) {
      expect(row.curvature).toBeCloseTo(2 * kappa, 5);
      expect(row.sagitta).toBeCloseTo(kappa * (4 * 24) ** 2, 1); // ℓ = 8 squares; 3.69 px
    }
    for (const col of s.columns) expect(col.rmsDistance).toBeLessThan(0.03);
    // The same scores on the true corners (the analytic value of the rendering).
    const t = lineStraightness(truthLattice(r));
    for (const row of t.rows) expect(row.curvature).toBeCloseTo(2 * kappa, 12);
  });
});

describe('detectCheckerboardCorners without a board (a result, not an error)', () => {
  it('reports notFound for a uniform image, noise, smooth texture and a tiny image', () => {
    const flat = createImage(200, 150, 1, new Float32Array(200 * 150).fill(0.4));
    const rng = createRng(11);
    const noise = createImage(200, 150, 1, new Float32Array(200 * 150).map(() => rng.random()));
    const tex = new Float32Array(200 * 150);
    for (let v = 0; v < 150; v++) for (let u = 0; u < 200; u++) tex[v * 200 + u] = 0.5 + 0.2 * Math.sin(u / 7) * Math.cos(v / 11) + 0.1 * Math.sin((u + v) / 3);
    const texture = createImage(200, 150, 1, tex);
    const blobs = renderBoard({ ...base, columns: 1, rows: 1, origin: [-500, -500], blobs: [{ x: 100, y: 100, radius: 30, value: 0.1 }, { x: 220, y: 90, radius: 25, value: 0.2 }] });
    for (const im of [flat, noise, texture, blobs.image, createImage(8, 8, 1)]) {
      const d = detectCheckerboardCorners(im);
      expect(d.status).toBe('notFound');
      expect(d.count).toBe(0);
      expect(d.points.length).toBe(0);
    }
  });

  it('refuses bad input with the library error', () => {
    expect(() => detectCheckerboardCorners({ width: 4, height: 4, channels: 1, data: new Float32Array(3) })).toThrow(MeniscusTypeError);
    const im = createImage(20, 20, 1);
    expect(() => detectCheckerboardCorners(im, { sigma: -1 })).toThrow(MeniscusRangeError);
    expect(() => detectCheckerboardCorners(im, { threshold: 2 })).toThrow(MeniscusRangeError);
    expect(() => detectCheckerboardCorners(im, { minCorners: 1 })).toThrow(MeniscusRangeError);
    expect(() => detectCheckerboardCorners(createImage(20, 20, 1, new Float32Array(400).fill(NaN)))).toThrow(MeniscusRangeError);
  });
});
