import { describe, it, expect } from 'vitest';
import { createImage, MeniscusRangeError, MeniscusTypeError, Status } from '../../src/core/index.js';
import { PinholeCamera, OrthographicCamera, createCameraPose } from '../../src/camera/index.js';
import { createPlaneSurface } from '../../src/surface/index.js';
import { renderThroughSurface, traceToScene } from '../../src/imaging/index.js';

const N = 64;
const f = N / 2 / Math.tan(Math.PI / 6);
const camera = new PinholeCamera({ model: 'pinhole', fx: f, fy: f, cx: (N - 1) / 2, cy: (N - 1) / 2, width: N, height: N });
const up = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0.02, -0.01, -0.4]);
const down = createCameraPose([1, 0, 0, 0, -1, 0, 0, 0, -1], [0.01, 0.03, 0.8]);
const domain = { xMin: -3, xMax: 3, yMin: -3, yMax: 3 };
const nW = 1.333, nA = 1.000293;

/** Snell's law in vector form, written out from the Khronos GLSL specification's `refract`. */
function snell(d: number[], nrm: number[], eta: number): number[] | null {
  let n = nrm;
  let c = n[0]! * d[0]! + n[1]! * d[1]! + n[2]! * d[2]!;
  if (c > 0) {
    n = n.map((x) => -x);
    c = -c;
  }
  const k = 1 - eta * eta * (1 - c * c);
  if (k < 0) return null;
  return d.map((x, i) => eta * x + (-eta * c - Math.sqrt(k)) * n[i]!);
}

/** Closed form: the ray meets the tilted plane h = h0 + sx·x + sy·y, refracts, meets z = Z. */
function closedForm(C: readonly number[], d: number[], h0: number, sx: number, sy: number, eta: number, Z: number): number[] | null {
  const t = (h0 + sx * C[0]! + sy * C[1]! - C[2]!) / (d[2]! - sx * d[0]! - sy * d[1]!);
  const P = [0, 1, 2].map((i) => C[i]! + t * d[i]!);
  const len = Math.hypot(sx, sy, 1);
  const r = snell(d, [-sx / len, -sy / len, 1 / len], eta);
  if (r === null) return null;
  const s = (Z - P[2]!) / r[2]!;
  return [P[0]! + s * r[0]!, P[1]! + s * r[1]!, Z];
}

function pixelsGrid(step: number): Float64Array {
  const a: number[] = [];
  for (let v = 0; v < N; v += step) for (let u = 0; u < N; u += step) a.push(u + 0.25, v - 0.125);
  return new Float64Array(a);
}

describe('traceToScene through a tilted flat surface (closed-form refraction)', () => {
  // Where every scene point lands, against the closed form (ray–plane intersection and the
  // vector Snell law of the GLSL specification / Glassner 1989): agreement to 1e-6 of a
  // pixel's footprint on the scene plane.
  for (const [name, pose, Z, n1, n2] of [
    ['camera below looking up at a plane above', up, 2.0, nW, nA],
    ['camera above looking down at a bottom', down, -1.2, nA, nW],
  ] as const) {
    it(name, () => {
      const h0 = 0.004, sx = 0.08, sy = -0.05;
      const s = createPlaneSurface({ height: h0, slopeX: sx, slopeY: sy, domain });
      const pix = pixelsGrid(3);
      const r = traceToScene(s, camera, pose, { type: 'plane', z: Z }, pix, { nWater: nW, nAir: nA });
      const footprint = (Math.abs(Z - pose.position[2]) * 1.2) / f; // metres per pixel, generous
      let worst = 0;
      for (let k = 0; k < pix.length / 2; k++) {
        const ray = camera.unproject([pix[2 * k]!, pix[2 * k + 1]!])!;
        const m = pose.rotation;
        const c = ray.direction;
        const d = [0, 1, 2].map((i) => m[3 * i]! * c[0] + m[3 * i + 1]! * c[1] + m[3 * i + 2]! * c[2]);
        const e = closedForm(pose.position, d, h0, sx, sy, n1 / n2, Z);
        expect(e).not.toBeNull();
        expect(r.status[k]).toBe(Status.ok);
        worst = Math.max(worst, Math.hypot(r.points[3 * k]! - e![0]!, r.points[3 * k + 1]! - e![1]!) / footprint);
      }
      expect(worst).toBeLessThan(1e-6);
    });
  }

  // Snell's window (any optics text): from below flat water, a sky direction at zenith
  // angle θa is seen at θw with n_w sin θw = n_a sin θa.
  it('sky directions through flat water obey n_w sin θw = n_a sin θa', () => {
    const s = createPlaneSurface({ domain });
    const pix = pixelsGrid(5);
    const r = traceToScene(s, camera, up, { type: 'sky' }, pix, { nWater: nW, nAir: nA });
    for (let k = 0; k < pix.length / 2; k++) {
      const ray = camera.unproject([pix[2 * k]!, pix[2 * k + 1]!])!;
      const sinW = Math.hypot(ray.direction[0], ray.direction[1]);
      const sinA = Math.hypot(r.points[3 * k]!, r.points[3 * k + 1]!);
      expect(nA * sinA).toBeCloseTo(nW * sinW, 12);
    }
  });
});

