/**
 * Running the frames of a command: in this thread (one worker) or in a pool of worker
 * threads, with the progress bar.
 *
 * @module
 */
import { runTasks } from '../batch/pool.js';
import type { TaskOutcome } from '../batch/pool.js';
import { createProgress } from '../batch/progress.js';
import type { CliIO } from './io.js';
import { cliWorkerUrl } from './locate.js';
import type { CliWorkerData } from './worker.js';

/** How to run a command's frames. */
export interface FrameRunOptions<T, R> {
  /** The tasks, in order. */
  readonly tasks: readonly T[];
  /** Worker threads (1 = in this thread). */
  readonly workers: number;
  /** The job and its setup, as the workers receive them. */
  readonly workerData: CliWorkerData;
  /** The same job, prepared in this thread (used when `workers` is 1). */
  readonly job: (task: T) => R;
  /** Streams (the bar is drawn on `stderr` when it is a terminal). */
  readonly io: CliIO;
  /** No progress bar. */
  readonly quiet: boolean;
}

/**
 * Run the tasks and return one outcome per task, in order, with the wall time.
 *
 * @param o - See {@link FrameRunOptions}.
 * @returns Outcomes, seconds and the number of threads used.
 * @throws What {@link runTasks} throws (a worker that cannot start).
 * @example
 * ```ts
 * const { outcomes } = await runFrames({ tasks, workers: 2, workerData, job, io, quiet: false });
 * ```
 */
export async function runFrames<T, R>(o: FrameRunOptions<T, R>): Promise<{ outcomes: TaskOutcome<R>[]; seconds: number; used: number }> {
  const bar = createProgress(o.tasks.length, { stream: o.io.stderr });
  const t0 = performance.now();
  const used = Math.max(1, Math.min(o.workers, o.tasks.length));
  let outcomes: TaskOutcome<R>[] = [];
  if (used === 1) {
    for (let k = 0; k < o.tasks.length; k++) {
      let out: TaskOutcome<R>;
      try {
        out = { index: k, ok: true, value: o.job(o.tasks[k]!) };
      } catch (e) {
        out = { index: k, ok: false, error: e instanceof Error ? e.message : String(e) };
      }
      outcomes.push(out);
      if (!o.quiet) bar.tick(1, out.ok ? 0 : 1);
      // Let the event loop breathe (signals, stream writes) between frames.
      await new Promise((r) => setImmediate(r));
    }
  } else if (o.tasks.length > 0) {
    outcomes = await runTasks<T, R>(o.tasks, {
      worker: cliWorkerUrl(),
      threads: used,
      workerData: o.workerData,
      onOutcome: (x) => {
        if (!o.quiet) bar.tick(1, x.ok ? 0 : 1);
      },
    });
  }
  if (!o.quiet && o.tasks.length > 0) bar.finish();
  return { outcomes, seconds: (performance.now() - t0) / 1000, used };
}
