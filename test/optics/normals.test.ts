import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError, Status, createRng } from '../../src/core/index.js';
import type { Mat3, MutableVec3, Rng, Vec3 } from '../../src/core/index.js';
import {
  normalCovarianceFromSlopes,
  normalFromRays,
  normalFromRaysBatch,
  normalFromRaysWithCovariance,
  normalFromSlopes,
  normalsFromSlopesBatch,
  refract,
  slopeCovarianceFromNormal,
  slopesFromNormal,
  slopesFromNormalsBatch,
} from '../../src/optics/index.js';
import type { SlopeCovariance } from '../../src/optics/index.js';
import { FC, angle, anyDirection, dot, expectError, incidentAt, index, perpendicular, unit, unitVec } from './helpers.js';

const distinctIndices = fc
  .tuple(index, index)
  .filter(([a, b]) => Math.abs(a - b) > 1e-3);

describe('normalFromRays: laws for all inputs (fast-check)', () => {
  it('refract then solve the normal returns the normal, oriented against the incident ray', () => {
    fc.assert(
      fc.property(anyDirection, unitVec, distinctIndices, (i, n0, [n1, n2]) => {
        const t = refract(i, n0, n1, n2);
        if (t === null) return;
        const n = normalFromRays(i, t, n1, n2);
        expect(n).not.toBeNull();
        const want = dot(i, n0) > 0 ? ([-n0[0], -n0[1], -n0[2]] as const) : n0;
        if (dot(i, n0) === 0) return; // tangent ray: orientation undefined
        expect(angle(n!, want)).toBeLessThan(1e-11);
        expect(dot(n!, i)).toBeLessThan(0);
      }),
      FC,
    );
  });

  it('for any pair of directions: either inconsistent, or refracting with the solved normal gives the refracted ray back', () => {
    fc.assert(
      fc.property(unitVec, unitVec, distinctIndices, (i, t, [n1, n2]) => {
        const n = normalFromRays(i, t, n1, n2);
        if (n === null) return;
        const back = refract(i, n, n1, n2);
        expect(back).not.toBeNull();
        expect(angle(back!, t)).toBeLessThan(1e-9);
      }),
      FC,
    );
  });

  it('a deviation larger than the media allow is inconsistent, a smaller one is not (analytic limit θc − … )', () => {
    // air → water: the largest deviation is 90° − θc, reached at grazing incidence
    fc.assert(
      fc.property(unitVec, fc.double({ min: 1.05, max: 2, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (i, nw, u) => {
        const dMax = Math.PI / 2 - Math.asin(1 / nw);
        const d = u * Math.PI;
        if (Math.abs(d - dMax) < 1e-9) return;
        const e = perpendicular(i);
        const t: MutableVec3 = [Math.cos(d) * i[0] + Math.sin(d) * e[0], Math.cos(d) * i[1] + Math.sin(d) * e[1], Math.cos(d) * i[2] + Math.sin(d) * e[2]];
        // the same deviation in both directions of travel: air → water and water → air
        const down = normalFromRays(i, t, 1, nw);
        const up = normalFromRays(t, i, nw, 1);
        if (d > dMax) {
          expect(down).toBeNull();
          expect(up).toBeNull();
        } else if (d > 0) {
          expect(down).not.toBeNull();
          expect(up).not.toBeNull();
        }
      }),
      FC,
    );
  });
});

describe('normalFromRays: examples', () => {
  it('normal incidence: the normal is the reversed ray (Snell: no bend at normal incidence)', () => {
    expect(normalFromRays([0, 0, -3], [0, 0, -1], 1, 1.333)!.map((v) => v + 0)).toEqual([0, 0, 1]);
    expect(normalFromRays([0, 0, 1], [0, 0, 1], 1.333, 1)!.map((v) => v + 0)).toEqual([0, 0, -1]);
  });

  it('rays on opposite sides, and a deviation beyond the largest the media allow, are inconsistent', () => {
    // reflected-looking pair: the second ray goes back up
    expect(normalFromRays([0.5, 0, -0.8], [0.5, 0, 0.8], 1, 1.333)).toBeNull();
    // air → water bends a ray by at most 90° − θc ≈ 41.4° (Snell at grazing incidence): 60° is impossible
    const i: Vec3 = [0, 0, -1];
    const t: Vec3 = [Math.sin(Math.PI / 3), 0, -Math.cos(Math.PI / 3)];
    expect(normalFromRays(i, t, 1, 1.333)).toBeNull();
    // 40° is possible: near-grazing incidence on a steep facet, and the normal refracts i into t
    const t40: Vec3 = [Math.sin((40 * Math.PI) / 180), 0, -Math.cos((40 * Math.PI) / 180)];
    const n = normalFromRays(i, t40, 1, 1.333)!;
    expect(angle(refract(i, n, 1, 1.333)!, t40)).toBeLessThan(1e-12);
  });
});

describe('normalFromRaysBatch', () => {
  it('agrees with the single form pair by pair; inconsistent pairs get (0, 0, 0)', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(anyDirection, anyDirection), { minLength: 1, maxLength: 20 }), distinctIndices, (pairs, [n1, n2]) => {
        const inc = new Float64Array(pairs.flatMap((p) => p[0]));
        const ref = new Float64Array(pairs.flatMap((p) => p[1]));
        const incCopy = inc.slice();
        const refCopy = ref.slice();
        const { normals, status } = normalFromRaysBatch(inc, ref, n1, n2);
        pairs.forEach(([i, t], r) => {
          const n = normalFromRays(i, t, n1, n2);
          const got = Array.from(normals.subarray(3 * r, 3 * r + 3));
          if (n === null) {
            expect(status[r]).toBe(Status.inconsistent);
            expect(got).toEqual([0, 0, 0]);
          } else {
            expect(status[r]).toBe(Status.ok);
            for (let k = 0; k < 3; k++) expect(Math.abs(got[k]! - n[k]!)).toBeLessThan(1e-14);
          }
        });
        expect(Array.from(inc)).toEqual(Array.from(incCopy));
        expect(Array.from(ref)).toEqual(Array.from(refCopy));
      }),
      { seed: 42, numRuns: 100 },
    );
  });

  it('handles very small and very large vectors without under- or overflow', () => {
    // the same pair of directions at lengths whose squares under- and overflow
    const t = refract([0.3, 0, -1], [0, 0, 1], 1, 1.333)!;
    const inc = new Float64Array([3e-201, 0, -1e-200, 3e199, 0, -1e200]);
    const ref = new Float64Array([t[0] * 1e-250, t[1] * 1e-250, t[2] * 1e-250, t[0] * 1e250, t[1] * 1e250, t[2] * 1e250]);
    const { normals, status } = normalFromRaysBatch(inc, ref, 1, 1.333);
    const want = normalFromRays([0.3, 0, -1], t, 1, 1.333)!;
    for (let r = 0; r < 2; r++) {
      expect(status[r]).toBe(Status.ok);
      for (let k = 0; k < 3; k++) expect(normals[3 * r + k]).toBeCloseTo(want[k]!, 14);
    }
  });

  it('bad input: mismatched lengths, bad vectors, equal indices, wrong buffers', () => {
    const a = new Float64Array([0, 0, -1, 0.1, 0, -1]);
    const b = new Float64Array([0, 0, -1, 0.08, 0, -1]);
    expectError(() => normalFromRaysBatch(a, b.subarray(0, 3), 1, 1.333), MeniscusTypeError, 'refracted');
    expectError(() => normalFromRaysBatch(a, new Float64Array([0, 0, -1, 0, 0, 0]), 1, 1.333), MeniscusRangeError, 'refracted[3..5]');
    expectError(() => normalFromRaysBatch(new Float64Array([0, 0, -1, 0, NaN, 1]), b, 1, 1.333), MeniscusRangeError, 'incident[3..5]');
    expectError(() => normalFromRaysBatch(a, b, 1.333, 1.333), MeniscusRangeError, 'n2');
    expectError(() => normalFromRaysBatch(a, b, -1, 1.333), MeniscusRangeError, 'n1');
    expectError(() => normalFromRaysBatch(a, b, 1, 1.333, { out: new Float64Array(3) }), MeniscusTypeError, 'options.out');
    expectError(() => normalFromRaysBatch(a, b, 1, 1.333, { status: new Uint8Array(1) }), MeniscusTypeError, 'options.status');
    expectError(() => normalFromRays([0, 0, 0], [0, 0, 1], 1, 1.333), MeniscusRangeError, 'incident');
    expectError(() => normalFromRays([0, 0, 1], [0, Infinity, 1], 1, 1.333), MeniscusRangeError, 'refracted');
    expectError(() => normalFromRays([0, 0, 1], [0, 0, 1], 1, 1), MeniscusRangeError, 'n2');
  });
});

