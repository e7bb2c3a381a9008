/**
 * Valid-but-degenerate inputs for the important functions (grazing and zero-length
 * geometry, one-sample grids, empty masks, blank frames, singular homographies, the poles,
 * broken files), and "one wrong argument" variants of valid calls: every call must return
 * a documented result or throw the library's error naming the parameter. Fixed seeds.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createGrid, createImage, createMask, isMeniscusError } from '../../src/core/index.js';
import { refract, refractBatch } from '../../src/optics/index.js';
import { INTEGRATION_METHODS, integrate, integrateScattered } from '../../src/integrate/index.js';
import { createGaussianSurface, createPlaneSurface, intersectSurface } from '../../src/surface/index.js';
import { detectSpots } from '../../src/sensor/index.js';
import { applyHomography, fitHomography, invertHomography, FisheyeCamera, OrthographicCamera, PinholeCamera } from '../../src/camera/index.js';
import { sunPosition } from '../../src/sun/index.js';
import { decodeNpy, decodePng, encodeNpy, encodePng } from '../../src/node/index.js';
import { documentsNonFinite } from './exports.js';
import { describeArgs, judgeCall, type CallPolicy } from './harness.js';
import { junk } from './junk.js';

const SEED = 7;
const RUNS = 150;

/** Run the cases; collect distinct defects. */
function survive(label: string, f: Function, arb: fc.Arbitrary<unknown[]>, policy: CallPolicy = {}, runs = RUNS, thisArg?: unknown): string[] {
  const out = new Map<string, string>();
  for (const args of fc.sample(arb, { seed: SEED, numRuns: runs })) {
    const shown = describeArgs(args);
    const o = judgeCall(label, f, args, { timeLimitMs: 2000, ...policy }, false, thisArg);
    if (o.kind === 'defect') {
      const key = o.why!.replace(/\d+/g, 'N').slice(0, 80);
      if (!out.has(key)) out.set(key, `${label}(${shown.slice(0, 300)}) → ${o.why}`);
    }
  }
  return [...out.values()];
}

/** The valid arguments with one replaced by junk, for every position. */
function oneWrong(valid: fc.Arbitrary<unknown[]>): fc.Arbitrary<unknown[]> {
  return fc.tuple(valid, fc.nat(), junk).map(([a, k, j]) => {
    const b = [...a];
    b[k % Math.max(1, b.length)] = j;
    return b;
  });
}

const tiny = fc.constantFrom(1e-300, 5e-324, 1e-12);
const comp = fc.oneof(fc.double({ min: -1, max: 1, noNaN: true }), tiny, fc.constantFrom(0, -0, 1e150, -1e150));
const vec = fc.tuple(comp, comp, comp);
const index = fc.oneof(fc.double({ min: 1, max: 2.5, noNaN: true }), fc.constantFrom(1, 1.000293, 1.333, 1e-6, 1e6));

