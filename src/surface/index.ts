/**
 * Surfaces: height fields sampled on a grid with smooth interpolation and exact
 * gradients, analytic surfaces (planes, travelling sinusoids, Gaussian bumps), all behind
 * the one {@link Surface} interface, and the ray–surface intersector.
 *
 * @module surface
 */
export type { Surface, SurfaceBounds, SurfaceDomain } from './types.js';
export { surfaceNormal } from './types.js';
export type {
  PlaneSurfaceOptions,
  SinusoidComponent,
  SinusoidSurfaceOptions,
  GaussianBump,
  GaussianSurfaceOptions,
} from './analytic.js';
export { createPlaneSurface, createSinusoidSurface, createGaussianSurface } from './analytic.js';
export type { GridInterpolation, GridSurfaceOptions } from './grid-surface.js';
export { createGridSurface } from './grid-surface.js';
export type {
  IntersectOptions,
  IntersectBatchOptions,
  SurfaceHit,
  SurfaceHitOk,
  SurfaceHitNone,
  SurfaceHitBatch,
} from './intersect.js';
export { intersectSurface, intersectSurfaceBatch, checkSurface } from './intersect.js';
