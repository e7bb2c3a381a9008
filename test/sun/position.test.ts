import { describe, expect, it } from 'vitest';
import { MeniscusRangeError, MeniscusTypeError } from '../../src/core/index.js';
import {
  atmosphericRefraction,
  createCollimatedLight,
  createPointLight,
  createSunLight,
  SOLAR_RADIUS,
  ASTRONOMICAL_UNIT,
  sunEquatorial,
  sunPosition,
} from '../../src/sun/index.js';

const DEG = Math.PI / 180;

// NREL Solar Position Algorithm worked example: Reda, I. & Andreas, A. (2004), Solar
// Energy 76(5), 577-589; NREL/TP-560-34302 (2008), table A4.1/A5.1.
// 2003-10-17 12:30:30 local time, UTC-7; lat 39.742476, lon -105.1786, elevation
// 1830.14 m, pressure 820 mbar, temperature 11 °C, ΔT 67 s.
const SPA_TIME = Date.UTC(2003, 9, 17, 19, 30, 30);
const SPA_SITE = { latitudeDeg: 39.742476, longitudeDeg: -105.1786, height: 1830.14 };

describe('sunPosition against the NREL SPA worked example (Reda & Andreas 2004)', () => {
  it('topocentric zenith 50.11162° and azimuth 194.34024° within 0.001°, ΔT 67 s', () => {
    const s = sunPosition(SPA_TIME, SPA_SITE, { pressureHPa: 820, temperatureC: 11, deltaTSeconds: 67 });
    expect(s.status).toBe('ok');
    expect(Math.abs(s.zenith / DEG - 50.11162)).toBeLessThan(0.001);
    expect(Math.abs(s.azimuth / DEG - 194.34024)).toBeLessThan(0.001);
    expect(s.deltaTSeconds).toBeCloseTo(67, 6);
  });

  it("with astronomy-engine's own ΔT model (≈ 64.5 s in 2003) the result moves by < 1e-5°", () => {
    const a = sunPosition(SPA_TIME, SPA_SITE, { pressureHPa: 820, temperatureC: 11, deltaTSeconds: 67 });
    const b = sunPosition(SPA_TIME, SPA_SITE, { pressureHPa: 820, temperatureC: 11 });
    expect(b.deltaTSeconds).toBeGreaterThan(63);
    expect(b.deltaTSeconds).toBeLessThan(66);
    expect(Math.abs(a.zenith - b.zenith) / DEG).toBeLessThan(1e-5);
    expect(Math.abs(a.azimuth - b.azimuth) / DEG).toBeLessThan(1e-5);
  });

  it('SPA intermediate values (from memory): geocentric RA 202.22741°, dec −9.31434°', () => {
    // Reda & Andreas (2004) table A5.1 lists α = 202.22741°, δ = −9.31434° (values
    // from memory; tolerance 0.001° ≈ 3.6″ to allow for a slip in memory of the last digit).
    const eq = sunEquatorial(SPA_TIME, { deltaTSeconds: 67 });
    expect(Math.abs(eq.rightAscension / DEG - 202.22741)).toBeLessThan(0.001);
    expect(Math.abs(eq.declination / DEG - -9.31434)).toBeLessThan(0.001);
  });

  it('refraction off gives the geometric zenith; the SPA refraction at that altitude is ≈ 0.0164°', () => {
    const on = sunPosition(SPA_TIME, SPA_SITE, { pressureHPa: 820, temperatureC: 11, deltaTSeconds: 67 });
    const off = sunPosition(SPA_TIME, SPA_SITE, { refraction: false, deltaTSeconds: 67 });
    expect(off.refraction).toBe(0);
    expect(off.elevation).toBeCloseTo(on.trueElevation, 12);
    // Formula check (Reda & Andreas 2004, eq. 42, evaluated by hand at h = 39.8883°):
    // (820/1010)(283/284)·1.02/(60 tan(39.8883 + 10.3/45.0)) ≈ 0.01637°.
    expect(on.refraction / DEG).toBeCloseTo(0.01637, 4);
  });
});

