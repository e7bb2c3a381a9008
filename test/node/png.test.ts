import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { afterAll, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MeniscusRangeError, MeniscusTypeError, createImage, gridFromFunction } from '../../src/core/index.js';
import { decodePng, encodePng, pngInfo, readGridPng, readPng, writeGridPng, writePng } from '../../src/node/index.js';
import { srgbDecode } from '../../src/viz/index.js';

const dir = mkdtempSync(join(tmpdir(), 'meniscus-png-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** An image whose values sit exactly on the code grid of the given depth. */
function codeImage(w: number, h: number, channels: number, max: number, seed: number) {
  const img = createImage(w, h, channels);
  const codes: number[] = [];
  for (let k = 0; k < img.data.length; k++) {
    const c = (k * 7919 + seed * 104729) % (max + 1);
    codes.push(c);
    img.data[k] = c / max;
  }
  return { img, codes };
}

describe('PNG round trips at 8 and 16 bit, 1–4 channels (pngjs as the reference decoder)', () => {
  for (const bitDepth of [8, 16] as const) {
    for (const channels of [1, 2, 3, 4]) {
      it(`${bitDepth}-bit, ${channels} channel(s)`, () => {
        const max = bitDepth === 8 ? 255 : 65535;
        const { img, codes } = codeImage(7, 5, channels, max, bitDepth + channels);
        const { png, report } = encodePng(img, { bitDepth });
        expect(report).toMatchObject({ width: 7, height: 5, channels, bitDepth, clippedLow: 0, clippedHigh: 0 });
        // pngjs decodes what we wrote to the same codes
        const ref = PNG.sync.read(Buffer.from(png), { skipRescale: true });
        expect(ref.depth).toBe(bitDepth);
        expect(ref.colorType).toBe([0, 0, 4, 2, 6][channels]);
        const rgba = ref.data as unknown as ArrayLike<number>;
        for (let p = 0; p < 35; p++) {
          const cs = codes.slice(p * channels, (p + 1) * channels);
          const got = channels >= 3 ? [rgba[p * 4]!, rgba[p * 4 + 1]!, rgba[p * 4 + 2]!] : [rgba[p * 4]!];
          if (channels === 2 || channels === 4) got.push(rgba[p * 4 + 3]!);
          expect(got).toEqual(cs);
        }
        // and our reader gives the exact values back
        const path = join(dir, `rt${bitDepth}_${channels}.png`);
        writePng(path, img, { bitDepth });
        const back = readPng(path);
        expect(back.channels).toBe(channels);
        expect(Array.from(back.data)).toEqual(Array.from(img.data));
        expect(pngInfo(readFileSync(path))).toEqual({ width: 7, height: 5, bitDepth, colorType: [0, 0, 4, 2, 6][channels] });
      });
    }
  }

  it('any value round-trips to within half a code step (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.float({ min: 0, max: 1, noNaN: true }), { minLength: 3, maxLength: 30 }), fc.constantFrom(8 as const, 16 as const), (vals, bitDepth) => {
        const n = vals.length - (vals.length % 3);
        const img = createImage(n / 3, 1, 3, Float32Array.from(vals.slice(0, n)));
        const back = decodePng(encodePng(img, { bitDepth }).png);
        const step = 1 / (bitDepth === 8 ? 255 : 65535);
        for (let k = 0; k < n; k++) expect(Math.abs(back.data[k]! - img.data[k]!)).toBeLessThanOrEqual(step / 2 + 1e-7);
      }),
      { seed: 42, numRuns: 100 },
    );
  });

  it('reads a 16-bit RGBA PNG written by pngjs itself', () => {
    const data = new Uint16Array([0, 1000, 65535, 32768, 7, 8, 9, 65535]);
    const png = PNG.sync.write({ width: 2, height: 1, data: Buffer.from(data.buffer) } as PNG, { colorType: 6, inputColorType: 6, bitDepth: 16 });
    const img = decodePng(png);
    expect(img.channels).toBe(4);
    expect(Array.from(img.data)).toEqual(Array.from(data).map((c) => Math.fround(c / 65535)));
  });
});

describe('sRGB transfer on write / read (IEC 61966-2-1 formula)', () => {
  it('0.5 linear is stored as code round(0.735357 · 255) = 188; alpha stays linear', () => {
    const img = createImage(1, 1, 4, new Float32Array([0.5, 0, 1, 0.5]));
    const ref = PNG.sync.read(Buffer.from(encodePng(img, { transfer: 'srgb' }).png));
    expect(Array.from(ref.data)).toEqual([188, 0, 255, 128]);
  });
  it('reading with transfer srgb decodes each code; all 256 8-bit codes survive decode → encode', () => {
    const codes = new Uint8Array(256).map((_, k) => k);
    const png = PNG.sync.write({ width: 256, height: 1, data: Buffer.from(codes) } as PNG, { colorType: 0, inputColorType: 0, bitDepth: 8 });
    const img = decodePng(png, { transfer: 'srgb' });
    expect(img.data[188]).toBe(Math.fround(srgbDecode(188 / 255)));
    const again = PNG.sync.read(Buffer.from(encodePng(img, { transfer: 'srgb' }).png));
    for (let k = 0; k < 256; k++) expect(again.data[k * 4]).toBe(k);
  });
});

