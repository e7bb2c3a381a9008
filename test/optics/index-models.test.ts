import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  airRefractiveIndex,
  airRelativeIndex,
  pureWaterDensity,
  seawaterRefractiveIndex,
  vacuumRelativeIndex,
  waterRefractiveIndex,
} from '../../src/optics/index.js';
import { expectError } from './helpers.js';

describe('IAPWS R9-97 refractive index of water', () => {
  it("the release's check value: 25 °C, 997.047435 kg/m³, 0.5893 µm → 1.33285819 (IAPWS R9-97)", () => {
    const n = waterRefractiveIndex(589.3, 25, { densityKgM3: 997.047435 });
    expect(n).toBeCloseTo(1.33285819, 8);
  });

  it('pure water at 20 °C, sodium D line, relative to air, is 1.33299 (handbook value, e.g. CRC Handbook; from memory)', () => {
    const nv = waterRefractiveIndex(589.3, 20);
    const na = airRelativeIndex(nv, 589.3, { temperatureC: 20 });
    expect(Math.abs(na - 1.33299)).toBeLessThan(2e-5);
  });

  it('dilute steam is close to 1 and the index falls with temperature (IAPWS R9-97 range)', () => {
    const steam = waterRefractiveIndex(589.3, 500, { densityKgM3: 1 });
    expect(steam).toBeGreaterThan(1);
    expect(steam).toBeLessThan(1.001);
    expect(waterRefractiveIndex(589.3, 30)).toBeLessThan(waterRefractiveIndex(589.3, 10));
    expect(waterRefractiveIndex(589.3, 20, { densityKgM3: 0 })).toBe(1);
  });

  it('refuses inputs outside its validity range unless extrapolating', () => {
    expectError(() => waterRefractiveIndex(150, 20), MeniscusRangeError, 'wavelengthNm');
    expectError(() => waterRefractiveIndex(1200, 20), MeniscusRangeError, 'wavelengthNm');
    expectError(() => waterRefractiveIndex(550, -20, { densityKgM3: 1000 }), MeniscusRangeError, 'temperatureC');
    expectError(() => waterRefractiveIndex(550, 600, { densityKgM3: 1 }), MeniscusRangeError, 'temperatureC');
    expectError(() => waterRefractiveIndex(550, 20, { densityKgM3: 1100 }), MeniscusRangeError, 'options.densityKgM3');
    // the density formula only covers 0–40 °C
    expectError(() => waterRefractiveIndex(550, 60), MeniscusRangeError, 'temperatureC');
    expectError(() => waterRefractiveIndex(NaN, 20), MeniscusRangeError, 'wavelengthNm');
    expectError(() => waterRefractiveIndex(550, 20, { extrapolate: 'yes' as unknown as boolean }), MeniscusTypeError, 'options.extrapolate');
    // with extrapolation the formula is evaluated (1.2 µm lies beyond the 1.1 µm bound)
    const n = waterRefractiveIndex(1200, 20, { extrapolate: true });
    expect(n).toBeGreaterThan(1.3);
    expect(n).toBeLessThan(waterRefractiveIndex(1100, 20));
    // but a non-physical result is still refused
    expectError(() => waterRefractiveIndex(-5, 20, { extrapolate: true }), MeniscusRangeError, 'wavelengthNm');
  });
});

describe('Tanaka et al. (2001) density of pure water', () => {
  it('25 °C agrees with the IAPWS-95 density used in the IAPWS R9-97 check value, 997.047435 kg/m³, within 1e-3 kg/m³', () => {
    // Tanaka et al. quote agreement with IAPWS-95 at the part-per-million level
    expect(Math.abs(pureWaterDensity(25) - 997.047435)).toBeLessThan(1e-3);
  });

  it('maximum density 999.97495 kg/m³ at 3.983035 °C (Tanaka et al. 2001, the formula’s parameters a5 and −a1)', () => {
    expect(pureWaterDensity(3.983035)).toBeCloseTo(999.97495, 9);
    expect(pureWaterDensity(3.9)).toBeLessThan(pureWaterDensity(3.983035));
    expect(pureWaterDensity(4.1)).toBeLessThan(pureWaterDensity(3.983035));
  });

  it('20 °C is 998.2067 kg/m³ (Tanaka et al. 2001 table, from memory)', () => {
    expect(pureWaterDensity(20)).toBeCloseTo(998.2067, 4);
  });

  it('refuses temperatures outside 0–40 °C unless extrapolating', () => {
    expectError(() => pureWaterDensity(-1), MeniscusRangeError, 'temperatureC');
    expectError(() => pureWaterDensity(41), MeniscusRangeError, 'temperatureC');
    expectError(() => pureWaterDensity(Infinity), MeniscusRangeError, 'temperatureC');
    expect(pureWaterDensity(50, { extrapolate: true })).toBeCloseTo(988.0, 0);
  });
});