describe('sunEquatorial against Meeus, Astronomical Algorithms (1998), example 25.b', () => {
  it('1992-10-13 0h TD: α = 13h13m30.749s, δ = −7°47′01.74″ (values from memory)', () => {
    // Meeus example 25.b (the full VSOP87 method): apparent α 13h13m30.749s and
    // δ −7°47'01.74", R = 0.99760775 AU — quoted from memory. The 0h TD instant is
    // reached by passing UT = TD − ΔT with that ΔT. Tolerance 2″ (about 3× the observed
    // difference, which includes FK5 and light-time details of the two theories).
    const deltaT = 59;
    const eq = sunEquatorial(Date.UTC(1992, 9, 13) - deltaT * 1000, { deltaTSeconds: deltaT });
    const raSec = ((eq.rightAscension / (2 * Math.PI)) * 86400) - (13 * 3600 + 13 * 60 + 30.749);
    const decArcsec = eq.declination / DEG * 3600 + (7 * 3600 + 47 * 60 + 1.74);
    expect(Math.abs(raSec * 15)).toBeLessThan(2); // arcsec of RA
    expect(Math.abs(decArcsec)).toBeLessThan(2);
    expect(Math.abs(eq.distance / ASTRONOMICAL_UNIT - 0.99760775)).toBeLessThan(1e-5);
  });

  it('agrees with the low-accuracy example 25.a (α 13h13m31.4s, δ −7°47′06″, from memory) within its stated 0.01°', () => {
    const eq = sunEquatorial(Date.UTC(1992, 9, 13) - 59000, { deltaTSeconds: 59 });
    expect(Math.abs(eq.rightAscension / DEG - (13 + 13 / 60 + 31.4 / 3600) * 15)).toBeLessThan(0.01);
    expect(Math.abs(eq.declination / DEG + (7 + 47 / 60 + 6 / 3600))).toBeLessThan(0.01);
  });
});

describe('the solar disc', () => {
  it('mean apparent diameter ≈ 0.533° (IAU 2015 Resolution B3 nominal radius at 1 au)', () => {
    // 2 asin(695 700 km / 1 au) = 0.53300°. Over a year the distance varies ±1.7 %.
    expect(2 * Math.asin(SOLAR_RADIUS / ASTRONOMICAL_UNIT) / DEG).toBeCloseTo(0.533, 3);
    let sum = 0;
    const days = 365;
    for (let d = 0; d < days; d++) {
      const s = sunPosition(Date.UTC(2021, 0, 1) + d * 86400e3, { latitudeDeg: 0, longitudeDeg: 0 });
      sum += 2 * s.angularRadius;
    }
    expect(sum / days / DEG).toBeCloseTo(0.533, 3);
  });

  it('is largest near perihelion (early January) and smallest near aphelion (early July) — common practice', () => {
    const jan = sunPosition(Date.UTC(2022, 0, 4), { latitudeDeg: 0, longitudeDeg: 0 });
    const jul = sunPosition(Date.UTC(2022, 6, 4), { latitudeDeg: 0, longitudeDeg: 0 });
    expect(jan.angularRadius).toBeGreaterThan(jul.angularRadius);
    expect(jan.distance / ASTRONOMICAL_UNIT).toBeCloseTo(0.9833, 3);
    expect(jul.distance / ASTRONOMICAL_UNIT).toBeCloseTo(1.0167, 3);
  });
});

describe('sunPosition geometry', () => {
  it('toSun is the unit ENU vector of azimuth and elevation', () => {
    const s = sunPosition(Date.UTC(2024, 2, 20, 9), { latitudeDeg: 45, longitudeDeg: 0 });
    expect(Math.hypot(...s.toSun)).toBeCloseTo(1, 14);
    expect(Math.atan2(s.toSun[0], s.toSun[1])).toBeCloseTo(s.azimuth > Math.PI ? s.azimuth - 2 * Math.PI : s.azimuth, 12);
    expect(Math.asin(s.toSun[2])).toBeCloseTo(s.elevation, 12);
    expect(s.zenith + s.elevation).toBeCloseTo(Math.PI / 2, 14);
    expect(s.toSun[0]).toBeGreaterThan(0); // morning: the sun is in the east
  });

  it('at an equinox noon on the equator the sun is near the zenith (declination ≈ 0 — common practice)', () => {
    // 2024 March equinox 03:06 UTC; solar noon at longitude 0 is about 12:07 UTC.
    const s = sunPosition(Date.UTC(2024, 2, 20, 12, 7), { latitudeDeg: 0, longitudeDeg: 0 }, { refraction: false });
    expect(s.zenith / DEG).toBeLessThan(0.5);
  });

  it('night is a status, not an error', () => {
    const s = sunPosition(Date.UTC(2024, 5, 21, 0), { latitudeDeg: 50, longitudeDeg: 0 });
    expect(s.status).toBe('belowHorizon');
    expect(s.elevation).toBeLessThan(0);
    expect(s.refraction).toBe(0); // far below the horizon: no refraction (SPA rule)
    const light = createSunLight(Date.UTC(2024, 5, 21, 0), { latitudeDeg: 50, longitudeDeg: 0 });
    expect(light.position.status).toBe('belowHorizon');
  });

  it('refraction at the horizon is about 0.5° for the standard atmosphere (Sæmundsson 1986; common practice ≈ 34′)', () => {
    const r = atmosphericRefraction(0, 1010, 10) / DEG;
    expect(r).toBeGreaterThan(0.45);
    expect(r).toBeLessThan(0.5);
    // Scales with P and 1/(273 + T).
    expect(atmosphericRefraction(0.3, 505, 10) / atmosphericRefraction(0.3, 1010, 10)).toBeCloseTo(0.5, 12);
    expect(atmosphericRefraction(0.3, 1010, 10) / atmosphericRefraction(0.3, 1010, 30)).toBeCloseTo(303 / 283, 12);
    expect(atmosphericRefraction(-5 * DEG, 1010, 10)).toBe(0);
  });
});

