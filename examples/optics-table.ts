/**
 * Light through a flat water surface: refraction angle and Fresnel transmittance across
 * incidence angles and wavelengths, for fresh water (IAPWS R9-97 at 20 °C) and for sea
 * water (Quan & Fry, 35 ‰, 20 °C), with the critical angle, Snell's window and Brewster's
 * angle. A worked table for an invented wave-tank lab at 20 °C.
 *
 *   npx tsx examples/optics-table.ts
 */
import { pathToFileURL } from 'node:url';
import {
  airRelativeIndex,
  brewsterAngle,
  criticalAngle,
  fresnelTransmittance,
  refract,
  seawaterRefractiveIndex,
  snellWindowHalfAngle,
  vacuumRelativeIndex,
  waterRefractiveIndex,
} from '../src/optics/index.js';

const DEG = 180 / Math.PI;
const WAVELENGTHS_NM = [450, 550, 650] as const;
const ANGLES_DEG = [0, 10, 20, 30, 40, 50, 60, 70, 75, 80, 85, 89] as const;
const TEMPERATURE_C = 20;
const SALINITY = 35;

interface Medium {
  label: string;
  wavelengthNm: number;
  /** Index relative to the air above (air at 20 °C, 1013.25 hPa, dry). */
  n: number;
}

/** Refraction angle (degrees from the nadir) and unpolarised transmittance, air → water. */
function through(angleDeg: number, n: number): { refractedDeg: number; transmittance: number } {
  const a = angleDeg / DEG;
  // light going down onto a level surface whose normal points up (+z)
  const t = refract([Math.sin(a), 0, -Math.cos(a)], [0, 0, 1], 1, n);
  if (t === null) throw new Error('no total internal reflection can occur going from air into water');
  return {
    refractedDeg: Math.atan2(Math.hypot(t[0], t[1]), -t[2]) * DEG,
    transmittance: fresnelTransmittance(Math.min(a, Math.PI / 2), 1, n).unpolarized,
  };
}

function pad(s: string, w: number, left = false): string {
  return left ? s.padEnd(w) : s.padStart(w);
}

/**
 * Build the table as text.
 *
 * @returns The formatted table (several blocks separated by blank lines).
 */
export function opticsTable(): string {
  const air = { temperatureC: TEMPERATURE_C };
  const media: Medium[] = [];
  const lines: string[] = [];
  lines.push(`Light through a flat water surface (air and water at ${TEMPERATURE_C} °C, 1013.25 hPa)`);
  lines.push('');
  lines.push('Refractive indices and special angles');
  const head1 = ['λ nm', 'medium', 'n vs vacuum', 'n vs air', 'critical ° (below)', "Snell's window ° (cone)", 'Brewster ° (above)'];
  const w1 = [6, 22, 12, 10, 18, 23, 18];
  lines.push(head1.map((h, k) => pad(h, w1[k]!, k === 1)).join(' '));
  lines.push(w1.map((w) => '-'.repeat(w)).join(' '));
  for (const wl of WAVELENGTHS_NM) {
    const fresh = waterRefractiveIndex(wl, TEMPERATURE_C);
    const freshAir = airRelativeIndex(fresh, wl, air);
    const seaAir = seawaterRefractiveIndex(wl, TEMPERATURE_C, SALINITY);
    const seaVac = vacuumRelativeIndex(seaAir, wl, air);
    media.push({ label: `fresh ${wl}`, wavelengthNm: wl, n: freshAir });
    media.push({ label: `sea ${wl}`, wavelengthNm: wl, n: seaAir });
    for (const [name, nv, na] of [
      ['fresh (IAPWS R9-97)', fresh, freshAir],
      [`sea ${SALINITY} ‰ (Quan & Fry)`, seaVac, seaAir],
    ] as const) {
      const crit = criticalAngle(na, 1)!;
      const cells = [
        String(wl),
        name,
        nv.toFixed(6),
        na.toFixed(6),
        (crit * DEG).toFixed(3),
        (snellWindowHalfAngle(na, 1) * DEG * 2).toFixed(2),
        (brewsterAngle(1, na) * DEG).toFixed(3),
      ];
      lines.push(cells.map((c, k) => pad(c, w1[k]!, k === 1)).join(' '));
    }
  }
  lines.push('');
  lines.push('From air into water: refraction angle θt (° from the nadir) and unpolarised transmittance T');
  const cols = media.map((m) => m.label);
  const head2 = ['θi °', ...cols.flatMap((c) => [`${c} θt`, 'T'])];
  const w2 = [5, ...cols.flatMap(() => [12, 6])];
  lines.push(head2.map((h, k) => pad(h, w2[k]!)).join(' '));
  lines.push(w2.map((w) => '-'.repeat(w)).join(' '));
  for (const a of ANGLES_DEG) {
    const cells = [String(a)];
    for (const m of media) {
      const r = through(a, m.n);
      cells.push(r.refractedDeg.toFixed(3), r.transmittance.toFixed(4));
    }
    lines.push(cells.map((c, k) => pad(c, w2[k]!)).join(' '));
  }
  lines.push('');
  lines.push(
    'Seen from below, the whole sky fits in Snell\'s window; beyond the critical angle the surface is a mirror (total internal reflection).',
  );
  return lines.join('\n');
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  console.log(opticsTable());
}