/** Cholesky factor (lower) of a symmetric positive-definite 3 × 3 matrix. */
function cholesky(m: ArrayLike<number>): number[] {
  const l = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j <= i; j++) {
      let s = m[i * 3 + j]!;
      for (let k = 0; k < j; k++) s -= l[i * 3 + k]! * l[j * 3 + k]!;
      l[i * 3 + j] = i === j ? Math.sqrt(s) : s / l[j * 3 + j]!;
    }
  }
  return l;
}

function randomSpd(rng: Rng, scale: number): Mat3 {
  const a = Array.from({ length: 9 }, () => rng.normal());
  const m = new Array<number>(9);
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += a[i * 3 + k]! * a[j * 3 + k]!;
      m[i * 3 + j] = scale * (s + (i === j ? 0.2 : 0));
    }
  }
  return m as unknown as Mat3;
}

function draw(rng: Rng, mean: Vec3, l: number[]): MutableVec3 {
  const z = [rng.normal(), rng.normal(), rng.normal()];
  return [
    mean[0] + l[0]! * z[0]!,
    mean[1] + l[3]! * z[0]! + l[4]! * z[1]!,
    mean[2] + l[6]! * z[0]! + l[7]! * z[1]! + l[8]! * z[2]!,
  ];
}

function frobenius(a: ArrayLike<number>): number {
  let s = 0;
  for (let k = 0; k < a.length; k++) s += a[k]! * a[k]!;
  return Math.sqrt(s);
}