describe('Quan & Fry (1995) sea water', () => {
  it('the equation at points of its range (Quan & Fry 1995; values computed from the equation in the project references)', () => {
    expect(seawaterRefractiveIndex(589.3, 20, 0)).toBeCloseTo(1.333004, 6);
    expect(seawaterRefractiveIndex(589.3, 20, 35)).toBeCloseTo(1.339406, 6);
  });

  it('at salinity 0 it agrees with IAPWS R9-97 (converted to air with Birch & Downs) to the fourth decimal over 400–650 nm, 0–30 °C', () => {
    let worst = 0;
    for (let t = 0; t <= 30; t += 5) {
      for (let wl = 400; wl <= 650; wl += 50) {
        const iapws = airRelativeIndex(waterRefractiveIndex(wl, t), wl, { temperatureC: t });
        worst = Math.max(worst, Math.abs(seawaterRefractiveIndex(wl, t, 0) - iapws));
      }
    }
    expect(worst).toBeLessThan(1e-4);
  });

  it('salt raises the index and blue light is refracted more (common practice)', () => {
    expect(seawaterRefractiveIndex(550, 10, 35)).toBeGreaterThan(seawaterRefractiveIndex(550, 10, 0));
    expect(seawaterRefractiveIndex(400, 10, 35)).toBeGreaterThan(seawaterRefractiveIndex(700, 10, 35));
  });

  it('refuses inputs outside 400–700 nm, 0–30 °C, 0–35 ‰ unless extrapolating', () => {
    expectError(() => seawaterRefractiveIndex(380, 20, 35), MeniscusRangeError, 'wavelengthNm');
    expectError(() => seawaterRefractiveIndex(550, 31, 35), MeniscusRangeError, 'temperatureC');
    expectError(() => seawaterRefractiveIndex(550, 20, 40), MeniscusRangeError, 'salinityPsu');
    expectError(() => seawaterRefractiveIndex(550, 20, -1, { extrapolate: true }), MeniscusRangeError, 'salinityPsu');
    expectError(() => seawaterRefractiveIndex(0, 20, 35, { extrapolate: true }), MeniscusRangeError, 'wavelengthNm');
    expect(seawaterRefractiveIndex(550, 32, 38, { extrapolate: true })).toBeGreaterThan(1.33);
  });
});

describe('Edlén / Birch & Downs index of air', () => {
  it('dry air at 0 °C, 1013.25 hPa, sodium D line is 1.000293 (handbook value for air at STP; common practice)', () => {
    expect(Math.abs(airRefractiveIndex(589.3, { temperatureC: 0 }) - 1.000293)).toBeLessThan(1e-6);
  });

  it('dry air at 20 °C, 1013.25 hPa, 633 nm: n − 1 = 2.7180e-4 (NIST modified-Edlén calculator example; from memory)', () => {
    expect(airRefractiveIndex(633, { temperatureC: 20 }) - 1).toBeCloseTo(2.718e-4, 8);
  });

  it('the temperature–pressure factor is 1 at the standard state 15 °C, 101 325 Pa (Birch & Downs 1993, by construction)', () => {
    const s2 = (1000 / 500) ** 2;
    const ns = (8342.54 + 2406147 / (130 - s2) + 15998 / (38.9 - s2)) * 1e-8;
    expect(Math.abs(airRefractiveIndex(500) - 1 - ns) / ns).toBeLessThan(2e-5);
  });

  it('water vapour lowers the index, pressure raises it, and the conversions invert each other', () => {
    expect(airRefractiveIndex(550, { waterVapourHPa: 15 })).toBeLessThan(airRefractiveIndex(550));
    expect(airRefractiveIndex(550, { pressureHPa: 1100 })).toBeGreaterThan(airRefractiveIndex(550));
    const nv = 1.3344;
    expect(vacuumRelativeIndex(airRelativeIndex(nv, 550), 550)).toBeCloseTo(nv, 14);
  });

  it('refuses out-of-range inputs unless extrapolating', () => {
    expectError(() => airRefractiveIndex(700), MeniscusRangeError, 'wavelengthNm');
    expectError(() => airRefractiveIndex(550, { temperatureC: 120 }), MeniscusRangeError, 'options.temperatureC');
    expectError(() => airRefractiveIndex(550, { pressureHPa: 500 }), MeniscusRangeError, 'options.pressureHPa');
    expectError(() => airRefractiveIndex(550, { waterVapourHPa: -1 }), MeniscusRangeError, 'options.waterVapourHPa');
    expectError(() => airRefractiveIndex(150, { extrapolate: true }), MeniscusRangeError, 'wavelengthNm');
    expectError(() => airRelativeIndex(0, 550), MeniscusRangeError, 'nVacuum');
    expectError(() => vacuumRelativeIndex(1.33, 550, null as unknown as undefined), MeniscusTypeError, 'options');
    expect(airRefractiveIndex(1000, { extrapolate: true })).toBeGreaterThan(1.00027);
  });

  it('does not mutate its options', () => {
    const o = Object.freeze({ temperatureC: 20, pressureHPa: 1000, waterVapourHPa: 10 });
    expect(() => airRefractiveIndex(550, o)).not.toThrow();
    expect(o).toEqual({ temperatureC: 20, pressureHPa: 1000, waterVapourHPa: 10 });
  });
});
