import { describe, expect, it } from 'vitest';
import { createImage, createRng, MeniscusRangeError } from '../../src/core/index.js';
import { detectSpots } from '../../src/sensor/index.js';

// A frame of Gaussian spots (σ 1.5 px, 4000 counts) on a background of 20 with noise σ 2.
function field(seed: number) {
  const n = 300, g = 12, pitch = n / g;
  const rng = createRng(seed);
  const cx: number[] = [], cy: number[] = [];
  const img = createImage(n, n);
  img.data.fill(20);
  for (let j = 0; j < g; j++) {
    for (let i = 0; i < g; i++) {
      const x0 = (i + 0.5) * pitch + rng.uniform(-3, 3), y0 = (j + 0.5) * pitch + rng.uniform(-3, 3);
      cx.push(x0);
      cy.push(y0);
      for (let v = Math.round(y0) - 7; v <= Math.round(y0) + 7; v++) {
        for (let u = Math.round(x0) - 7; u <= Math.round(x0) + 7; u++) {
          img.data[v * n + u]! += (4000 / (2 * Math.PI * 2.25)) * Math.exp(-((u - x0) ** 2 + (v - y0) ** 2) / 4.5);
        }
      }
    }
  }
  for (let k = 0; k < img.data.length; k++) img.data[k]! += rng.normal(0, 2);
  return { img, cx: Float64Array.from(cx), cy: Float64Array.from(cy) };
}

describe('detectSpots with search windows', () => {
  it('windows around the spots (moved by up to 2 px) find exactly what the whole-frame search finds', () => {
    const { img } = field(1);
    const full = detectSpots(img);
    expect(full.count).toBe(144);
    const rng = createRng(2);
    const x = full.x.map((v) => v + rng.uniform(-2, 2)), y = full.y.map((v) => v + rng.uniform(-2, 2));
    const win = detectSpots(img, { windows: { x, y, halfWidth: 10 } });
    expect(win.count).toBe(full.count);
    expect(win.rejected).toBe(0);
    // Same components, same order (row-major by first pixel), same centres to the bit.
    for (let k = 0; k < full.count; k++) {
      expect(win.x[k]).toBe(full.x[k]);
      expect(win.y[k]).toBe(full.y[k]);
      expect(win.flux[k]).toBe(full.flux[k]);
    }
  });

  it('a window that cuts a spot refuses it; spots outside every window are not seen', () => {
    const { img, cx, cy } = field(3);
    // Window 0: half-width 4 centred 5 px right of spot 0 (cuts it). Window 1: ±9 px on spot 1.
    const x = new Float64Array([cx[0]! + 5, cx[1]!]), y = new Float64Array([cy[0]!, cy[1]!]);
    const one = detectSpots(img, { windows: { x: x.subarray(0, 1), y: y.subarray(0, 1), halfWidth: 4 } });
    expect(one.count).toBe(0);
    expect(one.rejected).toBe(1);
    const both = detectSpots(img, { windows: { x, y, halfWidth: 9 } });
    expect(both.count).toBe(2);
    const cut = detectSpots(img, { windows: { x: Float64Array.of(cx[0]! + 5, cx[1]!), y, halfWidth: 4 } });
    // Spot 1 is whole in its ±4 px window only if its pixels above the threshold stay inside: either way, spot 0 never is.
    for (let k = 0; k < cut.count; k++) expect(Math.hypot(cut.x[k]! - cx[1]!, cut.y[k]! - cy[1]!)).toBeLessThan(0.2);
    expect(cut.rejected).toBeGreaterThanOrEqual(1);
  });

  it('refuses malformed windows', () => {
    const { img } = field(4);
    expect(() => detectSpots(img, { windows: { x: new Float64Array([1]), y: new Float64Array([NaN]), halfWidth: 3 } })).toThrow(MeniscusRangeError);
    expect(() => detectSpots(img, { windows: { x: new Float64Array([1]), y: new Float64Array([1]), halfWidth: 0 } })).toThrow(MeniscusRangeError);
  });
});
