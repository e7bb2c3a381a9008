/**
 * The shape of one benchmark case. Files in `bench/cases/` export `cases: BenchCase[]`;
 * `bench/run.ts` finds them all. Case names, sizes and inputs follow
 * `../shared/peers/peers.py` where a peer exists, so the two can be compared as ratios.
 */
export interface PreparedCase {
  /** The timed work. Its return value is kept from the last run and given to `error`. */
  run(): unknown;
  /** The case's accuracy figure, computed once after timing from the last result. */
  error(result: unknown): number;
  /** Optional extra figures printed after the table (e.g. points per second). */
  notes?(medianMs: number): string | undefined;
}

export interface BenchCase {
  /** Case name, as in the peers script where one exists. */
  name: string;
  /** The full size (as in the peers script). */
  size: number;
  /** A tiny size for `--quick` smoke runs in CI. */
  quickSize: number;
  /** Timed runs at full size. @defaultValue 5 */
  iterations?: number;
  /**
   * Untimed calls before the timed runs at full size, so the figure is the steady state
   * of a function called every frame (V8 optimises a kernel over its first few calls;
   * the numpy peers have no such warm-up). @defaultValue 1
   */
  warmup?: number;
  /** Build inputs at the given size (not timed). */
  prepare(size: number): PreparedCase | Promise<PreparedCase>;
}