describe('clipping and bad input', () => {
  it('values outside [0, 1] are clamped and counted', () => {
    const img = createImage(4, 1, 1, new Float32Array([-0.1, 0.5, 1.2, 3]));
    const r = writePng(join(dir, 'clip.png'), img);
    expect(r.clippedLow).toBe(1);
    expect(r.clippedHigh).toBe(2);
    expect(Array.from(readPng(join(dir, 'clip.png')).data)).toEqual([0, Math.fround(128 / 255), 1, 1]);
  });
  it('refuses NaN pixels, bad bit depths and bad transfer names', () => {
    expect(() => encodePng(createImage(1, 1, 1, new Float32Array([NaN])))).toThrow(MeniscusRangeError);
    expect(() => encodePng(createImage(1, 1), { bitDepth: 12 as never })).toThrow(/8 or 16/);
    expect(() => encodePng(createImage(1, 1), { transfer: 'gamma' as never })).toThrow(MeniscusRangeError);
    expect(() => writePng('', createImage(1, 1))).toThrow(MeniscusTypeError);
  });
  it('refuses non-PNG bytes, truncated PNGs and oversized headers before decoding', () => {
    expect(() => decodePng(new Uint8Array([1, 2, 3]))).toThrow(/PNG signature/);
    const good = encodePng(createImage(8, 8, 3)).png;
    expect(() => decodePng(good.subarray(0, good.length - 20))).toThrow(/valid PNG/);
    const huge = Buffer.from(good);
    huge.writeUInt32BE(70000, 16);
    expect(() => decodePng(huge)).toThrow(/LIMITS\.maxSide/);
    huge.writeUInt32BE(60000, 16);
    huge.writeUInt32BE(60000, 20);
    expect(() => decodePng(huge)).toThrow(/LIMITS\.maxSamples/);
  });
});

describe('grid as a 16-bit grey PNG with a JSON side file', () => {
  const g = gridFromFunction({ width: 33, height: 17, dx: 0.002, dy: 0.003, x0: -0.03, y0: 0.01 }, (x, y) => 0.004 * Math.sin(90 * x) * Math.cos(70 * y) - 0.001);
  it('round trip to within half a code step, with geometry and scale in the side file', () => {
    const path = join(dir, 'height.png');
    const side = writeGridPng(path, g, { units: 'm', description: 'invented wave-tank test field' });
    const json = JSON.parse(readFileSync(join(dir, 'height.json'), 'utf8'));
    expect(json).toEqual(JSON.parse(JSON.stringify(side)));
    expect(side).toMatchObject({ width: 33, height: 17, dx: 0.002, dy: 0.003, x0: -0.03, y0: 0.01, units: 'm', mask: null, clipped: 0 });
    // the PNG is 16-bit grey (pngjs)
    const ref = PNG.sync.read(readFileSync(path), { skipRescale: true });
    expect([ref.depth, ref.colorType]).toEqual([16, 0]);
    // decoding value = offset + scale · code with pngjs's codes
    const codes = ref.data as unknown as ArrayLike<number>;
    for (let k = 0; k < g.data.length; k++) {
      expect(Math.abs(side.offset + side.scale * codes[k * 4]! - g.data[k]!)).toBeLessThanOrEqual(side.scale / 2 + 1e-15);
    }
    const r = readGridPng(path);
    expect(r.mask).toBeNull();
    expect([r.grid.dx, r.grid.dy, r.grid.x0, r.grid.y0]).toEqual([0.002, 0.003, -0.03, 0.01]);
    for (let k = 0; k < g.data.length; k++) expect(Math.abs(r.grid.data[k]! - g.data[k]!)).toBeLessThanOrEqual(side.scale / 2 + 1e-15);
    expect(side.scale).toBeCloseTo((side.max - side.min) / 65535, 15);
  });
  it('a mask reserves code 0 for holes (holes may hold NaN)', () => {
    const data = g.data.slice();
    const mask = new Uint8Array(data.length).fill(1);
    mask[5] = 0;
    data[5] = NaN;
    const gm = { ...g, data };
    const path = join(dir, 'masked.png');
    const side = writeGridPng(path, gm, { mask });
    expect(side.mask).toEqual({ holeCode: 0 });
    const codes = PNG.sync.read(readFileSync(path), { skipRescale: true }).data as unknown as ArrayLike<number>;
    expect(codes[5 * 4]).toBe(0);
    let minCode = 65535;
    for (let k = 0; k < data.length; k++) if (k !== 5) minCode = Math.min(minCode, codes[k * 4]!);
    expect(minCode).toBe(1);
    const r = readGridPng(path);
    expect(r.mask![5]).toBe(0);
    expect(r.grid.data[5]).toBe(0);
    expect(Math.abs(r.grid.data[6]! - data[6]!)).toBeLessThanOrEqual(side.scale / 2 + 1e-15);
  });
  it('a fixed range clamps and counts; bad input is refused', () => {
    const side = writeGridPng(join(dir, 'r.png'), g, { range: [-0.002, 0.002] });
    expect(side.clipped).toBeGreaterThan(0);
    expect(side.max).toBe(0.002);
    expect(() => writeGridPng(join(dir, 'x.png'), g, { range: [1, 1] })).toThrow(MeniscusRangeError);
    const nan = { ...g, data: g.data.slice() };
    nan.data[0] = NaN;
    expect(() => writeGridPng(join(dir, 'x.png'), nan)).toThrow(/pass a mask/);
    expect(() => writeGridPng(join(dir, 'x.png'), g, { mask: new Uint8Array(g.data.length) })).toThrow(/at least one valid/);
    writeFileSync(join(dir, 'bad.json'), '{"format": "something-else"}');
    writePng(join(dir, 'bad.png'), createImage(2, 2));
    expect(() => readGridPng(join(dir, 'bad.png'))).toThrow(/format/);
  });
  it('a constant grid is stored and read back exactly', () => {
    const c = gridFromFunction({ width: 3, height: 2 }, () => 0.25);
    writeGridPng(join(dir, 'c.png'), c);
    expect(Array.from(readGridPng(join(dir, 'c.png')).grid.data)).toEqual([0.25, 0.25, 0.25, 0.25, 0.25, 0.25]);
  });
});