describe('covariance propagation agrees with a Monte Carlo estimate (seeded core Rng)', () => {
  // Sampling error of a covariance estimate from N draws is about √(2/N) relative
  // (≈ 1 % at N = 20 000); the first-order (linear) propagation adds O(σ) ≈ 0.1 %.
  // The tolerance, 5 %, is about five standard errors.
  const N = 20000;

  it('normal from a ray pair, several geometries and random full-rank covariances of the raw vectors', () => {
    const rng = createRng(2024);
    const cases: [Vec3, Vec3, number, number][] = [
      [[0.3, 0.1, -1], [0.05, 0.1, 1], 1.000293, 1.333],
      [[0.6, -0.2, -0.7], [-0.1, 0.2, 1], 1, 1.34],
      [[0.2, 0.1, 1], [0, 0.3, -1], 1.333, 1],
    ];
    for (const [i0, n0, n1, n2] of cases) {
      const t0 = refract(i0, n0, n1, n2)!;
      const si = randomSpd(rng, 1e-7);
      const st = randomSpd(rng, 1e-7);
      const res = normalFromRaysWithCovariance(i0, t0, n1, n2, si, st)!;
      expect(res).not.toBeNull();
      expect(angle(res.normal, dot(i0, n0) < 0 ? n0 : [-n0[0], -n0[1], -n0[2]])).toBeLessThan(1e-12);
      const li = cholesky(si);
      const lt = cholesky(st);
      const samples: MutableVec3[] = [];
      for (let s = 0; s < N; s++) {
        const n = normalFromRays(draw(rng, i0, li), draw(rng, t0, lt), n1, n2);
        expect(n).not.toBeNull();
        samples.push(n!);
      }
      const mean = [0, 1, 2].map((k) => samples.reduce((a, v) => a + v[k]!, 0) / N);
      const cov = new Array<number>(9).fill(0);
      for (const v of samples) for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) cov[a * 3 + b]! += ((v[a]! - mean[a]!) * (v[b]! - mean[b]!)) / (N - 1);
      const diff = cov.map((c, k) => c - res.covariance[k]!);
      expect(frobenius(diff) / frobenius(res.covariance)).toBeLessThan(0.05);
      // a unit normal cannot vary along itself: N Σ Nᵀ = 0 (analytic)
      const nv = res.normal;
      let q = 0;
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) q += nv[a]! * res.covariance[a * 3 + b]! * nv[b]!;
      expect(Math.abs(q)).toBeLessThan(1e-12 * frobenius(res.covariance) + 1e-30);
    }
  });

  it('slopes from a normal and a normal from slopes', () => {
    const rng = createRng(77);
    const p = 0.3;
    const q = -0.15;
    const sp: SlopeCovariance = [4e-6, 1e-6, 1e-6, 2e-6];
    // slopes → normal
    const cn = normalCovarianceFromSlopes(p, q, sp);
    const l2 = [Math.sqrt(sp[0]), 0, sp[1] / Math.sqrt(sp[0])];
    const l22 = Math.sqrt(sp[3] - l2[2]! * l2[2]!);
    const ns: MutableVec3[] = [];
    for (let s = 0; s < N; s++) {
      const z0 = rng.normal();
      const z1 = rng.normal();
      ns.push(normalFromSlopes(p + l2[0]! * z0, q + l2[2]! * z0 + l22 * z1));
    }
    const mean = [0, 1, 2].map((k) => ns.reduce((a, v) => a + v[k]!, 0) / N);
    const cov = new Array<number>(9).fill(0);
    for (const v of ns) for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) cov[a * 3 + b]! += ((v[a]! - mean[a]!) * (v[b]! - mean[b]!)) / (N - 1);
    expect(frobenius(cov.map((c, k) => c - cn[k]!)) / frobenius(cn)).toBeLessThan(0.05);
    // normal → slopes, with a tangent-plane covariance as a solver returns it
    const n0 = normalFromSlopes(p, q);
    const back = slopeCovarianceFromNormal(n0, cn)!;
    for (let k = 0; k < 4; k++) expect(back[k]).toBeCloseTo(sp[k]!, 15); // the two Jacobians invert each other on the tangent plane
    const cs = slopeCovarianceFromNormal(n0, randomSpd(rng, 1e-6))!;
    const sn = randomSpd(rng, 1e-6);
    const csn = slopeCovarianceFromNormal(n0, sn)!;
    const ln = cholesky(sn);
    const ps: [number, number][] = [];
    for (let s = 0; s < N; s++) ps.push(slopesFromNormal(draw(rng, n0, ln))!);
    const mp = ps.reduce((a, v) => a + v[0], 0) / N;
    const mq = ps.reduce((a, v) => a + v[1], 0) / N;
    const c2: [number, number, number, number] = [0, 0, 0, 0];
    for (const [a, b] of ps) {
      c2[0] += ((a - mp) * (a - mp)) / (N - 1);
      c2[1] += ((a - mp) * (b - mq)) / (N - 1);
      c2[3] += ((b - mq) * (b - mq)) / (N - 1);
    }
    c2[2] = c2[1];
    expect(frobenius(c2.map((c, k) => c - csn[k]!)) / frobenius(csn)).toBeLessThan(0.05);
    expect(cs[1]).toBe(cs[2]);
  });
});

