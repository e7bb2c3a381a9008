import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import type { MutableVec3, Vec3 } from '../../src/core/index.js';
import { criticalAngle, reflect, reflectBatch, refract, refractBatch } from '../../src/optics/index.js';
import { FC, angle, anyDirection, cross, dot, expectError, incidentAt, index, norm, perpendicular, unit, unitVec } from './helpers.js';

/**
 * `refract` as defined in the Khronos OpenGL Shading Language specification (built-in
 * geometric functions), transcribed literally: I and N unit, N facing I, eta = n1/n2.
 *   k = 1.0 - eta * eta * (1.0 - dot(N, I) * dot(N, I));
 *   if (k < 0.0) R = genType(0.0); else R = eta * I - (eta * dot(N, I) + sqrt(k)) * N;
 */
function glslRefract(I: Vec3, N: Vec3, eta: number): MutableVec3 {
  const d = dot(N, I);
  const k = 1.0 - eta * eta * (1.0 - d * d);
  if (k < 0.0) return [0, 0, 0];
  const s = eta * d + Math.sqrt(k);
  return [eta * I[0] - s * N[0], eta * I[1] - s * N[1], eta * I[2] - s * N[2]];
}

describe('refract: outside references', () => {
  it('GLSL refract worked ray (Khronos GLSL definition; values computed from it in the project references): i = (1,−1)/√2, n = (0,1), η = 0.9', () => {
    // 2-D ray embedded in the x–z plane
    const i: Vec3 = [Math.SQRT1_2, 0, -Math.SQRT1_2];
    const t = refract(i, [0, 0, 1], 0.9, 1)!;
    expect(t[0]).toBeCloseTo(0.636396103067893, 14);
    expect(t[1]).toBe(0);
    expect(t[2]).toBeCloseTo(-0.771362431027076, 14);
    // and equal to the literal transcription of the specification
    const g = glslRefract(i, [0, 0, 1], 0.9);
    for (let k = 0; k < 3; k++) expect(t[k]).toBeCloseTo(g[k]!, 15);
  });

  it('equals the GLSL definition for every ray and normal facing it, and with the normal flipped (Khronos GLSL spec)', () => {
    fc.assert(
      fc.property(unitVec, unitVec, index, index, (i, n0, n1, n2) => {
        const n: Vec3 = dot(i, n0) < 0 ? n0 : [-n0[0], -n0[1], -n0[2]];
        const eta = n1 / n2;
        const g = glslRefract(i, n, eta);
        const a = refract(i, n, n1, n2);
        const b = refract(i, [-n[0], -n[1], -n[2]], n1, n2);
        if (g[0] === 0 && g[1] === 0 && g[2] === 0) {
          expect(a).toBeNull();
          expect(b).toBeNull();
        } else {
          for (let k = 0; k < 3; k++) {
            expect(Math.abs(a![k]! - g[k]!)).toBeLessThan(1e-14);
            expect(b![k]).toBe(a![k]);
          }
        }
      }),
      FC,
    );
  });

  it('sunlight 30° from zenith into water (Snell law evaluated by hand): sin θt = 1.000293·0.5/1.333', () => {
    const t = refract([0.5, 0, -Math.sqrt(3) / 2], [0, 0, 1], 1.000293, 1.333)!;
    const thetaT = Math.atan2(Math.hypot(t[0], t[1]), -t[2]);
    expect(Math.sin(thetaT)).toBeCloseTo((1.000293 * 0.5) / 1.333, 14);
  });
});

