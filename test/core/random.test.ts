import { describe, expect, it } from 'vitest';
import { createRng, MeniscusRangeError, Rng } from '../../src/core/index.js';

describe('Rng (xoshiro128**)', () => {
  // Reference outputs of xoshiro128** started from the state {1, 2, 3, 4}, from the
  // authors' reference C implementation (Blackman & Vigna, xoshiro128starstar.c) —
  // from memory, and verified here by stepping the published recurrence by hand:
  // out = rotl(s1 * 5, 7) * 9; t = s1 << 9; s2 ^= s0; s3 ^= s1; s1 ^= s2; s0 ^= s3;
  // s2 ^= t; s3 = rotl(s3, 11).
  it('reproduces the reference stream from state {1, 2, 3, 4}', () => {
    const r = new Rng(1, 2, 3, 4);
    expect([r.nextUint32(), r.nextUint32(), r.nextUint32()]).toEqual([11520, 0, 5927040]);
  });

  it('gives bit-identical streams for equal seeds and different ones for different seeds', () => {
    const a = createRng(42);
    const b = createRng(42);
    const c = createRng(43);
    const xa = Array.from({ length: 100 }, () => a.random());
    const xb = Array.from({ length: 100 }, () => b.random());
    const xc = Array.from({ length: 100 }, () => c.random());
    expect(xa).toEqual(xb);
    expect(xa).not.toEqual(xc);
  });

  it('draws uniforms in [0, 1) with the moments of U(0, 1)', () => {
    const r = createRng(1);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    let min = 1;
    let max = 0;
    for (let k = 0; k < n; k++) {
      const u = r.random();
      s += u;
      s2 += u * u;
      min = Math.min(min, u);
      max = Math.max(max, u);
    }
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    // mean 1/2 and variance 1/12 (analytic), within ~5 standard errors
    expect(Math.abs(s / n - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(s2 / n - (s / n) ** 2 - 1 / 12)).toBeLessThan(0.002);
  });

  it('draws normals with mean 0, variance 1 and the Gaussian fourth moment 3', () => {
    const r = createRng(9);
    const n = 200_000;
    let s = 0;
    let s2 = 0;
    let s4 = 0;
    for (let k = 0; k < n; k++) {
      const z = r.normal();
      s += z;
      s2 += z * z;
      s4 += z ** 4;
    }
    expect(Math.abs(s / n)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.02);
    expect(Math.abs(s4 / n - 3)).toBeLessThan(0.1);
  });

  it('draws unbiased integers in [0, n)', () => {
    const r = createRng(5);
    const counts = new Array(6).fill(0);
    for (let k = 0; k < 60_000; k++) counts[r.integer(6)]++;
    for (const c of counts) expect(Math.abs(c - 10_000)).toBeLessThan(500);
  });

  it('refuses a non-finite seed and an all-zero state', () => {
    expect(() => createRng(NaN)).toThrow(MeniscusRangeError);
    expect(() => new Rng(0, 0, 0, 0)).toThrow(/state/);
  });
});