describe('bad input', () => {
  it('latitude outside ±90°', () => {
    expect(() => sunPosition(SPA_TIME, { latitudeDeg: 91, longitudeDeg: 0 })).toThrow(MeniscusRangeError);
    expect(() => sunPosition(SPA_TIME, { latitudeDeg: NaN, longitudeDeg: 0 })).toThrow(/latitudeDeg/);
    expect(() => sunPosition(SPA_TIME, { latitudeDeg: 0, longitudeDeg: 181 })).toThrow(/longitudeDeg/);
  });
  it('invalid dates', () => {
    expect(() => sunPosition(new Date('not a date'), SPA_SITE)).toThrow(MeniscusRangeError);
    expect(() => sunPosition(NaN, SPA_SITE)).toThrow(/time/);
    expect(() => sunPosition('2024-01-01' as never, SPA_SITE)).toThrow(MeniscusTypeError);
  });
  it('non-finite parameters', () => {
    expect(() => sunPosition(SPA_TIME, { ...SPA_SITE, height: Infinity })).toThrow(/height/);
    expect(() => sunPosition(SPA_TIME, SPA_SITE, { pressureHPa: -1 })).toThrow(/pressureHPa/);
    expect(() => sunPosition(SPA_TIME, SPA_SITE, { temperatureC: -300 })).toThrow(/temperatureC/);
    expect(() => sunPosition(SPA_TIME, SPA_SITE, { deltaTSeconds: NaN })).toThrow(/deltaTSeconds/);
    expect(() => sunPosition(SPA_TIME, null as never)).toThrow(MeniscusTypeError);
  });
  it('inputs are not mutated', () => {
    const d = new Date(SPA_TIME);
    const site = { ...SPA_SITE };
    sunPosition(d, site);
    expect(d.getTime()).toBe(SPA_TIME);
    expect(site).toEqual(SPA_SITE);
  });
});

describe('guide lights', () => {
  it('sun: the same direction everywhere, the disc radius from sunPosition', () => {
    const sun = createSunLight(SPA_TIME, SPA_SITE, { pressureHPa: 820, temperatureC: 11 });
    expect(sun.kind).toBe('sun');
    expect(sun.toLight([0, 0, 0])).toEqual(sun.position.toSun);
    expect(sun.toLight([100, -50, 3])).toEqual(sun.position.toSun);
    expect(sun.angularRadius([1, 2, 3])).toBe(sun.position.angularRadius);
    const b = sun.toLightBatch(new Float64Array([0, 0, 0, 5, 5, 5]));
    expect(Array.from(b.subarray(3))).toEqual(sun.position.toSun);
    const v = sun.toLight([0, 0, 0]);
    v[0] = 99;
    expect(sun.toLight([0, 0, 0])[0]).not.toBe(99);
  });

  it('collimated lamp: normalised direction, fixed divergence', () => {
    const lamp = createCollimatedLight([0, 0, 2], 0.001);
    expect(lamp.toLight([3, 4, 5])).toEqual([0, 0, 1]);
    expect(lamp.angularRadius([0, 0, 0])).toBe(0.001);
    expect(() => createCollimatedLight([0, 0, 0])).toThrow(MeniscusRangeError);
    expect(() => createCollimatedLight([0, 0, 1], -1)).toThrow(/angularRadius/);
  });

  it('point lamp: direction from the point to the lamp; a sphere subtends asin(r/d) (analytic)', () => {
    const lamp = createPointLight([0, 0, 2], 0.01);
    const d = lamp.toLight([2, 0, 0]);
    expect(d[0]).toBeCloseTo(-Math.SQRT1_2, 15);
    expect(d[2]).toBeCloseTo(Math.SQRT1_2, 15);
    expect(lamp.angularRadius([0, 0, 0])).toBeCloseTo(Math.asin(0.005), 15);
    const b = lamp.toLightBatch(new Float64Array([2, 0, 0, 0, 0, 1]));
    expect(b[0]).toBeCloseTo(-Math.SQRT1_2, 15);
    expect(Array.from(b.subarray(3))).toEqual([0, 0, 1]);
    expect(() => lamp.toLight([0, 0, 2])).toThrow(MeniscusRangeError);
    expect(() => lamp.angularRadius([0, 0, 2.001])).toThrow(MeniscusRangeError);
    expect(() => createPointLight([0, NaN, 0])).toThrow(MeniscusRangeError);
  });
});
