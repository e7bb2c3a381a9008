/**
 * Every seeded function of the library, each called with a fixed seed on a small input.
 * Shared by the determinism test and its worker-thread twin.
 */
import { createRng } from '../../src/core/index.js';
import { fitHomography } from '../../src/camera/index.js';
import { createApertureArray, createPlaneView, createSensorGeometry, renderSpotFrame, traceSpots } from '../../src/sensor/index.js';
import { createCollimatedLight } from '../../src/sun/index.js';
import { createSinusoidSurface } from '../../src/surface/index.js';
import { prepareRandomSea, synthesizeSea, tankSeaPreset } from '../../src/waves/index.js';

/** Name → a call of a seeded function with seed `seed`. */
export function seededCases(seed: number): Record<string, () => unknown> {
  return {
    'createRng (uniform, normal, integer, fill)': () => {
      const r = createRng(seed);
      const a = new Float64Array(64);
      for (let k = 0; k < 16; k++) a[k] = r.random();
      for (let k = 16; k < 32; k++) a[k] = r.normal(0, 2);
      for (let k = 32; k < 48; k++) a[k] = r.integer(1000);
      r.fillUniform(a.subarray(48, 56), -1, 1);
      r.fillNormal(a.subarray(56), 3, 0.5);
      return a;
    },
    'renderSpotFrame (shot and read noise)': () => {
      const apertures = createApertureArray({ lattice: 'hexagonal', pitch: 0.004, columns: 4, rows: 4, apertureDiameter: 0.001 });
      const geometry = createSensorGeometry({ apertures, maskDepth: 0.3, planeDistance: 0.05 });
      const light = createCollimatedLight([0.05, 0, 1]);
      const sea = createSinusoidSurface({ components: [{ amplitude: 0.0005, kx: 300, omega: 0 }], domain: { xMin: -0.1, xMax: 0.1, yMin: -0.1, yMax: 0.1 } });
      const view = createPlaneView({ width: 48, height: 48, pixelSize: 5e-4 });
      return renderSpotFrame(traceSpots(geometry, sea, light), light, view, { seed, readNoise: 2 });
    },
    'fitHomography (RANSAC sampling)': () => {
      const r = createRng(99); // fixed data; only the RANSAC seed varies
      const n = 30;
      const src = new Float64Array(2 * n), dst = new Float64Array(2 * n);
      for (let k = 0; k < n; k++) {
        const x = r.uniform(0, 100), y = r.uniform(0, 100);
        src[2 * k] = x;
        src[2 * k + 1] = y;
        const w = 1 + 0.001 * x;
        dst[2 * k] = (2 * x + 0.1 * y + 5) / w + (k % 5 === 0 ? r.uniform(20, 40) : r.normal(0, 0.2));
        dst[2 * k + 1] = (0.2 * x + 1.5 * y - 3) / w + r.normal(0, 0.2);
      }
      return fitHomography(src, dst, { ransac: { threshold: 1, seed } });
    },
    'prepareRandomSea (frame at t = 0.3 s)': () => {
      const { sea } = tankSeaPreset();
      return prepareRandomSea({ width: 32, height: 32, dx: 0.01 }, sea, { seed }).frame(0.3);
    },
    'synthesizeSea': () => {
      const { sea } = tankSeaPreset();
      return synthesizeSea({ width: 16, height: 32, dx: 0.015 }, sea, { seed });
    },
  };
}

/** Every typed array, number and string of a result, in a stable order, as bytes. */
export function resultBytes(v: unknown, out: number[] = [], depth = 0, seen = new Set<object>()): number[] {
  if (typeof v === 'number') {
    const b = new Uint8Array(new Float64Array([v]).buffer);
    out.push(...b);
  } else if (typeof v === 'string' || typeof v === 'boolean') {
    for (const c of String(v)) out.push(c.charCodeAt(0) & 255);
  } else if (v !== null && typeof v === 'object' && depth < 8 && !seen.has(v)) {
    seen.add(v);
    if (ArrayBuffer.isView(v)) out.push(...new Uint8Array(v.buffer, v.byteOffset, v.byteLength));
    else for (const k of Object.keys(v).sort()) {
      if (typeof (v as Record<string, unknown>)[k] === 'function') continue;
      for (const c of k) out.push(c.charCodeAt(0) & 255);
      resultBytes((v as Record<string, unknown>)[k], out, depth + 1, seen);
    }
  }
  return out;
}

/** A 64-bit FNV-1a digest (as hex) of a result's bytes, with their count. */
export function digest(v: unknown): string {
  const bytes = resultBytes(v);
  let h = 0xcbf29ce484222325n;
  for (const b of bytes) h = BigInt.asUintN(64, (h ^ BigInt(b)) * 0x100000001b3n);
  return `${bytes.length}:${h.toString(16)}`;
}
