/**
 * Internal raster helpers for the picture functions: a tiny bitmap font, rectangles and
 * text drawn into linear RGB images. Not part of the public API (not re-exported).
 *
 * @module
 * @internal
 */
import type { Image } from '../core/index.js';
import { srgbDecode } from './srgb.js';

/** Entry index of a table of `size` entries at position `t` (clamped). */
export function indexOf(size: number, t: number): number {
  const k = Math.floor(t * size);
  return k < 0 ? 0 : k >= size ? size - 1 : k;
}

/** A linear RGB colour. */
export type Rgb = readonly [number, number, number];

/** Linear RGB of an 8-bit sRGB colour. */
export function linearRgb(r: number, g: number, b: number): Rgb {
  return [srgbDecode(r / 255), srgbDecode(g / 255), srgbDecode(b / 255)];
}

/** Fill a rectangle (clipped to the image). */
export function fillRect(img: Image, x: number, y: number, w: number, h: number, c: Rgb): void {
  const x0 = Math.max(0, Math.floor(x));
  const y0 = Math.max(0, Math.floor(y));
  const x1 = Math.min(img.width, Math.floor(x + w));
  const y1 = Math.min(img.height, Math.floor(y + h));
  const ch = img.channels;
  const d = img.data;
  for (let v = y0; v < y1; v++) {
    for (let u = x0; u < x1; u++) {
      const k = (v * img.width + u) * ch;
      d[k] = c[0];
      d[k + 1] = c[1];
      d[k + 2] = c[2];
    }
  }
}

// 5-row bitmap glyphs; '#' is ink. Unknown characters draw as a blank of width 3.
const GLYPHS: Record<string, readonly string[]> = {
  '0': ['###', '#.#', '#.#', '#.#', '###'],
  '1': ['.#.', '##.', '.#.', '.#.', '###'],
  '2': ['###', '..#', '###', '#..', '###'],
  '3': ['###', '..#', '.##', '..#', '###'],
  '4': ['#.#', '#.#', '###', '..#', '..#'],
  '5': ['###', '#..', '###', '..#', '###'],
  '6': ['###', '#..', '###', '#.#', '###'],
  '7': ['###', '..#', '..#', '.#.', '.#.'],
  '8': ['###', '#.#', '###', '#.#', '###'],
  '9': ['###', '#.#', '###', '..#', '###'],
  '.': ['.', '.', '.', '.', '#'],
  '-': ['...', '...', '###', '...', '...'],
  '+': ['...', '.#.', '###', '.#.', '...'],
  e: ['...', '.#.', '#.#', '##.', '.##'],
  m: ['.....', '##.#.', '#.#.#', '#.#.#', '#.#.#'],
  c: ['...', '.##', '#..', '#..', '.##'],
  'µ': ['...', '#.#', '#.#', '##.', '#..'],
  u: ['...', '#.#', '#.#', '#.#', '.##'],
  n: ['...', '##.', '#.#', '#.#', '#.#'],
  k: ['#..', '#.#', '##.', '#.#', '#.#'],
  r: ['...', '#.#', '##.', '#..', '#..'],
  a: ['...', '.##', '#.#', '#.#', '.##'],
  d: ['..#', '.##', '#.#', '#.#', '.##'],
  s: ['...', '.##', '##.', '..#', '##.'],
  '/': ['..#', '..#', '.#.', '#..', '#..'],
  ' ': ['..', '..', '..', '..', '..'],
};

/** Glyph rows of the bitmap font (5 rows). */
export const GLYPH_HEIGHT = 5;

function glyph(ch: string): readonly string[] {
  return GLYPHS[ch] ?? ['...', '...', '...', '...', '...'];
}

/** Width in pixels of `text` drawn at `scale` (1 px gap between glyphs). */
export function textWidth(text: string, scale: number): number {
  let w = 0;
  for (const ch of text) w += (glyph(ch)[0]!.length + 1) * scale;
  return Math.max(0, w - scale);
}

/** Draw `text` with its top-left corner at (x, y). */
export function drawText(img: Image, text: string, x: number, y: number, scale: number, c: Rgb): void {
  let cx = Math.round(x);
  const cy = Math.round(y);
  for (const ch of text) {
    const g = glyph(ch);
    for (let r = 0; r < GLYPH_HEIGHT; r++) {
      const row = g[r]!;
      for (let q = 0; q < row.length; q++) if (row[q] === '#') fillRect(img, cx + q * scale, cy + r * scale, scale, scale, c);
    }
    cx += (g[0]!.length + 1) * scale;
  }
}
