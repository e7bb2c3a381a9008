/**
 * The sun seen from a tilted research buoy over one summer day.
 *
 * The "Lanterna Deep" buoy (an invented mooring, about 300 km off an invented coast at
 * 44.37° N, 9.85° W) carries an upward-looking camera. For each hour (UTC) this prints the
 * sun's azimuth and elevation, the unit vector towards the sun in the buoy's own frame
 * (forward, starboard, down) and in the camera frame (x right, y down, z up the mast),
 * and the direction in which the sunlight travels below a calm surface.
 *
 * Run with: npx tsx examples/sun-platform.ts
 */
import {
  createSunLight,
  enuToCamera,
  enuToPlatform,
  MOUNT_LOOKING_UP,
  underwaterLightDirection,
} from '../src/sun/index.js';

const DEG = Math.PI / 180;
const site = { latitudeDeg: 44.37, longitudeDeg: -9.85, height: 2 };
// The buoy swings on its mooring: heading 37°, pitched 4° bow-up and rolled 6° to port.
const attitude = { heading: 37 * DEG, pitch: 4 * DEG, roll: -6 * DEG };
const atmosphere = { pressureHPa: 1018, temperatureC: 17 };

const f = (v: number, w = 7, d = 3): string => v.toFixed(d).padStart(w);
const vec = (v: readonly number[]): string => `[${v.map((x) => f(x, 6, 3)).join(',')}]`;

console.log('Lanterna Deep buoy, 2025-06-21 (UTC); heading 37°, pitch +4°, roll −6°\n');
console.log(
  'UTC    azimuth  elev.   toSun in buoy frame (F,S,D)  toSun in camera frame   off-axis  in-water dir (E,N,U)    nadir',
);
for (let hour = 4; hour <= 21; hour++) {
  const time = Date.UTC(2025, 5, 21, hour, 0, 0);
  const sun = createSunLight(time, site, atmosphere);
  const p = sun.position;
  const toSun = sun.toLight([0, 0, 0]);
  const inBuoy = enuToPlatform(attitude, toSun);
  const inCamera = enuToCamera(attitude, MOUNT_LOOKING_UP, toSun);
  const offAxis = Math.acos(Math.max(-1, Math.min(1, inCamera[2]))) / DEG;
  const water = underwaterLightDirection(toSun, { nWater: 1.339 });
  const hh = `${String(hour).padStart(2, '0')}:00`;
  const wcol = water ? `${vec(water)}  ${f(Math.acos(-water[2]) / DEG, 6, 2)}°` : '   (sun below the horizon)';
  console.log(
    `${hh}  ${f(p.azimuth / DEG)}° ${f(p.elevation / DEG, 6, 2)}°   ${vec(inBuoy)}    ${vec(inCamera)}  ${f(offAxis, 6, 1)}°   ${wcol}${p.status === 'belowHorizon' ? '  [below horizon]' : ''}`,
  );
}
console.log('\nSun disc radius at noon:', (createSunLight(Date.UTC(2025, 5, 21, 13), site).angularRadius([0, 0, 0]) / DEG).toFixed(4), '°');