describe('refract: laws for all inputs (fast-check)', () => {
  it("Snell's law n1 sin θ1 = n2 sin θ2, unit result, plane of incidence, far side", () => {
    fc.assert(
      fc.property(anyDirection, anyDirection, index, index, (i0, nn, n1, n2) => {
        const t = refract(i0, nn, n1, n2);
        const i = unit(i0);
        const n = unit(nn);
        const sin1 = norm(cross(i, n));
        if (t === null) {
          // TIR: only when n1 sin θ1 > n2
          expect(n1 * sin1).toBeGreaterThan(n2 * (1 - 1e-12));
          return;
        }
        expect(Math.abs(norm(t) - 1)).toBeLessThan(1e-14);
        const sin2 = norm(cross(t, n));
        expect(Math.abs(n1 * sin1 - n2 * sin2)).toBeLessThan(1e-13);
        // coplanar with i and n: the triple product vanishes
        expect(Math.abs(dot(cross(i, n), t))).toBeLessThan(1e-14);
        // continues to the far side
        // (a refracted ray exactly at grazing, at the critical angle, has a zero normal part)
        if (dot(i, n) !== 0) expect(dot(t, n) * Math.sign(dot(i, n))).toBeGreaterThanOrEqual(-1e-15); // one rounding
        // the tangential part keeps its direction (the ray does not cross over the normal)
        const it = [i[0] - dot(i, n) * n[0], i[1] - dot(i, n) * n[1], i[2] - dot(i, n) * n[2]] as const;
        const tt = [t[0] - dot(t, n) * n[0], t[1] - dot(t, n) * n[1], t[2] - dot(t, n) * n[2]] as const;
        expect(dot(it, tt)).toBeGreaterThanOrEqual(-1e-15);
      }),
      FC,
    );
  });

  it('total internal reflection exactly beyond the critical angle', () => {
    fc.assert(
      fc.property(unitVec, fc.double({ min: 1.01, max: 2.5, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (n, ratio, u) => {
        const n2 = 1;
        const n1 = ratio;
        const tc = criticalAngle(n1, n2)!;
        const e = perpendicular(n);
        const theta = u * (Math.PI / 2);
        if (Math.abs(theta - tc) < 1e-9) return;
        const t = refract(incidentAt(n, e, theta), n, n1, n2);
        if (theta > tc) expect(t).toBeNull();
        else expect(t).not.toBeNull();
      }),
      FC,
    );
  });

  it('never TIR from the rarer into the denser medium', () => {
    fc.assert(
      fc.property(anyDirection, anyDirection, index, fc.double({ min: 0, max: 1.5, noNaN: true }), (i, n, n1, d) => {
        expect(refract(i, n, n1, n1 + d)).not.toBeNull();
      }),
      FC,
    );
  });
});

describe('refractBatch', () => {
  it('agrees with refract ray by ray, per-ray and shared normals; TIR rays carry the reflected direction', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(anyDirection, anyDirection), { minLength: 1, maxLength: 20 }), index, index, (pairs, n1, n2) => {
        const inc = new Float64Array(pairs.flatMap((p) => p[0]));
        const nor = new Float64Array(pairs.flatMap((p) => p[1]));
        const { directions, status } = refractBatch(inc, nor, n1, n2);
        const shared = refractBatch(inc, nor.subarray(0, 3), n1, n2);
        pairs.forEach(([i, n], r) => {
          const t = refract(i, n, n1, n2);
          const ts = refract(i, pairs[0]![1], n1, n2);
          const got = Array.from(directions.subarray(3 * r, 3 * r + 3));
          const gotS = Array.from(shared.directions.subarray(3 * r, 3 * r + 3));
          if (t === null) {
            expect(status[r]).toBe(Status.tir);
            const rf = reflect(i, n);
            for (let k = 0; k < 3; k++) expect(Math.abs(got[k]! - rf[k]!)).toBeLessThan(1e-14);
          } else {
            expect(status[r]).toBe(Status.ok);
            for (let k = 0; k < 3; k++) expect(Math.abs(got[k]! - t[k]!)).toBeLessThan(1e-14);
          }
          if (ts === null) expect(shared.status[r]).toBe(Status.tir);
          else for (let k = 0; k < 3; k++) expect(Math.abs(gotS[k]! - ts[k]!)).toBeLessThan(1e-14);
          for (const v of got) expect(Number.isFinite(v)).toBe(true);
        });
      }),
      { seed: 42, numRuns: 100 },
    );
  });

  it('writes into out and status buffers, also in place, and handles an empty batch', () => {
    const inc = new Float64Array([0, 0, -2, 3, 0, -4]);
    const out = new Float64Array(6);
    const st = new Uint8Array(2).fill(99);
    const r = refractBatch(inc, new Float64Array([0, 0, 1]), 1, 1.333, { out, status: st });
    expect(r.directions).toBe(out);
    expect(r.status).toBe(st);
    expect(Array.from(st)).toEqual([Status.ok, Status.ok]);
    const copy = inc.slice();
    refractBatch(copy, new Float64Array([0, 0, 1]), 1, 1.333, { out: copy });
    expect(Array.from(copy)).toEqual(Array.from(out));
    const empty = refractBatch(new Float64Array(0), new Float64Array(0), 1, 1.333);
    expect(empty.directions.length).toBe(0);
    expect(empty.status.length).toBe(0);
  });

  it('handles very small and very large vectors without under- or overflow', () => {
    const inc = new Float64Array([1e-200, 0, -1e-200, 1e200, 0, -1e200]);
    const a = refractBatch(inc, new Float64Array([0, 0, 1e-300, 0, 0, 1e300]), 1, 1.333);
    const want = refract([1, 0, -1], [0, 0, 1], 1, 1.333)!;
    for (let r = 0; r < 2; r++) for (let k = 0; k < 3; k++) expect(a.directions[3 * r + k]).toBeCloseTo(want[k]!, 14);
  });
});

