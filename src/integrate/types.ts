/**
 * Result types shared by every integrator.
 *
 * @module
 */
import type { Grid, Mask } from '../core/index.js';

/** One 4-connected piece of a mask, integrated on its own. */
export interface PieceInfo {
  /** Label of the piece (1-based, in scan order of its first sample). */
  readonly label: number;
  /** Number of valid samples in the piece. */
  readonly samples: number;
  /** The constant added to the piece's heights to meet the piston convention, metres. */
  readonly piston: number;
}

/** What every integrator returns. */
export interface IntegrationResult {
  /**
   * The height map, metres, on the grid the method documents (the slopes' grid for most
   * methods; the corner grid for Fried). Samples outside `mask` hold 0.
   */
  readonly height: Grid;
  /** Which samples of `height` are valid (1) or were not reconstructed (0). */
  readonly mask: Mask;
  /** RMS over the used slope samples of (gradient of the result − given slope), unitless. */
  readonly rmsResidual: number;
  /** Solver iterations (0 for direct transform methods). */
  readonly iterations: number;
  /** Whether an iterative solver met its tolerance (always true for direct methods). */
  readonly converged: boolean;
  /** The solver's final relative residual ‖r‖/‖b‖ (0 for direct methods). */
  readonly relativeResidual: number;
  /** Per-piece pistons, for methods that integrate mask pieces separately. */
  readonly pieces?: readonly PieceInfo[];
}

/** A progress report from an iterative method; return `false` to stop early. */
export type ProgressCallback = (iteration: number, relativeResidual: number) => boolean | void;
