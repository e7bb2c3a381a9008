/**
 * meniscus: see through a moving water surface. This root entry re-exports every
 * platform-neutral area; each is also available as its own subpath
 * (`meniscus/core`, `meniscus/optics`, …). Node-only helpers live in `meniscus/node`.
 *
 * @module meniscus
 */
export * from './core/index.js';
