/**
 * Internal SVG helpers: escaping, compact numbers, axes. Not re-exported.
 *
 * @module
 * @internal
 */
import { formatTick, lengthUnit, niceTicks } from './ticks.js';

/** Escape text for XML content and attribute values. */
export function esc(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&apos;' })[c]!);
}

/** A coordinate with at most 2 decimals. */
export function n2(v: number): string {
  const r = Math.round(v * 100) / 100;
  return Object.is(r, -0) ? '0' : String(r);
}

/** One linear axis mapping data values onto pixels. */
export interface Axis {
  readonly lo: number;
  readonly hi: number;
  readonly p0: number;
  readonly p1: number;
}

/** Pixel position of `v` on an axis. */
export function toPx(a: Axis, v: number): number {
  return a.p0 + ((v - a.lo) / (a.hi - a.lo)) * (a.p1 - a.p0);
}

/** Ticks and labels for an axis; lengths in metres get an SI prefix. */
export function axisTicks(a: Axis, count: number, metres: boolean): { values: number[]; labels: string[]; unit: string } {
  const t = niceTicks(Math.min(a.lo, a.hi), Math.max(a.lo, a.hi), count);
  if (metres) {
    const u = lengthUnit(Math.max(Math.abs(a.lo), Math.abs(a.hi)), false);
    return { values: t.values, labels: t.values.map((v) => formatTick(v / u.metres, t.step / u.metres)), unit: u.symbol };
  }
  return { values: t.values, labels: t.values.map((v) => formatTick(v, t.step)), unit: '' };
}

/** SVG for a horizontal axis at pixel row `y` with ticks below. */
export function xAxisSvg(a: Axis, y: number, count: number, metres: boolean, label: string, font: number): string {
  const t = axisTicks(a, count, metres);
  const parts = [`<line x1="${n2(a.p0)}" y1="${n2(y)}" x2="${n2(a.p1)}" y2="${n2(y)}" stroke="#000" stroke-width="1"/>`];
  t.values.forEach((v, k) => {
    const x = toPx(a, v);
    parts.push(`<line x1="${n2(x)}" y1="${n2(y)}" x2="${n2(x)}" y2="${n2(y + 4)}" stroke="#000" stroke-width="1"/>`);
    parts.push(`<text x="${n2(x)}" y="${n2(y + 6 + font)}" text-anchor="middle">${esc(t.labels[k]!)}</text>`);
  });
  const unit = t.unit === '' ? '' : ` (${t.unit})`;
  parts.push(`<text x="${n2((a.p0 + a.p1) / 2)}" y="${n2(y + 10 + 2 * font)}" text-anchor="middle">${esc(label + unit)}</text>`);
  return parts.join('\n');
}

/** SVG for a vertical axis at pixel column `x` with ticks to the left. */
export function yAxisSvg(a: Axis, x: number, count: number, metres: boolean, label: string, font: number): string {
  const t = axisTicks(a, count, metres);
  const parts = [`<line x1="${n2(x)}" y1="${n2(a.p0)}" x2="${n2(x)}" y2="${n2(a.p1)}" stroke="#000" stroke-width="1"/>`];
  let widest = 0;
  t.values.forEach((v, k) => {
    const y = toPx(a, v);
    parts.push(`<line x1="${n2(x - 4)}" y1="${n2(y)}" x2="${n2(x)}" y2="${n2(y)}" stroke="#000" stroke-width="1"/>`);
    parts.push(`<text x="${n2(x - 6)}" y="${n2(y + font * 0.35)}" text-anchor="end">${esc(t.labels[k]!)}</text>`);
    widest = Math.max(widest, t.labels[k]!.length);
  });
  const unit = t.unit === '' ? '' : ` (${t.unit})`;
  const lx = x - 10 - widest * font * 0.6;
  const my = (a.p0 + a.p1) / 2;
  if (label !== '') parts.push(`<text x="${n2(lx)}" y="${n2(my)}" text-anchor="middle" transform="rotate(-90 ${n2(lx)} ${n2(my)})">${esc(label + unit)}</text>`);
  return parts.join('\n');
}
