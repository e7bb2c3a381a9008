import { describe, expect, it } from 'vitest';
import { createGrid, MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  integrate,
  integrateDctPoisson,
  integrateFrankotChellappa,
  integrateLeastSquares,
  integrabilityMap,
  prepareIntegrator,
  prepareLeastSquares,
  slopeResidual,
} from '../../src/integrate/index.js';
import { allFinite, peaks, sample } from './fixtures.js';

const s = sample(peaks, 8, 6, 0.5, 0.5, -2, -1.5);
const spec = { width: 8, height: 6, dx: 0.5 };

describe('bad input gets a clear error (common practice: fail at the boundary, name the parameter)', () => {
  it('shape mismatch between p and q', () => {
    const q = createGrid({ width: 7, height: 6, dx: 0.5 });
    for (const f of [integrateFrankotChellappa, integrateDctPoisson, integrateLeastSquares]) {
      expect(() => f(s.p, q)).toThrow(MeniscusTypeError);
      expect(() => f(s.p, q)).toThrow(/q must be a grid of 8×6 samples/);
    }
  });

  it('spacing mismatch between p and q', () => {
    const q = createGrid({ width: 8, height: 6, dx: 0.4 }, s.q.data);
    expect(() => integrateDctPoisson(s.p, q)).toThrow(MeniscusRangeError);
  });

  it('NaN where no mask says so', () => {
    const p = createGrid(s.p, s.p.data.slice());
    p.data[5] = NaN;
    for (const f of [integrateFrankotChellappa, integrateDctPoisson, integrateLeastSquares]) {
      expect(() => f(p, s.q)).toThrow(/p\.data\[5\] must be a finite number/);
    }
    const mask = new Uint8Array(48).fill(1);
    expect(() => integrateLeastSquares(p, s.q, { mask })).toThrow(/p\.data\[5\] must be a finite number where the mask is 1/);
    mask[5] = 0;
    const r = integrateLeastSquares(p, s.q, { mask });
    expect(allFinite(r.height.data)).toBe(true);
    expect(r.height.data[5]).toBe(0);
  });

  it('a mask with no valid sample', () => {
    expect(() => integrateLeastSquares(s.p, s.q, { mask: new Uint8Array(48) })).toThrow(/at least one valid/);
    expect(() => prepareLeastSquares(spec, { mask: new Uint8Array(48) })).toThrow(MeniscusRangeError);
  });

  it('a mask of the wrong size or with values other than 0 and 1', () => {
    expect(() => integrateLeastSquares(s.p, s.q, { mask: new Uint8Array(47) })).toThrow(MeniscusTypeError);
    const m = new Uint8Array(48).fill(1);
    m[3] = 2;
    expect(() => integrateLeastSquares(s.p, s.q, { mask: m })).toThrow(/options\.mask\[3\]/);
  });

  it('weights that are zero everywhere, negative, or NaN', () => {
    const zero = createGrid(s.p);
    expect(() => integrateLeastSquares(s.p, s.q, { weights: zero })).toThrow(/all weights are zero/);
    const neg = createGrid(s.p, new Float64Array(48).fill(1));
    neg.data[7] = -1;
    expect(() => integrateLeastSquares(s.p, s.q, { weights: neg })).toThrow(/weights\.data\[7\]/);
    neg.data[7] = NaN;
    expect(() => integrateLeastSquares(s.p, s.q, { weights: neg })).toThrow(MeniscusRangeError);
  });

  it('known heights outside the grid, outside the mask, duplicated or non-finite', () => {
    const mask = new Uint8Array(48).fill(1);
    mask[0] = 0;
    expect(() => integrateLeastSquares(s.p, s.q, { knownHeights: [{ i: 8, j: 0, height: 1 }] })).toThrow(/knownHeights\[0\]\.i/);
    expect(() => integrateLeastSquares(s.p, s.q, { mask, knownHeights: [{ i: 0, j: 0, height: 1 }] })).toThrow(/inside the mask/);
    expect(() =>
      integrateLeastSquares(s.p, s.q, { knownHeights: [{ i: 1, j: 1, height: 1 }, { i: 1, j: 1, height: 2 }] }),
    ).toThrow(/not already listed/);
    expect(() => integrateLeastSquares(s.p, s.q, { knownHeights: [{ i: 1, j: 1, height: NaN }] })).toThrow(MeniscusRangeError);
    expect(() => integrateLeastSquares(s.p, s.q, { knownHeights: [{ i: 1, j: 1, height: 0, weight: 0 }] })).toThrow(/weight/);
  });

  it('bad solver options', () => {
    expect(() => integrateLeastSquares(s.p, s.q, { tolerance: 0 })).toThrow(/options\.tolerance/);
    expect(() => integrateLeastSquares(s.p, s.q, { tolerance: NaN })).toThrow(/options\.tolerance/);
    expect(() => integrateLeastSquares(s.p, s.q, { maxIterations: 1.5 })).toThrow(/options\.maxIterations/);
    expect(() => integrateLeastSquares(s.p, s.q, { smoothness: -1 })).toThrow(/options\.smoothness/);
    expect(() => integrateLeastSquares(s.p, s.q, { robust: 'cauchy' as never })).toThrow(/options\.robust\.loss/);
    expect(() => integrateLeastSquares(s.p, s.q, { onProgress: 3 as never })).toThrow(/options\.onProgress/);
    expect(() => integrateDctPoisson(s.p, s.q, { out: new Float64Array(3) })).toThrow(/options\.out/);
  });

  it('front door: an unknown method, or an option the method cannot honour', () => {
    expect(() => integrate(s.p, s.q, { method: 'magic' as never })).toThrow(MeniscusRangeError);
    expect(() => integrate(s.p, s.q, { method: 'dct-poisson', mask: new Uint8Array(48).fill(1) })).toThrow(
      /options\.mask must be undefined: method 'dct-poisson' does not use it/,
    );
    expect(() => integrate(s.p, s.q, { method: 'frankot-chellappa', weights: s.p })).toThrow(MeniscusTypeError);
    expect(() => prepareIntegrator(spec, { method: 'dct-poisson', warmStart: true })).toThrow(/warmStart/);
    expect(() => prepareIntegrator(spec, { method: 'least-squares', out: new Float64Array(48) } as never)).toThrow(/per frame/);
  });

  it('prepared solvers refuse frames of another size or spacing', () => {
    const other = sample(peaks, 9, 6, 0.5);
    for (const method of ['frankot-chellappa', 'dct-poisson', 'least-squares'] as const) {
      const solver = prepareIntegrator(spec, { method });
      expect(() => solver.solve(other.p, other.q)).toThrow(MeniscusTypeError);
      const spaced = sample(peaks, 8, 6, 0.25);
      expect(() => solver.solve(spaced.p, spaced.q)).toThrow(/prepared spacing/);
    }
  });

  it('diagnostics refuse grids too small for a cell and heights of the wrong size', () => {
    const tiny = sample(peaks, 1, 5, 0.5);
    expect(() => integrabilityMap(tiny.p, tiny.q)).toThrow(/at least 2 × 2/);
    expect(() => slopeResidual(tiny.h, s.p, s.q)).toThrow(MeniscusTypeError);
  });
});