describe('normals and slopes', () => {
  it('DESIGN convention n = (−p, −q, 1)/√(1 + p² + q²) round-trips for all slopes (fast-check)', () => {
    fc.assert(
      fc.property(fc.double({ min: -50, max: 50, noNaN: true }), fc.double({ min: -50, max: 50, noNaN: true }), (p, q) => {
        const n = normalFromSlopes(p, q);
        expect(Math.hypot(...n)).toBeCloseTo(1, 14);
        expect(n[2]).toBeGreaterThan(0);
        const s = slopesFromNormal(n)!;
        expect(Math.abs(s[0] - p)).toBeLessThan(1e-12 * (1 + Math.abs(p)));
        expect(Math.abs(s[1] - q)).toBeLessThan(1e-12 * (1 + Math.abs(q)));
        const down = slopesFromNormal([-n[0], -n[1], -n[2]])!;
        expect(down[0]).toBeCloseTo(s[0], 12);
      }),
      FC,
    );
  });

  it('batch conversions agree with the single ones; vertical facets are flagged, not NaN', () => {
    const normals = new Float64Array([-0.1, 0.2, 1, 0.3, 0, -2, 1, 0, 0]);
    const { slopes, status } = slopesFromNormalsBatch(normals);
    expect(Array.from(status)).toEqual([Status.ok, Status.ok, Status.inconsistent]);
    expect(slopes[0]).toBeCloseTo(0.1, 15);
    expect(slopes[1]).toBeCloseTo(-0.2, 15);
    expect(slopes[2]).toBeCloseTo(0.15, 15);
    expect(Array.from(slopes.subarray(4))).toEqual([0, 0]);
    expect(slopesFromNormal([1, 0, 0])).toBeNull();
    const back = normalsFromSlopesBatch(slopes.subarray(0, 4));
    const want = normalFromSlopes(0.1, -0.2);
    for (let k = 0; k < 3; k++) expect(back[k]).toBeCloseTo(want[k]!, 15);
    expect(back[5]).toBeLessThan(1); // second normal was pointing down; the upward one is returned
    expect(back[5]).toBeGreaterThan(0);
  });

  it('bad input names the parameter and mutates nothing', () => {
    const cov = [1, 0, 0, 0, 1, 0, 0, 0, 1];
    const covCopy = [...cov];
    expectError(() => slopesFromNormal([0, 0, 0]), MeniscusRangeError, 'normal');
    expectError(() => normalFromSlopes(NaN, 0), MeniscusRangeError, 'p');
    expectError(() => normalFromSlopes(0, Infinity), MeniscusRangeError, 'q');
    expectError(() => slopesFromNormalsBatch(new Float64Array(4)), MeniscusTypeError, 'normals');
    expectError(() => slopesFromNormalsBatch(new Float64Array([0, 0, 0])), MeniscusRangeError, 'normals[0..2]');
    expectError(() => normalsFromSlopesBatch(new Float64Array([0, NaN])), MeniscusRangeError, 'slopes[0..1]');
    expectError(() => normalsFromSlopesBatch(new Float64Array(3)), MeniscusTypeError, 'slopes');
    expectError(() => slopeCovarianceFromNormal([0, 0, 1], [1, 2, 0, 0, 1, 0, 0, 0, 1] as unknown as Mat3), MeniscusRangeError, 'normalCovariance');
    expectError(() => slopeCovarianceFromNormal([0, 0, 1], [1, 0, 0, 0, -1, 0, 0, 0, 1] as unknown as Mat3), MeniscusRangeError, 'normalCovariance');
    expectError(() => slopeCovarianceFromNormal([0, 0, 1], [1, 0, 0] as unknown as Mat3), MeniscusTypeError, 'normalCovariance');
    expectError(() => normalCovarianceFromSlopes(0, 0, [1, 0, 0, NaN] as unknown as SlopeCovariance), MeniscusRangeError, 'slopeCovariance');
    expectError(
      () => normalFromRaysWithCovariance([0, 0, -1], [0, 0, -1], 1, 1.333, cov as unknown as Mat3, [1, 0, 0, 0, 1, 0, 0, 0, NaN] as unknown as Mat3),
      MeniscusRangeError,
      'refractedCovariance',
    );
    normalFromRaysWithCovariance([0, 0, -1], [0, 0, -1], 1, 1.333, cov as unknown as Mat3, cov as unknown as Mat3);
    expect(cov).toEqual(covCopy);
    expect(normalFromRaysWithCovariance([0.5, 0, -0.8], [0.5, 0, 0.8], 1, 1.333, cov as unknown as Mat3, cov as unknown as Mat3)).toBeNull();
  });

  it('normal-incidence covariance example: diag((n1² + n2²)/(n2 − n1)² σ²) in the tangent plane (hand computation)', () => {
    const s = 1e-6;
    const iso: Mat3 = [s, 0, 0, 0, s, 0, 0, 0, s];
    const r = normalFromRaysWithCovariance([0, 0, -1], [0, 0, -1], 1, 1.333, iso, iso)!;
    const want = ((1 + 1.333 ** 2) / 0.333 ** 2) * s;
    expect(r.covariance[0]).toBeCloseTo(want, 15);
    expect(r.covariance[4]).toBeCloseTo(want, 15);
    expect(r.covariance[8]).toBe(0);
    expect(unit(r.normal).map((v) => v + 0)).toEqual([0, 0, 1]);
  });
});
