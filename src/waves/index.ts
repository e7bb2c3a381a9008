/**
 * Waves: dispersion of gravity–capillary waves, the surface tension of water, wave
 * spectra and directional spreading, spectral moments and mean-square slopes, random-sea
 * synthesis on a grid with time stepping, field statistics, and the Cox & Munk
 * slope model.
 *
 * @module waves
 */
export type { DispersionOptions, DispersionParameters, MinimumPhaseSpeed } from './dispersion.js';
export {
  STANDARD_GRAVITY,
  MAX_WAVENUMBER,
  surfaceTensionWater,
  dispersionParameters,
  angularFrequency,
  wavenumber,
  phaseSpeed,
  groupSpeed,
  minimumPhaseSpeed,
} from './dispersion.js';
export type { JonswapParameters, JonswapShape, JonswapPeakInputs, SpectralMoments } from './spectra.js';
export {
  piersonMoskowitzSpectrum,
  jonswapSpectrum,
  jonswapSpectrumFunction,
  jonswapPeakEnhancement,
  jonswapFromWind,
  jonswapFromPeak,
  spectralMoments,
} from './spectra.js';
export { cos2sNormalization, cos2sSpreading, cosSquaredSpreading, mitsuyasuExponent } from './spreading.js';
export type { SeaSpectrum, SeaMomentsOptions, SeaMoments } from './sea.js';
export { seaMoments } from './sea.js';
export type { RandomSeaOptions, SeaFrame, RandomSeaExpectation, RandomSea } from './synthesis.js';
export { prepareRandomSea, synthesizeSea, seaSurface } from './synthesis.js';
export type {
  SlopeStatisticsOptions,
  SlopeStatistics,
  CoxMunkOptions,
  CoxMunkSlopes,
} from './statistics.js';
export { significantWaveHeight, slopeStatistics, coxMunkMeanSquareSlope } from './statistics.js';
export type { SeaPreset } from './presets.js';
export { tankSeaPreset, harbourSeaPreset } from './presets.js';
