import { describe, expect, it } from 'vitest';
import { interpolateRdBu, interpolateViridis } from 'd3-scale-chromatic';
import { MeniscusRangeError } from '../../src/core/index.js';
import { colormapColor, colormapHex, colormapIndex, getColormap } from '../../src/viz/index.js';

function parse(c: string): [number, number, number] {
  if (c.startsWith('#')) return [1, 3, 5].map((k) => parseInt(c.slice(k, k + 2), 16)) as [number, number, number];
  const m = /^rgb\((\d+), (\d+), (\d+)\)$/.exec(c)!;
  return [Number(m[1]), Number(m[2]), Number(m[3])];
}

describe('viridis against d3-scale-chromatic 3.1.0 (interpolateViridis; published viridis table, CC0)', () => {
  const samples = [0, 0.001, 0.1, 0.25, 0.333, 0.5, 0.6, 0.75, 0.9, 0.999, 1];
  for (const t of samples) {
    it(`t = ${t}`, () => {
      expect(colormapColor('viridis', t)).toEqual(parse(interpolateViridis(t)));
    });
  }
  it('every one of the 256 entries', () => {
    for (let k = 0; k < 256; k++) expect(colormapColor('viridis', (k + 0.5) / 256)).toEqual(parse(interpolateViridis((k + 0.5) / 256)));
  });
  it('end points #440154 and #fde725 (matplotlib viridis table, from memory)', () => {
    expect(colormapHex('viridis', 0)).toBe('#440154');
    expect(colormapHex('viridis', 1)).toBe('#fde725');
  });
  it('CIE 1976 L* rises along the map (viridis is designed monotone in lightness; van der Walt & Smith 2015)', () => {
    // L* from relative luminance Y (CIE 1976; Y from linear sRGB with the Rec. 709 weights).
    const m = getColormap('viridis');
    const L: number[] = [];
    for (let k = 0; k < 256; k++) {
      const y = 0.2126 * m.linear[k * 3]! + 0.7152 * m.linear[k * 3 + 1]! + 0.0722 * m.linear[k * 3 + 2]!;
      L.push(y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (y * 24389) / 27);
    }
    // 8-bit rounding of the table leaves neighbour dips below 0.05 L*; over 4 entries it always rises.
    for (let k = 1; k < 256; k++) expect(L[k]! - L[k - 1]!).toBeGreaterThan(-0.05);
    for (let k = 4; k < 256; k++) expect(L[k]!).toBeGreaterThan(L[k - 4]!);
    expect(L[255]! - L[0]!).toBeGreaterThan(70);
  });
});

describe('blueRed against d3-scale-chromatic interpolateRdBu (ColorBrewer RdBu, reversed)', () => {
  it('at the 256 sample points t = k/255', () => {
    for (let k = 0; k < 256; k++) expect(colormapColor('blueRed', k / 255)).toEqual(parse(interpolateRdBu(1 - k / 255)));
  });
  it('blue at 0, near-white at 0.5, red at 1', () => {
    const [r0, , b0] = colormapColor('blueRed', 0);
    const [r1, , b1] = colormapColor('blueRed', 1);
    expect(b0).toBeGreaterThan(r0);
    expect(r1).toBeGreaterThan(b1);
    expect(Math.min(...colormapColor('blueRed', 0.5))).toBeGreaterThan(235);
  });
});

describe('lookups', () => {
  it('index rule floor(t · 256), clamped', () => {
    const m = getColormap('viridis');
    expect(colormapIndex(m, -1)).toBe(0);
    expect(colormapIndex(m, 0.5)).toBe(128);
    expect(colormapIndex(m, 1)).toBe(255);
    expect(colormapIndex(m, 2)).toBe(255);
    expect(() => colormapIndex(m, NaN)).toThrow(MeniscusRangeError);
    expect(() => getColormap('jet' as never)).toThrow(MeniscusRangeError);
  });
  it('licence noted', () => {
    expect(getColormap('viridis').licence).toMatch(/CC0/);
    expect(getColormap('blueRed').licence).toMatch(/Apache/);
  });
});