describe('documented results for degenerate but legal input (never a silent NaN)', () => {
  it('a mask piece of one pixel is its own piece with height 0', () => {
    const mask = new Uint8Array(48).fill(1);
    // isolate sample (6, 4): clear its four neighbours
    for (const k of [4 * 8 + 5, 4 * 8 + 7, 3 * 8 + 6, 5 * 8 + 6]) mask[k] = 0;
    const r = integrateLeastSquares(s.p, s.q, { mask });
    const lone = r.pieces.find((pc) => pc.label === r.labels[4 * 8 + 6])!;
    expect(lone.samples).toBe(1);
    expect(lone.piston).toBe(0);
    expect(r.height.data[4 * 8 + 6]).toBe(0);
    expect(allFinite(r.height.data)).toBe(true);
  });

  it('a single-sample grid integrates to 0 with every method of this module', () => {
    const one = sample(peaks, 1, 1, 1);
    for (const method of ['frankot-chellappa', 'dct-poisson', 'least-squares'] as const) {
      const r = integrate(one.p, one.q, { method });
      expect(r.height.data[0]).toBe(0);
      expect(r.rmsResidual).toBe(0);
    }
  });

  it('a zero-weight region takes its heights from the neighbouring slopes', () => {
    const w = createGrid(s.p, new Float64Array(48).fill(1));
    w.data[2 * 8 + 3] = 0;
    w.data[2 * 8 + 4] = 0;
    const r = integrateLeastSquares(s.p, s.q, { weights: w });
    expect(r.pieces.length).toBe(1);
    expect(allFinite(r.height.data)).toBe(true);
  });

  it('zero slopes give a flat zero surface', () => {
    const z = createGrid(spec);
    for (const method of ['frankot-chellappa', 'dct-poisson', 'least-squares'] as const) {
      const r = integrate(z, z, { method });
      expect(r.height.data.every((v) => v === 0)).toBe(true);
      expect(r.converged).toBe(true);
    }
  });
});
