/**
 * The sun's position for a UTC time and a site on the Earth, built on astronomy-engine's
 * planetary theory: topocentric zenith and azimuth, the unit `toSun` vector in the local
 * east-north-up frame, the distance and the apparent angular radius of the disc, with
 * atmospheric refraction off or scaled by pressure and temperature.
 *
 * @module
 */
import * as Astronomy from 'astronomy-engine';
import {
  checkBoolean,
  checkFinite,
  checkInRange,
  checkOptions,
  checkPositive,
  rangeError,
  typeError,
} from '../core/index.js';
import type { MutableVec3 } from '../core/index.js';

const DEG = Math.PI / 180;

/** The IAU 2015 nominal solar radius (Resolution B3), metres. */
export const SOLAR_RADIUS = 6.957e8;

/** The astronomical unit (IAU 2012 Resolution B2), metres. */
export const ASTRONOMICAL_UNIT = 149_597_870_700;

/**
 * Where the observer stands: geodetic latitude and longitude on the WGS-84 ellipsoid (as
 * astronomy-engine models the Earth) and the height above sea level.
 */
export interface Site {
  /** Geodetic latitude, degrees north, in [−90, 90]. */
  readonly latitudeDeg: number;
  /** Longitude, degrees east of Greenwich, in [−180, 180]. */
  readonly longitudeDeg: number;
  /** Height above sea level, metres. @defaultValue 0 */
  readonly height?: number;
}

/** A UTC instant: a `Date` or milliseconds since the Unix epoch. */
export type TimeInput = Date | number;

/** Options of {@link sunPosition}. */
export interface SunPositionOptions {
  /**
   * Apply atmospheric refraction to the altitude (the formula of {@link atmosphericRefraction}).
   * @defaultValue true
   */
  refraction?: boolean;
  /** Air pressure at the site, hPa (= mbar), for refraction. @defaultValue 1010 */
  pressureHPa?: number;
  /** Air temperature at the site, °C, for refraction. @defaultValue 10 */
  temperatureC?: number;
  /**
   * ΔT = TT − UT, seconds. When omitted, astronomy-engine's own model is used (the
   * Espenak–Meeus polynomials: about 64.5 s in 2003, 69 s in 2020). ΔT only moves the
   * sun along its orbit (about 0.04″ per second of ΔT), not the Earth's rotation angle,
   * which follows UT.
   */
  deltaTSeconds?: number;
}

/** The sun as seen from a site at an instant. All angles are radians. */
export interface SunPosition {
  /** `'belowHorizon'` when the centre of the disc is below the horizon (after refraction when on). */
  readonly status: 'ok' | 'belowHorizon';
  /** Topocentric zenith angle of the disc centre, radians, in [0, π] (refracted when on). */
  readonly zenith: number;
  /** Topocentric azimuth, radians, clockwise from north (east = π/2), in [0, 2π). */
  readonly azimuth: number;
  /** Apparent elevation above the horizon, radians (π/2 − zenith). */
  readonly elevation: number;
  /** The geometric (unrefracted) elevation, radians. */
  readonly trueElevation: number;
  /** The refraction added to the elevation, radians (0 when off). */
  readonly refraction: number;
  /** Unit vector from the site towards the sun, local east-north-up. */
  readonly toSun: MutableVec3;
  /** Topocentric distance from the site to the sun's centre, metres. */
  readonly distance: number;
  /** Apparent angular radius of the disc, radians: asin(SOLAR_RADIUS / distance). */
  readonly angularRadius: number;
  /** Topocentric apparent right ascension of date, radians, in [0, 2π). */
  readonly rightAscension: number;
  /** Topocentric apparent declination of date, radians. */
  readonly declination: number;
  /** The ΔT = TT − UT used, seconds. */
  readonly deltaTSeconds: number;
}

/** The sun's apparent equatorial coordinates of date. */
export interface SunEquatorial {
  /** Apparent right ascension of date (true equator and equinox), radians, in [0, 2π). */
  readonly rightAscension: number;
  /** Apparent declination of date, radians. */
  readonly declination: number;
  /** Distance to the sun's centre, metres (from the Earth's centre, or the site when one is given). */
  readonly distance: number;
}

