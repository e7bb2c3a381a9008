import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { interpolateViridis } from 'd3-scale-chromatic';
import { MeniscusRangeError, MeniscusTypeError, gridFromFunction } from '../../src/core/index.js';
import { encodePng } from '../../src/node/index.js';
import { colorizeGrid, errorMapImage, getColormap, heightMapImage } from '../../src/viz/index.js';

const spec = { width: 40, height: 20, dx: 0.001, x0: 0, y0: 0 };
// a ramp along x from 0 to 39 mm-ish values
const ramp = gridFromFunction(spec, (x) => x);

function pixel(img: { width: number; channels: number; data: Float32Array }, u: number, v: number): number[] {
  const k = (v * img.width + u) * img.channels;
  return Array.from(img.data.subarray(k, k + 3));
}

describe('colorizeGrid', () => {
  it('maps min → first entry and max → last entry of viridis (linear light)', () => {
    const { image, range, clipped } = colorizeGrid(ramp);
    const lin = getColormap('viridis').linear;
    expect(range).toEqual([0, 0.039]);
    expect(clipped).toBe(0);
    expect(pixel(image, 0, 0)).toEqual(Array.from(lin.subarray(0, 3)));
    expect(pixel(image, 39, 0)).toEqual(Array.from(lin.subarray(255 * 3, 256 * 3)));
  });
  it('written with the sRGB transfer, the PNG holds d3-scale-chromatic\'s viridis colours exactly', () => {
    const { image } = colorizeGrid(ramp);
    const png = PNG.sync.read(Buffer.from(encodePng(image, { transfer: 'srgb' }).png));
    for (let i = 0; i < 40; i++) {
      const t = i / 39;
      const want = interpolateViridis(Math.min(t, 0.99999)).slice(1);
      const got = [0, 1, 2].map((c) => png.data[i * 4 + c]!.toString(16).padStart(2, '0')).join('');
      expect(got).toBe(want);
    }
  });
  it('north up by default: grid row 0 (y0) is the bottom image row; pixelSize blocks', () => {
    const g = gridFromFunction({ width: 2, height: 3 }, (_x, y) => y);
    const up = colorizeGrid(g, { pixelSize: 2 }).image;
    expect([up.width, up.height]).toEqual([4, 6]);
    const lin = getColormap('viridis').linear;
    expect(pixel(up, 0, 5)).toEqual(Array.from(lin.subarray(0, 3))); // y = 0 at the bottom
    expect(pixel(up, 3, 0)).toEqual(Array.from(lin.subarray(765, 768))); // y = 2 at the top
    const down = colorizeGrid(g, { yUp: false }).image;
    expect(pixel(down, 0, 0)).toEqual(Array.from(lin.subarray(0, 3)));
  });
  it('mask colour for holes (NaN allowed there), clipping counted with a fixed range', () => {
    const d = ramp.data.slice();
    d[0] = NaN;
    const mask = new Uint8Array(d.length).fill(1);
    mask[0] = 0;
    const r = colorizeGrid({ ...ramp, data: d }, { mask, maskColor: [255, 0, 0], range: [0.01, 0.02], yUp: false });
    expect(pixel(r.image, 0, 0)).toEqual([1, 0, 0]);
    expect(r.clipped).toBe(20 * (10 + 19) - 1); // columns 0–9 below, 21–39 above, one masked
  });
  it('a constant field still draws (centred in its own small range)', () => {
    const c = gridFromFunction({ width: 3, height: 3 }, () => 0.5);
    const r = colorizeGrid(c);
    expect(r.range[0]).toBeLessThan(0.5);
    expect(r.range[1]).toBeGreaterThan(0.5);
  });
  it('bad input: NaN without mask, bad range, bad colour, bad colormap', () => {
    const d = ramp.data.slice();
    d[3] = NaN;
    expect(() => colorizeGrid({ ...ramp, data: d })).toThrow(MeniscusRangeError);
    expect(() => colorizeGrid(ramp, { range: [1, 0] })).toThrow(MeniscusRangeError);
    expect(() => colorizeGrid(ramp, { maskColor: [0, 0, 300] })).toThrow(MeniscusRangeError);
    expect(() => colorizeGrid(ramp, { maskColor: 'red' as never })).toThrow(MeniscusTypeError);
    expect(() => colorizeGrid(ramp, { colormap: 'jet' as never })).toThrow(MeniscusRangeError);
    expect(() => colorizeGrid(ramp, { pixelSize: 0 })).toThrow(MeniscusRangeError);
  });
});

