import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createRng, Status } from '../../src/core/index.js';
import { createApertureArray, matchSpots } from '../../src/sensor/index.js';
import type { LatticeKind, SpotReference } from '../../src/sensor/index.js';

/** A reference whose flat-water spots sit on the apertures themselves (vertical light, parallel plane). */
function latticeReference(lattice: LatticeKind, columns: number, rows: number, pitch = 1): SpotReference {
  const apertures = createApertureArray({ lattice, pitch, columns, rows, apertureDiameter: pitch / 10 });
  const x = new Float64Array(apertures.count), y = new Float64Array(apertures.count);
  for (let k = 0; k < apertures.count; k++) {
    x[k] = apertures.positions[2 * k]!;
    y[k] = apertures.positions[2 * k + 1]!;
  }
  return { apertures, x, y, status: new Uint8Array(apertures.count) };
}

interface Scene {
  x: Float64Array;
  y: Float64Array;
  /** True aperture of each spot, −1 for a spurious one. */
  truth: Int32Array;
  present: number;
}

/**
 * Spots displaced by a smooth field: the gradient of a sum of three long-crested waves
 * (wavelengths 20 to 40 pitches), scaled so that the largest shift is `amplitude`
 * pitches; a fraction of the spots removed, and spurious spots added at least 0.4 pitch
 * from every true spot position (closer, a glint is indistinguishable by position alone
 * from the missing spot whose place it takes).
 */
function scene(ref: SpotReference, seed: number, amplitude: number, missing: number, spurious: number): Scene {
  const rng = createRng(seed);
  const n = ref.apertures.count;
  const waves = [0, 1, 2].map(() => {
    const lambda = rng.uniform(20, 40);
    const th = rng.uniform(0, 2 * Math.PI);
    return { kx: (2 * Math.PI * Math.cos(th)) / lambda, ky: (2 * Math.PI * Math.sin(th)) / lambda, a: rng.uniform(0.3, 1), ph: rng.uniform(0, 2 * Math.PI) };
  });
  const dx = new Float64Array(n), dy = new Float64Array(n);
  let dmax = 0;
  for (let k = 0; k < n; k++) {
    for (const w of waves) {
      const s = -w.a * Math.sin(w.kx * ref.x[k]! + w.ky * ref.y[k]! + w.ph);
      dx[k]! += s * w.kx;
      dy[k]! += s * w.ky;
    }
    dmax = Math.max(dmax, Math.hypot(dx[k]!, dy[k]!));
  }
  const f = amplitude / dmax;
  const tx = new Float64Array(n), ty = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    tx[k] = ref.x[k]! + f * dx[k]!;
    ty[k] = ref.y[k]! + f * dy[k]!;
  }
  const xs: number[] = [], ys: number[] = [], tr: number[] = [];
  for (let k = 0; k < n; k++) {
    if (rng.random() < missing) continue;
    xs.push(tx[k]!);
    ys.push(ty[k]!);
    tr.push(k);
  }
  const present = xs.length;
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (let k = 0; k < n; k++) {
    x0 = Math.min(x0, tx[k]!);
    x1 = Math.max(x1, tx[k]!);
    y0 = Math.min(y0, ty[k]!);
    y1 = Math.max(y1, ty[k]!);
  }
  const want = Math.round(spurious * n);
  let added = 0, tries = 0;
  while (added < want && tries++ < 100000) {
    const px = rng.uniform(x0 - 1, x1 + 1), py = rng.uniform(y0 - 1, y1 + 1);
    let ok = true;
    for (let k = 0; k < n && ok; k++) if (Math.hypot(px - tx[k]!, py - ty[k]!) < 0.4) ok = false;
    if (!ok) continue;
    xs.push(px);
    ys.push(py);
    tr.push(-1);
    added++;
  }
  // Shuffle, so that the order of the spots tells nothing.
  const idx = xs.map((_, k) => k);
  for (let k = idx.length - 1; k > 0; k--) {
    const r = rng.integer(k + 1);
    [idx[k], idx[r]] = [idx[r]!, idx[k]!];
  }
  return {
    x: Float64Array.from(idx.map((k) => xs[k]!)),
    y: Float64Array.from(idx.map((k) => ys[k]!)),
    truth: Int32Array.from(idx.map((k) => tr[k]!)),
    present,
  };
}

function wrongPairs(m: ReturnType<typeof matchSpots>, sc: Scene): number {
  let wrong = 0;
  for (let a = 0; a < m.spotOfAperture.length; a++) {
    const s = m.spotOfAperture[a]!;
    if (s >= 0 && sc.truth[s] !== a) wrong++;
  }
  return wrong;
}