/** Options of {@link sunEquatorial}. */
export interface SunEquatorialOptions {
  /** Observe from this site (topocentric); omitted: from the Earth's centre (geocentric). */
  site?: Site;
  /** ΔT = TT − UT, seconds; see {@link SunPositionOptions.deltaTSeconds}. */
  deltaTSeconds?: number;
}

/**
 * Check a site at a public boundary.
 *
 * @param fn - The public function's name.
 * @param site - The site.
 * @param parameter - The parameter's name. @defaultValue "site"
 * @returns The site with its height filled in.
 * @throws {@link core!MeniscusRangeError} or {@link core!MeniscusTypeError} for a latitude outside
 *   [−90, 90], a longitude outside [−180, 180] or a non-finite height.
 * @example
 * ```ts
 * checkSite('mine', { latitudeDeg: 45, longitudeDeg: 7 }); // { …, height: 0 }
 * ```
 */
export function checkSite(fn: string, site: unknown, parameter = 'site'): Required<Site> {
  if (site === null || typeof site !== 'object') {
    typeError(fn, parameter, site, 'an object { latitudeDeg, longitudeDeg, height? }');
  }
  const s = site as Site;
  const latitudeDeg = checkInRange(fn, `${parameter}.latitudeDeg`, s.latitudeDeg, -90, 90);
  const longitudeDeg = checkInRange(fn, `${parameter}.longitudeDeg`, s.longitudeDeg, -180, 180);
  const height = s.height === undefined ? 0 : checkFinite(fn, `${parameter}.height`, s.height);
  return { latitudeDeg, longitudeDeg, height };
}

/**
 * Check a time at a public boundary.
 *
 * @param fn - The public function's name.
 * @param time - A `Date` or milliseconds since the Unix epoch (UTC).
 * @param parameter - The parameter's name. @defaultValue "time"
 * @returns The time as a `Date` (a new object).
 * @throws {@link core!MeniscusRangeError} for an invalid `Date` or a non-finite number;
 *   {@link core!MeniscusTypeError} for anything else.
 * @example
 * ```ts
 * checkTime('mine', Date.UTC(2024, 5, 21)); // a Date
 * ```
 */
export function checkTime(fn: string, time: unknown, parameter = 'time'): Date {
  if (time instanceof Date) {
    if (!Number.isFinite(time.getTime())) rangeError(fn, parameter, time, 'a valid Date');
    return new Date(time.getTime());
  }
  if (typeof time === 'number') {
    if (!Number.isFinite(time) || Math.abs(time) > 8.64e15) {
      rangeError(fn, parameter, time, 'a finite number of milliseconds since 1970-01-01T00:00:00Z');
    }
    return new Date(time);
  }
  return typeError(fn, parameter, time, 'a Date or milliseconds since the Unix epoch');
}

/**
 * Atmospheric refraction of the sun's altitude in the form used by the NREL Solar
 * Position Algorithm: Sæmundsson's formula scaled by pressure and temperature,
 * Δ = (P/1010)(283/(273 + T)) · 1.02 / (60 tan(h + 10.3/(h + 5.11))) degrees, with h
 * the true altitude in degrees. As in the algorithm, no refraction is applied when the
 * true altitude is below −(angular radius + 0.5667°) (the sun is then well below the
 * apparent horizon).
 *
 * @param trueElevation - Geometric elevation, radians.
 * @param pressureHPa - Pressure, hPa (> 0).
 * @param temperatureC - Temperature, °C (> −273).
 * @param angularRadius - The disc's angular radius, radians, for the cut-off. @defaultValue 0.26667°
 * @returns The refraction to add to the elevation, radians (≥ 0).
 * @throws {@link core!MeniscusRangeError} for non-finite input, a pressure ≤ 0 or a temperature ≤ −273 °C.
 * @see Sæmundsson, Þ. (1986), "Atmospheric refraction", Sky and Telescope 72, 70.
 * @see Reda, I. & Andreas, A. (2004), "Solar position algorithm for solar radiation
 *   applications", Solar Energy 76(5), 577–589, eq. 42.
 * @example
 * ```ts
 * atmosphericRefraction(0, 1010, 10) * 180 / Math.PI; // ≈ 0.48° at the horizon
 * ```
 */
