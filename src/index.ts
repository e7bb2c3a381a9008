/**
 * meniscus: see through a moving water surface. This root entry re-exports every
 * platform-neutral area; each is also available as its own subpath
 * (`meniscus/core`, `meniscus/optics`, …). Node-only helpers live in `meniscus/node`.
 *
 * @module meniscus
 */
export * from './core/index.js';
export * from './optics/index.js';
export * from './sun/index.js';
export * from './camera/index.js';
export * from './integrate/index.js';
export * from './surface/index.js';
export * from './waves/index.js';
export * from './sensor/index.js';
export * from './imaging/index.js';
export * from './metrics/index.js';
export * from './pipeline/index.js';
export * from './viz/index.js';
