/**
 * Size guards: absurd sizes (grids, images, masks, spot arrays, lattices, iteration caps,
 * sizes claimed by file headers) give the library's error quickly, before anything is
 * allocated, instead of an out-of-memory crash or a hang.
 */
import { describe, expect, it } from 'vitest';
import { createGrid, createImage, createMask, isMeniscusError, LIMITS } from '../../src/core/index.js';
import { fitHomography } from '../../src/camera/index.js';
import { createCornerLattice, detectCheckerboardCorners } from '../../src/metrics/index.js';
import { createApertureArray, createPlaneView, createSensorGeometry, renderSpotFrame, traceSpots, flatSurface } from '../../src/sensor/index.js';
import { createCollimatedLight } from '../../src/sun/index.js';
import { integrateScattered, integrateSouthwell, legendreModes, zernikeNoll } from '../../src/integrate/index.js';
import { slopeHistogram } from '../../src/viz/index.js';
import { crc32, decodeNpy, decodePng, encodePng, maskToNpy } from '../../src/node/index.js';

const HUGE = [65537, 2 ** 31, 1e12, 2 ** 53];

/** The call must throw the library's error within `ms`. */
function refusedFast(label: string, call: () => unknown, ms = 250): string | null {
  const t0 = performance.now();
  try {
    call();
  } catch (e) {
    const dt = performance.now() - t0;
    if (!isMeniscusError(e)) return `${label}: threw ${(e as Error)?.name}: ${(e as Error)?.message}`;
    if (dt > ms) return `${label}: refused but took ${dt.toFixed(0)} ms`;
    return null;
  }
  return `${label}: accepted`;
}

describe('fuzz: size guards', () => {
  it('grids, images and masks above LIMITS are refused before allocation', () => {
    const bad: (string | null)[] = [];
    for (const n of HUGE) {
      bad.push(refusedFast(`createGrid ${n}`, () => createGrid({ width: n, height: 2 })));
      bad.push(refusedFast(`createImage ${n}`, () => createImage(2, n)));
      bad.push(refusedFast(`createMask ${n}`, () => createMask(n, n)));
    }
    // each side within maxSide but the product above maxSamples
    const side = LIMITS.maxSide;
    bad.push(refusedFast('createGrid side²', () => createGrid({ width: side, height: side })));
    bad.push(refusedFast('createImage side²', () => createImage(side, side, 4)));
    // a grid object that claims a huge size but carries a small array
    bad.push(refusedFast('integrateSouthwell claimed size', () => {
      const g = { width: side, height: side, data: new Float64Array(4), dx: 1, dy: 1, x0: 0, y0: 0 };
      integrateSouthwell(g, g);
    }));
    bad.push(refusedFast('maskToNpy', () => maskToNpy(new Uint8Array(4), side, side)));
    expect(bad.filter(Boolean)).toEqual([]);
  });

  it('sensor, metrics, viz and integrators refuse absurd counts and caps', () => {
    const light = createCollimatedLight([0, 0, 1]);
    const small = createApertureArray({ lattice: 'square', pitch: 0.01, columns: 3, rows: 3, apertureDiameter: 0.001 });
    const geometry = createSensorGeometry({ apertures: small, maskDepth: 0.3, planeDistance: 0.05 });
    const trace = traceSpots(geometry, flatSurface(geometry), light);
    const tiny = createImage(8, 8, 1);
    const bad: (string | null)[] = [];
    for (const n of HUGE) {
      bad.push(refusedFast(`createApertureArray ${n}`, () => createApertureArray({ lattice: 'square', pitch: 0.01, columns: n, rows: n, apertureDiameter: 0.001 })));
      bad.push(refusedFast(`createPlaneView + renderSpotFrame ${n}`, () => renderSpotFrame(trace, light, createPlaneView({ width: n, height: n, pixelSize: 1e-4 }))));
      bad.push(refusedFast(`createCornerLattice ${n}`, () => createCornerLattice(n, n, new Float64Array(8))));
      bad.push(refusedFast(`slopeHistogram bins ${n}`, () => slopeHistogram(new Float64Array(4), { bins: n })));
      bad.push(refusedFast(`legendreModes ${n}`, () => legendreModes(n)));
      bad.push(refusedFast(`zernikeNoll ${n * 1e9}`, () => zernikeNoll(n * 1e9)));
      bad.push(refusedFast(`integrateScattered grid ${n}`, () => integrateScattered({ x: new Float64Array(1), y: new Float64Array(1), p: new Float64Array(1), q: new Float64Array(1) }, { width: n, height: n })));
      bad.push(refusedFast(`fitHomography ransac.maxIterations ${n * 1e6}`, () => fitHomography(new Float64Array(8), new Float64Array(8), { ransac: { maxIterations: n * 1e6 } })));
      bad.push(refusedFast(`integrateScattered maxIterations ${n * 1e6}`, () => integrateScattered({ x: new Float64Array(1), y: new Float64Array(1), p: new Float64Array(1), q: new Float64Array(1) }, { width: 3, height: 3 }, { maxIterations: n * 1e6 })));
      bad.push(refusedFast(`detectCheckerboardCorners minCorners ${n * 1e6}`, () => detectCheckerboardCorners(tiny, { minCorners: n * 1e6 })));
    }
    expect(bad.filter(Boolean)).toEqual([]);
  });

  it('file headers that claim absurd sizes are refused before allocation', () => {
    const text = new TextEncoder();
    const header = (h: string): Uint8Array => {
      const body = h.padEnd(118, ' ') + '\n';
      return Uint8Array.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, body.length & 255, body.length >> 8, ...text.encode(body)]);
    };
    const bad: (string | null)[] = [];
    for (const shape of ['(100000000000,)', '(65536, 65536, 65536)', '(9007199254740993,)', '(4294967296, 4294967296)']) {
      bad.push(refusedFast(`decodeNpy ${shape}`, () => decodeNpy(header(`{'descr': '<f8', 'fortran_order': False, 'shape': ${shape}, }`))));
    }
    // a PNG whose IHDR claims 65535 × 65535 pixels, with its CRC recomputed so that only the size can be refused
    const png = encodePng(createImage(5, 4, 1)).png.slice();
    png.set([0, 0, 255, 255, 0, 0, 255, 255], 16);
    const crc = crc32(png.subarray(12, 29));
    png.set([crc >>> 24, (crc >>> 16) & 255, (crc >>> 8) & 255, crc & 255], 29);
    bad.push(refusedFast('decodePng 65535²', () => decodePng(png)));
    expect(bad.filter(Boolean)).toEqual([]);
  });
});