export function atmosphericRefraction(
  trueElevation: number,
  pressureHPa: number,
  temperatureC: number,
  angularRadius = 0.26667 * DEG,
): number {
  const fn = 'atmosphericRefraction';
  checkFinite(fn, 'trueElevation', trueElevation);
  checkPositive(fn, 'pressureHPa', pressureHPa);
  checkFinite(fn, 'temperatureC', temperatureC);
  if (!(temperatureC > -273)) rangeError(fn, 'temperatureC', temperatureC, 'a temperature above −273 °C');
  checkFinite(fn, 'angularRadius', angularRadius);
  return refractionKernel(trueElevation / DEG, pressureHPa, temperatureC, angularRadius / DEG) * DEG;
}

function refractionKernel(hDeg: number, p: number, t: number, radiusDeg: number): number {
  if (hDeg < -(radiusDeg + 0.5667)) return 0;
  return ((p / 1010) * (283 / (273 + t)) * 1.02) / (60 * Math.tan((hDeg + 10.3 / (hDeg + 5.11)) * DEG));
}

function makeTime(date: Date, deltaTSeconds: number | undefined): Astronomy.AstroTime {
  const t = new Astronomy.AstroTime(date);
  if (deltaTSeconds !== undefined) t.tt = t.ut + deltaTSeconds / 86400;
  return t;
}

function wrap2Pi(a: number): number {
  const r = a % (2 * Math.PI);
  return r < 0 ? r + 2 * Math.PI : r;
}

/**
 * The sun's apparent position seen from a site: topocentric zenith angle and azimuth,
 * the `toSun` unit vector in east-north-up, distance and angular radius of the disc.
 * Apparent means corrected for light time, aberration, precession and nutation (the
 * planetary theory is astronomy-engine's VSOP87 series), and for the site's parallax.
 * Atmospheric refraction, when on, is {@link atmosphericRefraction}.
 *
 * A sun below the horizon is not an error: the result's `status` is `'belowHorizon'`
 * and its angles and vector are still filled in.
 *
 * @param time - UTC instant, a `Date` or milliseconds since the Unix epoch.
 * @param site - The observer's latitude, longitude and height.
 * @param options - Refraction and ΔT.
 * @returns The position.
 * @throws {@link core!MeniscusRangeError} for an invalid date, a latitude outside [−90, 90], a
 *   longitude outside [−180, 180], a non-finite height, pressure ≤ 0, temperature ≤ −273 °C
 *   or a non-finite ΔT; {@link core!MeniscusTypeError} for arguments of the wrong type.
 * @see Reda, I. & Andreas, A. (2004), "Solar position algorithm for solar radiation
 *   applications", Solar Energy 76(5), 577–589 (the refraction model and its worked example).
 * @see Bretagnon, P. & Francou, G. (1988), "Planetary theories in rectangular and
 *   spherical variables: VSOP87 solutions", Astronomy and Astrophysics 202, 309 (as used by astronomy-engine).
 * @example
 * ```ts
 * const sun = sunPosition(new Date('2024-06-21T12:00:00Z'), { latitudeDeg: 48.2, longitudeDeg: -4.5 });
 * sun.status;              // 'ok'
 * sun.zenith * 180 / Math.PI;
 * sun.toSun;               // [east, north, up]
 * ```
 */