describe('reflect', () => {
  it('law of reflection for all inputs (fast-check): equal angles, coplanar, back to the incident side, involution', () => {
    fc.assert(
      fc.property(anyDirection, anyDirection, (i0, nn) => {
        const r = reflect(i0, nn);
        const i = unit(i0);
        const n = unit(nn);
        expect(Math.abs(norm(r) - 1)).toBeLessThan(1e-14);
        expect(Math.abs(dot(r, n) + dot(i, n))).toBeLessThan(1e-14);
        expect(Math.abs(dot(cross(i, n), r))).toBeLessThan(1e-14);
        const back = reflect(r, nn);
        for (let k = 0; k < 3; k++) expect(Math.abs(back[k]! - i[k]!)).toBeLessThan(1e-14);
        const flipped = reflect(i0, [-nn[0], -nn[1], -nn[2]]);
        for (let k = 0; k < 3; k++) expect(Math.abs(flipped[k]! - r[k]!)).toBeLessThan(1e-15);
        expect(angle(r, n) + angle(i, n)).toBeCloseTo(Math.PI, 12);
      }),
      FC,
    );
  });

  it('reflectBatch agrees with reflect', () => {
    const inc = new Float64Array([1, 0, -1, 0.3, -0.2, -0.9, 0, 0, -1]);
    const nor = new Float64Array([0, 0, 1, 0.1, 0.1, 1, 0, 0, -5]);
    const out = reflectBatch(inc, nor);
    for (let r = 0; r < 3; r++) {
      const want = reflect([inc[3 * r]!, inc[3 * r + 1]!, inc[3 * r + 2]!], [nor[3 * r]!, nor[3 * r + 1]!, nor[3 * r + 2]!]);
      for (let k = 0; k < 3; k++) expect(out[3 * r + k]).toBeCloseTo(want[k]!, 15);
    }
    const shared = reflectBatch(inc, new Float64Array([0, 0, 2]));
    expect(Array.from(shared.subarray(0, 3)).map((v) => +v.toFixed(12))).toEqual([0.707106781187, 0, 0.707106781187]);
  });
});

describe('refraction: bad input gets a clear error and nothing is mutated', () => {
  it('single-ray functions', () => {
    const i: Vec3 = [1, 0, -1];
    const n: Vec3 = [0, 0, 1];
    expectError(() => refract([0, 0, 0], n, 1, 1.33), MeniscusRangeError, 'incident');
    expectError(() => refract(i, [0, 0, 0], 1, 1.33), MeniscusRangeError, 'normal');
    expectError(() => refract([NaN, 0, 1], n, 1, 1.33), MeniscusRangeError, 'incident');
    expectError(() => refract(i, [0, Infinity, 1], 1, 1.33), MeniscusRangeError, 'normal');
    expectError(() => refract([1, 0] as unknown as Vec3, n, 1, 1.33), MeniscusTypeError, 'incident');
    expectError(() => refract(i, n, 0, 1.33), MeniscusRangeError, 'n1');
    expectError(() => refract(i, n, 1, -1.33), MeniscusRangeError, 'n2');
    expectError(() => refract(i, n, 1, NaN), MeniscusRangeError, 'n2');
    expectError(() => reflect(i, [0, 0, 0]), MeniscusRangeError, 'normal');
    const iCopy = [...i];
    const nCopy = [...n];
    refract(i, n, 1, 1.33);
    reflect(i, n);
    expect([...i]).toEqual(iCopy);
    expect([...n]).toEqual(nCopy);
  });

  it('batch functions: mismatched lengths, wrong types, bad vectors, bad buffers; inputs untouched', () => {
    const inc = new Float64Array([0, 0, -1, 0.5, 0, -1]);
    const nor = new Float64Array([0, 0, 1, 0, 0, 1]);
    const incCopy = inc.slice();
    const norCopy = nor.slice();
    expectError(() => refractBatch(inc, new Float64Array(9), 1, 1.33), MeniscusTypeError, 'normals');
    expectError(() => refractBatch(new Float64Array(4), nor, 1, 1.33), MeniscusTypeError, 'incident');
    expectError(() => refractBatch([0, 0, -1] as unknown as Float64Array, nor, 1, 1.33), MeniscusTypeError, 'incident');
    expectError(() => refractBatch(inc, nor, 1, 0), MeniscusRangeError, 'n2');
    expectError(() => refractBatch(inc, nor, 1, 1.33, { out: new Float64Array(5) }), MeniscusTypeError, 'options.out');
    expectError(() => refractBatch(inc, nor, 1, 1.33, { status: new Uint8Array(3) }), MeniscusTypeError, 'options.status');
    expectError(() => refractBatch(inc, nor, 1, 1.33, { status: new Float64Array(2) as unknown as Uint8Array }), MeniscusTypeError, 'options.status');
    expectError(() => refractBatch(inc, new Float64Array([0, 0, 1, 0, 0, 0]), 1, 1.33), MeniscusRangeError, 'normals[3..5]');
    expectError(() => refractBatch(new Float64Array([0, 0, -1, NaN, 0, -1]), nor, 1, 1.33), MeniscusRangeError, 'incident[3..5]');
    expectError(() => refractBatch(inc, new Float64Array([0, 0, 0]), 1, 1.33), MeniscusRangeError, 'normals');
    expectError(() => reflectBatch(inc, new Float64Array(12)), MeniscusTypeError, 'normals');
    expectError(() => reflectBatch(new Float64Array([Infinity, 0, 0]), nor.subarray(0, 3)), MeniscusRangeError, 'incident[0..2]');
    expect(Array.from(inc)).toEqual(Array.from(incCopy));
    expect(Array.from(nor)).toEqual(Array.from(norCopy));
  });
});