describe('matchSpots', () => {
  it('grow: no aperture is paired with a wrong spot under smooth shifts up to 1.5 pitch, 5 % missing, 2 % spurious (property; the identifiability limits are common practice)', () => {
    fc.assert(
      fc.property(fc.constantFrom<LatticeKind>('square', 'hexagonal'), fc.integer({ min: 1, max: 1e9 }), fc.double({ min: 0.2, max: 1.5, noNaN: true }), (lattice, seed, amp) => {
        const ref = latticeReference(lattice, 24, 24);
        const sc = scene(ref, seed, amp, 0.05, 0.02);
        const m = matchSpots(sc, ref, { method: 'grow' });
        expect(wrongPairs(m, sc)).toBe(0);
        // Not a vacuous pass: most of the spots that exist are paired.
        expect(m.matched).toBeGreaterThan(0.9 * sc.present);
      }),
      { seed: 42, numRuns: 200 },
    );
  });

  it('nearest: every spot paired when shifts stay below 0.4 pitch, and none wrongly (property)', () => {
    fc.assert(
      fc.property(fc.constantFrom<LatticeKind>('square', 'hexagonal'), fc.integer({ min: 1, max: 1e9 }), (lattice, seed) => {
        const ref = latticeReference(lattice, 16, 16);
        const sc = scene(ref, seed, 0.4, 0, 0);
        const m = matchSpots(sc, ref, { method: 'nearest' });
        expect(wrongPairs(m, sc)).toBe(0);
        expect(m.matched).toBe(ref.apertures.count);
      }),
      { seed: 42, numRuns: 50 },
    );
  });

  it('nearest: a shift beyond half a pitch is never silently paired with the neighbour (flagged or paired to the right spot)', () => {
    const ref = latticeReference('square', 8, 8);
    // Uniform shift of 0.7 pitch: nearest pairing would take the neighbour's spot.
    const x = ref.x.map((v) => v + 0.7), y = ref.y.slice();
    const m = matchSpots({ x, y }, ref, { method: 'nearest' });
    // Each matched aperture a got the spot of aperture a − 1 (index order): nearest
    // matching cannot know better, which is why 'grow' exists.
    const g = matchSpots({ x, y }, ref, { method: 'grow' });
    let wrong = 0;
    for (let a = 0; a < 64; a++) if (g.spotOfAperture[a]! >= 0 && g.spotOfAperture[a] !== a) wrong++;
    expect(wrong).toBe(0);
    expect(g.matched).toBe(64);
    expect(m.matched).toBeGreaterThan(0);
  });

  it('two spots in one cell make the aperture ambiguous, not paired', () => {
    const ref = latticeReference('square', 6, 6);
    const x = Float64Array.from([...ref.x, ref.x[14]! + 0.1]);
    const y = Float64Array.from([...ref.y, ref.y[14]! - 0.1]);
    for (const method of ['nearest', 'grow'] as const) {
      const m = matchSpots({ x, y }, ref, { method });
      expect(m.apertureStatus[14]).toBe(Status.ambiguous);
      expect(m.spotOfAperture[14]).toBe(-1);
      expect(m.matched).toBe(35);
    }
  });

  it('a spot far from the lattice is an extra; a missing spot leaves its aperture unmatched', () => {
    const ref = latticeReference('hexagonal', 10, 10);
    const keep = Array.from({ length: 100 }, (_, k) => k).filter((k) => k !== 55);
    const x = Float64Array.from([...keep.map((k) => ref.x[k]!), 30]);
    const y = Float64Array.from([...keep.map((k) => ref.y[k]!), 30]);
    for (const method of ['nearest', 'grow'] as const) {
      const m = matchSpots({ x, y }, ref, { method });
      expect(m.apertureStatus[55]).toBe(Status.unmatched);
      expect(m.spotStatus[99]).toBe(Status.unmatched);
      expect(m.matched).toBe(99);
      expect(m.extra).toBe(1);
      expect(m.missing).toBe(1);
    }
  });

  it('empty input gives an all-unmatched result; bad input throws', () => {
    const ref = latticeReference('square', 4, 4);
    const m = matchSpots({ x: new Float64Array(0), y: new Float64Array(0) }, ref);
    expect(m.matched).toBe(0);
    expect(m.missing).toBe(16);
    expect(() => matchSpots({ x: new Float64Array(2), y: new Float64Array(3) }, ref)).toThrow(/spots\.y/);
    expect(() => matchSpots({ x: Float64Array.of(NaN), y: Float64Array.of(0) }, ref)).toThrow(/finite/);
    expect(() => matchSpots({ x: new Float64Array(1), y: new Float64Array(1) }, ref, { acceptRadius: 0.7 })).toThrow(/acceptRadius/);
  });
});