export function sunPosition(time: TimeInput, site: Site, options?: SunPositionOptions): SunPosition {
  const fn = 'sunPosition';
  const date = checkTime(fn, time);
  const s = checkSite(fn, site);
  const o = checkOptions(fn, options);
  const refraction = o.refraction === undefined ? true : checkBoolean(fn, 'options.refraction', o.refraction);
  const pressureHPa = o.pressureHPa === undefined ? 1010 : checkPositive(fn, 'options.pressureHPa', o.pressureHPa);
  const temperatureC = o.temperatureC === undefined ? 10 : checkFinite(fn, 'options.temperatureC', o.temperatureC);
  if (!(temperatureC > -273)) rangeError(fn, 'options.temperatureC', temperatureC, 'a temperature above −273 °C');
  const deltaT = o.deltaTSeconds === undefined ? undefined : checkFinite(fn, 'options.deltaTSeconds', o.deltaTSeconds);

  const t = makeTime(date, deltaT);
  const observer = new Astronomy.Observer(s.latitudeDeg, s.longitudeDeg, s.height);
  const eq = Astronomy.Equator(Astronomy.Body.Sun, t, observer, true, true);
  const hor = Astronomy.Horizon(t, observer, eq.ra, eq.dec);
  const distance = eq.dist * ASTRONOMICAL_UNIT;
  const angularRadius = Math.asin(SOLAR_RADIUS / distance);
  const hTrue = hor.altitude;
  const dh = refraction ? refractionKernel(hTrue, pressureHPa, temperatureC, angularRadius / DEG) : 0;
  const hApp = hTrue + dh;
  const elevation = hApp * DEG;
  const azimuth = wrap2Pi(hor.azimuth * DEG);
  const ce = Math.cos(elevation);
  const toSun: MutableVec3 = [Math.sin(azimuth) * ce, Math.cos(azimuth) * ce, Math.sin(elevation)];
  return {
    status: elevation < 0 ? 'belowHorizon' : 'ok',
    zenith: Math.PI / 2 - elevation,
    azimuth,
    elevation,
    trueElevation: hTrue * DEG,
    refraction: dh * DEG,
    toSun,
    distance,
    angularRadius,
    rightAscension: wrap2Pi(eq.ra * 15 * DEG),
    declination: eq.dec * DEG,
    deltaTSeconds: (t.tt - t.ut) * 86400,
  };
}

/**
 * The sun's apparent right ascension and declination of date (true equator and
 * equinox, corrected for light time, aberration and nutation), geocentric or, given a
 * site, topocentric.
 *
 * @param time - UTC instant, a `Date` or milliseconds since the Unix epoch.
 * @param options - Site and ΔT.
 * @returns Right ascension, declination (radians) and distance (metres).
 * @throws {@link core!MeniscusRangeError} for an invalid date, a bad site or a non-finite ΔT.
 * @see Meeus, J. (1998), Astronomical Algorithms, 2nd ed., Willmann-Bell, chapter 25
 *   ("Solar coordinates").
 * @example
 * ```ts
 * const eq = sunEquatorial(new Date('1992-10-13T00:00:00Z'));
 * eq.rightAscension * 12 / Math.PI; // hours
 * ```
 */
export function sunEquatorial(time: TimeInput, options?: SunEquatorialOptions): SunEquatorial {
  const fn = 'sunEquatorial';
  const date = checkTime(fn, time);
  const o = checkOptions(fn, options);
  const deltaT = o.deltaTSeconds === undefined ? undefined : checkFinite(fn, 'options.deltaTSeconds', o.deltaTSeconds);
  const t = makeTime(date, deltaT);
  if (o.site !== undefined) {
    const s = checkSite(fn, o.site, 'options.site');
    const eq = Astronomy.Equator(Astronomy.Body.Sun, t, new Astronomy.Observer(s.latitudeDeg, s.longitudeDeg, s.height), true, true);
    return { rightAscension: wrap2Pi(eq.ra * 15 * DEG), declination: eq.dec * DEG, distance: eq.dist * ASTRONOMICAL_UNIT };
  }
  const g = Astronomy.GeoVector(Astronomy.Body.Sun, t, true);
  const v = Astronomy.RotateVector(Astronomy.Rotation_EQJ_EQD(t), g);
  const sph = Astronomy.SphereFromVector(v);
  return { rightAscension: wrap2Pi(sph.lon * DEG), declination: sph.lat * DEG, distance: sph.dist * ASTRONOMICAL_UNIT };
}
