/**
 * Guide lights and frames: the sun's position from time and place (astronomy-engine),
 * collimated and point lamps behind one small interface, platform attitude (heading,
 * pitch, roll and quaternions), east-north-up ↔ platform ↔ camera frames, and the
 * light's direction inside the water.
 *
 * @module sun
 */
export * from './position.js';
export * from './guide-light.js';
export * from './attitude.js';
export * from './frames.js';
