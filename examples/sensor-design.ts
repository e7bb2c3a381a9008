/**
 * The design calculator on an invented sensor: a slope sensor for the wind-wave tank of
 * an imaginary coastal laboratory, a hexagonal pinhole mask 40 cm below the still water,
 * lit by the sun and watched by a camera looking at a diffuser.
 *
 *   npx tsx examples/sensor-design.ts
 */
import { pathToFileURL } from 'node:url';
import { designSensor, formatSensorDesign } from '../src/sensor/index.js';
import type { SensorDesignInput } from '../src/sensor/index.js';

/** The design budget and warnings for the invented tank sensor (and a too-ambitious variant). */
export function sensorDesignReport(): string {
  const tank: SensorDesignInput = {
    lattice: 'hexagonal',
    pitch: 0.008, // 8 mm between pinholes
    apertureDiameter: 0.0008, // 0.8 mm pinholes
    planeDistance: 0.04, // diffuser 4 cm below the mask
    maskDepth: 0.4,
    sourceAngularRadius: 0.00465, // the sun
    sourceZenith: (35 * Math.PI) / 180,
    wavelengthNm: 550,
    pixelSize: 0.2e-3, // the camera sees 0.2 mm of diffuser per pixel
    centroidPrecision: 0.05,
    diffuserBlur: 0.1e-3,
    // Short wind waves at a fetch of a few metres: mean-square slope 0.01, shortest 5 cm.
    sea: { meanSquareSlope: 0.01, shortestWavelength: 0.05, significantWaveHeight: 0.03 },
  };
  const lines = ['Wind-wave tank slope sensor (invented design)', '', formatSensorDesign(designSensor(tank)), ''];
  const steep = { ...tank, planeDistance: 0.15, pitch: 0.03, sea: { meanSquareSlope: 0.04, shortestWavelength: 0.04, significantWaveHeight: 0.5 } };
  lines.push('Same tank, a longer throw and coarser pitch, in a storm run:', '', formatSensorDesign(designSensor(steep)));
  return lines.join('\n');
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  console.log(sensorDesignReport());
}
