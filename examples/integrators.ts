/**
 * Compare the integrators on one invented scene: the glass floor of a small ripple
 * tank (0.6 m × 0.4 m, slopes sampled every 2 mm) seen through a rounded footprint, with
 * a bubble stuck on the glass that hides an oval patch, light slope noise and a few
 * glints that spoil single samples.
 *
 *   npx tsx examples/integrators.ts
 *
 * The transform methods need a full rectangle, so they get the slopes with the holes
 * filled by zeros; every error is measured over the footprint only.
 */
import { createGrid, createRng } from '../src/core/index.js';
import { integrate, prepareIntegrator, type IntegrationMethod, type IntegrateOptions } from '../src/integrate/index.js';

const width = 300;
const height = 200;
const dx = 0.002; // m
const spec = { width, height, dx, x0: -0.3, y0: -0.2 };

// Ripples from a dipper at (−0.08, 0.03) m: h = A e^{−r/L} cos(k r), plus a slow tilt.
const A = 0.8e-3;
const L = 0.15;
const k = (2 * Math.PI) / 0.035; // 35 mm wavelength
const sx = -0.08;
const sy = 0.03;
function surface(x: number, y: number): { h: number; p: number; q: number } {
  const r = Math.hypot(x - sx, y - sy) + 1e-12;
  const e = Math.exp(-r / L);
  const h = A * e * Math.cos(k * r) + 2e-4 * x;
  const dhdr = A * e * (-Math.cos(k * r) / L - k * Math.sin(k * r));
  return { h, p: (dhdr * (x - sx)) / r + 2e-4, q: (dhdr * (y - sy)) / r };
}

const truth = createGrid(spec);
const p = createGrid(spec);
const q = createGrid(spec);
const mask = new Uint8Array(width * height);
const rng = createRng(2024);
for (let j = 0; j < height; j++) {
  for (let i = 0; i < width; i++) {
    const x = spec.x0 + i * dx;
    const y = spec.y0 + j * dx;
    const s = surface(x, y);
    const kk = j * width + i;
    truth.data[kk] = s.h;
    // rounded-rectangle footprint, minus an oval bubble at (0.12, −0.05)
    const inside = Math.max(Math.abs(x) - 0.25, 0) ** 2 + Math.max(Math.abs(y) - 0.15, 0) ** 2 <= 0.04 ** 2;
    const bubble = ((x - 0.12) / 0.04) ** 2 + ((y + 0.05) / 0.025) ** 2 <= 1;
    mask[kk] = inside && !bubble ? 1 : 0;
    p.data[kk] = mask[kk] ? s.p + rng.normal(0, 2e-4) : NaN;
    q.data[kk] = mask[kk] ? s.q + rng.normal(0, 2e-4) : NaN;
  }
}
// glints: 0.3 % of the samples get a slope error of ±0.05
for (let t = 0; t < 0.003 * width * height; t++) {
  const kk = rng.integer(width * height);
  if (mask[kk]) p.data[kk] = p.data[kk]! + (rng.random() < 0.5 ? -0.05 : 0.05);
}
const filledP = createGrid(spec, p.data.map((v) => (Number.isFinite(v) ? v : 0)));
const filledQ = createGrid(spec, q.data.map((v) => (Number.isFinite(v) ? v : 0)));

function rmsErrorMicrons(h: Float64Array): number {
  let mh = 0;
  let mt = 0;
  let c = 0;
  for (let kk = 0; kk < h.length; kk++) if (mask[kk]) {
    mh += h[kk]!;
    mt += truth.data[kk]!;
    c++;
  }
  mh /= c;
  mt /= c;
  let e = 0;
  for (let kk = 0; kk < h.length; kk++) if (mask[kk]) e += (h[kk]! - mh - (truth.data[kk]! - mt)) ** 2;
  return Math.sqrt(e / c) * 1e6;
}

interface Row {
  label: string;
  errorUm: number;
  ms: number;
  note: string;
}
const rows: Row[] = [];
function time<T>(f: () => T): [T, number] {
  f(); // warm-up
  const t0 = performance.now();
  const r = f();
  return [r, performance.now() - t0];
}
function run(label: string, method: IntegrationMethod, options: IntegrateOptions, filled = false): void {
  const [r, ms] = time(() => integrate(filled ? filledP : p, filled ? filledQ : q, { method, ...options }));
  const note = r.iterations > 0 ? `${r.iterations} iterations` : filled ? 'holes filled with 0' : '';
  rows.push({ label, errorUm: rmsErrorMicrons(r.height.data), ms, note });
}

run('frankot-chellappa', 'frankot-chellappa', {}, true);
run('dct-poisson', 'dct-poisson', {}, true);
run('least-squares', 'least-squares', { mask });
run('least-squares, Huber', 'least-squares', { mask, robust: 'huber' });
run('least-squares, Tukey', 'least-squares', { mask, robust: 'tukey' });
run('southwell', 'southwell', { mask });
run('legendre (order 12)', 'legendre', { mask, order: 12 });
{
  const solver = prepareIntegrator(spec, { method: 'least-squares', mask });
  const [r, ms] = time(() => solver.solve(p, q));
  rows.push({ label: 'least-squares, prepared', errorUm: rmsErrorMicrons(r.height.data), ms, note: `per frame after set-up, ${r.iterations} iterations` });
}

const head = ['method', 'RMS error (µm)', 'time (ms)', ''];
const body = rows.map((r) => [r.label, r.errorUm.toFixed(2), r.ms.toFixed(1), r.note]);
const widths = head.map((h, c) => Math.max(h.length, ...body.map((b) => b[c]!.length)));
const line = (cells: string[]) => cells.map((s, c) => (c === 0 || c === 3 ? s.padEnd(widths[c]!) : s.padStart(widths[c]!))).join('  ');
console.log(`ripple tank, ${width} × ${height} samples at ${dx * 1e3} mm, ${mask.reduce((a, v) => a + v, 0)} in the footprint; ripple amplitude ${A * 1e3} mm`);
console.log(line(head));
console.log(widths.map((w) => '-'.repeat(w)).join('  '));
for (const b of body) console.log(line(b));