describe('fuzz: degenerate geometry and sizes', () => {
  it('refract: grazing, parallel, tiny and huge vectors, equal and extreme indices', () => {
    const arb = fc.oneof(
      fc.tuple(vec, vec, index, index),
      fc.tuple(fc.constant([1, 0, 0]), fc.constant([0, 0, 1]), index, index), // grazing
      fc.tuple(fc.constant([0, 0, -1]), fc.constant([0, 0, 1]), index, index), // along the normal
    );
    const defects = survive('refract', refract, arb);
    // a result is a unit vector
    for (const [i, n, n1, n2] of fc.sample(arb, { seed: SEED, numRuns: 200 })) {
      try {
        const r = refract(i as never, n as never, n1 as number, n2 as number);
        if (r !== null && Math.abs(Math.hypot(...r) - 1) > 1e-9) defects.push(`refract(${describeArgs([i, n, n1, n2])}) not unit: ${r}`);
      } catch (e) {
        if (!isMeniscusError(e)) defects.push(String(e));
      }
    }
    defects.push(...survive('refract', refract, oneWrong(fc.tuple(vec, vec, index, index))));
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('refractBatch: empty, one ray, zero-length rays, mismatched lengths', () => {
    const packed = fc.array(comp, { maxLength: 12 }).map((a) => Float64Array.from(a.slice(0, a.length - (a.length % 3))));
    const arb = fc.oneof(
      fc.tuple(packed, packed, index, index),
      fc.tuple(fc.constant(new Float64Array(0)), fc.constant(new Float64Array(0)), index, index),
      fc.tuple(fc.constant(new Float64Array(3)), fc.constant(Float64Array.of(0, 0, 1)), index, index),
    );
    const defects = [
      ...survive('refractBatch', refractBatch, arb, { nonFiniteOk: documentsNonFinite('refractBatch') }),
      ...survive('refractBatch', refractBatch, oneWrong(arb), { nonFiniteOk: documentsNonFinite('refractBatch') }),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('integrate (every method) and integrateScattered: one-sample and one-row grids, empty masks, huge slopes', () => {
    const sizes = fc.constantFrom([1, 1], [1, 5], [5, 1], [2, 2], [3, 4]);
    const slope = fc.constantFrom(0, 1e-300, 1, 1e150, -1e150);
    const maskKind = fc.constantFrom('none', 'empty', 'one', 'checker');
    const arb = fc.tuple(sizes, slope, maskKind, fc.constantFrom(...INTEGRATION_METHODS)).map(([[w, h], s, mk, method]) => {
      const p = createGrid({ width: w, height: h, dx: 0.01 }, new Float64Array(w * h).fill(s));
      const q = createGrid({ width: w, height: h, dx: 0.01 }, new Float64Array(w * h).fill(-s));
      const mask = mk === 'none' ? undefined : createMask(w, h, mk === 'empty' ? 0 : 1);
      if (mask && mk === 'one') mask.fill(0)[0] = 1;
      if (mask && mk === 'checker') mask.forEach((_, k) => (mask[k] = (k + Math.floor(k / w)) % 2));
      return [p, q, mask === undefined ? { method } : { method, mask }];
    });
    const defects = survive('integrate', integrate, arb, { nonFiniteOk: documentsNonFinite('integrate') }, 200);
    defects.push(...survive('integrate', integrate, oneWrong(arb), { nonFiniteOk: documentsNonFinite('integrate') }, 200));
    const pts = fc.array(fc.tuple(fc.double({ min: -0.1, max: 0.2, noNaN: true }), fc.double({ min: -0.1, max: 0.2, noNaN: true })), { maxLength: 6 });
    const scattered = fc.tuple(pts, fc.boolean(), sizes).map(([xy, same, [w, h]]) => {
      const n = xy.length;
      const x = Float64Array.from(xy, (v) => (same ? 0.01 : v[0]));
      const y = Float64Array.from(xy, (v) => (same ? 0.01 : v[1]));
      return [{ x, y, p: new Float64Array(n).fill(0.1), q: new Float64Array(n) }, { width: w, height: h, dx: 0.01 }];
    });
    defects.push(...survive('integrateScattered', integrateScattered, scattered, { nonFiniteOk: documentsNonFinite('integrateScattered') }));
    defects.push(...survive('integrateScattered', integrateScattered, oneWrong(scattered), { nonFiniteOk: documentsNonFinite('integrateScattered') }));
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('intersectSurface: rays parallel to the surface, starting on it, pointing away, from far away', () => {
    const plane = createPlaneSurface({ domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } });
    const bump = createGaussianSurface({ bumps: [{ amplitude: 0.01, x: 0, y: 0, sigmaX: 0.05 }], domain: { xMin: -1, xMax: 1, yMin: -1, yMax: 1 } });
    const origin = fc.oneof(vec, fc.constantFrom([0, 0, 0], [0, 0, 1], [1e12, 0, 1], [0.5, 0.5, 0.01]));
    const dir = fc.oneof(vec, fc.constantFrom([1, 0, 0], [0, 0, 1], [0, 0, -1], [1, 0, -1e-12]));
    const arb = fc.tuple(fc.constantFrom(plane, bump), origin, dir);
    const defects = [
      ...survive('intersectSurface', intersectSurface, arb, { nonFiniteOk: documentsNonFinite('intersectSurface') }),
      ...survive('intersectSurface', intersectSurface, oneWrong(arb), { nonFiniteOk: documentsNonFinite('intersectSurface') }),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('detectSpots: blank, constant, single-pixel, saturated and 1×1 frames', () => {
    const frame = fc.tuple(fc.constantFrom([1, 1], [1, 9], [9, 1], [8, 8], [16, 12]), fc.constantFrom('zero', 'const', 'dot', 'max', 'noise')).map(([[w, h], kind]) => {
      const im = createImage(w, h, 1);
      if (kind === 'const') im.data.fill(0.5);
      if (kind === 'dot') im.data[Math.floor((w * h) / 2)] = 1;
      if (kind === 'max') im.data.fill(3.4e38);
      if (kind === 'noise') im.data.forEach((_, k) => (im.data[k] = ((k * 7919) % 13) / 13));
      return [im];
    });
    const withOptions = fc.tuple(frame, fc.constantFrom(undefined, { method: 'gaussian' }, { threshold: 0 }, { threshold: 1e30 })).map(([[im], o]) => (o === undefined ? [im] : [im, o]));
    const defects = [
      ...survive('detectSpots', detectSpots, withOptions, { nonFiniteOk: documentsNonFinite('detectSpots') }),
      ...survive('detectSpots', detectSpots, oneWrong(withOptions), { nonFiniteOk: documentsNonFinite('detectSpots') }),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('camera project / unproject: the centre, behind the camera, far away, strong distortion', () => {
    const cams = [
      new PinholeCamera({ model: 'pinhole', fx: 500, fy: 500, cx: 320, cy: 240, k1: -0.9, k2: 0.5, width: 640, height: 480 }),
      new PinholeCamera({ model: 'pinhole', fx: 500, fy: 500, cx: 320, cy: 240 }),
      new FisheyeCamera({ model: 'fisheye', fx: 200, fy: 200, cx: 320, cy: 320, k1: 0.1, k2: -0.05 }),
      new OrthographicCamera({ model: 'orthographic', fx: 1000, fy: 1000, cx: 0, cy: 0 }),
    ];
    const point = fc.oneof(vec, fc.constantFrom([0, 0, 0], [0, 0, -1], [1, 0, 0], [1e300, 1e300, 1], [0, 0, 1e-300]));
    const pixel = fc.oneof(
      fc.tuple(fc.double({ min: -1e4, max: 1e4, noNaN: true }), fc.double({ min: -1e4, max: 1e4, noNaN: true })),
      fc.constantFrom([320, 240], [1e300, 0], [-1e12, 1e12]),
    );
    const defects: string[] = [];
    for (const cam of cams) {
      const name = cam.constructor.name;
      defects.push(...survive(`${name}.project`, cam.project, point.map((p) => [p]), { nonFiniteOk: documentsNonFinite('project') }, 120, cam));
      defects.push(...survive(`${name}.unproject`, cam.unproject, pixel.map((p) => [p]), { nonFiniteOk: documentsNonFinite('unproject') }, 120, cam));
      defects.push(...survive(`${name}.project`, cam.project, junk.map((p) => [p]), {}, 60, cam));
      defects.push(...survive(`${name}.unproject`, cam.unproject, junk.map((p) => [p]), {}, 60, cam));
    }
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('homography: collinear and repeated points, exactly four points, singular matrices', () => {
    const pts = fc.oneof(
      fc.array(fc.double({ min: -1e3, max: 1e3, noNaN: true }), { minLength: 8, maxLength: 16 }),
      fc.constantFrom([0, 0, 1, 1, 2, 2, 3, 3], [1, 1, 1, 1, 1, 1, 1, 1], [0, 0, 1, 0, 0, 1, 1, 1], [0, 0, 1e300, 0, 0, 1e300, 1e300, 1e300]),
    );
    const pair = fc.tuple(pts, pts).map(([a, b]) => {
      const n = 2 * Math.floor(Math.min(a.length, b.length) / 2);
      return [Float64Array.from(a.slice(0, n)), Float64Array.from(b.slice(0, n))];
    });
    const withRansac = fc.tuple(pair, fc.constantFrom(undefined, { ransac: { threshold: 1, seed: 3 } })).map(([a, o]) => (o ? [...a, o] : a));
    const mat = fc.oneof(
      fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 9, maxLength: 9 }),
      fc.constantFrom([0, 0, 0, 0, 0, 0, 0, 0, 0], [1, 2, 3, 2, 4, 6, 1, 1, 1], [1, 0, 0, 0, 1, 0, 0, 0, 0]),
    );
    const defects = [
      ...survive('fitHomography', fitHomography, withRansac, { nonFiniteOk: documentsNonFinite('fitHomography') }),
      ...survive('fitHomography', fitHomography, oneWrong(withRansac), { nonFiniteOk: documentsNonFinite('fitHomography') }),
      ...survive('invertHomography', invertHomography, mat.map((m) => [m])),
      ...survive('applyHomography', applyHomography, fc.tuple(mat, fc.constantFrom([0, 0], [1, 1], [1e300, 1]))),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('sunPosition: poles, the date line, far past and future, high sites', () => {
    const time = fc.oneof(
      fc.integer({ min: -62135596800000, max: 253402300799000 }),
      fc.constantFrom(0, 8.64e15, -8.64e15, Date.UTC(2024, 2, 20, 3, 6)),
      fc.date({ noInvalidDate: true }),
    );
    const site = fc.record({
      latitudeDeg: fc.constantFrom(90, -90, 0, 89.9999, 45),
      longitudeDeg: fc.constantFrom(180, -180, 0, 179.9999),
      height: fc.constantFrom(0, -400, 8848, 1e5),
    });
    const arb = fc.tuple(time, site);
    const defects = [
      ...survive('sunPosition', sunPosition, arb, { nonFiniteOk: documentsNonFinite('sunPosition') }, 100),
      ...survive('sunPosition', sunPosition, oneWrong(arb), { nonFiniteOk: documentsNonFinite('sunPosition') }, 100),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });

  it('decodeNpy and decodePng: truncated, corrupted and lying headers', () => {
    const npy = encodeNpy({ dtype: 'float64', shape: [3, 4], data: new Float64Array(12).fill(1.5) });
    const png = encodePng(createImage(5, 4, 1, new Float32Array(20).fill(0.25))).png;
    const text = new TextEncoder();
    const header = (h: string): Uint8Array => {
      const body = `${h}`.padEnd(118, ' ') + '\n';
      return Uint8Array.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, body.length & 255, body.length >> 8, ...text.encode(body)]);
    };
    const lying = fc.constantFrom(
      "{'descr': '<f8', 'fortran_order': False, 'shape': (100000000000,), }",
      "{'descr': '<f8', 'fortran_order': False, 'shape': (65536, 65536, 65536), }",
      "{'descr': '<f8', 'fortran_order': False, 'shape': (-1,), }",
      "{'descr': '<c16', 'fortran_order': False, 'shape': (1,), }",
      "{'descr': '<f8', 'fortran_order': False, 'shape': (2, 3), 'extra': 1}",
      "{'descr': '<f8', 'fortran_order': 1, 'shape': (0,), }",
      "{'descr': '<f8'",
      '',
    );
    const corrupt = (bytes: Uint8Array) =>
      fc.tuple(fc.nat({ max: bytes.length - 1 }), fc.integer({ min: 0, max: 255 }), fc.boolean()).map(([at, v, cut]) => {
        const b = bytes.slice(0, cut ? at : bytes.length);
        if (!cut) b[at] = v;
        return [b];
      });
    // a PNG header that claims an absurd size (65535 × 65535), with a valid CRC
    const bigPng = png.slice();
    bigPng.set([0, 0, 255, 255, 0, 0, 255, 255], 16);
    const defects = [
      ...survive('decodeNpy', decodeNpy, lying.map((h) => [header(h)])),
      ...survive('decodeNpy', decodeNpy, corrupt(npy)),
      ...survive('decodePng', decodePng, corrupt(png), {}, 200),
      ...survive('decodePng', decodePng, fc.constant([bigPng]), {}, 1),
    ];
    expect(defects, defects.join('\n')).toEqual([]);
  });
});
