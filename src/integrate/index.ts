/**
 * Integrate: slopes → height maps, on full rectangles, masked footprints with holes and
 * separate pieces, sensor geometries and scattered points, with diagnostics and
 * prepared solvers for video.
 *
 * ## Conventions (every method honours them)
 *
 * ```
 *        x0        x0+dx      x0+2dx               x →  (column i, east)
 *   y0    ●(0,0)────●(1,0)────●(2,0) ···            p = ∂h/∂x  > 0: rising towards +x
 *         │         │         │
 *   y0+dy ●(0,1)────●(1,1)────●(2,1) ···            q = ∂h/∂y  > 0: rising towards +y
 *         │         │ ■ cell  │                     h: metres, up (z = h(x, y))
 *   y0+2dy●(0,2)────●(1,2)────●(2,2) ···
 *         ↓ y (row j, north)           ● = sample: p, q, h all co-located here
 *                                      ■ = cell centre (curl map)
 * ```
 *
 * - Sample `(i, j)` (column i, row j) is `data[j·width + i]` and sits at world
 *   `x = x0 + i·dx`, `y = y0 + j·dy` (metres). Row index grows with `y`, column index
 *   with `x`; the world frame is east-north-up, so with the default origin row 0 is the
 *   southern edge of the footprint even though it is printed at the top above.
 * - Slopes are unitless: `p = ∂h/∂x`, `q = ∂h/∂y` at the same sample as `h`
 *   (a surface normal is `(−p, −q, 1)/√(1 + p² + q²)`). Fried heights are the exception:
 *   they sit on the `(width+1) × (height+1)` corner grid, half a spacing outside.
 * - The forward-difference model used by the least-squares and DCT methods (and by the
 *   `rmsResidual` they report): `(h[i+1,j] − h[i,j])/dx ≈ (p[i,j] + p[i+1,j])/2`, and
 *   `(h[i,j+1] − h[i,j])/dy ≈ (q[i,j] + q[i,j+1])/2`.
 * - Masks are `Uint8Array`s, 1 = valid. NaN in slopes is an error unless a mask marks
 *   the sample as a hole; heights outside the mask are 0 with `mask` 0 in the result.
 * - Piston: heights of every independent piece have zero mean over its valid samples,
 *   unless known heights or a prior fix the level (reported per piece in `pieces`).
 *
 * @module integrate
 */
export * from './types.js';
export * from './frankot.js';
export * from './dct.js';
export * from './leastsq.js';
export * from './diagnostics.js';
export * from './integrate.js';
export * from './zonal.js';
export * from './modal.js';
export * from './scattered.js';
