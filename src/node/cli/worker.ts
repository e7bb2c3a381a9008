/**
 * The worker thread of `meniscus process` and `meniscus simulate`: serves frames with the
 * same per-frame functions the single-threaded runs use.
 *
 * @module
 */
import { serveTasks } from '../batch/pool.js';
import { prepareFrameJob } from './frame-job.js';
import type { FrameJobSetup } from './frame-job.js';
import { prepareSimulateJob } from './simulate-job.js';
import type { SimulateJobSetup } from './simulate-job.js';

/** What a CLI worker is started with. */
export type CliWorkerData = { readonly job: 'process'; readonly setup: FrameJobSetup } | { readonly job: 'simulate'; readonly setup: SimulateJobSetup };

serveTasks<never, unknown>((data) => {
  const d = data as CliWorkerData;
  return (d.job === 'process' ? prepareFrameJob(d.setup) : prepareSimulateJob(d.setup)) as (task: never) => unknown;
});