describe('heightMapImage / errorMapImage', () => {
  const wave = gridFromFunction({ width: 60, height: 30, dx: 0.002 }, (x, y) => 0.003 * Math.sin(50 * x) * Math.cos(40 * y));
  it('map area equals colorizeGrid; colour bar runs from the top (high) to the bottom (low)', () => {
    const m = heightMapImage(wave, { pixelSize: 2 });
    const plain = colorizeGrid(wave, { pixelSize: 2 }).image;
    const { x, y, width, height } = m.mapRect;
    expect([width, height]).toEqual([120, 60]);
    for (const [u, v] of [[0, 0], [37, 11], [119, 59]] as const) expect(pixel(m.image, x + u, y + v)).toEqual(pixel(plain, u, v));
    const lin = getColormap('viridis').linear;
    const bx = x + width + 8 + 2; // bar starts 4·fontScale after the map
    expect(pixel(m.image, bx, y)).toEqual(Array.from(lin.subarray(765, 768)));
    expect(pixel(m.image, bx, y + height - 1)).toEqual(Array.from(lin.subarray(0, 3)));
    expect(pixel(m.image, 0, 0)).toEqual([1, 1, 1]); // white background
  });
  it('ticks are nice values inside the range, labelled in mm; the scale bar is a nice length (Heckbert 1990)', () => {
    const m = heightMapImage(wave, { pixelSize: 2 });
    expect(m.caption).toBe('mm');
    for (const t of m.ticks) {
      expect(t).toBeGreaterThanOrEqual(m.range[0]);
      expect(t).toBeLessThanOrEqual(m.range[1]);
      expect(Math.abs(t / 0.001 - Math.round(t / 0.001))).toBeLessThan(1e-9);
    }
    // 120 px at 1 mm per pixel: a quarter is 30 mm, which rounds to the nice 5 cm (Heckbert: 3 → 5), 50 px
    expect(m.scaleBar).toEqual({ metres: 0.05, pixels: 50, label: '5 cm' });
    const noDeco = heightMapImage(wave, { colorBar: false, scaleBar: false });
    expect([noDeco.image.width, noDeco.image.height]).toEqual([60 + 16, 30 + 16]);
    expect(noDeco.scaleBar).toBeNull();
  });
  it('error maps are symmetric about zero with white at zero (blue–red map)', () => {
    const e = gridFromFunction({ width: 21, height: 1, dx: 0.01 }, (x) => (x - 0.1) * (x < 0.1 ? 1e-4 : 2e-4));
    const m = errorMapImage(e, { scaleBar: false, labels: false });
    expect(m.range[0]).toBeCloseTo(-m.range[1], 15);
    const { x, y } = m.mapRect;
    const mid = pixel(m.image, x + 10, y);
    for (const c of mid) expect(c).toBeGreaterThan(0.8); // near white in linear light
  });
  it('other units label raw values and use the units as caption', () => {
    const m = heightMapImage(gridFromFunction({ width: 10, height: 10 }, (x) => x * 0.01), { units: 'rad' });
    expect(m.caption).toBe('rad');
    const u = heightMapImage(gridFromFunction({ width: 10, height: 10 }, (x) => x * 0.01), { units: '1' });
    expect(u.caption).toBe('');
  });
});