describe('renderThroughSurface', () => {
  // A texture holding its own coordinates (linear ramps, which bilinear sampling
  // reproduces exactly): each pixel's value is where its ray landed, in texture pixels.
  function coordinateTexture(T: number): ReturnType<typeof createImage> {
    const tex = createImage(T, T, 2);
    for (let v = 0; v < T; v++) for (let u = 0; u < T; u++) {
      tex.data[2 * (v * T + u)] = u;
      tex.data[2 * (v * T + u) + 1] = v;
    }
    return tex;
  }

  it('renders the closed-form landing points of a tilted flat surface (float32 precision)', () => {
    const tex = coordinateTexture(800);
    const dx = 0.01, x0 = -4, y0 = -4;
    const s = createPlaneSurface({ height: -0.002, slopeX: -0.06, slopeY: 0.03, domain });
    const r = renderThroughSurface(s, camera, up, { type: 'plane', z: 1.5, image: tex, x0, y0, dx }, { nWater: nW, nAir: nA });
    expect(r.invalid).toBe(0);
    for (let v = 0; v < N; v += 7) for (let u = 0; u < N; u += 7) {
      const ray = camera.unproject([u, v])!;
      const e = closedForm(up.position, [...ray.direction], -0.002, -0.06, 0.03, nW / nA, 1.5)!;
      const p = v * N + u;
      expect(Math.abs(r.image.data[2 * p]! - (e[0]! - x0) / dx)).toBeLessThan(1e-3);
      expect(Math.abs(r.image.data[2 * p + 1]! - (e[1]! - y0) / dx)).toBeLessThan(1e-3);
    }
  });

  it('supersampling averages the sub-pixel rays on a regular ss × ss pattern', () => {
    const tex = coordinateTexture(800);
    const s = createPlaneSurface({ slopeX: 0.05, domain });
    const scene = { type: 'plane', z: 1.5, image: tex, x0: -4, y0: -4, dx: 0.01 } as const;
    const ss = 3;
    const b = renderThroughSurface(s, camera, up, scene, { supersample: ss });
    for (const [u, v] of [[0, 0], [17, 40], [63, 63]] as const) {
      const pix: number[] = [];
      for (let j = 0; j < ss; j++) for (let i = 0; i < ss; i++) pix.push(u + (i + 0.5) / ss - 0.5, v + (j + 0.5) / ss - 0.5);
      const r = traceToScene(s, camera, up, { type: 'plane', z: 1.5 }, new Float64Array(pix));
      let mx = 0, my = 0;
      for (let k = 0; k < ss * ss; k++) {
        mx += (r.points[3 * k]! + 4) / 0.01 / (ss * ss);
        my += (r.points[3 * k + 1]! + 4) / 0.01 / (ss * ss);
      }
      const p = v * N + u;
      expect(Math.abs(b.image.data[2 * p]! - mx)).toBeLessThan(1e-3);
      expect(Math.abs(b.image.data[2 * p + 1]! - my)).toBeLessThan(1e-3);
    }
  });

  it('masks rays that leave the surface, miss the texture or meet total internal reflection', () => {
    const tex = coordinateTexture(50);
    // A small surface that covers only the middle of the view.
    const small = createPlaneSurface({ domain: { xMin: -0.05, xMax: 0.05, yMin: -0.05, yMax: 0.05 } });
    const r = renderThroughSurface(small, camera, up, { type: 'plane', z: 1, image: tex, dx: 0.001 });
    expect(r.invalid).toBeGreaterThan(0);
    expect(r.status.some((s) => s === Status.miss)).toBe(true);
    // A steep surface: rays from below beyond the critical angle are totally reflected.
    const steep = createPlaneSurface({ slopeX: 1.5, domain: { xMin: -0.2, xMax: 0.2, yMin: -0.2, yMax: 0.2 } });
    const t = renderThroughSurface(steep, camera, up, { type: 'plane', z: 1, image: coordinateTexture(400), dx: 0.05 });
    expect(t.status.some((s) => s === Status.tir)).toBe(true);
    expect(t.mask.every((m, i) => (m === 1) === (t.status[i] === Status.ok))).toBe(true);
  });

  it('refuses impossible geometry with errors naming the parameter', () => {
    const tex = coordinateTexture(8);
    const s = createPlaneSurface({ domain });
    const inWaves = createCameraPose([1, 0, 0, 0, 1, 0, 0, 0, 1], [0, 0, 0]);
    expect(() => renderThroughSurface(s, camera, inWaves, { type: 'plane', z: 1, image: tex, dx: 0.1 })).toThrow(/pose\.position\[2\]/);
    expect(() => renderThroughSurface(s, camera, up, { type: 'plane', z: -1, image: tex, dx: 0.1 })).toThrow(/scene\.z/);
    expect(() => renderThroughSurface(s, camera, down, { type: 'sky', image: tex })).toThrow(MeniscusRangeError);
    expect(() => renderThroughSurface(s, {} as never, up, { type: 'sky', image: tex })).toThrow(MeniscusTypeError);
    const noSize = new OrthographicCamera({ model: 'orthographic', fx: 100, fy: 100, cx: 4, cy: 4 });
    expect(() => renderThroughSurface(s, noSize, up, { type: 'sky', image: tex })).toThrow(/options\.width/);
  });
});
