/**
 * Pictures of results (`meniscus/viz`, platform-neutral): colour-mapped height and error
 * maps as `Image`s with colour and scale bars, slope fields and slope histograms as SVG
 * strings, colour-map data, the sRGB transfer function and axis helpers.
 *
 * @module viz
 */
export * from './srgb.js';
export * from './colormap.js';
export * from './ticks.js';
export * from './map-image.js';
export * from './slope-field.js';
export * from './slope-histogram.js';
